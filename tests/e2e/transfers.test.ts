import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import type { Worker } from 'bullmq';
import { mkdirSync } from 'node:fs';
import { Op } from 'sequelize';
import { HistoryEvent, Instrument, Job, RelayRun, Shop, Skill, Transfer, User } from '../../server/lib/models.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { startWorker } from '../../workers/processors.js';
import { launchBrowser, signInInBrowser, startAppServer } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { uniq } from '../helpers/factories.js';
import type { IsoWeekday } from '../../shared/domain.js';
import { waitForIdleQueue } from '../helpers/transfers.js';

/**
 * The regional manager requests a transfer of a baritone saxophone from Seattle, approves it from the
 * approvals queue, packs it (after the lifting caution), hands it over and receives it at Portland,
 * following it on the way; the worker runs in this process.
 *
 * The Seattle → Portland relay run is set, for this test, to leave only two days from today (Pacific) at
 * 07:30 and take 3 h. A hand-over today therefore waits for that run: the screen must show the run's
 * departure two days on at 07:30, not the hand-over time + 3 h.
 */
const SHOTS = '/tmp/shots-domain';
const PACIFIC = 'America/Los_Angeles';

/** Today's calendar date in Los Angeles + `days`, as a UTC-noon Date (only its calendar fields are read). */
function pacificDatePlus(days: number): Date {
  const [y, m, d] = new Intl.DateTimeFormat('en-CA', { timeZone: PACIFIC, year: 'numeric', month: '2-digit', day: '2-digit' })
    .format(new Date())
    .split('-')
    .map(Number);
  return new Date(Date.UTC(y, m - 1, d + days, 12));
}
const WEEKDAYS = ['Sun', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat'];
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];
/** "Tue 8 Dec 2026", spelled out here by hand rather than with the app's formatter. */
const dayLabel = (d: Date) => `${WEEKDAYS[d.getUTCDay()]} ${d.getUTCDate()} ${MONTHS[d.getUTCMonth()]} ${d.getUTCFullYear()}`;
describe('browser: a regional manager sends a baritone saxophone to another shop', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  let worker: Worker;
  let serial: string;
  let jobNumber: number;
  let networkId: string;
  const shops: Record<string, Shop> = {};
  let runDay: Date;
  let testRun: RelayRun;
  let pausedRunIds: string[] = [];

  beforeAll(async () => {
    ({ networkId } = await loadDemoNetwork());
    for (const s of await Shop.findAll({ where: { networkId } })) shops[s.code] = s;
    const lowSax = (await Skill.findOne({ where: { networkId, code: 'low_sax' } }))!;
    // a fresh baritone at Seattle, so the test owns its rows
    serial = `AB-9${uniq().slice(0, 5).toUpperCase()} 9`;
    const manager = (await User.findOne({ where: { networkId, email: demoPeople[1].email } }))!;
    const instrument = await Instrument.create({
      networkId, family: 'baritone_saxophone', maker: 'Aldmoor', model: 'Fenlark Baritone', serial, ownerKind: 'rental_fleet', currentShopId: shops.SEA.id,
    });
    // the next job number of the demo network: other browser tests open jobs there too
    const number = ((await Job.max<number, Job>('number', { where: { networkId } })) ?? 1000) + 1;
    const job = await Job.create({
      networkId, number, instrumentId: instrument.id, shopId: shops.SEA.id, stage: 'assessed', openedByUserId: manager.id,
      requiredSkillId: lowSax.id, estimatedHours: 10, complaint: 'Low B-flat pad leaks; bow guard rattles.',
    });
    // as the front desk's intake writes it, so the instrument's timeline starts where a real one does
    await HistoryEvent.bulkCreate([
      { networkId, instrumentId: instrument.id, jobId: job.id, shopId: shops.SEA.id, userId: manager.id, kind: 'intake', summary: `Checked in at Seattle: ${job.complaint}` },
      { networkId, instrumentId: instrument.id, jobId: job.id, shopId: shops.SEA.id, userId: manager.id, kind: 'job_opened', summary: `Job ${number} opened at Seattle` },
    ]);
    jobNumber = job.number;

    // the only Seattle → Portland run leaves two days from today at 07:30 Pacific and takes 3 h
    runDay = pacificDatePlus(2);
    const isoWeekday = (runDay.getUTCDay() === 0 ? 7 : runDay.getUTCDay()) as IsoWeekday;
    const existing = await RelayRun.findAll({ where: { networkId, fromShopId: shops.SEA.id, toShopId: shops.PDX.id, active: true } });
    pausedRunIds = existing.map((r) => r.id);
    await RelayRun.update({ active: false }, { where: { networkId, id: { [Op.in]: pausedRunIds } } });
    testRun = await RelayRun.create({
      networkId, fromShopId: shops.SEA.id, toShopId: shops.PDX.id, weekdays: [isoWeekday], departureTime: '07:30:00', transitHours: 3,
    });
    mkdirSync(SHOTS, { recursive: true });
    worker = startWorker(4);
    await waitForIdleQueue();
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    // the demo network's runs as they were, for the browser tests after this one (the test's run stays,
    // inactive: the transfer names it)
    await testRun?.update({ active: false });
    if (pausedRunIds.length) await RelayRun.update({ active: true }, { where: { networkId, id: { [Op.in]: pausedRunIds } } });
    await browser?.close();
    await app?.close();
    await worker?.close();
    await closeServerResources();
  });

  it('requests with the ranked recommendation, approves, packs, hands over and receives', { timeout: 120_000 }, async () => {
    const page = await browser.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[1].name));
    // after the sign-in, which sets its own default: a loaded machine may need the longer wait
    page.setDefaultTimeout(30_000);

    // Seattle, then Transfers → Request a transfer
    await page.getByLabel('Shop').selectOption(shops.SEA.id);
    await page.waitForURL((u) => u.searchParams.get('shop') === shops.SEA.id);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Transfers' }).click();
    await page.getByRole('heading', { level: 1, name: 'Transfers' }).waitFor();
    await page.getByRole('link', { name: 'Request a transfer' }).click();

    // pick the job from Seattle's open jobs
    const jobSelect = page.getByLabel('Job', { exact: true });
    const option = await jobSelect.locator('option', { hasText: serial }).getAttribute('value');
    await jobSelect.selectOption(option);
    await page.getByRole('button', { name: 'Show where it could go' }).click();

    // the ranking: Portland recommended, with its reasons; the caution for a heavy case
    const portland = page.getByRole('radio', { name: /Harborline Portland/ });
    await portland.waitFor();
    expect(await portland.isChecked()).toBe(true);
    await page.getByText('Recommended', { exact: true }).waitFor();
    const why = page.getByRole('list', { name: 'Why Harborline Portland' });
    // the Seattle → Portland relay run is named, as the way chosen or, on days a road trip finishes sooner, as the slower way
    expect(await why.innerText()).toMatch(/Next relay run leaves Harborline Seattle|The next relay run would arrive/);
    expect(await page.getByRole('list', { name: 'Why Harborline Chicago' }).innerText()).toMatch(/great-circle/);
    await page.getByRole('note', { name: 'Lifting caution' }).first().waitFor();
    expect(await page.getByLabel('Reason').inputValue()).toMatch(/Harborline Portland would finish it soonest/);
    await page.getByRole('button', { name: 'Request transfer' }).click();

    // the transfer page; the request is recorded by the worker
    await page.getByRole('heading', { level: 1, name: 'Baritone saxophone: Harborline Seattle → Harborline Portland' }).waitFor();
    await page.getByText(/Transfer requested: Harborline Seattle → Harborline Portland/).waitFor();
    const transfer = (await Transfer.findOne({ where: { networkId, fromShopId: shops.SEA.id }, order: [['createdAt', 'DESC']] }))!;
    expect(page.url()).toContain(`/transfers/${transfer.id}`);

    // the approvals queue
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Transfers' }).click();
    await page.getByRole('button', { name: 'Approvals' }).click();
    await page.getByRole('button', { name: `Approve transfer of job ${jobNumber}` }).click();
    // the worker approves it, and it leaves the queue
    await page.getByRole('button', { name: `Approve transfer of job ${jobNumber}` }).waitFor({ state: 'detached' });
    expect((await transfer.reload()).state).toBe('approved');
    await page.getByRole('button', { name: 'Outgoing' }).click();
    await page.getByRole('listitem').filter({ hasText: serial }).locator('[data-state="approved"]').waitFor();
    await page.goto(`${app.url}/transfers/${transfer.id}?shop=${shops.SEA.id}`);
    const main = page.getByRole('main');
    await main.locator('header').getByText('Approved', { exact: true }).waitFor();

    // pack: the caution must be confirmed first
    const pack = page.getByRole('region', { name: 'Pack for the relay run' });
    await pack.getByRole('note', { name: 'Lifting caution' }).waitFor();
    await pack.getByRole('button', { name: 'Mark as packed' }).click();
    await pack.getByText('Confirm you have read the lifting caution: two people or a cart.').waitFor();
    await pack.getByLabel(/I have read the lifting caution/).check();
    await pack.getByLabel('Number of cases').fill('2');
    await pack.getByLabel('Contents and accessories').fill('Bari in its case; neck, mouthpiece and strap in the second case');
    await pack.getByLabel('Condition on departure').fill('Low B-flat pad leaks; bow guard loose');
    await pack.getByRole('button', { name: 'Mark as packed' }).click();
    await main.locator('header').getByText('Packed', { exact: true }).waitFor();

    // meanwhile the job page says a transfer is open, and links to it
    await page.goto(`${app.url}/jobs/${transfer.jobId}?shop=${shops.SEA.id}`);
    const openNote = page.getByRole('status', { name: 'Open transfer' });
    await openNote.getByText(/A transfer from Harborline Seattle to Harborline Portland is packed/).waitFor();
    await openNote.getByRole('link', { name: 'Open the transfer' }).click();
    await page.waitForURL((u) => u.pathname === `/transfers/${transfer.id}`);

    // hand over today: it waits for the run two days on, 07:30 Pacific, and is expected at 10:30
    await page.getByRole('button', { name: 'Handed over to the courier' }).click();
    await main.locator('header').getByText('In transit', { exact: true }).waitFor();
    const details = page.getByRole('region', { name: 'Details' });
    await details.getByText('Waiting for the run of').waitFor();
    const detailsText = await details.innerText();
    expect(detailsText).toMatch(new RegExp(`Waiting for the run of\\s+${dayLabel(runDay)}, 07:30 P[SD]T`));
    expect(detailsText).toMatch(new RegExp(`Expected\\s+${dayLabel(runDay)}, 10:30 P[SD]T`));
    expect(detailsText).toMatch(/Cases\s+2/);
    await page.getByText(new RegExp(`Handed over for the relay run of ${dayLabel(runDay)}, 07:30 P[SD]T: Harborline Seattle → Harborline Portland`)).waitFor();
    expect((await Job.findOne({ where: { networkId, number: jobNumber } }))!.stage).toBe('in_transit');
    for (const width of [1280, 390]) {
      await page.setViewportSize({ width, height: 900 });
      await page.screenshot({ path: `${SHOTS}/transfer-in-transit-${width}.png`, fullPage: true });
      const overflow = await page.evaluate(() => document.documentElement.scrollWidth - document.documentElement.clientWidth);
      expect(overflow).toBeLessThanOrEqual(0);
    }
    await page.setViewportSize({ width: 1280, height: 900 });

    // the manifest opens: a PDF, stored at packing
    const manifest = await page.request.get(`${app.url}/api/transfers/${transfer.id}/manifest`);
    expect(manifest.status()).toBe(200);
    expect(manifest.headers()['content-type']).toBe('application/pdf');

    // the job page: on the relay run from Seattle to Portland, not "at Seattle"
    await page.goto(`${app.url}/jobs/${transfer.jobId}?shop=${shops.SEA.id}`);
    const onRun = page.getByRole('status', { name: 'Open transfer' });
    await onRun.getByText(new RegExp(`On the relay run from Harborline Seattle to Harborline Portland, leaving ${dayLabel(runDay)}, 07:30 P[SD]T, expected ${dayLabel(runDay)}, 10:30 P[SD]T`)).waitFor();
    for (const width of [1280, 390]) {
      await page.setViewportSize({ width, height: 900 });
      await page.screenshot({ path: `${SHOTS}/job-in-transit-${width}.png`, fullPage: true });
    }
    await page.setViewportSize({ width: 1280, height: 900 });
    // nor is the instrument "now at" Seattle on its registry page
    await page.goto(`${app.url}/registry/instruments/${transfer.instrumentId}?shop=${shops.SEA.id}`);
    await page.getByText(new RegExp(`Baritone saxophone, on the relay run from Harborline Seattle to Harborline Portland, expected ${dayLabel(runDay)}, 10:30 P[SD]T`)).waitFor();
    expect(await page.getByRole('main').innerText()).not.toContain('now at Harborline Seattle');
    await page.goto(`${app.url}/transfers/${transfer.id}?shop=${shops.SEA.id}`);
    await main.locator('header').getByText('In transit', { exact: true }).waitFor();

    // receive at Portland: a wrong serial is refused, the right one (typed loosely) accepted
    const receive = page.getByRole('region', { name: 'Receive' });
    await receive.getByLabel('Serial number on the instrument').fill('AB-000000 0');
    await receive.getByRole('button', { name: 'Confirm receipt' }).click();
    await receive.getByText('This is not the serial of the instrument on this transfer.').waitFor();
    await receive.getByLabel('Serial number on the instrument').fill(serial.toLowerCase().replace(/[- ]/g, ''));
    await receive.getByRole('button', { name: 'Confirm receipt' }).click();
    await main.locator('header').getByText('Received', { exact: true }).waitFor();

    // followed all the way: the timeline, the manifest, and the job now at Portland
    const timeline = page.getByRole('region', { name: 'Timeline' });
    await timeline.getByText(/Received: Harborline Seattle → Harborline Portland/).waitFor();
    for (const step of ['Transfer requested', 'Transfer approved', 'Packed for the relay run', 'Handed over for the relay run']) {
      expect(await timeline.innerText()).toContain(step);
    }
    const download = page.waitForEvent('download');
    await page.getByRole('link', { name: 'Download manifest (PDF)' }).click();
    expect((await download).suggestedFilename()).toBe(`transfer-job-${jobNumber}-manifest.pdf`);
    expect((await Job.findOne({ where: { networkId, number: jobNumber } }))!.shopId).toBe(shops.PDX.id);

    // and Portland's board shows it arrived
    await page.getByLabel('Shop').selectOption(shops.PDX.id);
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Transfers' }).click();
    await page.getByLabel('Show finished transfers too').check();
    const card = page.getByRole('listitem').filter({ hasText: serial });
    await card.locator('[data-state="received"]').waitFor();
    await page.close();
  });
});
