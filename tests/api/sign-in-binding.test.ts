import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { AuditLog, Invitation, Membership, User } from '../../server/lib/models.js';
import { hashToken } from '../../server/modules/members/invitations.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn, signInFollowing } from '../helpers/sign-in.js';
import { closeServerResources } from '../helpers/close.js';

/**
 * A person is their identity-provider account (issuer + subject), bound at first sign-in. Another
 * account that merely carries the same e-mail address (anyone can make one at some provider) is
 * refused, and an address the provider has not verified never binds or accepts an invitation.
 * The stand-in's testing options make those accounts (tests/helpers/sign-in.ts).
 */
describe('sign-in binds a person to one identity-provider account', () => {
  const app = buildApp();
  const issuer = process.env.OIDC_ISSUER!;
  let networkId: string;
  let shopId: string;
  let owner: User;

  beforeAll(async () => {
    const network = await makeNetwork();
    networkId = network.id;
    shopId = (await makeShop(networkId)).id;
    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
  });

  afterAll(closeServerResources);

  const refusals = (userId: string) =>
    AuditLog.findAll({ where: { networkId, entity: 'User', entityId: userId, action: 'sign_in.refused' }, order: [['at', 'ASC']] });

  it('first sign-in of a person created without an account binds issuer and subject', async () => {
    expect(owner.oidcSubject ?? null).toBeNull();
    const cookie = await signIn(app, owner.email);
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    const stored = await User.findByPk(owner.id);
    expect(stored).toMatchObject({ oidcIssuer: issuer, oidcSubject: owner.email });
    const bound = await AuditLog.findOne({ where: { networkId, entityId: owner.id, action: 'sign_in.bound' } });
    expect(bound?.actorUserId).toBe(owner.id);
  });

  it('ATTACK: another account with the owner\u2019s e-mail is refused; nothing signed in, nothing changed, audited', async () => {
    const before = await User.findByPk(owner.id);
    const { cookie, location } = await signInFollowing(app, owner.email, '/people', { subject: `impostor-${uniq()}` });
    expect(location).toBe('/sign-in?error=identity_mismatch');
    // not signed in, not even as "no access"
    const me = await request(app).get('/api/me').set('Cookie', cookie).expect(401);
    expect(me.body.error.code).toBe('unauthenticated');
    await request(app).get('/api/people').set('Cookie', cookie).expect(401);
    const after = await User.findByPk(owner.id);
    expect(after).toMatchObject({ oidcIssuer: issuer, oidcSubject: owner.email, email: owner.email });
    expect(after!.lastSignInAt?.toISOString()).toBe(before!.lastSignInAt?.toISOString());
    const [entry] = await refusals(owner.id);
    expect(entry).toBeTruthy();
    expect(entry.actorUserId).toBeNull();
    expect(entry.after).toMatchObject({ reason: 'identity_mismatch', email: owner.email, issuer });
    expect(String(entry.after!.subject)).toMatch(/^impostor-/);
  });

  it('the refusal signs out whoever was signed in with that browser', async () => {
    const { cookie } = await signInFollowing(app, owner.email);
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    // the same browser (cookie) goes through sign-in again, now with the other account
    const attempt = await signInFollowing(app, owner.email, undefined, { subject: `impostor-${uniq()}`, cookie });
    expect(attempt.location).toBe('/sign-in?error=identity_mismatch');
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);
    await request(app).get('/api/me').set('Cookie', attempt.cookie).expect(401);
  });

  it('the owner still signs in with their own account afterwards', async () => {
    const cookie = await signIn(app, owner.email);
    const me = await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(me.body.user).toMatchObject({ id: owner.id, email: owner.email });
  });

  it('an address the provider has not verified never binds a person; after verifying it binds', async () => {
    const tech = await makeUser(networkId, [{ shopId, role: 'technician' }]);
    const { cookie, location } = await signInFollowing(app, tech.email, undefined, { unverified: true });
    expect(location).toBe('/sign-in?error=email_unverified');
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);
    const stored = await User.findByPk(tech.id);
    expect(stored!.oidcSubject ?? null).toBeNull();
    expect(stored!.oidcIssuer ?? null).toBeNull();
    const [entry] = await refusals(tech.id);
    expect(entry.after).toMatchObject({ reason: 'email_unverified', emailVerified: false });

    const verified = await signIn(app, tech.email);
    await request(app).get('/api/me').set('Cookie', verified).expect(200);
    expect(await User.findByPk(tech.id)).toMatchObject({ oidcIssuer: issuer, oidcSubject: tech.email });
  });

  it('a person bound before issuers were stored keeps signing in with that subject (which records the issuer), no other', async () => {
    const older = await makeUser(networkId, [{ shopId, role: 'front_desk' }]);
    await User.update({ oidcSubject: older.email }, { where: { id: older.id, networkId } });
    const refused = await signInFollowing(app, older.email, undefined, { subject: `impostor-${uniq()}` });
    expect(refused.location).toBe('/sign-in?error=identity_mismatch');
    expect(await User.findByPk(older.id)).toMatchObject({ oidcIssuer: null, oidcSubject: older.email });

    const cookie = await signIn(app, older.email);
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(await User.findByPk(older.id)).toMatchObject({ oidcIssuer: issuer, oidcSubject: older.email });
  });

  describe('invitations', () => {
    async function invitation(email: string) {
      const token = `tok-${uniq()}-${uniq()}-${uniq()}-${uniq()}-abcdefghijk`.slice(0, 43);
      await Invitation.create({
        networkId,
        email,
        tokenHash: hashToken(token),
        roles: [{ shopId, role: 'technician' }],
        invitedByUserId: owner.id,
        expiresAt: new Date(Date.now() + 3 * 24 * 3600_000),
      });
      return token;
    }

    it('an unverified address cannot accept an invitation; nothing is created', async () => {
      const email = `unverified-${uniq()}@example.test`;
      const token = await invitation(email);
      const { cookie, location } = await signInFollowing(app, email, `/invitations/${token}/accept`, { unverified: true });
      expect(location).toBe(`/invitations/${token}/accept`);
      const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('email_unverified');
      expect(res.body.error.message).toContain('has not confirmed');
      expect(await User.count({ where: { networkId, email } })).toBe(0);
      const inv = await Invitation.findOne({ where: { networkId, tokenHash: hashToken(token) } });
      expect(inv!.acceptedAt ?? null).toBeNull();
      await request(app).get('/api/me').set('Cookie', cookie).expect(403);
    });

    it('accepting binds the new person to the account that accepted', async () => {
      const email = `joiner-${uniq()}@example.test`;
      const token = await invitation(email);
      const { cookie } = await signInFollowing(app, email, `/invitations/${token}/accept`);
      await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token }).expect(200);
      expect(await User.findOne({ where: { networkId, email } })).toMatchObject({ oidcIssuer: issuer, oidcSubject: email });
    });

    it('ATTACK: another account with a bound person\u2019s address cannot accept an invitation sent to that address', async () => {
      // a deactivated, bound person invited back: only their own account may take the invitation
      const former = await makeUser(networkId, [{ shopId, role: 'front_desk' }]);
      await signIn(app, former.email);
      await User.update({ active: false, deactivatedAt: new Date() }, { where: { id: former.id, networkId } });
      await Membership.destroy({ where: { networkId, userId: former.id } });
      const token = await invitation(former.email);
      const { cookie } = await signInFollowing(app, former.email, `/invitations/${token}/accept`, { subject: `impostor-${uniq()}` });
      const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('identity_mismatch');
      const stored = await User.findByPk(former.id);
      expect(stored).toMatchObject({ active: false, oidcSubject: former.email });
      expect(await Membership.count({ where: { networkId, userId: former.id } })).toBe(0);
      expect((await Invitation.findOne({ where: { networkId, tokenHash: hashToken(token) } }))!.acceptedAt ?? null).toBeNull();
      expect((await refusals(former.id)).some((e) => e.after?.via === 'invitation')).toBe(true);

      // the person's own account still accepts
      const own = await signInFollowing(app, former.email, `/invitations/${token}/accept`);
      await request(app).post('/api/invitations/accept').set('Cookie', own.cookie).send({ token }).expect(200);
      expect(await User.findByPk(former.id)).toMatchObject({ active: true });
    });
  });

  it('one account is never bound to two people of a network: an account already bound to a deactivated person is refused', async () => {
    const a = await makeUser(networkId, [{ shopId, role: 'technician' }]);
    const b = await makeUser(networkId, [{ shopId, role: 'technician' }]);
    const account = `shared-account-${uniq()}`;
    await User.update({ oidcIssuer: issuer, oidcSubject: account, active: false }, { where: { id: a.id, networkId } });
    const { location } = await signInFollowing(app, b.email, undefined, { subject: account });
    expect(location).toBe('/sign-in?error=identity_mismatch');
    expect(await User.findByPk(b.id)).toMatchObject({ oidcIssuer: null, oidcSubject: null });
    expect((await refusals(b.id))[0].after).toMatchObject({ reason: 'identity_mismatch', subject: account });
  });
});
