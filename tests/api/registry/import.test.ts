import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Customer, HistoryEvent, Instrument } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/** A school's fleet file with good and bad rows, imported through the API as the client sends it. */
describe('POST /api/instruments/import', () => {
  const app = buildApp();
  let networkId: string;
  let shopId: string;
  let schoolId: string;
  let deskCookie: string;
  let techCookie: string;
  let otherDeskCookie: string;
  let otherShopId: string;

  // rows as the client sends them after the column mapping: spreadsheet row numbers, text cells
  const file = () => [
    { row: 2, serial: 'AB-104 233', maker: 'Aldmoor', family: 'Alto Sax', model: 'Fenlark Alto', assetTag: 'qp-001', yearMade: '2016' },
    { row: 3, serial: '7719204', maker: 'Skelmire Winds', family: 'alto saxophone', model: 'Skelmire Alto', yearMade: '' },
    { row: 4, serial: '', maker: 'Aldmoor', family: 'tenor sax' }, // no serial
    { row: 5, serial: 'Q 771 002', maker: 'Quellstone', family: 'kazoo' }, // unknown family
    { row: 6, serial: 'ab104233', maker: 'ALDMOOR', family: 'alto sax' }, // the same instrument as row 2
    { row: 7, serial: 'HF/20331', maker: 'Harrowgate & Finch', family: 'clarinet', yearMade: '1492' }, // year too early
    { row: 8, serial: 'BM.12.613', maker: 'Brassmere', family: 'Trumpet', model: 'Gullstep Trumpet', notes: 'Third slide stiff' },
  ];
  const send = (cookie: string, rows: unknown[], over: Record<string, unknown> = {}) =>
    request(app)
      .post('/api/instruments/import')
      .set('Cookie', cookie)
      .send({ shopId, ownerKind: 'school', ownerCustomerId: schoolId, rows, ...over });
  const count = () => Instrument.count({ where: { networkId } });

  beforeAll(async () => {
    const net = await makeNetwork();
    networkId = net.id;
    const shop = await makeShop(net.id, { name: 'Cedar Lane bench' });
    const otherShop = await makeShop(net.id, { name: 'Larkspur bench' });
    shopId = shop.id;
    otherShopId = otherShop.id;
    const school = await Customer.create({ networkId, kind: 'school', name: 'Quillon Park High School', homeShopId: shop.id });
    schoolId = school.id;
    const desk = await makeUser(net.id, [{ shopId: shop.id, role: 'front_desk' }]);
    const tech = await makeUser(net.id, [{ shopId: shop.id, role: 'technician' }]);
    const otherDesk = await makeUser(net.id, [{ shopId: otherShop.id, role: 'front_desk' }]);
    deskCookie = await signIn(app, desk.email);
    techCookie = await signIn(app, tech.email);
    otherDeskCookie = await signIn(app, otherDesk.email);
  });
  afterAll(closeServerResources);

  it('imports the good rows and reports each bad row by row number and field', async () => {
    const res = await send(deskCookie, file()).expect(200);
    expect(res.body.counts).toEqual({ created: 3, updated: 0, unchanged: 0, held_elsewhere: 0, error: 4 });
    const byRow = Object.fromEntries(res.body.results.map((r: { row: number }) => [r.row, r]));
    expect(byRow[2].outcome).toBe('created');
    expect(byRow[3].outcome).toBe('created');
    expect(byRow[8].outcome).toBe('created');
    expect(byRow[4]).toMatchObject({ outcome: 'error', errors: { serial: 'Enter the serial number.' } });
    expect(byRow[5]).toMatchObject({ outcome: 'error', errors: { family: expect.stringMatching(/Choose a family/) } });
    expect(byRow[6]).toMatchObject({ outcome: 'error', errors: { serial: 'Same serial and maker as row 2.' } });
    expect(byRow[7]).toMatchObject({ outcome: 'error', errors: { yearMade: expect.stringMatching(/1800 or later/) } });
    expect(await count()).toBe(3);

    const alto = await Instrument.findOne({ where: { networkId, serialNormalized: 'AB104233' } });
    expect(alto).toMatchObject({
      family: 'alto_saxophone', maker: 'Aldmoor', serial: 'AB-104 233', assetTag: 'QP-001', yearMade: 2016,
      ownerKind: 'school', ownerCustomerId: schoolId, currentShopId: shopId,
    });
    // every new instrument starts its timeline
    expect(await HistoryEvent.count({ where: { networkId, instrumentId: alto!.id, kind: 'registered' } })).toBe(1);
    const generated = await Instrument.findOne({ where: { networkId, serialNormalized: '7719204' } });
    expect(generated!.assetTag).toMatch(/^BR-[A-Z2-9]{4}-[A-Z2-9]{4}$/);
  });

  it('importing the same file again creates nothing new', async () => {
    const res = await send(deskCookie, file()).expect(200);
    expect(res.body.counts).toEqual({ created: 0, updated: 0, unchanged: 3, held_elsewhere: 0, error: 4 });
    expect(await count()).toBe(3);
    expect(await HistoryEvent.count({ where: { networkId, kind: 'registered' } })).toBe(3);
  });

  it('a corrected file updates the instruments it names, still without duplicates', async () => {
    const corrected = file().map((r) => (r.row === 3 ? { ...r, model: 'Skelmire Alto Lacquered', serial: '77-19-204' } : r));
    const res = await send(deskCookie, corrected).expect(200);
    expect(res.body.counts).toMatchObject({ created: 0, updated: 1, unchanged: 2 });
    expect(await count()).toBe(3);
    const alto = await Instrument.findOne({ where: { networkId, serialNormalized: '7719204' } });
    expect(alto!.model).toBe('Skelmire Alto Lacquered');
    expect(alto!.assetTag).toMatch(/^BR-/); // the tag made at the first import is kept
    // the change is on the instrument's timeline: one event saying what changed, from what to what
    const events = await HistoryEvent.findAll({ where: { networkId, instrumentId: alto!.id, kind: 'details_changed' } });
    expect(events).toHaveLength(1);
    expect(events[0].summary).toBe('Details changed by a fleet import at Cedar Lane bench: model');
    expect(events[0].data).toMatchObject({ source: 'fleet_import', row: 3, changes: { model: { from: 'Skelmire Alto', to: 'Skelmire Alto Lacquered' } } });
    expect(Object.keys(events[0].data.changes as object)).toEqual(['model']);
    expect(events[0].userId).toBeTruthy();
  });

  it('reports an asset tag already on another instrument as that row’s error', async () => {
    const res = await send(deskCookie, [{ row: 2, serial: 'TV_30011', maker: 'Tamsin Vale', family: 'flute', assetTag: 'QP-001' }]).expect(200);
    expect(res.body.results[0]).toMatchObject({ row: 2, outcome: 'error', errors: { assetTag: expect.stringMatching(/already on Aldmoor AB-104 233/) } });
    expect(await count()).toBe(3);
  });

  it('refuses people who do not register instruments at that shop', async () => {
    await send(techCookie, file()).expect(403);
    await send(otherDeskCookie, file()).expect(403);
  });

  describe('an instrument held by another shop (the attack: rewriting another shop’s instrument by naming its serial)', () => {
    let held: Instrument;
    const attackRow = () => ({ row: 2, serial: held.serial, maker: held.maker, family: 'flute', assetTag: 'SEA-TAKEN-1', notes: 'Ours now' });

    beforeAll(async () => {
      const denverOwner = await Customer.create({ networkId, kind: 'person', name: 'Perrin Ashcombe', homeShopId: otherShopId });
      held = await Instrument.create({
        networkId, family: 'flute', maker: 'Quellstone', model: 'QF-1', serial: `DEN-${Math.floor(Math.random() * 1e8)}`, assetTag: 'DEN-0001',
        ownerKind: 'customer', ownerCustomerId: denverOwner.id, currentShopId: otherShopId, status: 'in_service', notes: 'Denver’s flute',
      });
    });

    it('the row is reported “held by another shop — not changed”; the instrument and its timeline stay as they were', async () => {
      const before = (await Instrument.findOne({ where: { networkId, id: held.id } }))!.get({ plain: true });
      const res = await send(deskCookie, [attackRow()]).expect(200);
      expect(res.body.counts).toEqual({ created: 0, updated: 0, unchanged: 0, held_elsewhere: 1, error: 0 });
      expect(res.body.results[0]).toMatchObject({
        row: 2, outcome: 'held_elsewhere', instrumentId: held.id, message: 'Held by another shop — not changed.',
        heldBy: { id: otherShopId, name: 'Larkspur bench' },
      });
      const after = (await Instrument.findOne({ where: { networkId, id: held.id } }))!.get({ plain: true });
      expect(after).toEqual(before);
      expect(after).toMatchObject({ assetTag: 'DEN-0001', notes: 'Denver’s flute', ownerKind: 'customer', currentShopId: otherShopId });
      expect(await HistoryEvent.count({ where: { networkId, instrumentId: held.id } })).toBe(0);
    });

    it('the preview (dry run) reports the same and writes nothing, for any row', async () => {
      const fresh = { row: 3, serial: `NEW-${Math.floor(Math.random() * 1e8)}`, maker: 'Aldmoor', family: 'clarinet' };
      const total = await count();
      const res = await send(deskCookie, [attackRow(), fresh], { dryRun: true }).expect(200);
      expect(res.body.dryRun).toBe(true);
      expect(res.body.results.map((r: { outcome: string }) => r.outcome)).toEqual(['held_elsewhere', 'created']);
      expect(await count()).toBe(total);
      expect(await HistoryEvent.count({ where: { networkId, instrumentId: held.id } })).toBe(0);
    });

    it('the holding shop’s desk may change it, and that change is on the timeline', async () => {
      const res = await send(otherDeskCookie, [attackRow()], { shopId: otherShopId, ownerKind: 'rental_fleet', ownerCustomerId: undefined }).expect(200);
      expect(res.body.results[0]).toMatchObject({ outcome: 'updated', changed: ['assetTag', 'notes', 'ownerKind', 'ownerCustomerId'] });
      await held.reload();
      expect(held).toMatchObject({ assetTag: 'SEA-TAKEN-1', notes: 'Ours now', ownerKind: 'rental_fleet', ownerCustomerId: null });
      const events = await HistoryEvent.findAll({ where: { networkId, instrumentId: held.id } });
      expect(events.map((e) => e.kind)).toEqual(['details_changed']);
      expect(events[0].summary).toBe('Details changed by a fleet import at Larkspur bench: asset tag, notes, owner kind, owner');
    });
  });

  it('refuses a batch without an owner for school instruments, naming the field', async () => {
    const res = await send(deskCookie, file(), { ownerCustomerId: undefined }).expect(400);
    expect(res.body.error.fields).toHaveProperty('ownerCustomerId');
  });
});
