import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { createHash, randomBytes } from 'node:crypto';
import { buildApp } from '../../../server/app.js';
import { config } from '../../../server/config.js';
import { Customer, CustomerLink, EstimateDecision, HistoryEvent, Job } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, uniq } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';

/**
 * The customer's private link: one job per token, nothing else of the network, the same 404 for every
 * token that does not open a page, and approve / decline with the typed name recorded with amount,
 * version, time and how.
 */
describe('the customer link', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'technician']);
  });
  afterAll(closeServerResources);

  const desk = () => w.cookies.front_desk;
  const origin = () => process.env.APP_ORIGIN!;

  /** A job at Assessed with two lines: 6 h labour at the shop's rate and a $64.50 part. */
  async function assessedJob(serial = `LK-${uniq()}-7731`) {
    const { instrument, job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake', serial });
    await job.update({ customerId: w.customer.id, promisedOn: '2027-03-09' });
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', desk()).set('Origin', origin())
      .send({ kind: 'labor', catalogItemId: w.catalog.repadAlto.id }).expect(201);
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', desk()).set('Origin', origin())
      .send({ kind: 'part', description: 'Glued pad set, alto', quantity: 1, unitPriceCents: 6450 }).expect(201);
    await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', desk()).set('Origin', origin()).send({ to: 'assessed' }).expect(200);
    return { instrument, job: (await Job.findByPk(job.id))! };
  }

  async function linkFor(jobId: string) {
    const res = await request(app).post(`/api/jobs/${jobId}/customer-link`).set('Cookie', desk()).set('Origin', origin()).send({}).expect(201);
    const url = res.body.url as string;
    expect(url.startsWith(`${config.appOrigin}/c/`)).toBe(true);
    return url.split('/c/')[1];
  }

  const page = (token: string) => request(app).get(`/api/public/jobs/${token}`);
  const decide = (token: string, body: object) => request(app).post(`/api/public/jobs/${token}/decision`).set('Origin', origin()).send(body);

  it('shows the instrument, the stage in words, the shops, the promise and the estimate — and no customer, serial or id', async () => {
    const { instrument, job } = await assessedJob('TQ-55017731');
    const token = await linkFor(job.id);
    const res = await page(token).expect(200);
    expect(res.headers['cache-control']).toBe('no-store');
    expect(res.body.job).toMatchObject({ number: job.number, stage: 'assessed', promisedOn: 'Tue 9 Mar 2027' });
    expect(res.body.job.stageText).toMatch(/waits for your answer/);
    expect(res.body.instrument).toEqual({ family: 'Alto saxophone', maker: 'Testmaker', model: 'Testmodel', serialEnding: '…7731' });
    expect(res.body.shopNow.name).toBe(w.shop.name);
    expect(res.body.pickupShop.name).toBe(w.shop.name);
    // 6 h × the shop's rate and one $64.50 part, at the shop's tax rate: read back from the rows the desk wrote
    const shopRate = w.shop.laborRateCents;
    const subtotal = 6 * shopRate + 6450;
    expect(res.body.estimate.subtotalCents).toBe(subtotal);
    expect(res.body.estimate.lines.map((l: { totalCents: number }) => l.totalCents)).toEqual([6 * shopRate, 6450]);
    expect(res.body.estimate.totalCents).toBe(subtotal + res.body.estimate.taxCents);
    expect(res.body.approval).toMatchObject({ status: 'awaiting', canDecide: true, approved: null });

    const text = res.text;
    for (const secret of [w.customer.name, w.customer.email!, w.customer.phone!, 'Tamsin', instrument.serial, job.id, instrument.id, w.shop.id, w.network.id, w.people.front_desk.email]) {
      expect(text).not.toContain(secret);
    }
  });

  it('opens only the job its token was made for', async () => {
    const a = await assessedJob(`AA-${uniq()}-1111`);
    const b = await assessedJob(`BB-${uniq()}-2222`);
    const tokenA = await linkFor(a.job.id);
    const tokenB = await linkFor(b.job.id);
    expect((await page(tokenA).expect(200)).body.job.number).toBe(a.job.number);
    expect((await page(tokenB).expect(200)).body.job.number).toBe(b.job.number);
    expect((await page(tokenA)).text).not.toContain('2222');
    // a decision through A's token changes A and nothing of B
    await decide(tokenA, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: a.job.estimateVersion }).expect(200);
    expect(await EstimateDecision.count({ where: { jobId: b.job.id } })).toBe(0);
    expect((await Job.findByPk(b.job.id))!.stage).toBe('assessed');
  });

  it('answers an unknown, malformed, revoked or expired token with the same 404', async () => {
    const revokedJob = await assessedJob();
    const revoked = await linkFor(revokedJob.job.id);
    const revoke = await request(app).delete(`/api/jobs/${revokedJob.job.id}/customer-link`).set('Cookie', desk()).set('Origin', origin()).expect(200);
    expect(revoke.body.customerLink.live).toBe(0);

    const expiredJob = await assessedJob();
    const expired = await linkFor(expiredJob.job.id);
    await Job.update({ stage: 'released', releasedAt: new Date(Date.now() - 31 * 86_400_000) }, { where: { id: expiredJob.job.id } });

    const stillOpenJob = await assessedJob();
    const stillOpen = await linkFor(stillOpenJob.job.id);
    await Job.update({ stage: 'released', releasedAt: new Date(Date.now() - 29 * 86_400_000) }, { where: { id: stillOpenJob.job.id } });
    await page(stillOpen).expect(200);

    const unknown = randomBytes(32).toString('base64url');
    const answers = await Promise.all([unknown, revoked, expired, 'not-a-token', `${revoked}x`].map((t) => page(t)));
    // the same answer whatever the token was (only the request's own id differs, as on every answer)
    const withoutRequestId = (body: { error: Record<string, unknown> }) => ({ error: { ...body.error, requestId: undefined } });
    for (const res of answers) {
      expect(res.status).toBe(404);
      expect(withoutRequestId(res.body)).toEqual(withoutRequestId(answers[0].body));
    }
    const decisions = await Promise.all([unknown, revoked, expired].map((t) => decide(t, { decision: 'approved', name: 'Some One', estimateVersion: 0 })));
    for (const res of decisions) {
      expect(res.status).toBe(404);
      expect(withoutRequestId(res.body)).toEqual(withoutRequestId(answers[0].body));
    }
    expect(await EstimateDecision.count({ where: { jobId: revokedJob.job.id } })).toBe(0);
  });

  it('stores only the hash of the token', async () => {
    const { job } = await assessedJob();
    const token = await linkFor(job.id);
    const rows = await CustomerLink.findAll({ where: { jobId: job.id } });
    // SHA-256 of the token as sent (node:crypto here, not the app's helper)
    const expected = createHash('sha256').update(token).digest('hex');
    expect(rows.filter((r) => r.tokenHash.toString('hex') === expected)).toHaveLength(1);
    for (const row of rows) {
      expect(row.tokenHash).toHaveLength(32);
      expect(row.tokenHash.toString('latin1')).not.toContain(token);
      expect(row.tokenHash.toString('base64url')).not.toBe(token);
    }
  });

  it('records an approval from the link: typed name, amount in cents, version, time, and the job moves to Approved', async () => {
    const { job } = await assessedJob();
    const token = await linkFor(job.id);
    const before = (await page(token)).body;
    const started = Date.now();
    const res = await decide(token, { decision: 'approved', name: '  Tamsin Ordway ', estimateVersion: before.estimate.version }).expect(200);
    expect(res.body.approval.status).toBe('approved');
    expect(res.body.approval.approved).toMatchObject({ totalCents: before.estimate.totalCents, version: before.estimate.version, method: 'on this page' });

    const [decision] = await EstimateDecision.findAll({ where: { jobId: job.id } });
    expect(decision).toMatchObject({ decision: 'approved', method: 'link', name: 'Tamsin Ordway', totalCents: before.estimate.totalCents, estimateVersion: before.estimate.version });
    expect(decision.decidedAt.getTime()).toBeGreaterThanOrEqual(started - 1000);
    const after = (await Job.findByPk(job.id))!;
    expect(after.stage).toBe('approved');
    expect(after).toMatchObject({ approvedTotalCents: before.estimate.totalCents, estimateApprovalMethod: 'link', estimateApprovedByName: 'Tamsin Ordway' });
    // the timeline says how, not who
    const event = await HistoryEvent.findOne({ where: { jobId: job.id, kind: 'estimate_approved' } });
    expect(event!.summary).toContain('customer link');
    expect(event!.summary).not.toContain('Tamsin');

    // the desk sees it on the job page
    const detail = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', desk()).expect(200);
    expect(detail.body.estimateDecisions[0]).toMatchObject({ decision: 'approved', method: 'link', name: 'Tamsin Ordway', totalCents: before.estimate.totalCents });
    // approving twice is refused and records nothing
    await decide(token, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: before.estimate.version }).expect(409);
    expect(await EstimateDecision.count({ where: { jobId: job.id } })).toBe(1);
  });

  it('records a decline, keeps the job at Assessed, and still lets the customer approve afterwards', async () => {
    const { job } = await assessedJob();
    const token = await linkFor(job.id);
    const version = (await page(token)).body.estimate.version;
    const res = await decide(token, { decision: 'declined', name: 'Tamsin Ordway', estimateVersion: version }).expect(200);
    expect(res.body.approval).toMatchObject({ status: 'declined', canDecide: true });
    expect((await Job.findByPk(job.id))!).toMatchObject({ stage: 'assessed', approvedTotalCents: null });
    expect(await EstimateDecision.count({ where: { jobId: job.id, decision: 'declined', method: 'link' } })).toBe(1);
    await decide(token, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: version }).expect(200);
    expect((await Job.findByPk(job.id))!.stage).toBe('approved');
  });

  it('refuses an answer to a version the customer did not read, and a missing name', async () => {
    const { job } = await assessedJob();
    const token = await linkFor(job.id);
    const stale = await decide(token, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: job.estimateVersion - 1 });
    expect(stale.status).toBe(409);
    expect(stale.body.error.code).toBe('estimate_changed');
    const noName = await decide(token, { decision: 'approved', name: ' ', estimateVersion: job.estimateVersion });
    expect(noName.status).toBe(400);
    expect(noName.body.error.fields.name).toBeTruthy();
    expect(await EstimateDecision.count({ where: { jobId: job.id } })).toBe(0);
  });

  it('after a raise above the approved amount, shows both and takes a new approval of the new total', async () => {
    const { job } = await assessedJob();
    const token = await linkFor(job.id);
    const first = (await page(token)).body;
    await decide(token, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: first.estimate.version }).expect(200);
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', desk()).set('Origin', origin())
      .send({ kind: 'part', description: 'Neck tenon cork', quantity: 1, unitPriceCents: 2500 }).expect(201);

    const raised = (await page(token)).body;
    expect(raised.approval.status).toBe('needs_reapproval');
    expect(raised.approval.canDecide).toBe(true);
    expect(raised.approval.approved).toMatchObject({ totalCents: first.estimate.totalCents, version: first.estimate.version });
    expect(raised.estimate.totalCents).toBeGreaterThan(first.estimate.totalCents);
    expect(raised.estimate.version).toBe(first.estimate.version + 1);

    await decide(token, { decision: 'approved', name: 'Tamsin Ordway', estimateVersion: raised.estimate.version }).expect(200);
    const decisions = await EstimateDecision.findAll({ where: { jobId: job.id }, order: [['decidedAt', 'ASC']] });
    expect(decisions.map((d) => [d.totalCents, d.estimateVersion])).toEqual([
      [first.estimate.totalCents, first.estimate.version],
      [raised.estimate.totalCents, raised.estimate.version],
    ]);
    expect((await Job.findByPk(job.id))!.approvedTotalCents).toBe(raised.estimate.totalCents);
  });

  it('keeps the desk’s phone approval as one more way, with its own decision row', async () => {
    const { job } = await assessedJob();
    await request(app).post(`/api/jobs/${job.id}/approval`).set('Cookie', desk()).set('Origin', origin())
      .send({ approvedByName: 'Tamsin Ordway', method: 'phone' }).expect(200);
    const [decision] = await EstimateDecision.findAll({ where: { jobId: job.id } });
    expect(decision).toMatchObject({ decision: 'approved', method: 'phone', recordedByUserId: w.people.front_desk.id });
    // the desk cannot claim the customer used the link
    await request(app).post(`/api/jobs/${job.id}/approval`).set('Cookie', desk()).set('Origin', origin())
      .send({ approvedByName: 'Tamsin Ordway', method: 'link' }).expect(400);
  });

  it('is made and revoked by the front desk, not by a technician', async () => {
    const { job } = await assessedJob();
    // moving to Assessed e-mailed the estimate with a link of its own
    const before = await CustomerLink.count({ where: { jobId: job.id, revokedAt: null } });
    await request(app).post(`/api/jobs/${job.id}/customer-link`).set('Cookie', w.cookies.technician).set('Origin', origin()).send({}).expect(403);
    await request(app).delete(`/api/jobs/${job.id}/customer-link`).set('Cookie', w.cookies.technician).set('Origin', origin()).expect(403);
    expect(await CustomerLink.count({ where: { jobId: job.id, revokedAt: null } })).toBe(before);
  });

  it('is rate limited per address', async () => {
    const limited = buildApp({ rateLimits: { ...config.rateLimits, namespace: `test-${uniq()}`, customerLinks: 3 } });
    const token = randomBytes(32).toString('base64url');
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await request(limited).get(`/api/public/jobs/${token}`)).status);
    expect(statuses).toEqual([404, 404, 404, 429]);
  });

  it('shows a school’s purchase order and tax-exempt certificate on its estimate', async () => {
    await Customer.update({ poNumber: 'PO-2027-0412', taxExemptCertificate: 'TX-EX-88120' }, { where: { id: w.customer.id } });
    const { job } = await assessedJob();
    const body = (await page(await linkFor(job.id))).body;
    expect(body.estimate).toMatchObject({ poNumber: 'PO-2027-0412', taxExemptCertificate: 'TX-EX-88120' });
    await Customer.update({ poNumber: null, taxExemptCertificate: null }, { where: { id: w.customer.id } });
  });
});
