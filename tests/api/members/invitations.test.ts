import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { waitForMail, type CaughtMail } from '../../../server/lib/mail.js';
import { AuditLog, Invitation, Membership, Notification, OutboxMessage, User } from '../../../server/lib/models.js';
import { hashToken } from '../../../server/modules/members/invitations.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';
import { signIn, signInFollowing } from '../../helpers/sign-in.js';

/**
 * Invitations end to end: the owner invites, the mail arrives at the local catcher, the person follows
 * the link through the real identity provider and accepts; the link then never works again.
 */
describe('invitations', () => {
  const app = buildApp();
  let networkId: string;
  let networkName: string;
  let seattle: { id: string; name: string };
  let portland: { id: string; name: string };
  let owner: User;
  let ownerCookie: string;

  beforeAll(async () => {
    const network = await makeNetwork();
    networkId = network.id;
    networkName = network.name;
    seattle = await makeShop(networkId, { name: `Cedar Quay Bench ${uniq()}` });
    portland = await makeShop(networkId, { name: `Willow Row Bench ${uniq()}` });
    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }], { name: 'Avery Quill' });
    ownerCookie = await signIn(app, owner.email);
  });

  afterAll(closeServerResources);

  async function invite(email: string, roles = [{ shopId: seattle.id, role: 'technician' }, { shopId: portland.id, role: 'front_desk' }]) {
    const res = await request(app).post('/api/invitations').set('Cookie', ownerCookie).send({ email, roles });
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    return res.body as { invitation: { id: string; email: string; status: string; roles: Array<{ shopName: string; role: string }> }; mailed: boolean };
  }

  const mailTo = (email: string, after = 0) =>
    waitForMail((m: CaughtMail) => m.to.includes(email) && m.subject.includes(networkName) && Date.parse(m.receivedAt) >= after, { timeoutMs: 8000 });

  function tokenFrom(mail: CaughtMail): string {
    const link = new RegExp(`${process.env.APP_ORIGIN}/invitations/([A-Za-z0-9_-]{43})`).exec(mail.text)?.[1];
    if (!link) throw new Error(`no invitation link in: ${mail.text}`);
    return link;
  }

  it('mails a link to the catcher; the person signs in through it, accepts once, and holds the roles', async () => {
    const email = `lena.brightwater-${uniq()}@example.test`;
    const created = await invite(email);
    expect(created.mailed).toBe(true);
    expect(created.invitation).toMatchObject({ email, status: 'pending' });

    const mail = await mailTo(email);
    expect(mail.text).toContain('Technician at ' + seattle.name);
    expect(mail.text).toContain('Front desk at ' + portland.name);
    const token = tokenFrom(mail);
    // only the hash is stored
    const stored = await Invitation.findOne({ where: { networkId, email } });
    expect(stored!.tokenHash).toBe(hashToken(token));
    expect(stored!.tokenHash).not.toContain(token);

    // the link's page asks the public preview what it is about
    const preview = await request(app).get(`/api/invitations/preview/${token}`).expect(200);
    expect(preview.body.invitation).toMatchObject({ email, networkName, invitedByName: 'Avery Quill', status: 'pending' });

    // sign-in through the real provider comes back to the accept page even though the e-mail has no role yet
    const returnTo = `/invitations/${token}/accept`;
    const { cookie, location } = await signInFollowing(app, email, returnTo);
    expect(location).toBe(returnTo);
    await request(app).get('/api/me').set('Cookie', cookie).expect(403);

    const accepted = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
    expect(accepted.status, JSON.stringify(accepted.body)).toBe(200);
    // the session changed id when it gained rights: the old cookie no longer signs anyone in
    const newCookie = String(accepted.headers['set-cookie']).split(';')[0];
    expect(newCookie).toMatch(/^benchrelay\.sid=/);
    expect(newCookie).not.toBe(cookie);
    const me = await request(app).get('/api/me').set('Cookie', newCookie).expect(200);
    expect(me.body.network.id).toBe(networkId);
    expect(me.body.memberships).toEqual(
      expect.arrayContaining([
        { shopId: seattle.id, shopName: seattle.name, role: 'technician' },
        { shopId: portland.id, shopName: portland.name, role: 'front_desk' },
      ]),
    );
    const user = await User.findOne({ where: { networkId, email } });
    expect(user!.name).toBe(email.split('@')[0]); // the stand-in provider's display name

    // used once: the same link is refused, before and after sign-in
    const again = await request(app).post('/api/invitations/accept').set('Cookie', newCookie).send({ token });
    expect(again.status).toBe(410);
    expect(again.body.error.code).toBe('invitation_used');
    expect((await request(app).get(`/api/invitations/preview/${token}`)).body.invitation.status).toBe('accepted');

    // the inviter hears about it, and the log has the whole story
    const notice = await Notification.findOne({ where: { networkId, userId: owner.id, kind: 'invitation_accepted' } });
    expect(notice?.title).toContain('accepted your invitation');
    // invitation_accepted goes by e-mail too unless the inviter turned it off (the default is on)
    const outbox = await OutboxMessage.findOne({ where: { networkId, dedupeKey: `invitation_accepted:${stored!.id}:email:${owner.id}` } });
    expect(outbox?.payload).toMatchObject({ to: expect.stringContaining(owner.email), subject: expect.stringContaining('joined Benchrelay') });
    const actions = (await AuditLog.findAll({ where: { networkId, entityId: stored!.id } })).map((a) => a.action).sort();
    expect(actions).toEqual(['invitation.accepted', 'invitation.created']);
  });

  it('refuses an expired link', async () => {
    const email = `expired-${uniq()}@example.test`;
    const since = Date.now();
    await invite(email);
    const token = tokenFrom(await mailTo(email, since - 1000));
    await Invitation.update({ expiresAt: new Date(Date.now() - 60_000) }, { where: { networkId, email } });
    const { cookie, location } = await signInFollowing(app, email, `/invitations/${token}/accept`);
    expect(location).toBe(`/invitations/${token}/accept`);
    const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('invitation_expired');
    expect(await Membership.count({ where: { networkId }, include: [{ model: User, as: 'user', where: { email } }] })).toBe(0);
  });

  it('refuses a link used by another e-mail address, and refuses anyone not signed in', async () => {
    const email = `meant-for-${uniq()}@example.test`;
    await invite(email);
    const token = tokenFrom(await mailTo(email));
    await request(app).post('/api/invitations/accept').send({ token }).expect(401);
    const stranger = await signIn(app, `someone-else-${uniq()}@example.test`);
    const res = await request(app).post('/api/invitations/accept').set('Cookie', stranger).send({ token });
    expect(res.status).toBe(403);
    expect(res.body.error).toMatchObject({ code: 'invitation_wrong_email', invitedEmail: email });
    // still usable by the right person
    expect((await request(app).get(`/api/invitations/preview/${token}`)).body.invitation.status).toBe('pending');
  });

  it('refuses a revoked link, and a resent invitation replaces the old link', async () => {
    const email = `resend-${uniq()}@example.test`;
    const { invitation } = await invite(email);
    const first = tokenFrom(await mailTo(email));
    await request(app).post(`/api/invitations/${invitation.id}/resend`).set('Cookie', ownerCookie).expect(200);
    const second = tokenFrom(await waitForMail((m) => m.to.includes(email) && !m.text.includes(first), { timeoutMs: 8000 }));
    expect(second).not.toBe(first);
    await request(app).get(`/api/invitations/preview/${first}`).expect(404);

    await request(app).delete(`/api/invitations/${invitation.id}`).set('Cookie', ownerCookie).expect(200);
    const cookie = await signIn(app, email);
    const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token: second });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('invitation_revoked');
  });

  it('inviting the same address again leaves only the newest link working', async () => {
    const email = `twice-${uniq()}@example.test`;
    await invite(email);
    const first = tokenFrom(await mailTo(email));
    await invite(email, [{ shopId: portland.id, role: 'auditor' }]);
    const second = tokenFrom(await waitForMail((m) => m.to.includes(email) && !m.text.includes(first), { timeoutMs: 8000 }));
    expect((await request(app).get(`/api/invitations/preview/${first}`)).body.invitation.status).toBe('revoked');
    const list = await request(app).get('/api/invitations').set('Cookie', ownerCookie).expect(200);
    const open = list.body.invitations.filter((i: { email: string }) => i.email === email);
    expect(open).toHaveLength(1);
    expect(open[0].roles).toEqual([{ shopId: portland.id, shopName: portland.name, role: 'auditor' }]);
    expect(second).toHaveLength(43);
  });

  it('refuses to invite someone who is already a member, and checks the fields', async () => {
    const member = await makeUser(networkId, [{ shopId: seattle.id, role: 'front_desk' }]);
    const dup = await request(app).post('/api/invitations').set('Cookie', ownerCookie).send({ email: member.email.toUpperCase(), roles: [{ shopId: portland.id, role: 'technician' }] });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.email).toBeTruthy();
    const bad = await request(app).post('/api/invitations').set('Cookie', ownerCookie).send({ email: 'not an address', roles: [{ shopId: null, role: 'technician' }] });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['email', 'roles.0.shopId']);
  });

  it('deactivating a person withdraws their open invitation, so they cannot let themselves back in', async () => {
    const email = `leaving-${uniq()}@example.test`;
    const person = await makeUser(networkId, [], { email });
    await invite(email, [{ shopId: seattle.id, role: 'front_desk' }]);
    const token = tokenFrom(await mailTo(email));
    await request(app).post(`/api/people/${person.id}/deactivate`).set('Cookie', ownerCookie).expect(200);
    const { cookie } = await signInFollowing(app, email, `/invitations/${token}/accept`);
    const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
    expect(res.status).toBe(410);
    expect(res.body.error.code).toBe('invitation_revoked');
    await person.reload();
    expect(person.active).toBe(false);
  });

  it('an existing member accepting gains the new roles; a deactivated person invited again is active again', async () => {
    const email = `returning-${uniq()}@example.test`;
    const person = await makeUser(networkId, [], { email });
    await person.update({ active: false, deactivatedAt: new Date() });
    await invite(email, [{ shopId: portland.id, role: 'technician' }]);
    const token = tokenFrom(await mailTo(email));
    const { cookie } = await signInFollowing(app, email, `/invitations/${token}/accept`);
    const res = await request(app).post('/api/invitations/accept').set('Cookie', cookie).send({ token });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    await person.reload();
    expect(person.active).toBe(true);
    expect(await Membership.findOne({ where: { networkId, userId: person.id, shopId: portland.id } })).toMatchObject({ role: 'technician' });
  });
});
