import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Shop, ShopClosingDay } from '../../server/lib/models.js';
import { mkdirSync } from 'node:fs';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';

/**
 * In Chromium at 390 px: the owner closes a shop for a day from the shop's screen, sees the public holidays
 * already counted beside it, and opens the shop again on that day after confirming.
 */
describe('browser: a shop’s closing days on a phone', () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };

  beforeAll(async () => {
    await loadDemoNetwork();
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
    await closeServerResources();
  });

  it('adds a closing day with its reason, lists the public holidays, and removes the day after a confirmation', async () => {
    const shop = (await Shop.findOne({ where: { name: 'Harborline Sacramento' }, order: [['createdAt', 'DESC']] }))!;
    await ShopClosingDay.destroy({ where: { networkId: shop.networkId, shopId: shop.id } });
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[0].name));
    await page.goto(`${app.url}/shops/${shop.id}`);
    const section = page.getByRole('region', { name: 'Closing days' });
    await section.getByText('No closing days set.').waitFor();
    // the shop is in California (US): Thanksgiving is a public holiday every year, within any 12 months
    expect(await section.getByRole('list', { name: 'Public holidays' }).getByText(/Thanksgiving/).count()).toBeGreaterThan(0);

    await section.getByLabel('Day', { exact: true }).fill('2030-08-16');
    await section.getByRole('button', { name: 'Add closing day' }).click();
    await section.getByText('Say why the shop is closed, e.g. Stocktake.').waitFor();
    await section.getByLabel('Reason', { exact: true }).fill('Stocktake');
    await section.getByRole('button', { name: 'Add closing day' }).click();
    const owned = section.getByRole('list', { name: 'Closing days set by the owner' });
    await owned.getByText('Stocktake').waitFor();
    expect(await owned.getByText('Fri 16 Aug 2030', { exact: true }).count()).toBe(1);
    expect((await ShopClosingDay.findAll({ where: { networkId: shop.networkId, shopId: shop.id } })).map((d) => d.date)).toEqual(['2030-08-16']);

    // nothing wider than the phone
    mkdirSync(SHOTS, { recursive: true });
    await section.screenshot({ path: `${SHOTS}/closing-days-390.png` });
    expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);

    page.once('dialog', (d) => void d.accept());
    await owned.getByRole('button', { name: /Remove/ }).click();
    await section.getByText('No closing days set.').waitFor();
    expect(await ShopClosingDay.count({ where: { networkId: shop.networkId, shopId: shop.id } })).toBe(0);
    await context.close();
  });
});
