import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { mkdirSync } from 'node:fs';
import type { Browser, BrowserContext } from 'playwright-core';
import { buildApp } from '../../server/app.js';
import { waitForMail } from '../../server/lib/mail.js';
import { EstimateDecision, Job } from '../../server/lib/models.js';
import { startWorker } from '../../workers/processors.js';
import { launchBrowser, startAppServer } from '../helpers/browser.js';
import { describeViolations, seriousViolations } from '../helpers/axe.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob, uniq } from '../helpers/factories.js';
import { waitForIdleQueue } from '../helpers/transfers.js';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';

/**
 * In Chromium on a 390 px phone: the customer opens the link from the caught estimate e-mail, reads the
 * estimate and approves it with their name; a revoked link and another job's decision stay out of reach.
 */
describe('browser: the customer approves the estimate from the e-mailed link', () => {
  const api = buildApp();
  let browser: Browser;
  let server: { url: string; close(): Promise<void> };
  let worker: ReturnType<typeof startWorker>;
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let phone: BrowserContext;

  beforeAll(async () => {
    mkdirSync(SHOTS, { recursive: true });
    w = await makeBenchWorld(api, ['front_desk']);
    server = await startAppServer();
    worker = startWorker(2);
    await waitForIdleQueue();
    browser = await launchBrowser();
    phone = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true, bypassCSP: true });
  });

  afterAll(async () => {
    await phone?.close();
    await browser?.close();
    await worker?.close();
    await server?.close();
    await closeServerResources();
  });

  const origin = () => process.env.APP_ORIGIN!;

  /** A job assessed by the front desk through the API: the move e-mails the estimate with its link. */
  async function assessedJob() {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake', serial: `ZB-${uniq()}-4821` });
    await job.update({ customerId: w.customer.id, promisedOn: '2027-04-13' });
    const post = (path: string, body: object) => request(api).post(path).set('Cookie', w.cookies.front_desk).set('Origin', origin()).send(body);
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'labor', catalogItemId: w.catalog.repadAlto.id }).expect(201);
    await post(`/api/jobs/${job.id}/line-items`, { kind: 'part', description: 'Glued pad set, alto', quantity: 1, unitPriceCents: 6450 }).expect(201);
    await post(`/api/jobs/${job.id}/stage`, { to: 'assessed' }).expect(200);
    const mail = await waitForMail((m) => m.to.includes(w.customer.email!) && m.subject.includes(`job ${job.number} awaits your approval`), { timeoutMs: 20_000 });
    const link = /(http:\/\/\S+\/c\/[A-Za-z0-9_-]{43})/.exec(mail.text)?.[1];
    expect(link).toBeTruthy();
    const pdf = mail.attachments?.find((a) => a.contentType === 'application/pdf');
    expect(pdf?.filename).toBe(`estimate-job-${job.number}-v2.pdf`);
    expect(Buffer.from(pdf!.contentBase64, 'base64').subarray(0, 5).toString()).toBe('%PDF-');
    return { job, link: link! };
  }

  it('opens the caught link at 390 px, passes axe, and approves with the typed name', async () => {
    const { job, link } = await assessedJob();
    expect(link.startsWith(server.url)).toBe(true);
    const page = await phone.newPage();
    page.setDefaultTimeout(30_000);
    await page.goto(link);
    await page.getByRole('heading', { name: /Alto saxophone/ }).waitFor();
    await page.getByText('The estimate below waits for your answer').waitFor();
    // $540.00 labour (6 h at $90.00, the bench world's rate) + $64.50 part = $604.50, 10 % tax $60.45: $664.95
    expect(await page.locator('[data-estimate-total]').innerText()).toBe('$664.95');
    expect(await page.getByText('Tue 13 Apr 2027').count()).toBe(1);
    // nothing overflows the phone's width
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    const violations = await seriousViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await page.screenshot({ path: `${SHOTS}/customer-link-390.png`, fullPage: true });

    // no name, no answer
    await page.getByRole('button', { name: 'Approve $664.95' }).click();
    await page.getByText('Type your full name.').waitFor();
    expect(await EstimateDecision.count({ where: { jobId: job.id } })).toBe(0);

    await page.getByLabel('Your full name').fill('Tamsin Ordway');
    await page.getByRole('button', { name: 'Approve $664.95' }).click();
    await page.locator('[data-approval-status="approved"]').waitFor();
    await page.getByText('The estimate is approved.').waitFor();
    await page.screenshot({ path: `${SHOTS}/customer-link-approved-390.png`, fullPage: true });

    const decision = await EstimateDecision.findOne({ where: { jobId: job.id } });
    expect(decision).toMatchObject({ decision: 'approved', method: 'link', name: 'Tamsin Ordway', totalCents: 66495, estimateVersion: 2 });
    expect((await Job.findByPk(job.id))!.stage).toBe('approved');
    await page.close();
  });

  it('declines from the link, and a revoked link opens nothing', async () => {
    const { job, link } = await assessedJob();
    const page = await phone.newPage();
    page.setDefaultTimeout(30_000);
    await page.goto(link);
    await page.getByLabel('Your full name').fill('Tamsin Ordway');
    await page.getByRole('button', { name: 'Decline' }).click();
    await page.locator('[data-approval-status="declined"]').waitFor();
    expect(await EstimateDecision.count({ where: { jobId: job.id, decision: 'declined' } })).toBe(1);
    expect((await Job.findByPk(job.id))!.stage).toBe('assessed');

    await request(api).delete(`/api/jobs/${job.id}/customer-link`).set('Cookie', w.cookies.front_desk).set('Origin', origin()).expect(200);
    await page.reload();
    await page.getByRole('heading', { name: 'This link cannot be opened' }).waitFor();
    expect(await page.getByText('Alto saxophone').count()).toBe(0);
    await page.screenshot({ path: `${SHOTS}/customer-link-revoked-390.png`, fullPage: true });
    await page.close();
  });
});
