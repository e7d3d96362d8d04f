import fs from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { describeViolations, seriousViolations } from '../helpers/axe.js';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';

/** The owner runs the network from the dashboard: overdue → the list → its CSV, and the screens pass axe-core. */
// a browser, a whole network's figures and three axe-core runs per test: more than the default 30 s on a shared machine
describe('browser: dashboard, overdue list, CSV export, accessibility', { timeout: 120_000 }, () => {
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

  it('the owner opens the dashboard, follows “overdue” to the list and exports it as CSV; axe-core finds nothing serious', async () => {
    const context = await browser.newContext({ acceptDownloads: true, viewport: { width: 1280, height: 900 }, bypassCSP: true });
    const page = await context.newPage();
    const owner = demoPeople[0];
    await signInInBrowser(page, app.url, new RegExp(owner.name));
    page.setDefaultTimeout(30_000);

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Dashboard' }).click();
    await page.getByRole('heading', { level: 1, name: 'Dashboard' }).waitFor();
    await page.getByRole('heading', { name: 'Open jobs by stage' }).waitFor();
    await page.getByRole('heading', { name: 'Weekly intake, last 52 weeks' }).waitFor();
    // the charts drew (recharts renders SVG bars) and their tables are there for screen readers
    await page.locator('.recharts-bar-rectangle').first().waitFor();
    expect(await page.getByRole('table', { name: 'Open jobs by stage, per shop' }).count()).toBe(1);
    for (const city of ['Seattle', 'Portland', 'Sacramento', 'Denver', 'Chicago']) {
      expect(await page.getByRole('rowheader', { name: `Harborline ${city}` }).count()).toBeGreaterThan(0);
    }

    const dashboardViolations = await seriousViolations(page);
    expect(dashboardViolations, describeViolations(dashboardViolations)).toEqual([]);

    // the overdue card: its number is the length of the list it leads to
    const card = page.getByRole('link', { name: /Overdue promises/ });
    const shown = Number((await card.innerText()).match(/Overdue promises\s+(\d+)/)?.[1]);
    expect(shown).toBeGreaterThan(0);
    await card.click();
    await page.waitForURL((u) => u.pathname === '/reports/overdue');
    await page.getByRole('heading', { level: 1, name: 'Overdue promises' }).waitFor();
    const rows = page.getByRole('table', { name: 'Overdue promises' }).locator('tbody tr');
    await rows.first().waitFor();
    expect(await rows.count()).toBe(shown);

    const listViolations = await seriousViolations(page);
    expect(listViolations, describeViolations(listViolations)).toEqual([]);

    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('link', { name: /Download CSV/ }).click()]);
    expect(download.suggestedFilename()).toMatch(/^benchrelay-overdue-all-shops-\d{4}-\d{2}-\d{2}\.csv$/);
    const csv = fs.readFileSync(await download.path(), 'utf8');
    const lines = csv.trimEnd().split('\r\n');
    expect(lines[0]).toBe('job_number,shop,stage,family,maker,model,serial,customer,promised_on,days_late,assignee');
    expect(lines).toHaveLength(shown + 1);
    // the jobs in the file are the jobs on the screen
    const numbersOnScreen = (await rows.locator('th').allInnerTexts()).map((t) => t.trim()).sort();
    expect(lines.slice(1).map((l) => l.split(',')[0]).sort()).toEqual(numbersOnScreen);
    await context.close();
  });

  it('the reports page passes axe-core, offers every CSV and downloads the invoice CSV', async () => {
    const context = await browser.newContext({ acceptDownloads: true, bypassCSP: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[0].name));
    await page.goto(`${app.url}/reports`);
    await page.getByRole('heading', { level: 1, name: 'Reports' }).waitFor();
    await page.getByRole('table', { name: 'Open jobs by stage, per shop' }).waitFor();
    const violations = await seriousViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    const csvLinks = await page.getByRole('link', { name: /Download CSV/ }).evaluateAll((as) => as.map((a) => (a as HTMLAnchorElement).pathname));
    expect(csvLinks.sort()).toEqual(
      ['bench-load', 'open-jobs', 'overdue', 'transfers', 'turnaround', 'weekly-intake'].map((n) => `/api/reports/${n}.csv`).sort(),
    );

    // the last 365 days, so the demo's year of released work is in it
    const to = new Date().toISOString().slice(0, 10);
    const from = new Date(Date.now() - 360 * 86_400_000).toISOString().slice(0, 10);
    await page.getByLabel('Released from').fill(from);
    await page.getByLabel('Released to (inclusive)').fill(to);
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download invoice CSV' }).click()]);
    expect(download.suggestedFilename()).toMatch(/^benchrelay-invoices-/);
    const csv = fs.readFileSync(await download.path(), 'utf8');
    const lines = csv.trimEnd().split('\r\n');
    expect(lines[0].startsWith('job_number,released_on,shop_code,')).toBe(true);
    expect(lines.length).toBeGreaterThan(10);

    // a reversed range is a field error on the page, not a broken download
    await page.getByLabel('Released from').fill(to);
    await page.getByLabel('Released to (inclusive)').fill(from);
    await page.getByRole('button', { name: 'Download invoice CSV' }).click();
    await page.getByText('The end date must not be before the start date.').waitFor();
    await context.close();
  });

  it('on a phone the dashboard fits the screen and a technician sees only her shops, with the chart’s table one tap away', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true, bypassCSP: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[3].name));
    await page.goto(`${app.url}/dashboard`);
    await page.getByRole('heading', { name: 'Open jobs by stage' }).waitFor();
    const table = page.getByRole('table', { name: 'Open jobs by stage, per shop' });
    const shopsShown = (await table.getByRole('rowheader').allInnerTexts()).sort();
    expect(shopsShown).toEqual(['Harborline Portland', 'Harborline Seattle']);
    // the table is for screen readers until asked for; then it is on screen
    // (visually hidden: a 1 px clipped box, as Tailwind's sr-only makes it)
    const hiddenBox = () => table.evaluate((el) => el.parentElement!.getBoundingClientRect().width);
    expect(await hiddenBox()).toBeLessThanOrEqual(1);
    await page.getByRole('button', { name: 'Show table' }).first().click();
    expect(await hiddenBox()).toBeGreaterThan(200);
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    const violations = await seriousViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await context.close();
  });
});
