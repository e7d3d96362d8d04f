import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { AuditLog, Membership, type User } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/** The owner's audit log: names for the ids it mentions, and filters by person, shop, kind and dates. */
describe('audit log filters and names', () => {
  const app = buildApp();
  let networkId: string;
  let alder: { id: string; name: string };
  let birch: { id: string; name: string };
  let owner: User;
  let ownerCookie: string;
  let mira: User;
  let olle: User;
  let inviteEmail: string;

  type Entry = { id: string; action: string; entity: string; entityId: string | null; subject: string; at: string; actor: { id: string } | null };
  const log = async (query: Record<string, string>) => {
    const res = await request(app).get('/api/audit-log').query({ limit: 200, ...query }).set('Cookie', ownerCookie).expect(200);
    return res.body as { entries: Entry[]; names: Record<string, string>; nextCursor: string | null };
  };

  beforeAll(async () => {
    networkId = (await makeNetwork()).id;
    alder = await makeShop(networkId, { name: `Alder Bench ${uniq()}` });
    birch = await makeShop(networkId, { name: `Birch Bench ${uniq()}` });
    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }], { name: 'Avery Quill' });
    ownerCookie = await signIn(app, owner.email);
    mira = await makeUser(networkId, [], { name: 'Mira Stavros' });
    olle = await makeUser(networkId, [], { name: 'Olle Penhallow' });
    // Mira gets a role at Alder, Olle one at Birch; an invitation names both shops
    await request(app).post(`/api/people/${mira.id}/memberships`).set('Cookie', ownerCookie).send({ shopId: alder.id, role: 'technician' }).expect(200);
    await request(app).post(`/api/people/${olle.id}/memberships`).set('Cookie', ownerCookie).send({ shopId: birch.id, role: 'front_desk' }).expect(200);
    const miraRole = await Membership.findOne({ where: { networkId, userId: mira.id, shopId: alder.id } });
    await request(app).patch(`/api/memberships/${miraRole!.id}`).set('Cookie', ownerCookie).send({ role: 'auditor' }).expect(200);
    inviteEmail = `ines.barros-${uniq()}@example.test`;
    await request(app).post('/api/invitations').set('Cookie', ownerCookie)
      .send({ email: inviteEmail, roles: [{ shopId: alder.id, role: 'front_desk' }, { shopId: birch.id, role: 'technician' }] })
      .expect((res) => expect([200, 201]).toContain(res.status));
  });

  afterAll(closeServerResources);

  it('names every person, shop and skill the before and after values mention', async () => {
    const { entries, names } = await log({ entity: 'Membership', action: 'membership.updated' });
    expect(entries).toHaveLength(1);
    expect(entries[0].subject).toBe(`Mira Stavros at ${alder.name}`);
    expect(names[alder.id]).toBe(alder.name);
    expect(names[mira.id]).toBe('Mira Stavros');
    const invitation = await log({ action: 'invitation.created' });
    expect(invitation.names[birch.id]).toBe(birch.name);
  });

  it('by person: what they did and what was done about them, nobody else’s', async () => {
    const { entries } = await log({ personId: mira.id });
    expect(entries.map((e) => e.action).sort()).toEqual(['membership.created', 'membership.updated']);
    expect(entries.every((e) => e.subject.startsWith('Mira Stavros'))).toBe(true);
    // the owner did all of it: filtering by the owner finds every change
    // (and the owner's own first sign-in, which bound the account to the identity provider's subject)
    const byOwner = await log({ personId: owner.id });
    expect(byOwner.entries.map((e) => e.action).sort()).toEqual(
      ['invitation.created', 'membership.created', 'membership.created', 'membership.updated', 'sign_in.bound'],
    );
  });

  it('by shop: roles there and invitations naming it, not another shop’s roles', async () => {
    const atBirch = await log({ shopId: birch.id });
    expect(atBirch.entries.map((e) => e.subject).sort()).toEqual([inviteEmail, `Olle Penhallow at ${birch.name}`].sort());
    const atAlder = await log({ shopId: alder.id });
    expect(atAlder.entries.map((e) => e.action).sort()).toEqual(['invitation.created', 'membership.created', 'membership.updated']);
  });

  it('by kind of record or of change', async () => {
    expect((await log({ entity: 'Invitation' })).entries.map((e) => e.subject)).toEqual([inviteEmail]);
    expect((await log({ action: 'membership.created' })).entries).toHaveLength(2);
  });

  it('by date range: from inclusive, to exclusive', async () => {
    const { entries } = await log({ personId: olle.id });
    expect(entries).toHaveLength(1);
    const old = await AuditLog.findOne({ where: { networkId, id: entries[0].id } });
    await AuditLog.update({ at: new Date('2026-03-09T12:00:00Z') }, { where: { networkId, id: old!.id } });
    const inMarch = await log({ from: '2026-03-09T00:00:00-08:00', to: '2026-03-10T00:00:00-08:00' });
    expect(inMarch.entries.map((e) => e.id)).toEqual([old!.id]);
    expect((await log({ from: '2026-03-09T12:00:00Z', to: '2026-03-09T12:00:01Z' })).entries).toHaveLength(1);
    expect((await log({ from: '2026-03-08T00:00:00Z', to: '2026-03-09T12:00:00Z' })).entries).toHaveLength(0);
    // everything else happened today, after March
    const since = await log({ from: '2026-04-01T00:00:00Z' });
    expect(since.entries.map((e) => e.id)).not.toContain(old!.id);
    expect(since.entries.map((e) => e.action).sort()).toEqual(['invitation.created', 'membership.created', 'membership.updated', 'sign_in.bound']);
  });

  it('refuses filters it cannot read, field by field, and changes nothing', async () => {
    const bad = async (query: Record<string, string>, field: string) => {
      const res = await request(app).get('/api/audit-log').query(query).set('Cookie', ownerCookie).expect(400);
      expect(Object.keys(res.body.error.fields)).toContain(field);
    };
    await bad({ personId: 'mira' }, 'personId');
    await bad({ shopId: '12' }, 'shopId');
    await bad({ entity: 'Invoice' }, 'entity');
    await bad({ action: 'drop table' }, 'action');
    await bad({ from: 'yesterday' }, 'from');
    await bad({ from: '2026-03-10T00:00:00Z', to: '2026-03-09T00:00:00Z' }, 'to');
  });

  it('never shows another network’s entries, whatever the filter names', async () => {
    const other = await makeNetwork();
    const otherShop = await makeShop(other.id);
    const otherOwner = await makeUser(other.id, [{ shopId: null, role: 'owner' }]);
    const stranger = await makeUser(other.id, []);
    const cookie = await signIn(app, otherOwner.email);
    await request(app).post(`/api/people/${stranger.id}/memberships`).set('Cookie', cookie).send({ shopId: otherShop.id, role: 'technician' }).expect(200);
    expect((await log({ shopId: otherShop.id })).entries).toHaveLength(0);
    expect((await log({ personId: otherOwner.id })).entries).toHaveLength(0);
  });
});
