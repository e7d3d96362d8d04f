import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../../server/app.js';
import { Notification, RelayRun, Shop, ShopSkill, Transfer } from '../../../../server/lib/models.js';
import { makeUser } from '../../../helpers/factories.js';
import { appQueue } from '../../../../server/lib/queue.js';
import { headObject } from '../../../../server/lib/storage.js';
import { applyTransferStep, checkTransferArrival, manifestKeyFor } from '../../../../server/modules/transfers/service.js';
import { arrivalCheckJobId, type TransferStepData } from '../../../../server/modules/transfers/queue.js';
import { closeServerResources } from '../../../helpers/close.js';
import { signIn } from '../../../helpers/sign-in.js';
import { makeTransferJob, makeTransferNetwork, pdfText, type TransferNetwork } from '../../../helpers/transfers.js';

/**
 * A hand-over for a relay run waits for the run. Worked by hand:
 * - hand-over Saturday 2026-12-05 16:06 Pacific (PST = UTC−8) = 2026-12-06T00:06:00Z;
 * - the run goes Tue/Thu at 07:30 Pacific and takes 3 h;
 * - the next departure on or after the hand-over is Tuesday 2026-12-08 07:30 PST = 2026-12-08T15:30:00Z;
 * - expected at 07:30 + 3 h = 10:30 PST = 2026-12-08T18:30:00Z
 *   (today's code said Saturday 16:06 + 3 h = 19:06 PST = 2026-12-06T03:06:00Z).
 */
const HANDED_OVER = '2026-12-06T00:06:00.000Z';
const RUN_LEAVES = '2026-12-08T15:30:00.000Z';
const EXPECTED = '2026-12-08T18:30:00.000Z';

describe('a relay run hand-over waits for the run, and the manifest travels with it', { timeout: 60_000 }, () => {
  const app = buildApp();
  let world: TransferNetwork;
  let tueThu: RelayRun;
  const cookies: Record<string, string> = {};

  beforeAll(async () => {
    world = await makeTransferNetwork();
    // the helper's daily run would leave Sunday; this network's only run is Tuesday and Thursday
    await world.run.update({ active: false });
    tueThu = await RelayRun.create({
      networkId: world.networkId, fromShopId: world.origin.id, toShopId: world.destination.id,
      weekdays: [2, 4], departureTime: '07:30:00', transitHours: 3,
    });
    cookies.manager = await signIn(app, world.people.manager.email);
    cookies.owner = await signIn(app, world.people.owner.email);
  });
  afterAll(() => closeServerResources());

  async function packedTransfer(contents: { caseCount?: number; contents?: string; departureCondition?: string } = {}) {
    const { job, instrument } = await makeTransferJob(world);
    const { networkId, people } = world;
    const t = await Transfer.create({
      networkId, jobId: job.id, instrumentId: instrument.id, fromShopId: world.origin.id, toShopId: world.destination.id,
      reason: 'Low-reed specialist at the destination', requestedByUserId: people.manager.id,
    });
    const step = (to: TransferStepData['to'], at: string, extra: Partial<TransferStepData> = {}) =>
      applyTransferStep({ networkId, transferId: t.id, to, actorUserId: people.manager.id, at, ...extra });
    await step('requested', '2026-12-05T20:00:00.000Z');
    await step('approved', '2026-12-05T21:00:00.000Z');
    return { t, job, step, pack: () => step('packed', '2026-12-05T23:50:00.000Z', { relayRunId: tueThu.id, ...contents }) };
  }

  it('leaves at the run’s next departure and is expected at departure + run time; notices say the run’s date', async () => {
    const { t, job, pack, step } = await packedTransfer();
    await pack();
    await step('in_transit', HANDED_OVER);
    await t.reload();
    expect(t.handedOverAt!.toISOString()).toBe(HANDED_OVER);
    expect(t.departedAt!.toISOString()).toBe(RUN_LEAVES);
    expect(t.expectedArrivalAt!.toISOString()).toBe(EXPECTED);

    // the notice (and so the e-mail, which carries the same body) names the run's date, not the hand-over + 3 h
    const notices = await Notification.findAll({ where: { networkId: world.networkId, userId: world.people.destinationDesk.id, link: `/transfers/${t.id}` } });
    const handOver = notices.find((n) => n.title.startsWith('Handed over'));
    expect(handOver?.body).toContain('The run leaves Tue 8 Dec 2026, 07:30 PST.');
    expect(handOver?.body).toContain('Expected at');
    expect(handOver?.body).toContain('Tue 8 Dec 2026, 10:30 PST.');
    expect(handOver?.body).not.toContain('Sat 5 Dec 2026, 19:06');

    // the API shows the run's departure and that it is waiting for it
    const res = await request(app).get(`/api/transfers/${t.id}`).set('Cookie', cookies.manager).expect(200);
    expect(res.body.transfer).toMatchObject({ departedAt: RUN_LEAVES, expectedArrivalAt: EXPECTED, handedOverAt: HANDED_OVER });

    // the arrival check is scheduled for the new expected arrival and does not fire before it
    const check = await appQueue().getJob(arrivalCheckJobId(t.id));
    expect(check).toBeTruthy();
    expect(Math.abs(check!.timestamp + (check!.opts.delay ?? 0) - Date.parse(EXPECTED))).toBeLessThan(5_000);
    const data = { networkId: world.networkId, transferId: t.id };
    // Saturday 19:06 PST, when today's code called it overdue: not due
    expect(await checkTransferArrival(data, new Date('2026-12-06T03:07:00.000Z'))).toEqual({ status: 'not-due' });
    expect(await checkTransferArrival(data, new Date('2026-12-08T18:31:00.000Z'))).toEqual({ status: 'overdue' });
    expect(job.number).toBeGreaterThan(0);
  });

  it('no manifest before packing, and asking for it writes nothing', async () => {
    const { t } = await packedTransfer();
    const res = await request(app).get(`/api/transfers/${t.id}/manifest`).set('Cookie', cookies.manager).expect(409);
    expect(res.body.error.message).toMatch(/made when the instrument is packed/);
    await t.reload();
    expect(t.manifestKey).toBeNull();
    expect(await headObject(manifestKeyFor(world.networkId, t.id))).toBeNull();
  });

  it('the manifest made at packing names the run date, contents, cases, condition and the signature lines', async () => {
    const { t, pack, step } = await packedTransfer({
      caseCount: 2,
      contents: 'Baritone saxophone in hard case; neck and mouthpiece in the second case; low-A extension rod',
      departureCondition: 'Low B-flat key guard bent; pads dry; no play in the neck tenon',
    });
    await pack();
    await t.reload();
    expect(t.manifestKey).toBe(manifestKeyFor(world.networkId, t.id));
    const packed = await request(app).get(`/api/transfers/${t.id}/manifest`).set('Cookie', cookies.manager).buffer(true)
      .parse((res, cb) => { const chunks: Buffer[] = []; res.on('data', (c: Buffer) => chunks.push(c)); res.on('end', () => cb(null, Buffer.concat(chunks))); })
      .expect(200);
    const text = await pdfText(packed.body as Buffer);
    // packed Saturday for the Tue/Thu run: the run it is packed for leaves Tuesday 8 December
    expect(text).toContain('Run date');
    expect(text).toContain('Tue 8 Dec 2026, 07:30 PST');
    expect(text).toContain('Number of cases');
    expect(text).toMatch(/Number of cases\s*2/);
    expect(text).toContain('low-A extension rod');
    expect(text).toContain('Condition on departure');
    expect(text).toContain('Low B-flat key guard bent');
    expect(text).toContain('Handed over by');
    expect(text).toContain('Received by');

    // after the hand-over the manifest says the departure and the expected arrival
    await step('in_transit', HANDED_OVER);
    const after = await request(app).get(`/api/transfers/${t.id}/manifest`).set('Cookie', cookies.manager).buffer(true)
      .parse((res, cb) => { const chunks: Buffer[] = []; res.on('data', (c: Buffer) => chunks.push(c)); res.on('end', () => cb(null, Buffer.concat(chunks))); })
      .expect(200);
    const afterText = await pdfText(after.body as Buffer);
    expect(afterText).toContain('Tue 8 Dec 2026, 10:30 PST');
    expect(afterText).toContain('Sat 5 Dec 2026, 16:06 PST');
  });

  it('a cancelled transfer offers no manifest, and the owner hears of the cancellation', async () => {
    const { t, pack, step } = await packedTransfer();
    await pack();
    await step('cancelled', '2026-12-06T01:00:00.000Z', { reason: 'The customer collected it' });
    const res = await request(app).get(`/api/transfers/${t.id}/manifest`).set('Cookie', cookies.manager).expect(409);
    expect(res.body.error.message).toBe('This transfer was cancelled; it has no manifest.');
    const detail = await request(app).get(`/api/transfers/${t.id}`).set('Cookie', cookies.manager).expect(200);
    expect(detail.body.transfer.manifestAvailable).toBe(false);
    const ownerNotices = await Notification.findAll({ where: { networkId: world.networkId, userId: world.people.owner.id, link: `/transfers/${t.id}` } });
    expect(ownerNotices.map((n) => n.title)).toEqual(expect.arrayContaining([expect.stringMatching(/^Transfer cancelled/)]));
  });

  it('warns, in the recommendation and the request, when nobody at the destination may receive', async () => {
    const { networkId } = world;
    const benchOnly = await Shop.create({
      networkId, name: `Bench only ${Date.now()}`, code: `BO${String(Date.now()).slice(-5)}`, city: 'Tacoma',
      timeZone: 'America/Los_Angeles', latitude: 47.2529, longitude: -122.4443, openingDays: [1, 2, 3, 4, 5], laborRateCents: 9000,
    });
    await ShopSkill.create({ networkId, shopId: benchOnly.id, skillId: world.skill.id, weeklyBenchHours: 20 });
    await makeUser(networkId, [{ shopId: benchOnly.id, role: 'technician' }]);
    const { job } = await makeTransferJob(world);
    const rec = await request(app).get('/api/transfers/recommendation').query({ jobId: job.id }).set('Cookie', cookies.manager).expect(200);
    expect(rec.body.withoutReceiver).toEqual([benchOnly.id]);
    const res = await request(app).post('/api/transfers').set('Cookie', cookies.manager)
      .send({ jobId: job.id, toShopId: benchOnly.id, reason: 'Nearest bench with the skill' }).expect(201);
    expect(res.body.warnings).toEqual([
      `Nobody at ${benchOnly.name} may receive transfers (no front desk or regional manager there): only the owner could confirm receipt. Give someone there that role before the instrument arrives.`,
    ]);
    // where someone may receive, no warning
    const { job: other } = await makeTransferJob(world);
    const ok = await request(app).post('/api/transfers').set('Cookie', cookies.manager)
      .send({ jobId: other.id, toShopId: world.destination.id, reason: 'Low-reed specialist' }).expect(201);
    expect(ok.body.warnings).toEqual([]);
  });

  it('refuses a case count that is not a whole number, and changes nothing', async () => {
    const { t } = await packedTransfer();
    const res = await request(app)
      .post(`/api/transfers/${t.id}/pack`).set('Cookie', cookies.manager)
      .send({ relayRunId: tueThu.id, liftingAcknowledged: true, caseCount: 'two' })
      .expect(400);
    expect(res.body.error.fields.caseCount).toBe('Enter a number of cases.');
    await t.reload();
    expect(t.state).toBe('approved');
  });
});
