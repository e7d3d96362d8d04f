import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Customer, HistoryEvent, Instrument, Job } from '../../../server/lib/models.js';
import { abilityFor } from '../../../shared/auth/ability.js';
import { openJob } from '../../../server/modules/jobs/service.js';
import type { Actor } from '../../../server/lib/auth.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

describe('POST /api/intake and openJob', () => {
  const app = buildApp();
  let networkId: string;
  let shopA: { id: string; name: string };
  let shopB: { id: string; name: string };
  let deskCookie: string;
  let deskBCookie: string;
  let deskUserId: string;

  const body = (over: Record<string, unknown> = {}) => ({
    shopId: shopA.id,
    requestKey: randomUUID(),
    instrument: { new: { serial: `ZX-${Math.floor(Math.random() * 1e8)}`, maker: 'Aldmoor', family: 'alto_saxophone', model: 'Fenlark Alto', ownerKind: 'customer' } },
    customer: { new: { kind: 'person', name: 'Wren Halvorsen', phone: '+1 555 0142', email: 'wren@mail.test' } },
    job: { complaint: 'Low notes gurgle below D', conditionNotes: 'Case latch broken' },
    ...over,
  });

  beforeAll(async () => {
    const net = await makeNetwork();
    networkId = net.id;
    shopA = await makeShop(net.id, { name: 'Front Street bench' });
    shopB = await makeShop(net.id, { name: 'Harbour bench' });
    const desk = await makeUser(net.id, [{ shopId: shopA.id, role: 'front_desk' }]);
    const deskB = await makeUser(net.id, [{ shopId: shopB.id, role: 'front_desk' }]);
    deskUserId = desk.id;
    deskCookie = await signIn(app, desk.email);
    deskBCookie = await signIn(app, deskB.email);
  });
  afterAll(closeServerResources);

  it('registers the instrument and the customer and opens job 1 at stage intake, with its history', async () => {
    const res = await request(app).post('/api/intake').set('Cookie', deskCookie).send(body()).expect(201);
    expect(res.body.job).toMatchObject({ number: 1, stage: 'intake', shopId: shopA.id });
    const instrument = await Instrument.findOne({ where: { networkId, id: res.body.instrument.id } });
    expect(instrument).toMatchObject({ currentShopId: shopA.id, status: 'in_shop', ownerKind: 'customer', ownerCustomerId: res.body.customerId });
    expect(instrument!.assetTag).toMatch(/^BR-/);
    const customer = await Customer.findOne({ where: { networkId, id: res.body.customerId } });
    expect(customer).toMatchObject({ name: 'Wren Halvorsen', homeShopId: shopA.id });
    const events = await HistoryEvent.findAll({ where: { networkId, instrumentId: instrument!.id }, order: [['occurredAt', 'ASC']] });
    expect(events.map((e) => e.kind)).toEqual(['registered', 'intake', 'job_opened']);
    expect(events.every((e) => e.idempotencyKey)).toBe(true);
    expect(events[1].summary).toBe('Checked in at Front Street bench: Low notes gurgle below D');
  });

  it('a repeated submit with the same request key opens one job', async () => {
    const once = body();
    const first = await request(app).post('/api/intake').set('Cookie', deskCookie).send(once).expect(201);
    const again = await request(app).post('/api/intake').set('Cookie', deskCookie).send(once).expect(200);
    expect(again.body.replayed).toBe(true);
    expect(again.body.job.id).toBe(first.body.job.id);
    expect(await Job.count({ where: { networkId, instrumentId: first.body.instrument.id } })).toBe(1);
  });

  it('takes a known instrument in, moving it to this shop, and refuses a second open job', async () => {
    const owner = await Customer.create({ networkId, kind: 'school', name: 'Marrowdale Middle School', homeShopId: shopB.id });
    const known = await Instrument.create({
      networkId, family: 'trumpet', maker: 'Brassmere', serial: 'BM.12.613', ownerKind: 'school', ownerCustomerId: owner.id,
      currentShopId: shopB.id, status: 'in_service',
    });
    // shop A has never served the owner on record: the job opens without naming them
    const res = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ instrument: { id: known.id }, customer: null })).expect(201);
    await known.reload();
    expect(known).toMatchObject({ currentShopId: shopA.id, status: 'in_shop' });
    const job = await Job.findOne({ where: { networkId, id: res.body.job.id } });
    expect(job!.customerId).toBeNull();

    const second = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ instrument: { id: known.id }, customer: null })).expect(409);
    expect(second.body.error).toMatchObject({ code: 'open_job_exists', jobNumber: res.body.job.number });
  });

  describe('naming a customer of another shop (the attack: a job would make the shop a serving shop and open the contact)', () => {
    let stranger: Customer;
    let strangersFlute: Instrument;

    beforeAll(async () => {
      stranger = await Customer.create({
        networkId, kind: 'person', name: 'Oriane Pelletwhistle', email: 'oriane.pelletwhistle@mail.test', phone: '+1 555 0177',
        homeShopId: shopB.id,
      });
      strangersFlute = await Instrument.create({
        networkId, family: 'flute', maker: 'Quellstone', serial: `QF-${Math.floor(Math.random() * 1e8)}`, ownerKind: 'customer',
        ownerCustomerId: stranger.id, currentShopId: shopB.id, status: 'in_service',
      });
    });

    const contactStillHidden = async () => {
      expect(await Job.count({ where: { networkId, customerId: stranger.id } })).toBe(0);
      const page = await request(app).get(`/api/instruments/${strangersFlute.id}`).set('Cookie', deskCookie).expect(200);
      expect(page.body.owner).toMatchObject({ id: stranger.id, name: null, contactVisible: false, contact: null });
      expect(page.text).not.toContain('Pelletwhistle');
      expect(page.text).not.toContain('oriane.pelletwhistle@mail.test');
      const found = await request(app).get('/api/customers?q=Pelletwhistle').set('Cookie', deskCookie).expect(200);
      expect(found.body.customers).toEqual([]);
    };

    it('a new instrument owned by another shop’s private customer: refused, nothing created', async () => {
      const attempt = body({ customer: { id: stranger.id } });
      const res = await request(app).post('/api/intake').set('Cookie', deskCookie).send(attempt).expect(404);
      expect(res.body.error.fields).toHaveProperty('customer');
      expect(res.text).not.toContain('Pelletwhistle');
      const serial = (attempt.instrument as { new: { serial: string } }).new.serial;
      expect(await Instrument.count({ where: { networkId, serial } })).toBe(0);
      await contactStillHidden();
    });

    it('the customer’s own instrument, naming them as the owner on record: refused, the instrument stays where it was', async () => {
      const res = await request(app).post('/api/intake').set('Cookie', deskCookie)
        .send(body({ instrument: { id: strangersFlute.id }, customer: { id: stranger.id } })).expect(404);
      expect(res.body.error.fields).toHaveProperty('customer');
      await strangersFlute.reload();
      expect(strangersFlute).toMatchObject({ currentShopId: shopB.id, status: 'in_service' });
      expect(await Job.count({ where: { networkId, instrumentId: strangersFlute.id } })).toBe(0);
      await contactStillHidden();
    });

    it('a fleet import may not name them as the owner either', async () => {
      const res = await request(app).post('/api/instruments/import').set('Cookie', deskCookie)
        .send({ shopId: shopA.id, ownerKind: 'customer', ownerCustomerId: stranger.id, rows: [{ serial: 'IMP-1', maker: 'Quellstone', family: 'flute' }] })
        .expect(400);
      expect(res.body.error.fields).toHaveProperty('ownerCustomerId');
      expect(await Instrument.count({ where: { networkId, ownerCustomerId: stranger.id } })).toBe(1);
    });

    it('the home shop’s desk still names them', async () => {
      const res = await request(app).post('/api/intake').set('Cookie', deskBCookie)
        .send(body({ shopId: shopB.id, instrument: { id: strangersFlute.id }, customer: { id: stranger.id } })).expect(201);
      expect(res.body.customerId).toBe(stranger.id);
    });
  });

  it('refuses a second registration of the same serial and maker, pointing at the first', async () => {
    const first = await request(app).post('/api/intake').set('Cookie', deskCookie).send(body()).expect(201);
    const serial = first.body.instrument.serial.toLowerCase().replace('-', ' ');
    const dup = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ instrument: { new: { serial, maker: 'ALDMOOR', family: 'alto_saxophone', ownerKind: 'rental_fleet' } }, customer: null }))
      .expect(409);
    expect(dup.body.error).toMatchObject({ code: 'already_registered', instrumentId: first.body.instrument.id });
    // named by its place in the request, so the screen shows it at the serial of the new instrument
    expect(dup.body.error.fields).toEqual({ 'instrument.new.serial': 'This serial is already registered under this maker.' });
  });

  it('warns when the serial is registered under another maker, and still takes it in', async () => {
    const first = await request(app).post('/api/intake').set('Cookie', deskCookie).send(body()).expect(201);
    const res = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ instrument: { new: { serial: first.body.instrument.serial, maker: 'Corvell Band Works', family: 'trumpet', ownerKind: 'rental_fleet' } }, customer: null }))
      .expect(201);
    expect(res.body.warnings).toEqual([expect.stringMatching(/also registered under Aldmoor/)]);
  });

  it('names the fields that need attention', async () => {
    const res = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ job: { complaint: '', promisedOn: '2001-01-01' } })).expect(400);
    expect(Object.keys(res.body.error.fields)).toContain('job.complaint');
    const past = await request(app).post('/api/intake').set('Cookie', deskCookie)
      .send(body({ job: { complaint: 'Sticky keys', promisedOn: '2001-01-01' } })).expect(400);
    expect(past.body.error.fields).toEqual({ promisedOn: 'The promised date cannot be in the past.' });
    const noOwner = await request(app).post('/api/intake').set('Cookie', deskCookie).send(body({ customer: null })).expect(400);
    expect(noOwner.body.error.fields).toHaveProperty('customer');
  });

  it('front desk of another shop cannot open jobs here', async () => {
    await request(app).post('/api/intake').set('Cookie', deskBCookie).send(body()).expect(403);
  });

  it('numbers jobs densely per network even when desks open them at the same moment', async () => {
    const memberships = [{ shopId: shopA.id, role: 'front_desk' as const }];
    const actor: Actor = { id: deskUserId, networkId, email: 'x@example.test', name: 'Desk', memberships, ability: abilityFor({ id: deskUserId, memberships }) };
    const instruments = await Promise.all(
      Array.from({ length: 8 }, (_, n) =>
        Instrument.create({ networkId, family: 'flute', maker: 'Quellstone', serial: `RACE-${n}-${randomUUID().slice(0, 6)}`, ownerKind: 'rental_fleet', currentShopId: shopA.id }),
      ),
    );
    const before = (await Job.max<number, Job>('number', { where: { networkId } })) ?? 0;
    const jobs = await Promise.all(instruments.map((i) => openJob(actor, { instrumentId: i.id, shopId: shopA.id, complaint: 'Rental check-in' })));
    const numbers = jobs.map((j) => j.number).sort((a, b) => a - b);
    expect(numbers).toEqual(Array.from({ length: 8 }, (_, n) => before + 1 + n));
  });
});
