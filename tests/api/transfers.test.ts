import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { Instrument, Job, Shop, Transfer } from '../../server/lib/models.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { closeServerResources } from '../helpers/close.js';
import { signIn } from '../helpers/sign-in.js';

/** The transfer API on the demo network: what each person sees, the ranking and its reasons, refusals. */
describe('transfers API on the demo network', () => {
  const app = buildApp();
  let networkId: string;
  const shop: Record<string, Shop> = {};
  const cookie: Record<'owner' | 'manager' | 'desk' | 'auditor' | 'tobias', string> = {} as never;
  let bari1Job: Job;
  let awaiting: Transfer;

  beforeAll(async () => {
    ({ networkId } = await loadDemoNetwork());
    for (const s of await Shop.findAll({ where: { networkId } })) shop[s.code] = s;
    cookie.owner = await signIn(app, demoPeople[0].email);
    cookie.manager = await signIn(app, demoPeople[1].email);
    cookie.desk = await signIn(app, demoPeople[2].email);
    cookie.auditor = await signIn(app, demoPeople[4].email);
    cookie.tobias = await signIn(app, 'tobias.renninger@benchrelay.test');
    const bari1 = (await Instrument.findOne({ where: { networkId, family: 'baritone_saxophone', currentShopId: shop.SEA.id, model: 'Fenlark Baritone' } }))!;
    bari1Job = (await Job.findOne({ where: { networkId, instrumentId: bari1.id, stage: 'assessed' } }))!;
    awaiting = (await Transfer.findOne({ where: { networkId, jobId: bari1Job.id, state: 'requested' } }))!;
  });
  afterAll(closeServerResources);

  it('ranks Portland over Chicago for the Seattle baritone, with its reasons, and notes the transfer already asked for', async () => {
    const res = await request(app).get('/api/transfers/recommendation').query({ jobId: bari1Job.id }).set('Cookie', cookie.desk).expect(200);
    // only Portland and Chicago have low-saxophone bench hours
    expect(res.body.ranked.map((r: { shopName: string }) => r.shopName)).toEqual(['Harborline Portland', 'Harborline Chicago']);
    expect(res.body.recommendedShopId).toBe(shop.PDX.id);
    const [portland, chicago] = res.body.ranked;
    // the demo's Seattle → Portland run; on some days of the week a road trip finishes sooner, and then the run is
    // named as the slower way
    const portlandTrips = portland.reasons.filter((r: { kind: string }) => r.kind === 'transport').map((r: { text: string }) => r.text);
    if (portland.transport === 'relay_run') expect(portlandTrips[0]).toMatch(/^Next relay run leaves Harborline Seattle (Tue|Thu) \d{1,2} \w{3} \d{4}, \d\d:\d\d P[SD]T, /);
    else expect(portlandTrips).toContainEqual(expect.stringMatching(/^The next relay run would arrive (Tue|Wed|Thu|Fri) .* and finish later\.$/));
    expect(portland.transport).toMatch(/^(relay_run|road)$/);
    expect(chicago.transport).toBe('road');
    expect(chicago.reasons[0].text).toMatch(/No relay run from Harborline Seattle: 2,7\d\d km great-circle at 60 km\/h/);
    expect(portland.reasons.some((r: { text: string }) => /This job: 18 h/.test(r.text))).toBe(true);
    expect(Date.parse(portland.finishAt)).toBeLessThan(Date.parse(chicago.finishAt));
    expect(res.body.job).toMatchObject({ number: bari1Job.number, transferable: false, openTransferId: awaiting.id });
    expect(res.body.skill.code).toBe('low_sax');
  });

  it('lists the open jobs Seattle could send, leaving out finished work and jobs already being transferred', async () => {
    const res = await request(app).get('/api/transfers/requestable-jobs').query({ shopId: shop.SEA.id }).set('Cookie', cookie.desk).expect(200);
    const ids = res.body.jobs.map((j: { id: string }) => j.id);
    expect(ids).not.toContain(bari1Job.id);
    const stages = new Set(res.body.jobs.map((j: { stage: string }) => j.stage));
    expect(stages.has('ready')).toBe(false);
    expect(stages.has('released')).toBe(false);
    expect(res.body.jobs.length).toBeGreaterThan(3);
    // Priya works the Seattle desk only
    await request(app).get('/api/transfers/requestable-jobs').query({ shopId: shop.PDX.id }).set('Cookie', cookie.desk).expect(403);
  });

  it('puts the requested Seattle → Portland transfer in the approvals of the manager and the owner, not of the front desk', async () => {
    const approvals = async (c: string) =>
      (await request(app).get('/api/transfers').query({ view: 'approvals' }).set('Cookie', c).expect(200)).body.transfers.map((t: { id: string }) => t.id);
    expect(await approvals(cookie.manager)).toContain(awaiting.id);
    expect(await approvals(cookie.owner)).toContain(awaiting.id);
    expect(await approvals(cookie.desk)).toEqual([]);
    // the desk still sees it among Seattle's outgoing transfers
    const outgoing = await request(app).get('/api/transfers').query({ view: 'outgoing', shopId: shop.SEA.id }).set('Cookie', cookie.desk).expect(200);
    expect(outgoing.body.transfers.find((t: { id: string }) => t.id === awaiting.id)).toMatchObject({ state: 'requested', toShop: { name: 'Harborline Portland' } });
    await request(app).get('/api/transfers').query({ view: 'incoming' }).set('Cookie', cookie.desk).expect(400);
  });

  it('shows the baritone on the road to Chicago as incoming there, and the auditor only Denver’s transfers', async () => {
    const incoming = await request(app).get('/api/transfers').query({ view: 'incoming', shopId: shop.CHI.id, status: 'open' }).set('Cookie', cookie.tobias).expect(200);
    const onRoad = incoming.body.transfers.find((t: { state: string }) => t.state === 'in_transit');
    expect(onRoad).toMatchObject({ fromShop: { name: 'Harborline Denver' }, instrument: { family: 'baritone_saxophone' }, overdue: false });

    const audited = await request(app).get('/api/transfers').set('Cookie', cookie.auditor).expect(200);
    expect(audited.body.transfers.length).toBeGreaterThan(0);
    for (const t of audited.body.transfers) expect([t.fromShop.id, t.toShop.id]).toContain(shop.DEN.id);
    await request(app).get(`/api/transfers/${awaiting.id}`).set('Cookie', cookie.auditor).expect(404);
    const detail = await request(app).get(`/api/transfers/${onRoad.id}`).set('Cookie', cookie.auditor).expect(200);
    expect(detail.body.transfer).toMatchObject({ state: 'in_transit', heavyCase: true, relayRun: { departureTime: '06:00' } });
  });

  it('refuses a request with field errors, for the same shop, for a finished job and for a job already on its way', async () => {
    const bad = await request(app).post('/api/transfers').set('Cookie', cookie.desk).send({ jobId: bari1Job.id, reason: 'x' }).expect(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['reason', 'toShopId']);
    const released = (await Job.findOne({ where: { networkId, shopId: shop.SEA.id, stage: 'released' } }))!;
    await request(app).post('/api/transfers').set('Cookie', cookie.desk).send({ jobId: released.id, toShopId: shop.PDX.id, reason: 'Send it on.' }).expect(409);
    await request(app).post('/api/transfers').set('Cookie', cookie.desk).send({ jobId: bari1Job.id, toShopId: shop.CHI.id, reason: 'Send it on.' }).expect(409);
    const intake = (await Job.findOne({ where: { networkId, shopId: shop.SEA.id, stage: 'intake' } }))!;
    const same = await request(app).post('/api/transfers').set('Cookie', cookie.desk).send({ jobId: intake.id, toShopId: shop.SEA.id, reason: 'Send it on.' }).expect(400);
    expect(same.body.error.fields.toShopId).toBeTruthy();
    expect(await Transfer.count({ where: { networkId, jobId: intake.id } })).toBe(0);
  });
});
