import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { listCaughtMail, waitForMail, type CaughtMail } from '../../../server/lib/mail.js';
import { Customer, Job, sequelize } from '../../../server/lib/models.js';
import { noticeCustomerOfTransfer, sendPickupReminders } from '../../../server/modules/jobs/service.js';
import { startWorker } from '../../../workers/processors.js';
import { closeServerResources } from '../../helpers/close.js';
import { pdfText, waitForIdleQueue } from '../../helpers/transfers.js';
import { makeInstrumentWithJob, uniq } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';

/**
 * A customer's e-mails, counted at the mail catcher: the estimate with its PDF and link (always), and the
 * notices they may turn off — sent to another shop, ready to collect, and a reminder after 7 days.
 */
describe('customer notices at the mail catcher', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let worker: ReturnType<typeof startWorker>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'technician']);
    worker = startWorker(2);
    await waitForIdleQueue();
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  const origin = () => process.env.APP_ORIGIN!;
  const post = (path: string, body: object = {}) => request(app).post(path).set('Cookie', w.cookies.front_desk).set('Origin', origin()).send(body);

  /** A customer of their own (each test counts its own mail), and a job of theirs. */
  async function customerJob(stage: 'intake' | 'quality_check' | 'approved' = 'intake', over: Partial<{ noticesOptOut: boolean }> = {}) {
    const customer = await Customer.create({
      networkId: w.network.id, kind: 'school', name: `Quarry Hill School ${uniq()}`, contactName: 'Odile Brandt, band director',
      email: `band-${uniq()}@quarryhill.school.test`, homeShopId: w.shop.id, ...over,
    });
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage });
    await job.update({ customerId: customer.id, pickupShopId: w.shop.id, assignedUserId: w.people.technician.id });
    return { customer, job };
  }

  const mailTo = async (email: string) => (await listCaughtMail()).filter((m) => m.to.includes(email));
  /** Waits until exactly `count` messages matching reached the catcher, then a moment more to catch an extra one. */
  async function expectCount(email: string, match: (m: CaughtMail) => boolean, count: number) {
    if (count > 0) await waitForMail((m) => m.to.includes(email) && match(m) && true, { timeoutMs: 20_000 });
    await waitForIdleQueue();
    expect((await mailTo(email)).filter(match)).toHaveLength(count);
  }

  it('sends the estimate with a PDF (shop, lines, tax, total, what approval means) and a link; Send estimate sends it again with a new link', async () => {
    const { customer, job } = await customerJob();
    await customer.update({ poNumber: 'PO-7781', taxExemptCertificate: 'EX-4410' });
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Octave key pad', quantity: 2, unitPriceCents: 1250 }).expect(201);
    await post(`/api/jobs/${job.id}/stage`, { to: 'assessed' }).expect(200);
    const isEstimate = (m: CaughtMail) => m.subject.startsWith(`Estimate for job ${job.number} awaits your approval`);
    await expectCount(customer.email!, isEstimate, 1);
    const [mail] = (await mailTo(customer.email!)).filter(isEstimate);
    expect(mail.text).toContain('Purchase order: PO-7781');
    expect(mail.text).toContain('Tax-exempt certificate: EX-4410');
    const pdf = Buffer.from(mail.attachments!.find((a) => a.contentType === 'application/pdf')!.contentBase64, 'base64');
    const text = (await pdfText(pdf)).replace(/\s+/g, ' ');
    // 2 × $12.50 = $25.00, 10 % tax (the bench world's rate) $2.50, total $27.50
    for (const expected of [w.shop.name, 'Octave key pad', '$25.00', '$2.50', '$27.50', 'What approving means', 'PO-7781', 'EX-4410']) {
      expect(text).toContain(expected);
    }
    const firstLink = /\/c\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];

    await post(`/api/jobs/${job.id}/estimate/send`).expect(200);
    await expectCount(customer.email!, isEstimate, 2);
    const links = (await mailTo(customer.email!)).filter(isEstimate).map((m) => /\/c\/([A-Za-z0-9_-]{43})/.exec(m.text)![1]);
    expect(new Set(links).size).toBe(2);
    expect(links).toContain(firstLink);
    // both still open the page
    for (const token of links) await request(app).get(`/api/public/jobs/${token}`).expect(200);
  });

  it('asks again when a change raises the total above the approved amount, once, naming both amounts', async () => {
    const { customer, job } = await customerJob();
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Neck cork', quantity: 1, unitPriceCents: 1800 }).expect(201);
    await post(`/api/jobs/${job.id}/stage`, { to: 'assessed' }).expect(200);
    await post(`/api/jobs/${job.id}/approval`, { approvedByName: 'Odile Brandt', method: 'phone' }).expect(200);
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Thumb rest', quantity: 1, unitPriceCents: 900 }).expect(201);
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Guard felt', quantity: 1, unitPriceCents: 300 }).expect(201);
    const isRaise = (m: CaughtMail) => m.subject.startsWith(`Estimate for job ${job.number} has risen`);
    await expectCount(customer.email!, isRaise, 1);
    const [mail] = (await mailTo(customer.email!)).filter(isRaise);
    // approved $18.00 + 10 % = $19.80; after the thumb rest $27.00 + 10 % = $29.70
    expect(mail.text).toContain('You approved $19.80 (version 1)');
    expect(mail.text).toContain('is now $29.70 (version 2)');
  });

  it('tells the customer it went to another shop, and is ready at which shop, with opening days', async () => {
    const { customer, job } = await customerJob('quality_check');
    await sequelize.transaction((t) => noticeCustomerOfTransfer(job, w.otherShop.name, `transfer-${uniq()}`, t));
    const isTransfer = (m: CaughtMail) => m.subject.includes(`going to our ${w.otherShop.name} shop — job ${job.number}`);
    await expectCount(customer.email!, isTransfer, 1);
    const [moved] = (await mailTo(customer.email!)).filter(isTransfer);
    expect(moved.text).toContain(`You still collect it at ${w.shop.name}`);

    await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', w.cookies.technician).set('Origin', origin()).send({ to: 'ready' }).expect(200);
    const isReady = (m: CaughtMail) => m.subject.includes(`is ready — job ${job.number}`);
    await expectCount(customer.email!, isReady, 1);
    const [ready] = (await mailTo(customer.email!)).filter(isReady);
    expect(ready.text).toContain(`ready to collect at ${w.shop.name}`);
    expect(ready.text).toContain('Open Mon–Fri');
  });

  it('reminds once after 7 days uncollected, not before, however often the sweep runs', async () => {
    const { customer, job } = await customerJob('quality_check');
    await job.update({ stage: 'ready', readyAt: new Date(Date.now() - 8 * 86_400_000) });
    const { customer: recent, job: recentJob } = await customerJob('quality_check');
    await recentJob.update({ stage: 'ready', readyAt: new Date(Date.now() - 6 * 86_400_000) });
    await sendPickupReminders();
    await sendPickupReminders();
    const isReminder = (m: CaughtMail) => m.subject.startsWith('Reminder: your');
    await expectCount(customer.email!, isReminder, 1);
    expect((await mailTo(customer.email!)).find(isReminder)!.text).toContain('ready to collect for 8 days');
    await expectCount(recent.email!, isReminder, 0);
  });

  it('sends no notices to a customer who opted out, but still asks for approval', async () => {
    const { customer, job } = await customerJob('intake', { noticesOptOut: true });
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Spring set', quantity: 1, unitPriceCents: 1200 }).expect(201);
    await post(`/api/jobs/${job.id}/stage`, { to: 'assessed' }).expect(200);
    await sequelize.transaction((t) => noticeCustomerOfTransfer(job, w.otherShop.name, `transfer-${uniq()}`, t));
    await Job.update({ stage: 'ready', readyAt: new Date(Date.now() - 9 * 86_400_000) }, { where: { id: job.id } });
    await sendPickupReminders();
    await expectCount(customer.email!, (m) => m.subject.includes('awaits your approval'), 1);
    await expectCount(customer.email!, () => true, 1);
  });

  it('lets the front desk record the purchase order, certificate and the opt-out on the job’s customer', async () => {
    const { customer, job } = await customerJob();
    const res = await request(app).patch(`/api/jobs/${job.id}/customer`).set('Cookie', w.cookies.front_desk).set('Origin', origin())
      .send({ poNumber: 'PO-1200', taxExemptCertificate: 'EX-77', noticesOptOut: true }).expect(200);
    expect(res.body.customer).toMatchObject({ poNumber: 'PO-1200', taxExemptCertificate: 'EX-77', noticesOptOut: true });
    expect(await Customer.findByPk(customer.id)).toMatchObject({ poNumber: 'PO-1200', taxExemptCertificate: 'EX-77', noticesOptOut: true });
    await request(app).patch(`/api/jobs/${job.id}/customer`).set('Cookie', w.cookies.technician).set('Origin', origin()).send({ noticesOptOut: false }).expect(403);
    expect((await Customer.findByPk(customer.id))!.noticesOptOut).toBe(true);
  });
});
