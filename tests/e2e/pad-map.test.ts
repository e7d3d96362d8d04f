import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Instrument, Job, PadMap, Part, Shop, StockReservation, User } from '../../server/lib/models.js';
import { uniq } from '../helpers/factories.js';

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
      networkId, family: 'alto_saxophone', maker: 'Aldmoor', model: 'AS-300', serial: `AB-E2E ${uniq()}`, ownerKind: 'rental_fleet', currentShopId: shopId,
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
    const safety = checklist.getByRole('complementary', { name: 'Safety cautions' });
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
});
