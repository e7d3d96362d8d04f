import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { HistoryEvent, Instrument, Job, JobLineItem, PadMap, Shop, StockReservation } from '../../server/lib/models.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { makePadCatalog, setStock, stockOf } from '../helpers/pad-catalog.js';
import { signIn } from '../helpers/sign-in.js';

/*
 * Saving a pad map for a job: the map is kept with the instrument, becomes the job's pad lines and
 * reserves the pads at the job's shop in one go; a later repad of the same serial starts from it.
 */

const PORTLAND = { latitude: 45.5152, longitude: -122.6784 };
const SEATTLE = { latitude: 47.6062, longitude: -122.3321 };
const DENVER = { latitude: 39.7392, longitude: -104.9903 };

describe('pad maps API', () => {
  const app = buildApp();
  let networkId: string;
  let shopA: Shop;
  let shopB: Shop;
  let shopC: Shop;
  let catalog: Awaited<ReturnType<typeof makePadCatalog>>;
  let cookies: Record<'owner' | 'techA' | 'techB' | 'deskA' | 'auditorA' | 'otherOwner', string>;
  let owner: { id: string; email: string };
  let job: Job;
  let instrument: Instrument;

  const firstMap = {
    unitSystem: 'mm',
    entries: [
      { keyId: 'low_c', padKind: 'self_leveling', floor: 'flat', cupDiameter: '30.5', cupDepth: '4', rimDiameter: '28.5' },
      { keyId: 'low_cs', padKind: 'self_leveling', floor: 'flat', cupDiameter: '1.200in', cupDepth: '3.5' },
      { keyId: 'palm_d', padKind: 'glued', floor: 'flat', cupDiameter: '10.2', rimDiameter: '8' },
      { keyId: 'low_b', padKind: 'self_leveling', floor: 'flat', cupDiameter: '29.3', cupDepth: '4' },
      { keyId: 'octave_neck', padKind: 'glued', floor: 'flat', cupDiameter: '' },
    ],
  };

  beforeAll(async () => {
    const net = await makeNetwork();
    networkId = net.id;
    shopA = await makeShop(networkId, { name: 'Portland bench' });
    shopB = await makeShop(networkId, { name: 'Seattle bench' });
    shopC = await makeShop(networkId, { name: 'Denver bench' });
    await shopA.update(PORTLAND);
    await shopB.update(SEATTLE);
    await shopC.update(DENVER);
    catalog = await makePadCatalog(networkId);

    owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
    const techA = await makeUser(networkId, [{ shopId: shopA.id, role: 'technician' }]);
    const techB = await makeUser(networkId, [{ shopId: shopB.id, role: 'technician' }]);
    const deskA = await makeUser(networkId, [{ shopId: shopA.id, role: 'front_desk' }]);
    const auditorA = await makeUser(networkId, [{ shopId: shopA.id, role: 'auditor' }]);
    const other = await makeNetwork();
    const otherOwner = await makeUser(other.id, [{ shopId: null, role: 'owner' }]);

    ({ job, instrument } = await makeInstrumentWithJob(networkId, shopA.id, owner.id, { stage: 'on_bench', family: 'alto_saxophone' }));
    // labor and a non-pad part already on the job must survive every save
    await JobLineItem.create({ networkId, jobId: job.id, kind: 'labor', catalogItemId: catalog.repad.id, description: 'Repad — alto saxophone', hours: 6, rateCents: 9000, position: 0 });

    await setStock(networkId, shopA.id, catalog.pad('self_leveling', 30).id, 1);
    await setStock(networkId, shopA.id, catalog.pad('glued', 10).id, 5);
    await setStock(networkId, shopB.id, catalog.pad('self_leveling', 30).id, 4);
    await setStock(networkId, shopC.id, catalog.pad('self_leveling', 30).id, 10);

    cookies = {
      owner: await signIn(app, owner.email),
      techA: await signIn(app, techA.email),
      techB: await signIn(app, techB.email),
      deskA: await signIn(app, deskA.email),
      auditorA: await signIn(app, auditorA.email),
      otherOwner: await signIn(app, otherOwner.email),
    };
  });
  afterAll(closeServerResources);

  describe('saving', () => {
    let firstMapId: string;

    it('stores the readings in millimetres and the results, with the typed text kept', async () => {
      const res = await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(200);
      expect(res.body.saved).toMatchObject({ created: true, labor: { standardHours: 6, hours: 2.13, keysRepadded: 4, selfLevelingPads: 3, gluedPads: 1 } });
      firstMapId = res.body.saved.padMapId;
      const stored = await PadMap.findOne({ where: { networkId, id: firstMapId } });
      expect(stored).toMatchObject({ instrumentId: instrument.id, jobId: job.id, shopId: shopA.id, unitSystem: 'mm' });
      const lowCs = stored!.entries.find((e) => e.keyId === 'low_cs');
      expect(lowCs).toMatchObject({ cupDiameterMm: 30.48, cupDepthMm: 3.5, typed: { cupDiameter: '1.200in', cupDepth: '3.5' } });
      const results = stored!.results as Array<Record<string, unknown>>;
      expect(results.map((r) => [r.keyId, r.padDiameterMm, r.stemHeightMm, r.status])).toEqual([
        ['low_c', 30, 1, 'ok'],
        ['low_cs', 30, 0.5, 'ok'],
        ['palm_d', 10, null, 'ok'],
        ['low_b', 29, 1, 'ok'],
        ['octave_neck', null, null, 'empty'],
      ]);
      expect(res.body.padMap.id).toBe(firstMapId);
      expect(res.body.padMap.createdBy).toBeTruthy();
    });

    it('made the job’s pad lines, keeping labor and other parts', async () => {
      const lines = await JobLineItem.findAll({ where: { networkId, jobId: job.id }, order: [['position', 'ASC']] });
      expect(lines.map((l) => [l.kind, l.description, l.quantity])).toEqual([
        ['labor', 'Repad — alto saxophone', null],
        ['part', 'Self-leveling pad 29.0 mm × 3.6 mm (Low B)', 1],
        ['part', 'Self-leveling pad 30.0 mm × 3.6 mm (Low C, Low C♯)', 2],
        ['part', 'Glued pad 10.0 mm × 4.0 mm (Palm D)', 1],
      ]);
      expect(lines[2].unitPriceCents).toBe(catalog.pad('self_leveling', 30).unitPriceCents);
    });

    it('reserved the pads at the job’s shop and lists the shortages with the nearest shop that has them', async () => {
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 30).id)).toEqual({ onHand: 1, reserved: 2 });
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 29).id)).toEqual({ onHand: 0, reserved: 1 });
      expect(await stockOf(networkId, shopA.id, catalog.pad('glued', 10).id)).toEqual({ onHand: 5, reserved: 1 });
      const res = await request(app).get(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).expect(200);
      const bySku = Object.fromEntries(res.body.parts.map((p: { sku: string }) => [p.sku, p]));
      expect(bySku['PAD-S-30.0']).toMatchObject({ quantity: 2, onHand: 1, shortfall: 1, uncovered: 1 });
      // Seattle is about 230 km from Portland, Denver about 1,600 km: the nearer shop is suggested
      expect(bySku['PAD-S-30.0'].source).toMatchObject({ shopId: shopB.id, shopName: 'Seattle bench', free: 4, coversAll: true });
      expect(bySku['PAD-S-30.0'].source.distanceKm).toBeGreaterThan(200);
      expect(bySku['PAD-S-30.0'].source.distanceKm).toBeLessThan(260);
      expect(bySku['PAD-S-29.0']).toMatchObject({ shortfall: 1, source: null });
      expect(bySku['PAD-G-10.0']).toMatchObject({ shortfall: 0, source: null });
      expect(res.body.can).toEqual({ edit: true, requestParts: true });
    });

    it('wrote the instrument’s history', async () => {
      const events = await HistoryEvent.findAll({ where: { networkId, instrumentId: instrument.id, kind: 'pad_map_saved' } });
      expect(events).toHaveLength(1);
      expect(events[0].summary).toBe('Pad map saved at Portland bench: 4 pads (3 self-leveling, 1 glued)');
    });

    it('saving again replaces the lines and releases what is no longer wanted', async () => {
      const glued = await StockReservation.findOne({ where: { networkId, jobId: job.id, partId: catalog.pad('glued', 10).id, releasedAt: null } });
      const second = { ...firstMap, entries: firstMap.entries.filter((e) => e.keyId === 'low_c' || e.keyId === 'palm_d') };
      const res = await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send(second).expect(200);
      expect(res.body.saved).toMatchObject({ created: false, padMapId: firstMapId });
      expect(await PadMap.count({ where: { networkId, jobId: job.id } })).toBe(1);
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 30).id)).toEqual({ onHand: 1, reserved: 1 });
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 29).id)).toEqual({ onHand: 0, reserved: 0 });
      expect(await stockOf(networkId, shopA.id, catalog.pad('glued', 10).id)).toEqual({ onHand: 5, reserved: 1 });
      // an unchanged line keeps its reservation rather than churning a new one
      const stillGlued = await StockReservation.findOne({ where: { networkId, jobId: job.id, partId: catalog.pad('glued', 10).id, releasedAt: null } });
      expect(stillGlued!.id).toBe(glued!.id);
      const parts = await JobLineItem.findAll({ where: { networkId, jobId: job.id, kind: 'part' } });
      expect(parts.map((p) => p.quantity).sort()).toEqual([1, 1]);
      expect(await JobLineItem.count({ where: { networkId, jobId: job.id, kind: 'labor' } })).toBe(1);
      const shortLine = res.body.parts.find((p: { sku: string }) => p.sku === 'PAD-S-30.0');
      expect(shortLine).toMatchObject({ quantity: 1, onHand: 1, shortfall: 0 });
    });

    it('releasing the job’s reservations puts the pads back on the shelf', async () => {
      const res = await request(app).post(`/api/jobs/${job.id}/reservations/release`).set('Cookie', cookies.techA).expect(200);
      expect(res.body).toEqual({ released: 2, stock: [] });
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 30).id)).toEqual({ onHand: 1, reserved: 0 });
      expect(await stockOf(networkId, shopA.id, catalog.pad('glued', 10).id)).toEqual({ onHand: 5, reserved: 0 });
      expect(await StockReservation.count({ where: { networkId, jobId: job.id, releasedAt: null } })).toBe(0);
      // saving again reserves afresh
      await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(200);
      expect(await stockOf(networkId, shopA.id, catalog.pad('self_leveling', 30).id)).toEqual({ onHand: 1, reserved: 2 });
    });

    it('answers readings it cannot read with an error beside the very cell', async () => {
      const res = await request(app)
        .put(`/api/jobs/${job.id}/pad-map`)
        .set('Cookie', cookies.techA)
        .send({ unitSystem: 'in', entries: [{ keyId: 'low_c', padKind: 'self_leveling', cupDiameter: '30.5' }, { keyId: 'low_b', padKind: 'glued', cupDiameter: 'wide' }, { keyId: 'extra-1', padKind: 'glued', cupDiameter: '12mm' }] })
        .expect(400);
      expect(Object.keys(res.body.error.fields).sort()).toEqual(['entries.0.cupDiameter', 'entries.1.cupDiameter', 'entries.2.keyName']);
      expect(res.body.error.fields['entries.0.cupDiameter']).toMatch(/774\.7 mm/);
      const bad = await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send({ entries: [{ keyId: 'low_c', padKind: 'felt' }] }).expect(400);
      expect(bad.body.error.fields['entries.0.padKind']).toBeTruthy();
    });
  });

  describe('who may', () => {
    it('front desk and a technician of another shop read the map but may not save it', async () => {
      for (const who of ['deskA', 'techB'] as const) {
        const read = await request(app).get(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies[who]).expect(200);
        expect(read.body.can.edit).toBe(false);
        await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies[who]).send(firstMap).expect(403);
        await request(app).post(`/api/jobs/${job.id}/reservations/release`).set('Cookie', cookies[who]).expect(who === 'deskA' ? 200 : 403);
      }
      await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(200);
    });

    it('the auditor of the shop reads it; another network finds nothing; nobody signed out gets in', async () => {
      const audit = await request(app).get(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.auditorA).expect(200);
      expect(audit.body.padMap.entries).toHaveLength(5);
      expect(audit.body.can).toEqual({ edit: false, requestParts: false });
      await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.auditorA).send(firstMap).expect(403);
      await request(app).get(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.otherOwner).expect(404);
      await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.otherOwner).send(firstMap).expect(404);
      await request(app).get(`/api/instruments/${instrument.id}/pad-map`).set('Cookie', cookies.otherOwner).expect(404);
      await request(app).get(`/api/jobs/${job.id}/pad-map`).expect(401);
      await request(app).get('/api/jobs/not-a-job/pad-map').set('Cookie', cookies.techA).expect(404);
    });

    it('a released job’s pads are not changed any more', async () => {
      const { job: released } = await makeInstrumentWithJob(networkId, shopA.id, owner.id, { stage: 'released' });
      const res = await request(app).put(`/api/jobs/${released.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(409);
      expect(res.body.error.message).toMatch(/released/);
    });

    it('a job that is ready keeps its frozen estimate: saving a map there is refused and changes nothing', async () => {
      const { job: ready, instrument: readyInstrument } = await makeInstrumentWithJob(networkId, shopA.id, owner.id, { stage: 'ready', family: 'alto_saxophone' });
      const padLine = await JobLineItem.create({
        networkId, jobId: ready.id, kind: 'part', partId: catalog.pad('glued', 10).id, description: 'Glued pad 10 mm (palm D)', quantity: 1, unitPriceCents: 450, position: 0,
      });
      const versionBefore = (await Job.findByPk(ready.id))!.estimateVersion;

      const res = await request(app).put(`/api/jobs/${ready.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(409);
      expect(res.body.error.message).toMatch(/estimate can no longer change/);

      const lines = await JobLineItem.findAll({ where: { networkId, jobId: ready.id } });
      expect(lines.map((l) => [l.id, l.description, l.quantity, l.unitPriceCents])).toEqual([[padLine.id, 'Glued pad 10 mm (palm D)', 1, 450]]);
      expect((await Job.findByPk(ready.id))!.estimateVersion).toBe(versionBefore);
      expect(await PadMap.count({ where: { networkId, jobId: ready.id } })).toBe(0);
      expect(await HistoryEvent.count({ where: { networkId, instrumentId: readyInstrument.id, kind: ['pad_map_saved', 'estimate_changed'] } })).toBe(0);
      expect(await StockReservation.count({ where: { networkId, jobId: ready.id } })).toBe(0);

      const workspace = await request(app).get(`/api/jobs/${ready.id}/pad-map`).set('Cookie', cookies.techA).expect(200);
      expect(workspace.body.can.edit).toBe(false);
    });
  });

  describe('memory across the network', () => {
    it('the next repad of the same serial, at another shop, starts from the stored map', async () => {
      const next = await Job.create({ networkId, number: 900_000 + Math.floor(Math.random() * 90_000), instrumentId: instrument.id, shopId: shopB.id, stage: 'on_bench', openedByUserId: owner.id });
      const res = await request(app).get(`/api/jobs/${next.id}/pad-map`).set('Cookie', cookies.techB).expect(200);
      expect(res.body.padMap).toBeNull();
      expect(res.body.previous).toMatchObject({ jobId: job.id, jobNumber: job.number, shopName: 'Portland bench' });
      expect(res.body.previous.entries.map((e: { keyId: string }) => e.keyId)).toContain('low_cs');
      expect(res.body.suggestions).toBeNull();
      expect(res.body.can.edit).toBe(true);
      const latest = await request(app).get(`/api/instruments/${instrument.id}/pad-map`).set('Cookie', cookies.deskA).expect(200);
      expect(latest.body.padMap).toMatchObject({ jobId: job.id, unitSystem: 'mm' });
    });

    it('an instrument never mapped gets the median of earlier maps of its family, maker and model', async () => {
      const makeInstrument = (maker: string, model: string) =>
        Instrument.create({ networkId, family: 'alto_saxophone', maker, model, serial: `MED-${uniq()}`, ownerKind: 'rental_fleet', currentShopId: shopA.id });
      const earlier = async (maker: string, model: string, lowC: number, pad: number) => {
        const inst = await makeInstrument(maker, model);
        await PadMap.create({
          networkId, instrumentId: inst.id, shopId: shopC.id, unitSystem: 'mm', createdByUserId: owner.id,
          entries: [{ keyId: 'low_c', padKind: 'self_leveling', floor: 'flat', cupDiameterMm: lowC, cupDepthMm: 4, rimDiameterMm: null, typed: {} }],
          results: [{ keyId: 'low_c', padKind: 'self_leveling', padDiameterMm: pad }],
        });
      };
      // three of the model (maker written three ways), one of another model, one of another maker
      await earlier('Quillfield Winds', 'QA-2', 30.4, 30.0);
      await earlier('quillfield winds', 'qa-2 ', 30.6, 30.0);
      await earlier('Quillfield  Winds', 'QA-2', 31.2, 30.5);
      await earlier('Quillfield Winds', 'QA-9', 45.0, 44.5);
      await earlier('Brightmoor', 'QA-2', 20.0, 19.5);
      const fresh = await makeInstrument('Quillfield Winds', 'QA-2');
      const freshJob = await Job.create({ networkId, number: 800_000 + Math.floor(Math.random() * 90_000), instrumentId: fresh.id, shopId: shopA.id, stage: 'assessed', openedByUserId: owner.id });

      const res = await request(app).get(`/api/jobs/${freshJob.id}/pad-map`).set('Cookie', cookies.techA).expect(200);
      expect(res.body.previous).toBeNull();
      expect(res.body.suggestions).toMatchObject({ basedOnMaps: 3, keys: { low_c: { basedOn: 3, cupDiameterMm: 30.6, cupDepthMm: 4, padDiameterMm: 30, padKind: 'self_leveling' } } });

      const direct = await request(app)
        .get('/api/pad-maps/suggestions')
        .query({ family: 'alto_saxophone', maker: 'QUILLFIELD WINDS', model: 'qa-9' })
        .set('Cookie', cookies.deskA)
        .expect(200);
      expect(direct.body).toMatchObject({ basedOnMaps: 1, keys: { low_c: { cupDiameterMm: 45, basedOn: 1 } } });
      await request(app).get('/api/pad-maps/suggestions').query({ family: 'kazoo', maker: 'x' }).set('Cookie', cookies.deskA).expect(400);
    });
  });

  describe('pad rules', () => {
    it('everyone reads the rules; the defaults are those of the issue', async () => {
      const res = await request(app).get('/api/pad-rules').set('Cookie', cookies.techA).expect(200);
      expect(res.body.rules).toEqual({ selfLevelingMinClearanceMm: 0.15, gluedOffsetMm: 0, minRimOverlapMm: 0.5, stemHeightsMm: [0.5, 1, 1.5], minProtrusionMm: 0.5, selfLevelingLaborFactor: 0.5, repadBaseHours: 1.5, repadHoursPerKey: 0.25, maxRadialClearanceMm: 1 });
    });

    it('only the owner changes them, within bounds, and the next save follows them', async () => {
      const changed = { ...((await request(app).get('/api/pad-rules').set('Cookie', cookies.owner)).body.rules), gluedOffsetMm: -0.5, stemHeightsMm: [1.5, 0.5, 1, 2] };
      await request(app).put('/api/pad-rules').set('Cookie', cookies.techA).send(changed).expect(403);
      const invalid = await request(app).put('/api/pad-rules').set('Cookie', cookies.owner).send({ ...changed, gluedOffsetMm: 1 }).expect(400);
      expect(invalid.body.error.fields.gluedOffsetMm).toMatch(/at most 0.5/);
      const ok = await request(app).put('/api/pad-rules').set('Cookie', cookies.owner).send(changed).expect(200);
      expect(ok.body.rules).toMatchObject({ gluedOffsetMm: -0.5, stemHeightsMm: [0.5, 1, 1.5, 2] });

      // palm D: glued, 10.2 mm cup; with −0.5 mm the largest allowed is 9.7 → 9.5 mm
      const res = await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', cookies.techA).send(firstMap).expect(200);
      const palmD = res.body.padMap.results.find((r: { keyId: string }) => r.keyId === 'palm_d');
      expect(palmD.padDiameterMm).toBe(9.5);
      await request(app).put('/api/pad-rules').set('Cookie', cookies.owner).send({ ...changed, gluedOffsetMm: 0, stemHeightsMm: [0.5, 1, 1.5] }).expect(200);
    });
  });
});
