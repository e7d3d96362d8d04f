import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Job, Notification, OutboxMessage, Part, ServiceCatalogItem } from '../../../server/lib/models.js';
import { applyTransferStep } from '../../../server/modules/transfers/service.js';
import type { BenchJob, JobDetail } from '../../../shared/jobs/dto.js';
import type { InstrumentFamily } from '../../../shared/domain.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, uniq } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { signIn } from '../../helpers/sign-in.js';
import { makeTransferJob, makeTransferNetwork, type TransferNetwork } from '../../helpers/transfers.js';

/*
 * Expected words are written out here, not taken from shared/safety/hazards.ts: a caution that loses the words
 * a person needs (the torch, the lead, the spill) should fail this test.
 */
const WORK_HAZARDS: Array<[hazard: string, words: RegExp]> = [
  ['adhesive', /Cyanoacrylate bonds skin[\s\S]*mars lacquer[\s\S]*Contact cement gives off solvent fumes/],
  ['solvent', /Solvents and cleaning chemicals[\s\S]*gloves and eye protection/],
  ['heat_flame', /Hot-melt pad cement and shellac[\s\S]*burn[\s\S]*alcohol-lamp flame[\s\S]*burning spirit/],
  ['solder_lead', /torch[\s\S]*flux fumes[\s\S]*Old solder may contain lead/],
  ['abrasive_rotary', /Abrasive discs and buffing wheels/],
  ['springs_sharp', /Needle springs are sharp[\s\S]*flat springs can slip/],
  ['pad_removal', /Removing old pads and cleaning pad cups[\s\S]*heat[\s\S]*debonder[\s\S]*solvent[\s\S]*gloves and eye protection/],
];
const SDS = /Follow the product's safety data sheet, local codes and licensed practice/;
const LIFTING = /two people or move it on a cart[\s\S]*manual-handling rules and local codes/;

afterAll(closeServerResources);

describe('hazard tags decide the cautions at each step', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner', 'front_desk', 'technician']);
  });

  const approvedJob = async (family: InstrumentFamily = 'alto_saxophone') => {
    const { job, instrument } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'approved', family });
    await job.update({ assignedUserId: w.people.technician.id });
    return { job, instrument };
  };
  const detail = async (jobId: string, cookie = w.cookies.technician) =>
    (await request(app).get(`/api/jobs/${jobId}`).set('Cookie', cookie).expect(200)).body as JobDetail;
  const myBench = async () => (await request(app).get('/api/jobs/mine').set('Cookie', w.cookies.technician).expect(200)).body.jobs as BenchJob[];

  it('the owner tags catalog items; an unknown hazard is refused on the field and nothing is created', async () => {
    const name = `Post soldering ${uniq()}`;
    const bad = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name, family: null, standardHours: 1, skillId: null, hazards: ['solder_lead', 'glitter'] })
      .expect(400);
    expect(bad.body.error.fields.hazards).toMatch(/glitter/);
    expect(await ServiceCatalogItem.count({ where: { networkId: w.network.id, name } })).toBe(0);
    const bad2 = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name, family: null, standardHours: 1, skillId: null, hazards: 'solder_lead' })
      .expect(400);
    expect(bad2.body.error.fields.hazards).toBe('Choose hazards from the list.');

    const created = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name, family: null, standardHours: 1, skillId: null, hazards: ['solder_lead', 'abrasive_rotary', 'solder_lead'] })
      .expect(201);
    expect(created.body.item.hazards).toEqual(['solder_lead', 'abrasive_rotary']);
    const changed = await request(app)
      .patch(`/api/service-catalog/${created.body.item.id}`)
      .set('Cookie', w.cookies.owner)
      .send({ hazards: ['heat_flame'] })
      .expect(200);
    expect(changed.body.item.cautions.map((c: { hazard: string }) => c.hazard)).toEqual(['heat_flame']);
    // only the owner tags
    await request(app).patch(`/api/service-catalog/${created.body.item.id}`).set('Cookie', w.cookies.technician).send({ hazards: [] }).expect(403);
  });

  it('the owner tags parts; bad tags, another network’s part and a non-owner change nothing', async () => {
    const part = await Part.create({ networkId: w.network.id, sku: `PAD-CEMENT-${uniq()}`, name: 'Pad cement stick', kind: 'other', unitPriceCents: 550 });
    const bad = await request(app).put(`/api/parts/${part.id}/hazards`).set('Cookie', w.cookies.owner).send({ hazards: ['sparkle'] }).expect(400);
    expect(bad.body.error.fields.hazards).toMatch(/sparkle/);
    await request(app).put(`/api/parts/${part.id}/hazards`).set('Cookie', w.cookies.technician).send({ hazards: ['adhesive'] }).expect(403);
    expect((await part.reload()).hazards).toEqual([]);

    const other = await makeNetwork();
    const foreign = await Part.create({ networkId: other.id, sku: `X-${uniq()}`, name: 'Foreign part', kind: 'other', unitPriceCents: 1 });
    await request(app).put(`/api/parts/${foreign.id}/hazards`).set('Cookie', w.cookies.owner).send({ hazards: ['adhesive'] }).expect(404);
    expect((await foreign.reload()).hazards).toEqual([]);

    const ok = await request(app).put(`/api/parts/${part.id}/hazards`).set('Cookie', w.cookies.owner).send({ hazards: ['heat_flame', 'adhesive'] }).expect(200);
    expect(ok.body.part.hazards).toEqual(['adhesive', 'heat_flame']);
    const stock = await request(app).get('/api/stock').query({ shopId: w.shop.id, q: part.sku }).set('Cookie', w.cookies.owner).expect(200);
    expect(stock.body.rows[0]).toMatchObject({ partId: part.id, hazards: ['adhesive', 'heat_flame'] });
    expect(stock.body.can.setHazards).toBe(true);
  });

  it('each tagged hazard is cautioned beside Start on bench and on My bench, deferring to the data sheet', async () => {
    for (const [hazard, words] of WORK_HAZARDS) {
      const item = await ServiceCatalogItem.create({ networkId: w.network.id, name: `Work ${hazard} ${uniq()}`, standardHours: 1, hazards: [hazard as never] });
      const { job } = await approvedJob();
      await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.technician).send({ kind: 'labor', catalogItemId: item.id, hours: 1 }).expect(201);
      const body = await detail(job.id);
      // the move that starts the work is offered, and the job's cautions stand beside it
      expect(body.moves.map((m) => m.label)).toContain('Start on bench');
      expect(body.safety.hazards, hazard).toEqual([hazard]);
      expect(body.safety.heavyCase).toBe(false);
      expect(body.safety.cautions[0].text, hazard).toMatch(words);
      expect(body.safety.cautions[0].text, hazard).toMatch(SDS);
      expect(body.lineItems[0].cautions.map((c) => c.hazard)).toEqual([hazard]);
      const mine = (await myBench()).find((j) => j.id === job.id);
      expect(mine?.hazards, hazard).toEqual([hazard]);
    }
  });

  it('a part line carries its part’s tags: pad cement brings adhesive and heat', async () => {
    const cement = await Part.create({
      networkId: w.network.id, sku: `CEMENT-${uniq()}`, name: 'Pad cement stick', kind: 'other', unitPriceCents: 550, hazards: ['adhesive', 'heat_flame'],
    });
    const { job } = await approvedJob();
    const res = await request(app)
      .post(`/api/jobs/${job.id}/line-items`)
      .set('Cookie', w.cookies.technician)
      .send({ kind: 'part', partId: cement.id, description: 'Pad cement stick', quantity: 1, unitPriceCents: 550 })
      .expect(201);
    const body = res.body as JobDetail;
    expect(body.lineItems[0].cautions.map((c) => c.hazard)).toEqual(['adhesive', 'heat_flame']);
    expect(body.safety.hazards).toEqual(['adhesive', 'heat_flame']);
  });

  it('a job whose name only sounds hazardous gets no caution: the tags decide, not the words', async () => {
    const item = await ServiceCatalogItem.create({ networkId: w.network.id, name: `Repad and chemical clean ${uniq()}`, standardHours: 1 });
    const { job } = await approvedJob();
    const res = await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.technician).send({ kind: 'labor', catalogItemId: item.id, hours: 1 }).expect(201);
    expect((res.body as JobDetail).safety.cautions).toEqual([]);
  });

  it('a tuba, a euphonium and a bass saxophone carry the lifting caution at the bench and at hand-back', async () => {
    for (const family of ['tuba', 'euphonium', 'bass_saxophone', 'baritone_saxophone'] as const) {
      const { job } = await approvedJob(family);
      const body = await detail(job.id);
      expect(body.safety.heavyCase, family).toBe(true);
      expect(body.job.instrument.heavyCase).toBe(true);
      const lifting = body.safety.cautions.find((c) => c.hazard === 'heavy_lift')!;
      expect(lifting.text).toMatch(LIFTING);
      // lifting defers to manual-handling rules, not to a data sheet
      expect(lifting.text).not.toMatch(/safety data sheet/);
      expect((await myBench()).find((j) => j.id === job.id)?.hazards).toEqual(['heavy_lift']);
      // hand-back: at Ready the front desk's Release move has the same lifting caution to stand beside
      await Job.update({ stage: 'ready' }, { where: { networkId: w.network.id, id: job.id } });
      const desk = await detail(job.id, w.cookies.front_desk);
      expect(desk.moves.map((m) => m.to)).toContain('released');
      expect(desk.safety.cautions.map((c) => c.hazard)).toEqual(['heavy_lift']);
    }
    const { job } = await approvedJob('trumpet');
    expect((await detail(job.id)).safety).toMatchObject({ heavyCase: false, cautions: [] });
  });

  it('an instrument in a heavy case is flagged by its shop and then carries the lifting caution', async () => {
    const { job, instrument } = await approvedJob('alto_saxophone');
    const bad = await request(app).patch(`/api/instruments/${instrument.id}/heavy-case`).set('Cookie', w.cookies.front_desk).send({ heavyCase: 'yes' }).expect(400);
    expect(bad.body.error.fields.heavyCase).toBe('Say whether the case is heavy.');
    const res = await request(app).patch(`/api/instruments/${instrument.id}/heavy-case`).set('Cookie', w.cookies.front_desk).send({ heavyCase: true }).expect(200);
    expect(res.body.instrument).toMatchObject({ heavyCaseFlag: true, heavyCase: true });
    const body = await detail(job.id);
    expect(body.safety.cautions.map((c) => c.hazard)).toEqual(['heavy_lift']);
    const timeline = await request(app).get(`/api/instruments/${instrument.id}/timeline`).set('Cookie', w.cookies.front_desk).expect(200);
    expect(JSON.stringify(timeline.body.items)).toMatch(/Marked as travelling in a heavy case/);
  });

  it('intake answers with the lifting caution for a heavy case, and none for a light one', async () => {
    const intake = (instrument: Record<string, unknown>) =>
      request(app)
        .post('/api/intake')
        .set('Cookie', w.cookies.front_desk)
        .send({
          shopId: w.shop.id,
          requestKey: randomUUID(),
          instrument: { new: { serial: `HZ-${uniq()}`, maker: 'Aldmoor', ownerKind: 'rental_fleet', ...instrument } },
          customer: null,
          job: { complaint: 'Check before the season' },
        })
        .then((res) => {
          expect(res.status, JSON.stringify(res.body)).toBe(201);
          return res;
        });
    const bass = await intake({ family: 'bass_saxophone', model: 'Fenlark Bass' });
    expect(bass.body.instrument.heavyCase).toBe(true);
    expect(bass.body.cautions.map((c: { hazard: string }) => c.hazard)).toEqual(['heavy_lift']);
    expect(bass.body.cautions[0].text).toMatch(LIFTING);
    const alto = await intake({ family: 'alto_saxophone' });
    expect(alto.body.cautions).toEqual([]);
    const flagged = await intake({ family: 'alto_saxophone', heavyCase: true });
    expect(flagged.body.cautions[0].text).toMatch(LIFTING);
  });
});

describe('the receiving shop hears the lifting caution of a heavy transfer, in the app and by e-mail', () => {
  const app = buildApp();
  let world: TransferNetwork;
  const cookies: Record<string, string> = {};

  beforeAll(async () => {
    world = await makeTransferNetwork();
    for (const key of ['originDesk', 'manager'] as const) cookies[key] = await signIn(app, world.people[key].email);
  });

  const requestAndApprove = async (family: InstrumentFamily) => {
    const { job } = await makeTransferJob(world, { family });
    const created = await request(app)
      .post('/api/transfers')
      .set('Cookie', cookies.originDesk)
      .send({ jobId: job.id, toShopId: world.destination.id, reason: 'Needs the low-saxophone bench.' })
      .expect(201);
    const transferId: string = created.body.id;
    const base = { networkId: world.networkId, transferId };
    // the steps run here rather than on a worker, so the test reads what they wrote at once
    await applyTransferStep({ ...base, to: 'requested', actorUserId: world.people.originDesk.id, at: new Date().toISOString() });
    await request(app).post(`/api/transfers/${transferId}/approve`).set('Cookie', cookies.manager).send({}).expect(202);
    await applyTransferStep({ ...base, to: 'approved', actorUserId: world.people.manager.id, at: new Date().toISOString() });
    const notice = await Notification.findOne({ where: { networkId: world.networkId, userId: world.people.destinationDesk.id, dedupeKey: `transfer:${transferId}:approved:${world.people.destinationDesk.id}` } });
    const mail = await OutboxMessage.findOne({
      where: { networkId: world.networkId, dedupeKey: `transfer:${transferId}:approved:email:${world.people.destinationDesk.id}` },
    });
    return { notice: notice!, mail: mail! };
  };

  it('a baritone saxophone: notice and e-mail to the destination carry the one lifting text', async () => {
    const { notice, mail } = await requestAndApprove('baritone_saxophone');
    expect(notice.body).toMatch(LIFTING);
    expect(notice.body).not.toMatch(/safety data sheet/);
    expect(String(mail.payload.text)).toMatch(LIFTING);
  });

  it('a clarinet: no lifting caution', async () => {
    const { notice, mail } = await requestAndApprove('clarinet');
    expect(notice.body).not.toMatch(/manual-handling/);
    expect(String(mail.payload.text)).not.toMatch(/manual-handling/);
  });
});
