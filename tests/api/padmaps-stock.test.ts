import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { RelayRun, type Shop } from '../../server/lib/models.js';
import { PartTransfer } from '../../server/modules/stock/models.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser } from '../helpers/factories.js';
import { makePadCatalog, setStock, stockOf } from '../helpers/pad-catalog.js';
import { signIn } from '../helpers/sign-in.js';

/*
 * Pad stock per shop: the stock page with its shortages, and parts asked for from another shop,
 * sent on the relay run and taken in, each step moving the counts exactly once.
 */
describe('stock and parts between shops', () => {
  const app = buildApp();
  let networkId: string;
  let shopA: Shop;
  let shopB: Shop;
  let shopC: Shop;
  let shopD: Shop;
  let catalog: Awaited<ReturnType<typeof makePadCatalog>>;
  let cookies: Record<'owner' | 'techA' | 'managerB' | 'techB' | 'deskA' | 'auditorC' | 'otherOwner', string>;
  let jobId: string;
  const sl30 = () => catalog.pad('self_leveling', 30).id;

  beforeAll(async () => {
    const net = await makeNetwork();
    networkId = net.id;
    shopA = await makeShop(networkId, { name: 'Portland bench' });
    shopB = await makeShop(networkId, { name: 'Seattle bench' });
    shopC = await makeShop(networkId, { name: 'Sacramento bench' });
    shopD = await makeShop(networkId, { name: 'Salem bench' });
    await shopA.update({ latitude: 45.5152, longitude: -122.6784 });
    await shopB.update({ latitude: 47.6062, longitude: -122.3321 });
    await shopC.update({ latitude: 38.5816, longitude: -121.4944 });
    await shopD.update({ latitude: 44.9429, longitude: -123.0351 });
    await RelayRun.create({ networkId, fromShopId: shopB.id, toShopId: shopA.id, weekdays: [2, 4], departureTime: '07:30:00', transitHours: 3.5 });
    catalog = await makePadCatalog(networkId, { from: 28, to: 32 });
    const owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
    const techA = await makeUser(networkId, [{ shopId: shopA.id, role: 'technician' }]);
    const managerB = await makeUser(networkId, [{ shopId: shopB.id, role: 'regional_manager' }]);
    const techB = await makeUser(networkId, [{ shopId: shopB.id, role: 'technician' }]);
    const deskA = await makeUser(networkId, [{ shopId: shopA.id, role: 'front_desk' }]);
    const auditorC = await makeUser(networkId, [{ shopId: shopC.id, role: 'auditor' }]);
    const other = await makeNetwork();
    const otherOwner = await makeUser(other.id, [{ shopId: null, role: 'owner' }]);
    cookies = {
      owner: await signIn(app, owner.email),
      techA: await signIn(app, techA.email),
      managerB: await signIn(app, managerB.email),
      techB: await signIn(app, techB.email),
      deskA: await signIn(app, deskA.email),
      auditorC: await signIn(app, auditorC.email),
      otherOwner: await signIn(app, otherOwner.email),
    };

    // Portland has one 30.0 mm self-leveling pad and a job that needs three
    await setStock(networkId, shopA.id, sl30(), 1);
    await setStock(networkId, shopD.id, sl30(), 1); // nearest, about 70 km, but cannot cover the shortage of 2
    await setStock(networkId, shopB.id, sl30(), 2); // about 230 km, covers it
    await setStock(networkId, shopC.id, sl30(), 6); // about 800 km, covers it too
    const { job } = await makeInstrumentWithJob(networkId, shopA.id, owner.id, { stage: 'on_bench' });
    jobId = job.id;
    const entries = ['low_b', 'low_c', 'low_cs'].map((keyId) => ({ keyId, padKind: 'self_leveling', cupDiameter: '30.5', cupDepth: '4' }));
    await request(app).put(`/api/jobs/${jobId}/pad-map`).set('Cookie', cookies.techA).send({ unitSystem: 'mm', entries }).expect(200);
  });
  afterAll(closeServerResources);

  it('the stock page shows the shortage and the nearest shop that can cover it', async () => {
    const res = await request(app).get('/api/stock').query({ shopId: shopA.id, attention: 'true' }).set('Cookie', cookies.techA).expect(200);
    expect(res.body.shop).toEqual({ id: shopA.id, name: 'Portland bench' });
    const row = res.body.rows.find((r: { partId: string }) => r.partId === sl30());
    expect(row).toMatchObject({ onHand: 1, reserved: 3, available: -2, shortage: 2, incoming: 0 });
    // Salem is nearest but has only 1; Seattle is the nearest that covers the whole shortage
    expect(row.source).toMatchObject({ shopId: shopB.id, shopName: 'Seattle bench', free: 2, coversAll: true, relayRun: true });
    expect(res.body.rows.every((r: { shortage: number; belowReorderPoint: boolean }) => r.shortage > 0 || r.belowReorderPoint)).toBe(true);
    expect(res.body.totals.short).toBe(1);
    expect(res.body.can).toEqual({ update: false, pack: false, request: true, receive: true, setHazards: false });

    const all = await request(app).get('/api/stock').query({ shopId: shopA.id, kind: 'pad', q: 'PAD-S-3' }).set('Cookie', cookies.techA).expect(200);
    expect(all.body.rows.map((r: { sku: string }) => r.sku)).toEqual(['PAD-S-30.0', 'PAD-S-30.5', 'PAD-S-31.0', 'PAD-S-31.5', 'PAD-S-32.0']);
  });

  it('only staff of a shop read its stock', async () => {
    await request(app).get('/api/stock').query({ shopId: shopA.id }).set('Cookie', cookies.deskA).expect(200);
    await request(app).get('/api/stock').query({ shopId: shopA.id }).set('Cookie', cookies.techB).expect(403);
    await request(app).get('/api/stock').query({ shopId: shopA.id }).set('Cookie', cookies.auditorC).expect(403);
    await request(app).get('/api/stock').query({ shopId: shopA.id }).set('Cookie', cookies.otherOwner).expect(404);
    await request(app).get('/api/stock').query({ shopId: shopA.id }).expect(401);
    await request(app).get('/api/stock').set('Cookie', cookies.techA).expect(400);
  });

  it('counts are set by a manager of the shop, not by its technicians', async () => {
    await request(app).patch(`/api/stock/${shopB.id}/parts/${sl30()}`).set('Cookie', cookies.techB).send({ onHand: 9 }).expect(403);
    await request(app).patch(`/api/stock/${shopA.id}/parts/${sl30()}`).set('Cookie', cookies.managerB).send({ onHand: 9 }).expect(403);
    const bad = await request(app).patch(`/api/stock/${shopB.id}/parts/${sl30()}`).set('Cookie', cookies.managerB).send({ onHand: -1 }).expect(400);
    expect(bad.body.error.fields.onHand).toMatch(/below zero/);
    const ok = await request(app).patch(`/api/stock/${shopB.id}/parts/${catalog.pad('glued', 29).id}`).set('Cookie', cookies.managerB).send({ onHand: 7, reorderPoint: 3 }).expect(200);
    expect(ok.body).toMatchObject({ onHand: 7, reserved: 0, reorderPoint: 3 });
  });

  describe('a parts transfer, one click from the shortage', () => {
    let transferId: string;

    it('the technician of the short shop asks; asking twice finds the same request', async () => {
      const body = { partId: sl30(), fromShopId: shopB.id, toShopId: shopA.id, quantity: 2, jobId };
      const first = await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.techA).send(body).expect(201);
      transferId = first.body.transfer.id;
      expect(first.body.transfer).toMatchObject({ state: 'requested', quantity: 2, relayRun: true, fromShop: { name: 'Seattle bench' }, toShop: { name: 'Portland bench' } });
      const again = await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.techA).send(body).expect(200);
      expect(again.body.transfer.id).toBe(transferId);
      expect(await PartTransfer.count({ where: { networkId, jobId } })).toBe(1);
      // the job's line now shows the parts as requested, so no second button
      const screen = await request(app).get(`/api/jobs/${jobId}/pad-map`).set('Cookie', cookies.techA).expect(200);
      expect(screen.body.parts[0]).toMatchObject({ shortfall: 2, uncovered: 0, requested: [{ id: transferId, state: 'requested', quantity: 2 }] });
      // and the stock page counts them as incoming rather than offering another shop
      const seattle = await request(app).get('/api/stock').query({ shopId: shopA.id }).set('Cookie', cookies.techA).expect(200);
      expect(seattle.body.rows.find((r: { partId: string }) => r.partId === sl30())).toMatchObject({ shortage: 2, incoming: 2, source: null });
    });

    it('nobody else asks on the short shop’s behalf, and a job of another shop is refused', async () => {
      const body = { partId: sl30(), fromShopId: shopC.id, toShopId: shopA.id, quantity: 1 };
      await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.techB).send(body).expect(403);
      await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.deskA).send(body).expect(403);
      await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.otherOwner).send(body).expect(404);
      const wrongShop = await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.managerB).send({ ...body, toShopId: shopB.id, jobId }).expect(400);
      expect(wrongShop.body.error.fields.jobId).toBeTruthy();
      await request(app).post('/api/stock/part-transfers').set('Cookie', cookies.techA).send({ ...body, fromShopId: shopA.id }).expect(400);
    });

    it('cannot be taken in before it is sent; only the sending shop’s manager sends it', async () => {
      await request(app).post(`/api/stock/part-transfers/${transferId}/receive`).set('Cookie', cookies.techA).expect(409);
      await request(app).post(`/api/stock/part-transfers/${transferId}/send`).set('Cookie', cookies.techA).expect(403);
      await request(app).post(`/api/stock/part-transfers/${transferId}/send`).set('Cookie', cookies.techB).expect(403);
      await request(app).post(`/api/stock/part-transfers/${transferId}/send`).set('Cookie', cookies.otherOwner).expect(404);
      const sent = await request(app).post(`/api/stock/part-transfers/${transferId}/send`).set('Cookie', cookies.managerB).expect(200);
      expect(sent.body.transfer.state).toBe('sent');
      expect(await stockOf(networkId, shopB.id, sl30())).toEqual({ onHand: 0, reserved: 0 });
      await request(app).post(`/api/stock/part-transfers/${transferId}/send`).set('Cookie', cookies.managerB).expect(409);
      await request(app).post(`/api/stock/part-transfers/${transferId}/cancel`).set('Cookie', cookies.techA).expect(409);
    });

    it('taken in at the short shop, the parts cover the job', async () => {
      await request(app).post(`/api/stock/part-transfers/${transferId}/receive`).set('Cookie', cookies.managerB).expect(403);
      const received = await request(app).post(`/api/stock/part-transfers/${transferId}/receive`).set('Cookie', cookies.techA).expect(200);
      expect(received.body.transfer.state).toBe('received');
      expect(await stockOf(networkId, shopA.id, sl30())).toEqual({ onHand: 3, reserved: 3 });
      await request(app).post(`/api/stock/part-transfers/${transferId}/receive`).set('Cookie', cookies.techA).expect(409);
      const screen = await request(app).get(`/api/jobs/${jobId}/pad-map`).set('Cookie', cookies.techA).expect(200);
      expect(screen.body.parts[0]).toMatchObject({ quantity: 3, onHand: 3, shortfall: 0, uncovered: 0 });
    });

    it('a request not yet sent can be cancelled by either shop; the sending shop cannot send more than it has', async () => {
      const ask = await request(app)
        .post('/api/stock/part-transfers')
        .set('Cookie', cookies.techA)
        .send({ partId: catalog.pad('glued', 29).id, fromShopId: shopB.id, toShopId: shopA.id, quantity: 8 })
        .expect(201);
      await request(app).post(`/api/stock/part-transfers/${ask.body.transfer.id}/send`).set('Cookie', cookies.managerB).expect(409); // 7 on hand
      const cancelled = await request(app).post(`/api/stock/part-transfers/${ask.body.transfer.id}/cancel`).set('Cookie', cookies.managerB).expect(200);
      expect(cancelled.body.transfer.state).toBe('cancelled');
      expect(await stockOf(networkId, shopB.id, catalog.pad('glued', 29).id)).toMatchObject({ onHand: 7 });
      const listed = await request(app).get('/api/stock').query({ shopId: shopB.id }).set('Cookie', cookies.managerB).expect(200);
      expect(listed.body.transfers.outgoing.map((t: { state: string }) => t.state).sort()).toEqual(['cancelled', 'received']);
    });
  });
});
