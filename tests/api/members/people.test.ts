import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { sequelize } from '../../../server/lib/db.js';
import { Membership, User } from '../../../server/lib/models.js';
import { loadActorRecord, lockOwners, removeMembership } from '../../../server/modules/members/service.js';
import { abilityFor } from '../../../shared/auth/ability.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/** The owner's People screen API: roles per shop, deactivation, the last-owner rule, the audit log. */
describe('people and roles', () => {
  const app = buildApp();
  let networkId: string;
  let shopA: { id: string; name: string };
  let shopB: { id: string; name: string };
  let owner: User;
  let ownerCookie: string;

  beforeAll(async () => {
    networkId = (await makeNetwork()).id;
    shopA = await makeShop(networkId, { name: 'Alder Bench' });
    shopB = await makeShop(networkId, { name: 'Birch Bench' });
    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }], { name: 'Avery Quill' });
    ownerCookie = await signIn(app, owner.email);
  });

  afterAll(closeServerResources);

  const sessionsOf = async (userId: string) => {
    const [rows] = await sequelize.query(`select count(*)::int as n from session where sess->'user'->>'id' = :userId`, { replacements: { userId } });
    return (rows as Array<{ n: number }>)[0].n;
  };

  it('lists people with their roles per shop, and filters by shop and status', async () => {
    const tech = await makeUser(networkId, [{ shopId: shopA.id, role: 'technician' }, { shopId: shopB.id, role: 'front_desk' }], { name: 'Mira Stavros' });
    const gone = await makeUser(networkId, [{ shopId: shopB.id, role: 'auditor' }], { name: 'Olle Penhallow' });
    await gone.update({ active: false, deactivatedAt: new Date() });
    // someone of another network never shows
    const other = await makeNetwork();
    await makeUser(other.id, [{ shopId: null, role: 'owner' }], { name: 'Foreign Owner' });

    const all = await request(app).get('/api/people').set('Cookie', ownerCookie).expect(200);
    const names = all.body.people.map((p: { name: string }) => p.name);
    expect(names).toEqual(['Avery Quill', 'Mira Stavros', 'Olle Penhallow']);
    const mira = all.body.people.find((p: { id: string }) => p.id === tech.id);
    expect(mira.memberships.map((m: { shopName: string; role: string }) => `${m.shopName}:${m.role}`)).toEqual([
      'Alder Bench:technician',
      'Birch Bench:front_desk',
    ]);

    const atA = await request(app).get('/api/people').query({ shopId: shopA.id }).set('Cookie', ownerCookie).expect(200);
    expect(atA.body.people.map((p: { name: string }) => p.name)).toEqual(['Mira Stavros']);
    const inactive = await request(app).get('/api/people').query({ status: 'inactive' }).set('Cookie', ownerCookie).expect(200);
    expect(inactive.body.people.map((p: { name: string }) => p.name)).toEqual(['Olle Penhallow']);
    const search = await request(app).get('/api/people').query({ q: 'stav' }).set('Cookie', ownerCookie).expect(200);
    expect(search.body.people.map((p: { name: string }) => p.name)).toEqual(['Mira Stavros']);
  });

  it('gives, changes and removes a role per shop; a role change applies to the next request', async () => {
    const person = await makeUser(networkId, [{ shopId: shopA.id, role: 'technician' }]);
    const cookie = await signIn(app, person.email);
    const before = await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(before.body.shops.map((s: { id: string }) => s.id)).toEqual([shopA.id]);

    const added = await request(app).post(`/api/people/${person.id}/memberships`).set('Cookie', ownerCookie).send({ shopId: shopB.id, role: 'front_desk' });
    expect(added.status, JSON.stringify(added.body)).toBe(200);
    const atB = added.body.person.memberships.find((m: { shopId: string }) => m.shopId === shopB.id);
    expect(atB.role).toBe('front_desk');
    // the same session sees the new shop at once
    const after = await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(after.body.shops.map((s: { id: string }) => s.id).sort()).toEqual([shopA.id, shopB.id].sort());

    // one role per shop: giving another role at B replaces it
    await request(app).post(`/api/people/${person.id}/memberships`).set('Cookie', ownerCookie).send({ shopId: shopB.id, role: 'auditor' }).expect(200);
    expect(await Membership.count({ where: { networkId, userId: person.id, shopId: shopB.id } })).toBe(1);
    const changed = await request(app).patch(`/api/memberships/${atB.id}`).set('Cookie', ownerCookie).send({ role: 'technician' }).expect(200);
    expect(changed.body.person.memberships.find((m: { id: string }) => m.id === atB.id).role).toBe('technician');

    await request(app).delete(`/api/memberships/${atB.id}`).set('Cookie', ownerCookie).expect(200);
    const removed = await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(removed.body.shops.map((s: { id: string }) => s.id)).toEqual([shopA.id]);

    // field errors come from the shared schema
    const bad = await request(app).post(`/api/people/${person.id}/memberships`).set('Cookie', ownerCookie).send({ shopId: null, role: 'technician' });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fields.shopId).toMatch(/needs a shop/);
  });

  it('deactivating a person ends their existing session at once', async () => {
    const person = await makeUser(networkId, [{ shopId: shopA.id, role: 'front_desk' }]);
    const cookie = await signIn(app, person.email);
    const second = await signIn(app, person.email);
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(await sessionsOf(person.id)).toBe(2);

    const res = await request(app).post(`/api/people/${person.id}/deactivate`).set('Cookie', ownerCookie).expect(200);
    expect(res.body.endedSessions).toBe(2);
    expect(res.body.person.active).toBe(false);
    expect(await sessionsOf(person.id)).toBe(0);
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);
    await request(app).get('/api/me').set('Cookie', second).expect(401);
    // and cannot sign in again: the provider vouches for the e-mail, Benchrelay refuses it
    const again = await signIn(app, person.email);
    expect((await request(app).get('/api/me').set('Cookie', again)).body.error.code).toBe('no_access');

    await request(app).post(`/api/people/${person.id}/reactivate`).set('Cookie', ownerCookie).expect(200);
    const back = await signIn(app, person.email);
    await request(app).get('/api/me').set('Cookie', back).expect(200);
  });

  it('protects the last owner: not removed, not demoted, not deactivated', async () => {
    const net = await makeNetwork();
    const shop = await makeShop(net.id);
    const soleOwner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const cookie = await signIn(app, soleOwner.email);
    const ownerRole = await Membership.findOne({ where: { networkId: net.id, userId: soleOwner.id } });

    const remove = await request(app).delete(`/api/memberships/${ownerRole!.id}`).set('Cookie', cookie);
    expect(remove.status).toBe(409);
    expect(remove.body.error.code).toBe('last_owner');
    const demote = await request(app).patch(`/api/memberships/${ownerRole!.id}`).set('Cookie', cookie).send({ role: 'regional_manager' });
    expect(demote.status).toBe(409);
    const self = await request(app).post(`/api/people/${soleOwner.id}/deactivate`).set('Cookie', cookie);
    expect(self.status).toBe(409);

    // a second owner arrives; now the first may step down, but the second is then the last again
    const second = await makeUser(net.id, [{ shopId: shop.id, role: 'technician' }]);
    await request(app).post(`/api/people/${second.id}/memberships`).set('Cookie', cookie).send({ shopId: null, role: 'owner' }).expect(200);
    const secondCookie = await signIn(app, second.email);
    await request(app).delete(`/api/memberships/${ownerRole!.id}`).set('Cookie', secondCookie).expect(200);
    const secondOwnerRole = await Membership.findOne({ where: { networkId: net.id, userId: second.id, role: 'owner' } });
    const last = await request(app).delete(`/api/memberships/${secondOwnerRole!.id}`).set('Cookie', secondCookie);
    expect(last.status).toBe(409);
    // the first owner lost the role: their session no longer reaches the People API
    await request(app).get('/api/people').set('Cookie', cookie).expect(401);
  });

  it('owner removals in one network wait for each other, so two owners removing each other cannot both win', async () => {
    // straight through the service, so both actors hold their rights when they start
    const net = await makeNetwork();
    const a = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const b = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const actor = async (u: User) => {
      const record = (await loadActorRecord(u.id, net.id))!;
      return { ...record, ability: abilityFor(record) };
    };
    const roleOf = async (u: User) => (await Membership.findOne({ where: { networkId: net.id, userId: u.id } }))!.id;
    const [actorA, actorB, roleA, roleB] = [await actor(a), await actor(b), await roleOf(a), await roleOf(b)];

    // while another change to the owners is in flight, a removal waits instead of counting stale owners
    const inFlight = await sequelize.transaction();
    await lockOwners(net.id, inFlight);
    let firstDone = false;
    const first = removeMembership(actorA, roleB).then(() => (firstDone = true));
    await new Promise((resolve) => setTimeout(resolve, 300));
    expect(firstDone).toBe(false);
    await inFlight.commit();
    await first;

    await expect(removeMembership(actorB, roleA)).rejects.toMatchObject({ status: 409, code: 'last_owner' });
    expect(await Membership.count({ where: { networkId: net.id, role: 'owner' } })).toBe(1);
  });

  it('writes every change to the audit log with before and after, which the owner reads page by page', async () => {
    const person = await makeUser(networkId, [{ shopId: shopA.id, role: 'technician' }], { name: `Audit Subject ${uniq()}` });
    const role = await Membership.findOne({ where: { networkId, userId: person.id } });
    await request(app).patch(`/api/memberships/${role!.id}`).set('Cookie', ownerCookie).send({ role: 'auditor' }).expect(200);
    await request(app).patch(`/api/people/${person.id}`).set('Cookie', ownerCookie).send({ name: 'Audit Renamed' }).expect(200);

    const byRole = await request(app).get('/api/audit-log').query({ entity: 'Membership', entityId: role!.id }).set('Cookie', ownerCookie).expect(200);
    expect(byRole.body.entries).toHaveLength(1);
    expect(byRole.body.entries[0]).toMatchObject({
      action: 'membership.updated',
      subject: 'Audit Renamed at Alder Bench', // today's name: the log reads with current names
      actor: { id: owner.id, name: 'Avery Quill' },
      before: { role: 'technician', shopId: shopA.id },
      after: { role: 'auditor', shopId: shopA.id },
    });
    const byPerson = await request(app).get('/api/audit-log').query({ entity: 'User', entityId: person.id }).set('Cookie', ownerCookie).expect(200);
    expect(byPerson.body.entries[0]).toMatchObject({ action: 'person.updated', subject: 'Audit Renamed', before: { name: expect.stringContaining('Audit Subject') }, after: { name: 'Audit Renamed' } });

    // pages do not overlap and cover everything
    const first = await request(app).get('/api/audit-log').query({ limit: 2 }).set('Cookie', ownerCookie).expect(200);
    expect(first.body.entries).toHaveLength(2);
    expect(first.body.nextCursor).toBeTruthy();
    const next = await request(app).get('/api/audit-log').query({ limit: 2, cursor: first.body.nextCursor }).set('Cookie', ownerCookie).expect(200);
    const ids = [...first.body.entries, ...next.body.entries].map((e: { id: string }) => e.id);
    expect(new Set(ids).size).toBe(ids.length);
    const whole = await request(app).get('/api/audit-log').query({ limit: 4 }).set('Cookie', ownerCookie).expect(200);
    expect(whole.body.entries.map((e: { id: string }) => e.id)).toEqual(ids);
  });

  it('answers another network’s person as not found, and a non-owner with a clear refusal', async () => {
    const other = await makeNetwork();
    const stranger = await makeUser(other.id, [{ shopId: null, role: 'owner' }]);
    const res = await request(app).get(`/api/people/${stranger.id}`).set('Cookie', ownerCookie);
    expect(res.status).toBe(404);
    const manager = await makeUser(networkId, [{ shopId: shopA.id, role: 'regional_manager' }]);
    const denied = await request(app).get('/api/people').set('Cookie', await signIn(app, manager.email));
    expect(denied.status).toBe(403);
    expect(denied.body.error.message).toMatch(/owner/);
  });
});
