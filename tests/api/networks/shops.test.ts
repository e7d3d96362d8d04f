import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { AuditLog, RelayRun, Skill, User } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/** The owner's Shops screen API, and how the lists are cut down to what each person may read. */
describe('shops, skills and relay runs', () => {
  const app = buildApp();
  let networkId: string;
  let owner: User;
  let ownerCookie: string;
  let north: { id: string; name: string };
  let south: { id: string; name: string };
  let east: { id: string; name: string };
  let lowSax: Skill;
  let flute: Skill;

  beforeAll(async () => {
    networkId = (await makeNetwork()).id;
    north = await makeShop(networkId, { name: 'North Bench' });
    south = await makeShop(networkId, { name: 'South Bench' });
    east = await makeShop(networkId, { name: 'East Bench' });
    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
    ownerCookie = await signIn(app, owner.email);
    lowSax = await Skill.create({ networkId, code: 'low_sax', name: 'Low saxophones' });
    flute = await Skill.create({ networkId, code: 'flute', name: 'Flutes' });
  });

  afterAll(closeServerResources);

  const code = () => `Q${Math.floor(Math.random() * 1e6)}`.slice(0, 8);

  it('creates a shop with coordinates, time zone and opening days, and logs it', async () => {
    const body = {
      name: 'Juniper Yard Bench', code: code().toLowerCase(), addressLine: '12 Juniper Yard', city: 'Boise', region: 'ID',
      postalCode: '83702', latitude: 43.615, longitude: -116.2023, timeZone: 'America/Boise', openingDays: [5, 1, 3],
      // 6 %: a rate invented for the test
      laborRateCents: 8700, taxRateBasisPoints: 600, email: 'Juniper@Example.test',
    };
    const res = await request(app).post('/api/shops').set('Cookie', ownerCookie).send(body);
    expect(res.status, JSON.stringify(res.body)).toBe(201);
    expect(res.body.shop).toMatchObject({
      name: 'Juniper Yard Bench', code: body.code.toUpperCase(), latitude: 43.615, longitude: -116.2023,
      timeZone: 'America/Boise', openingDays: [1, 3, 5], laborRateCents: 8700, email: 'juniper@example.test', active: true,
    });
    const log = await AuditLog.findOne({ where: { networkId, entity: 'Shop', entityId: res.body.shop.id } });
    expect(log).toMatchObject({ action: 'shop.created', actorUserId: owner.id, before: null });
    expect(log!.after).toMatchObject({ name: 'Juniper Yard Bench', timeZone: 'America/Boise' });
  });

  it('answers field errors from the shared schema, and a taken code as a conflict on that field', async () => {
    const bad = await request(app).post('/api/shops').set('Cookie', ownerCookie).send({
      name: ' ', code: 'x', timeZone: 'Mars/Olympus', openingDays: [], laborRateCents: -5, latitude: 91,
    });
    expect(bad.status).toBe(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['code', 'latitude', 'laborRateCents', 'name', 'openingDays', 'timeZone'].sort());
    const taken = await request(app).post('/api/shops').set('Cookie', ownerCookie).send({
      name: 'Copy', code: (await request(app).get(`/api/shops/${north.id}`).set('Cookie', ownerCookie)).body.shop.code,
      timeZone: 'America/Chicago', openingDays: [1], laborRateCents: 1,
    });
    expect(taken.status).toBe(409);
    expect(taken.body.error.fields.code).toBeTruthy();
  });

  it('edits a shop; the log keeps the values before and after', async () => {
    const res = await request(app).patch(`/api/shops/${south.id}`).set('Cookie', ownerCookie).send({ openingDays: [2, 3, 4, 5, 6], timeZone: 'America/Denver' });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    expect(res.body.shop).toMatchObject({ openingDays: [2, 3, 4, 5, 6], timeZone: 'America/Denver', name: 'South Bench' });
    const log = await AuditLog.findOne({ where: { networkId, entity: 'Shop', entityId: south.id, action: 'shop.updated' } });
    expect(log!.before).toMatchObject({ openingDays: [1, 2, 3, 4, 5], timeZone: 'America/Los_Angeles' });
    expect(log!.after).toMatchObject({ openingDays: [2, 3, 4, 5, 6], timeZone: 'America/Denver' });
  });

  it('sets the skills a shop offers and each technician’s weekly hours', async () => {
    const tech = await makeUser(networkId, [{ shopId: north.id, role: 'technician' }], { name: 'Hollis Vance' });
    const desk = await makeUser(networkId, [{ shopId: north.id, role: 'front_desk' }]);
    const skills = await request(app).put(`/api/shops/${north.id}/skills`).set('Cookie', ownerCookie)
      .send({ skills: [{ skillId: lowSax.id, weeklyBenchHours: 40 }, { skillId: flute.id, weeklyBenchHours: 12.5 }] });
    expect(skills.status, JSON.stringify(skills.body)).toBe(200);
    expect(skills.body.shop.skills).toEqual([
      { skillId: flute.id, code: 'flute', name: 'Flutes', weeklyBenchHours: 12.5 },
      { skillId: lowSax.id, code: 'low_sax', name: 'Low saxophones', weeklyBenchHours: 40 },
    ]);
    // replacing the set drops what is no longer offered
    const fewer = await request(app).put(`/api/shops/${north.id}/skills`).set('Cookie', ownerCookie).send({ skills: [{ skillId: lowSax.id, weeklyBenchHours: 30 }] });
    expect(fewer.body.shop.skills.map((s: { code: string }) => s.code)).toEqual(['low_sax']);

    const hours = await request(app).put(`/api/shops/${north.id}/technician-skills`).set('Cookie', ownerCookie)
      .send({ userId: tech.id, skills: [{ skillId: lowSax.id, weeklyHours: 20 }] });
    expect(hours.status, JSON.stringify(hours.body)).toBe(200);
    expect(hours.body.shop.technicians).toEqual([
      { userId: tech.id, name: 'Hollis Vance', email: tech.email, active: true, skills: [{ skillId: lowSax.id, name: 'Low saxophones', weeklyHours: 20 }] },
    ]);
    const notTech = await request(app).put(`/api/shops/${north.id}/technician-skills`).set('Cookie', ownerCookie)
      .send({ userId: desk.id, skills: [{ skillId: lowSax.id, weeklyHours: 5 }] });
    expect(notTech.status).toBe(400);
    expect(notTech.body.error.fields.userId).toMatch(/technician role/);
    const tooMany = await request(app).put(`/api/shops/${north.id}/technician-skills`).set('Cookie', ownerCookie)
      .send({ userId: tech.id, skills: [{ skillId: lowSax.id, weeklyHours: 200 }] });
    expect(tooMany.body.error.fields['skills.0.weeklyHours']).toMatch(/168/);
  });

  it('keeps relay runs between two shops of the network, with days, departure and transit hours', async () => {
    const created = await request(app).post('/api/relay-runs').set('Cookie', ownerCookie)
      .send({ fromShopId: north.id, toShopId: south.id, weekdays: [4, 2], departureTime: '07:30', transitHours: 3.5 });
    expect(created.status, JSON.stringify(created.body)).toBe(201);
    expect(created.body.relayRun).toMatchObject({ fromShopName: 'North Bench', toShopName: 'South Bench', weekdays: [2, 4], departureTime: '07:30', transitHours: 3.5, active: true });
    const id = created.body.relayRun.id;

    const edited = await request(app).patch(`/api/relay-runs/${id}`).set('Cookie', ownerCookie).send({ departureTime: '08:15', active: false });
    expect(edited.body.relayRun).toMatchObject({ departureTime: '08:15', active: false });

    const same = await request(app).post('/api/relay-runs').set('Cookie', ownerCookie)
      .send({ fromShopId: north.id, toShopId: north.id, weekdays: [1], departureTime: '25:00', transitHours: 0 });
    expect(same.status).toBe(400);
    expect(Object.keys(same.body.error.fields).sort()).toEqual(['departureTime', 'toShopId', 'transitHours']);
    const loop = await request(app).post('/api/relay-runs').set('Cookie', ownerCookie)
      .send({ fromShopId: north.id, toShopId: north.id, weekdays: [1], departureTime: '06:00', transitHours: 2 });
    expect(loop.body.error.fields.toShopId).toBeTruthy();

    const removed = await request(app).delete(`/api/relay-runs/${id}`).set('Cookie', ownerCookie).expect(200);
    expect(removed.body.removed).toBe(true);
    expect(await RelayRun.count({ where: { networkId, id } })).toBe(0);
  });

  it('filters lists in SQL to what each person may read', async () => {
    await RelayRun.bulkCreate([
      { networkId, fromShopId: north.id, toShopId: south.id, weekdays: [1], departureTime: '06:00:00', transitHours: 2 },
      { networkId, fromShopId: south.id, toShopId: east.id, weekdays: [3], departureTime: '06:00:00', transitHours: 2 },
      { networkId, fromShopId: east.id, toShopId: north.id, weekdays: [5], departureTime: '06:00:00', transitHours: 2 },
    ]);
    const tech = await makeUser(networkId, [{ shopId: east.id, role: 'technician' }]);
    const manager = await makeUser(networkId, [{ shopId: north.id, role: 'regional_manager' }]);
    const techCookie = await signIn(app, tech.email);
    const managerCookie = await signIn(app, manager.email);

    const techShops = await request(app).get('/api/shops').set('Cookie', techCookie).expect(200);
    expect(techShops.body.shops.map((s: { name: string }) => s.name)).toEqual(['East Bench']);
    const techRuns = await request(app).get('/api/relay-runs').set('Cookie', techCookie).expect(200);
    // only runs leaving or reaching East
    expect(techRuns.body.relayRuns.map((r: { fromShopName: string; toShopName: string }) => `${r.fromShopName}→${r.toShopName}`).sort())
      .toEqual(['East Bench→North Bench', 'South Bench→East Bench']);
    await request(app).get(`/api/shops/${north.id}`).set('Cookie', techCookie).expect(403);

    const managerShops = await request(app).get('/api/shops').set('Cookie', managerCookie).expect(200);
    expect(managerShops.body.shops.length).toBeGreaterThanOrEqual(3);
    const managerRuns = await request(app).get('/api/relay-runs').set('Cookie', managerCookie).expect(200);
    expect(managerRuns.body.relayRuns.length).toBeGreaterThanOrEqual(3);
    // reading is not editing
    const denied = await request(app).patch(`/api/shops/${north.id}`).set('Cookie', managerCookie).send({ name: 'Mine now' });
    expect(denied.status).toBe(403);
    expect(denied.body.error.message).toMatch(/owner/);
  });

  it('keeps skills by code, unique in the network', async () => {
    const created = await request(app).post('/api/skills').set('Cookie', ownerCookie).send({ code: `bass_${uniq()}`, name: 'Bass clarinets' }).expect(201);
    const dup = await request(app).post('/api/skills').set('Cookie', ownerCookie).send({ code: created.body.skill.code, name: 'Again' });
    expect(dup.status).toBe(409);
    expect(dup.body.error.fields.code).toBeTruthy();
    const renamed = await request(app).patch(`/api/skills/${created.body.skill.id}`).set('Cookie', ownerCookie).send({ name: 'Bass and contra clarinets' }).expect(200);
    expect(renamed.body.skill.name).toBe('Bass and contra clarinets');
  });
});
