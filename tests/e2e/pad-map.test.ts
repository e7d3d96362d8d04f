import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Instrument, Job, PadMap, Part, Shop, StockReservation, User } from '../../server/lib/models.js';
import { mkdirSync } from 'node:fs';
import { uniq } from '../helpers/factories.js';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';

/**
 * A technician repads an alto saxophone: fills the pad map with the keyboard alone (Enter down a
 * column, Tab along a row, units typed inline, Ctrl+S to save), sees each result and warning as
 * they type, and after saving sees the parts list with its reservation at the shop.
 */
describe('browser: pad map for an alto saxophone, by keyboard', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  let jobId: string;
  let jobNumber: number;
  let shopId: string;
  let networkId: string;

  beforeAll(async () => {
    ({ networkId } = await loadDemoNetwork());
    const portland = await Shop.findOne({ where: { networkId, code: 'PDX' } });
    shopId = portland!.id;
    const tech = await User.findOne({ where: { networkId, email: demoPeople[3].email } });
    const instrument = await Instrument.create({
      networkId, family: 'alto_saxophone', maker: 'Aldmoor', model: 'Fenlark Alto', serial: `AB-E2E ${uniq()}`, ownerKind: 'rental_fleet', currentShopId: shopId,
    });
    jobNumber = 700_000 + Math.floor(Math.random() * 99_000);
    const job = await Job.create({
      networkId, number: jobNumber, instrumentId: instrument.id, shopId, stage: 'on_bench', complaint: 'Full repad', openedByUserId: tech!.id, assignedUserId: tech!.id,
    });
    jobId = job.id;
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await closeServerResources();
  });

  /** Types into the focused cell and moves on with a key, as a technician at the bench would. */
  async function enter(page: Page, text: string, then: 'Enter' | 'Tab' | 'Shift+Enter' | null = 'Enter') {
    await page.keyboard.type(text);
    if (then) await page.keyboard.press(then);
  }

  it('fills cups down the column, sees results and warnings live, saves with Ctrl+S and gets the parts reserved', async () => {
    const page = await browser.newPage({ viewport: { width: 1400, height: 1000 } });
    await signInInBrowser(page, app.url, new RegExp(demoPeople[3].name));
    // a shared, busy machine can be slow to draw; the steps below still wait for what a person would see
    page.setDefaultTimeout(60_000);
    await page.goto(`${app.url}/jobs/${jobId}/pad-map?shop=${shopId}`);
    await page.getByRole('heading', { name: `Pad map · Job ${jobNumber}` }).waitFor();

    // the safety cautions stand in the glue-only-the-stem step
    const checklist = page.getByRole('region', { name: 'Install checklist' });
    await checklist.getByText('Glue only the stem').waitFor();
    const safety = checklist.getByRole('note', { name: 'Safety cautions' });
    expect(await safety.innerText()).toMatch(/Cyanoacrylate[\s\S]*ventilate[\s\S]*safety data sheet, local codes and licensed practice/i);

    // the first cell gets the focus once; everything after is the keyboard
    await page.getByLabel('Low B♭ cup diameter').focus();
    await enter(page, '45.8'); // Low B♭
    await enter(page, '45.9'); // Low B
    await enter(page, '1.200in'); // Low C♯, typed in inches
    await enter(page, '30.5', null); // Low C
    for (let i = 0; i < 3; i++) await page.keyboard.press('Shift+Enter'); // back up to Low B♭
    await page.keyboard.press('Tab'); // → depth
    await enter(page, '4.5');
    await enter(page, '4.5');
    await enter(page, '3.5');
    await enter(page, '4', 'Tab'); // Low C depth → Low C rim
    await enter(page, '30.2', null); // a rim wider than the pad would be

    // live preview: the inch reading is shown in millimetres, and the pads are chosen
    await page.getByText('= 30.480 mm').waitFor();
    const row = (name: string) => page.locator('tr', { has: page.getByLabel(`${name} cup diameter`, { exact: true }) });
    expect(await row('Low C♯').locator('[data-result="pad"]').innerText()).toContain('30.0 mm');
    expect(await row('Low B♭').locator('[data-result="pad"]').innerText()).toContain('45.5 mm');
    // the warning sits beside the rim cell that causes it, and is tied to it for screen readers
    const rim = page.getByLabel('Low C tone-hole rim diameter');
    expect(await rim.getAttribute('aria-invalid')).toBe('true');
    await row('Low C').getByText(/does not cover the 30\.20 mm tone-hole rim/).waitFor();

    // fix the reading: the cell's text is replaced by typing over it
    await page.keyboard.press('Control+A');
    await enter(page, '28', null);
    await page.waitForFunction(() => !document.querySelector('[aria-invalid="true"]'));

    await page.keyboard.press('Control+S');
    await page.getByRole('status').filter({ hasText: /^Saved · 4 pads reserved/ }).waitFor();

    const parts = page.getByRole('region', { name: 'Parts list' });
    await parts.locator('[data-part="PAD-S-30.0"]').getByText('Reserved 2').waitFor(); // Low C♯ and Low C
    await parts.locator('[data-part="PAD-S-45.5"]').getByText('Reserved 2').waitFor(); // Low B♭ and Low B
    expect(await parts.innerText()).toMatch(/Self-leveling 45\.5 mm[\s\S]*Low B♭, Low B/);
    expect(await parts.locator('[data-labor]').innerText()).toMatch(/2 h estimated for 4 keys repadded: 1.5 h base \+ 0.25 h per key \(4 self-leveling at 50 %\)/); // 1.5 + 0.25 × 4 × 0.5 = 2 h

    const stored = await PadMap.findOne({ where: { networkId, jobId } });
    expect(stored!.entries.filter((e) => e.cupDiameterMm != null)).toHaveLength(4);
    const sl30 = await Part.findOne({ where: { networkId, sku: 'PAD-S-30.0' } });
    const held = await StockReservation.findOne({ where: { networkId, jobId, partId: sl30!.id, releasedAt: null } });
    expect(held!.quantity).toBe(2);
    await page.close();
  }, 240_000);
  it('on a phone: one card per key with its result beside its readings, no sideways scroll, the Save bar covers nothing; at 1280 px no sideways scroll', async () => {
    mkdirSync(SHOTS, { recursive: true });
    const tech = await User.findOne({ where: { networkId, email: demoPeople[3].email } });
    const instrument = await Instrument.create({
      networkId, family: 'alto_saxophone', maker: 'Aldmoor', model: 'Fenlark Alto', serial: `AB-PHONE ${uniq()}`, ownerKind: 'rental_fleet', currentShopId: shopId,
    });
    const number = 800_000 + Math.floor(Math.random() * 99_000);
    const job = await Job.create({
      networkId, number, instrumentId: instrument.id, shopId, stage: 'on_bench', complaint: 'Repad', openedByUserId: tech!.id, assignedUserId: tech!.id,
    });
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[3].name));
    page.setDefaultTimeout(60_000);
    await page.goto(`${app.url}/jobs/${job.id}/pad-map?shop=${shopId}`);
    await page.getByRole('heading', { name: `Pad map · Job ${number}` }).waitFor();

    const card = (name: string) => page.locator('[data-key-card]', { has: page.getByLabel(`${name} cup diameter`, { exact: true }) });
    await card('Low C').getByLabel('Low C cup diameter', { exact: true }).fill('30.5');
    await card('Low C').getByLabel('Low C cup depth', { exact: true }).fill('4');
    await card('Low C').getByLabel('Low C tone-hole rim diameter', { exact: true }).fill('30.2');
    await card('Low B♭').getByLabel('Low B♭ cup diameter', { exact: true }).fill('45.8');
    await card('Low B♭').getByLabel('Low B♭ cup depth', { exact: true }).fill('4.5');
    await card('Low C').getByText(/does not cover the 30\.20 mm tone-hole rim/).waitFor();

    // the page is no wider than the phone
    const width = await page.evaluate(() => document.documentElement.scrollWidth);
    expect(width).toBeLessThanOrEqual(390);
    // the result of a key is in its own card, in view next to its readings
    const result = card('Low B♭').locator('[data-result="pad"]');
    expect(await result.innerText()).toContain('45.5 mm');
    const box = await result.boundingBox();
    expect(box!.x).toBeGreaterThanOrEqual(0);
    expect(box!.x + box!.width).toBeLessThanOrEqual(390);
    // the parts list is on the screen too
    const parts = page.getByRole('region', { name: 'Parts list' });
    const partsBox = await parts.boundingBox();
    expect(partsBox!.x + partsBox!.width).toBeLessThanOrEqual(390);

    // the Save bar never lies over a warning, wherever the page is scrolled
    const warning = card('Low C').getByText(/does not cover the 30\.20 mm tone-hole rim/);
    await warning.scrollIntoViewIfNeeded();
    for (const scroll of [0, 300, 600, 900]) {
      await page.evaluate((y) => window.scrollTo(0, y), scroll);
      const overlaps = await page.evaluate(() => {
        const bar = document.querySelector('[data-save-bar]')!.getBoundingClientRect();
        return [...document.querySelectorAll('[data-key-card] li')].some((li) => {
          const r = li.getBoundingClientRect();
          return r.bottom > bar.top && r.top < bar.bottom && r.right > bar.left && r.left < bar.right;
        });
      });
      expect(overlaps).toBe(false);
    }
    await warning.scrollIntoViewIfNeeded();
    await page.screenshot({ path: `${SHOTS}/pad-map-390.png`, fullPage: true });

    // a desktop: the table, and still nothing scrolls sideways
    await page.setViewportSize({ width: 1280, height: 900 });
    await page.locator('table').first().waitFor();
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(1280);
    const sheet = page.locator('[data-print="sheet"]');
    const sheetSize = await sheet.evaluate((el) => ({ scrollWidth: el.scrollWidth, clientWidth: el.clientWidth }));
    expect(sheetSize.scrollWidth, `the table needs ${sheetSize.scrollWidth} px of ${sheetSize.clientWidth}`).toBeLessThanOrEqual(sheetSize.clientWidth);
    await page.screenshot({ path: `${SHOTS}/pad-map-1280.png`, fullPage: true });
    await context.close();
  }, 240_000);
});
