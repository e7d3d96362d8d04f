import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { HistoryEvent, JobLineItem, Transfer } from '../../../server/lib/models.js';
import { applyTransferStep } from '../../../server/modules/transfers/service.js';
import type { TransferStepData } from '../../../server/modules/transfers/queue.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeUser } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { makePadCatalog } from '../../helpers/pad-catalog.js';
import { makeTransferJob, makeTransferNetwork } from '../../helpers/transfers.js';
import { signIn } from '../../helpers/sign-in.js';
import type { JobDetail } from '../../../shared/jobs/dto.js';

/**
 * An approved estimate that rises needs a new approval, and every change of lines, tax or total is on
 * the instrument's history. Amounts are worked by hand: the bench shop charges $90.00 an hour and 10 %
 * tax (tests/helpers/factories.ts), so 1 h of labor is $90.00 + $9.00 = $99.00.
 */
describe('approved estimates: re-approval on a raise, and a trace of every change', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'technician', 'auditor']);
  });
  afterAll(closeServerResources);

  const detail = async (jobId: string, cookie = w.cookies.front_desk) =>
    (await request(app).get(`/api/jobs/${jobId}`).set('Cookie', cookie).expect(200)).body as JobDetail;
  const approve = (jobId: string, cookie = w.cookies.front_desk) =>
    request(app).post(`/api/jobs/${jobId}/approval`).set('Cookie', cookie).send({ approvedByName: 'Tamsin Ordway', method: 'phone' });
  const estimateEvents = (jobId: string) =>
    HistoryEvent.findAll({ where: { networkId: w.network.id, jobId, kind: 'estimate_changed' }, order: [['occurredAt', 'ASC'], ['createdAt', 'ASC']] });

  it('a line the technician adds after approval raises the total: both shown, the bench waits, the desk re-approves', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'assessed', family: 'alto_saxophone' });
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.front_desk)
      .send({ kind: 'labor', catalogItemId: w.catalog.leakTest.id }).expect(201);
    await approve(job.id).expect(200);
    let d = await detail(job.id);
    expect(d.job.stage).toBe('approved');
    // 1 h × $90.00 = $90.00, 10 % tax $9.00: $99.00, estimate version 1 (one change: the line added)
    expect(d.job.estimateApproval).toMatchObject({ totalCents: 9900, version: 1 });
    expect(d.job.needsReapproval).toBe(false);

    // the technician finds a bent key guard: a $20.00 part. $90 + $20 = $110.00, tax $11.00: $121.00
    const added = await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.technician)
      .send({ kind: 'part', description: 'Key guard, low B-flat', quantity: 1, unitPriceCents: 2000 }).expect(201);
    expect((added.body as JobDetail).totals.totalCents).toBe(12100);
    d = await detail(job.id, w.cookies.technician);
    expect(d.job).toMatchObject({ needsReapproval: true, estimateVersion: 2, estimateApproval: { totalCents: 9900, version: 1 } });
    expect(d.moves.find((m) => m.to === 'on_bench')?.blockedBy).toEqual(['estimate_reapproved']);
    // the hold for parts is still open to the bench
    expect(d.moves.find((m) => m.to === 'waiting_for_parts')?.blockedBy).toEqual([]);

    const refused = await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', w.cookies.technician).send({ to: 'on_bench' }).expect(409);
    expect(refused.body.error).toMatchObject({ code: 'move_refused', reason: 'estimate_reapproved' });
    expect((await detail(job.id)).job.stage).toBe('approved');

    const events = await estimateEvents(job.id);
    expect(events.map((e) => e.summary)).toEqual([
      `Job ${job.number}: estimate v1, line added (labor); total $0.00 → $99.00`,
      `Job ${job.number}: estimate v2, line added (Key guard, low B-flat); total $99.00 → $121.00; approved $99.00 (v1), now $121.00: needs a new approval`,
    ]);
    expect(events[1].userId).toBe(w.people.technician.id);

    // the technician cannot record the customer's approval; the front desk does
    await approve(job.id, w.cookies.technician).expect(403);
    await approve(job.id).expect(200);
    d = await detail(job.id, w.cookies.technician);
    expect(d.job).toMatchObject({ needsReapproval: false, estimateApproval: { totalCents: 12100, version: 2 } });
    await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', w.cookies.technician).send({ to: 'on_bench' }).expect(200);

    // a change that lowers the total needs no approval, but is on the history all the same
    const part = await JobLineItem.findOne({ where: { networkId: w.network.id, jobId: job.id, kind: 'part' } });
    await request(app).delete(`/api/jobs/${job.id}/line-items/${part!.id}`).set('Cookie', w.cookies.technician).expect(200);
    d = await detail(job.id);
    expect(d.job.needsReapproval).toBe(false);
    expect((await estimateEvents(job.id)).at(-1)!.summary).toBe(
      `Job ${job.number}: estimate v3, line removed (Key guard, low B-flat); total $121.00 → $99.00; within the approved $121.00`,
    );
  });

  it('technicians edit estimates only at their own shop; auditors never', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.otherShop.id, w.people.front_desk.id, { stage: 'approved' });
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.technician)
      .send({ kind: 'part', description: 'Cork', quantity: 1, unitPriceCents: 100 }).expect(403);
    const { job: own } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'approved' });
    await request(app).post(`/api/jobs/${own.id}/line-items`).set('Cookie', w.cookies.auditor)
      .send({ kind: 'part', description: 'Cork', quantity: 1, unitPriceCents: 100 }).expect(403);
    expect(await JobLineItem.count({ where: { networkId: w.network.id, jobId: [job.id, own.id] } })).toBe(0);
  });

  it('a pad-map save that adds pads after approval needs a new approval and is on the history', async () => {
    await makePadCatalog(w.network.id);
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'assessed', family: 'alto_saxophone' });
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.front_desk)
      .send({ kind: 'labor', catalogItemId: w.catalog.leakTest.id }).expect(201);
    await approve(job.id).expect(200);
    await request(app).put(`/api/jobs/${job.id}/pad-map`).set('Cookie', w.cookies.technician).send({
      unitSystem: 'mm',
      entries: [
        { keyId: 'low_c', padKind: 'self_leveling', floor: 'flat', cupDiameter: '30.5', cupDepth: '4' },
        { keyId: 'palm_d', padKind: 'glued', floor: 'flat', cupDiameter: '10.2' },
      ],
    }).expect(200);
    const d = await detail(job.id);
    expect(d.job.needsReapproval).toBe(true);
    expect(d.job.estimateApproval?.totalCents).toBe(9900);
    expect(d.totals.totalCents).toBeGreaterThan(9900);
    const last = (await estimateEvents(job.id)).at(-1)!;
    expect(last.summary).toMatch(new RegExp(`^Job ${job.number}: estimate v2, pad lines replaced by the pad map; total \\$99\\.00 → \\$[0-9.,]+; approved \\$99\\.00 \\(v1\\)`));
    expect(last.userId).toBe(w.people.technician.id);
  });

  it('a transfer to a shop with a higher tax rate re-taxes the estimate: history entry and a new approval needed', async () => {
    const t = await makeTransferNetwork();
    await t.origin.update({ taxRateBasisPoints: 1000 });
    // 12.5 %: invented for the test
    await t.destination.update({ taxRateBasisPoints: 1250 });
    const { job, instrument } = await makeTransferJob(t);
    // 1 h at $90.00 written at the origin: 10 % tax → $99.00
    await JobLineItem.create({ networkId: t.networkId, jobId: job.id, kind: 'labor', description: 'Leak test & adjust', hours: 1, rateCents: 9000, position: 0 });
    const originDesk = await signIn(app, t.people.originDesk.email);
    await approve(job.id, originDesk).expect(200);
    expect((await detail(job.id, originDesk)).job.estimateApproval?.totalCents).toBe(9900);

    const tr = await Transfer.create({
      networkId: t.networkId, jobId: job.id, instrumentId: instrument.id, fromShopId: t.origin.id, toShopId: t.destination.id,
      reason: 'Low-reed specialist', requestedByUserId: t.people.manager.id,
    });
    const step = (to: TransferStepData['to'], extra: Partial<TransferStepData> = {}) =>
      applyTransferStep({ networkId: t.networkId, transferId: tr.id, to, actorUserId: t.people.manager.id, at: new Date().toISOString(), ...extra });
    await step('requested');
    await step('approved');
    await step('packed', { relayRunId: t.run.id });
    await step('in_transit');
    await step('received', { receiveMethod: 'typed' });

    // at the destination: 12.5 % of $90.00 = $11.25 → $101.25, above the approved $99.00
    const destinationTech = await makeUser(t.networkId, [{ shopId: t.destination.id, role: 'technician' }]);
    const techCookie = await signIn(app, destinationTech.email);
    const d = await detail(job.id, techCookie);
    expect(d.totals).toMatchObject({ taxRateBasisPoints: 1250, taxCents: 1125, totalCents: 10125 });
    expect(d.job).toMatchObject({ needsReapproval: true, estimateApproval: { totalCents: 9900 } });
    const events = await HistoryEvent.findAll({ where: { networkId: t.networkId, jobId: job.id, kind: 'estimate_changed' } });
    expect(events.map((e) => e.summary)).toEqual([
      `Job ${job.number}: estimate v1, re-taxed at ${t.destination.name}'s rate after the transfer; total $99.00 → $101.25; approved $99.00 (v0), now $101.25: needs a new approval`,
    ]);
    const refused = await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', techCookie).send({ to: 'on_bench' }).expect(409);
    expect(refused.body.error.reason).toBe('estimate_reapproved');
  });
});
