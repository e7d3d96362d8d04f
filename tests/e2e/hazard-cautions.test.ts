import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdirSync } from 'node:fs';
import type { Browser } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { uniq } from '../helpers/factories.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Instrument, Job, JobLineItem, ServiceCatalogItem, Shop, User } from '../../server/lib/models.js';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';

/**
 * In Chromium at 390 px: a tuba dent job shows its cautions (lifting, soldering, abrasives) right under
 * "Start on bench", and intake shows the lifting caution as soon as the family is a heavy one.
 */
describe('browser: cautions at the step, on a phone', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  let shopId: string;
  let deskShopId: string;
  let jobId: string;
  let jobNumber: number;

  beforeAll(async () => {
    const { networkId } = await loadDemoNetwork();
    const portland = (await Shop.findOne({ where: { networkId, code: 'PDX' } }))!;
    shopId = portland.id;
    // the technician at Portland works the front desk at Seattle: intake happens there
    deskShopId = (await Shop.findOne({ where: { networkId, code: 'SEA' } }))!.id;
    const tech = (await User.findOne({ where: { networkId, email: demoPeople[3].email } }))!;
    const dent = (await ServiceCatalogItem.findOne({ where: { networkId, name: 'Dent removal — large brass' } }))!;
    const instrument = await Instrument.create({
      networkId, family: 'tuba', maker: 'Corvell Band Works', model: 'Thistlecombe Grand', serial: `CB-E2E ${uniq()}`, ownerKind: 'rental_fleet', currentShopId: shopId,
    });
    jobNumber = 800_000 + Math.floor(Math.random() * 99_000);
    const job = await Job.create({
      networkId, number: jobNumber, instrumentId: instrument.id, shopId, stage: 'approved', complaint: 'Bottom bow dent', openedByUserId: tech.id,
      assignedUserId: tech.id, estimateApprovedAt: new Date(), estimateApprovedByName: 'Band director', estimateApprovalMethod: 'phone',
    });
    await JobLineItem.create({ networkId, jobId: job.id, kind: 'labor', catalogItemId: dent.id, description: dent.name, hours: 3, rateCents: 8800 });
    jobId = job.id;
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await closeServerResources();
  });

  it('shows the job’s cautions beside Start on bench, and lifting at intake for a heavy case', async () => {
    mkdirSync(SHOTS, { recursive: true });
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[3].name));

    await page.goto(`${app.url}/jobs/${jobId}?shop=${shopId}`);
    const start = page.getByRole('button', { name: /Start on bench/ });
    await start.waitFor();
    const cautions = page.locator('#cautions-on_bench');
    await cautions.scrollIntoViewIfNeeded();
    const text = await cautions.innerText();
    expect(text).toMatch(/Before you start on the bench/);
    expect(text).toMatch(/torch[\s\S]*flux fumes[\s\S]*lead/);
    expect(text).toMatch(/Abrasive discs/);
    expect(text).toMatch(/two people or move it on a cart[\s\S]*manual-handling rules and local codes/);
    expect(text).toMatch(/safety data sheet, local codes and licensed practice/);
    // beside the action: directly under the button, in the same column
    const b = (await start.boundingBox())!;
    const c = (await cautions.boundingBox())!;
    expect(c.y).toBeGreaterThanOrEqual(b.y + b.height - 1);
    expect(c.y - (b.y + b.height)).toBeLessThan(40);
    expect(await start.getAttribute('aria-describedby')).toContain('cautions-on_bench');
    await page.locator('#cautions-on_bench').evaluate((el) => el.parentElement!.scrollIntoView());
    await page.screenshot({ path: `${SHOTS}/cautions-start-on-bench-390.png` });
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

    // My bench: the job with its hazards named
    await page.goto(`${app.url}/bench?shop=${shopId}`);
    const onBench = page.getByRole('note', { name: `Safety cautions for job ${jobNumber}` });
    await onBench.waitFor();
    expect(await onBench.innerText()).toMatch(/Soldering[\s\S]*Heavy lift/);

    // intake of a new bass saxophone: the lifting caution as soon as the family is chosen
    await page.goto(`${app.url}/intake?shop=${deskShopId}`);
    await page.getByRole('heading', { name: 'Which instrument?' }).waitFor();
    await page.getByRole('combobox', { name: /serial number/i }).fill(`BS-E2E-${Date.now() % 1_000_000}`);
    await page.getByText(/No instrument in the network matches/).waitFor();
    await page.getByRole('button', { name: /as a new instrument/ }).click();
    expect(await page.getByRole('note', { name: 'Lifting caution' }).count()).toBe(0);
    await page.getByLabel(/^Family/).selectOption('bass_saxophone');
    const lifting = page.getByRole('note', { name: 'Lifting caution' });
    await lifting.waitFor();
    expect(await lifting.innerText()).toMatch(/manual-handling rules and local codes/);
    await lifting.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SHOTS}/cautions-intake-heavy-390.png` });
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
    // an alto in a heavy case: the desk ticks the box and the caution stays
    await page.getByLabel(/^Family/).selectOption('alto_saxophone');
    await lifting.waitFor({ state: 'detached' });
    await page.getByRole('checkbox', { name: /Heavy case/ }).check();
    await page.getByRole('note', { name: 'Lifting caution' }).waitFor();
    await context.close();
  });
});
