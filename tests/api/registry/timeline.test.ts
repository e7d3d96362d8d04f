import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Attachment, HistoryEvent, Instrument, Job, PadMap } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/** One timeline from history events, photos, documents and pad maps, newest first, filterable by kind. */
describe('GET /api/instruments/:id/timeline', () => {
  const app = buildApp();
  let cookie: string;
  let instrumentId: string;
  const at = (daysAgo: number) => new Date(Date.now() - daysAgo * 864e5);

  beforeAll(async () => {
    const net = await makeNetwork();
    const north = await makeShop(net.id, { name: 'North bench', timeZone: 'America/Chicago' });
    const south = await makeShop(net.id, { name: 'South bench', timeZone: 'America/Denver' });
    const tech = await makeUser(net.id, [{ shopId: north.id, role: 'technician' }], { name: 'Ines Okonkwo-Hart' });
    const desk = await makeUser(net.id, [{ shopId: south.id, role: 'front_desk' }]);
    const instrument = await Instrument.create({
      networkId: net.id, family: 'clarinet', maker: 'Harrowgate & Finch', serial: 'HF/20331', ownerKind: 'rental_fleet', currentShopId: north.id,
    });
    instrumentId = instrument.id;
    const job = await Job.create({ networkId: net.id, number: 77, instrumentId, shopId: north.id, stage: 'on_bench', complaint: 'Squeaks', openedByUserId: tech.id });
    const photo = await Attachment.create({
      networkId: net.id, instrumentId, jobId: job.id, shopId: north.id, kind: 'photo', tag: 'before', caption: 'Torn pads on the lower joint',
      objectKey: `t/${instrumentId}/1.jpg`, contentType: 'image/jpeg', sizeBytes: 1234, status: 'stored', uploadedByUserId: tech.id,
      createdAt: at(2),
    });
    await Attachment.create({
      networkId: net.id, instrumentId, shopId: north.id, kind: 'document', objectKey: `t/${instrumentId}/2.pdf`, contentType: 'application/pdf',
      sizeBytes: 99, status: 'pending', uploadedByUserId: tech.id, // not stored yet: not on the timeline
    });
    const padMap = await PadMap.create({
      networkId: net.id, instrumentId, jobId: job.id, shopId: north.id, unitSystem: 'mm', entries: [{ key: 'low E' }, { key: 'low F' }],
      createdByUserId: tech.id, createdAt: at(1),
    });
    await HistoryEvent.bulkCreate([
      { networkId: net.id, instrumentId, jobId: job.id, shopId: south.id, userId: desk.id, kind: 'intake', summary: 'Checked in at South bench', occurredAt: at(30) },
      { networkId: net.id, instrumentId, jobId: job.id, shopId: north.id, userId: tech.id, kind: 'transfer_received', summary: 'Received: South → North', occurredAt: at(20) },
      { networkId: net.id, instrumentId, jobId: job.id, shopId: north.id, userId: tech.id, kind: 'stage_changed', summary: 'Job 77: approved → on bench', occurredAt: at(10) },
      // a feature that also logs its photo and pad map as events: shown once, from their own rows
      { networkId: net.id, instrumentId, shopId: north.id, userId: tech.id, kind: 'photo_added', summary: 'Photo added', data: { attachmentId: photo.id }, occurredAt: at(2) },
      { networkId: net.id, instrumentId, shopId: north.id, userId: tech.id, kind: 'pad_map_saved', summary: 'Pad map saved', data: { padMapId: padMap.id }, occurredAt: at(1) },
      { networkId: net.id, instrumentId, shopId: north.id, userId: tech.id, kind: 'note', summary: 'Register key spring replaced', occurredAt: at(0.5) },
    ]);
    cookie = await signIn(app, desk.email);
  });
  afterAll(closeServerResources);

  const get = (kinds?: string) =>
    request(app).get(`/api/instruments/${instrumentId}/timeline`).query(kinds ? { kinds } : {}).set('Cookie', cookie);

  it('merges every source, newest first, with shop, person and job on each entry', async () => {
    const res = await get().expect(200);
    expect(res.body.items.map((i: { kind: string }) => i.kind)).toEqual(['note', 'pad_map', 'photo', 'stage_changed', 'transfer_received', 'intake']);
    const photo = res.body.items.find((i: { kind: string }) => i.kind === 'photo');
    expect(photo).toMatchObject({
      filter: 'photo', summary: 'Torn pads on the lower joint', person: 'Ines Okonkwo-Hart',
      shop: { name: 'North bench', timeZone: 'America/Chicago' }, job: { number: 77 }, data: { tag: 'before' },
    });
    expect(res.body.items.find((i: { kind: string }) => i.kind === 'pad_map').summary).toBe('Pad map of 2 keys');
    // times are UTC instants; the client shows them in the viewer's shop clock
    for (const item of res.body.items) expect(item.at).toMatch(/Z$/);
  });

  it('filters by kind, one or several', async () => {
    expect((await get('photo').expect(200)).body.items.map((i: { kind: string }) => i.kind)).toEqual(['photo']);
    expect((await get('transfer,intake').expect(200)).body.items.map((i: { kind: string }) => i.kind)).toEqual(['transfer_received', 'intake']);
    expect((await get('document').expect(200)).body.items).toEqual([]);
    await get('gossip').expect(400);
  });

  it('answers 404 for an id that names nothing', async () => {
    await request(app).get('/api/instruments/not-a-uuid/timeline').set('Cookie', cookie).expect(404);
    await request(app).get('/api/instruments/8f0e4c1e-5b2a-4c55-9a61-2f1f3b0c9d11').set('Cookie', cookie).expect(404);
  });
});
