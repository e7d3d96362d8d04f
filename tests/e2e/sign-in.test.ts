import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';

/** A person signs in on the identity provider stand-in's page in Chromium and sees their shops. */
describe('browser: sign in and see my shops', () => {
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

  it('the owner signs in and sees every shop of the demo network with open-job counts', async () => {
    const page = await browser.newPage();
    const owner = demoPeople[0];
    await signInInBrowser(page, app.url, new RegExp(owner.name));
    await page.getByRole('heading', { name: 'Your shops' }).waitFor();
    for (const city of ['Seattle', 'Portland', 'Sacramento', 'Denver', 'Chicago']) {
      await page.getByRole('heading', { name: `Harborline ${city}` }).waitFor();
    }
    const text = await page.locator('main').innerText();
    expect(text).toMatch(/\d+\s*open jobs/);
    expect(await page.getByRole('link', { name: 'People' }).count()).toBeGreaterThan(0);
    await page.close();
  });

  it('the technician with two roles sees exactly her two shops in the switcher, on a phone', async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    const tech = demoPeople[3];
    await signInInBrowser(page, app.url, new RegExp(tech.name));
    const switcher = page.getByLabel('Shop');
    await switcher.waitFor();
    const options = (await switcher.locator('option').allInnerTexts()).map((s) => s.split(' · ')[0]).sort();
    expect(options).toEqual(['Harborline Portland', 'Harborline Seattle']);
    // not an owner: no People page in the menu
    expect(await page.getByRole('link', { name: 'People' }).count()).toBe(0);
    await context.close();
  });

  it('an e-mail with no role sees the no-access page, not an error', async () => {
    const page = await browser.newPage();
    await page.goto(`${app.url}/`);
    await page.getByRole('link', { name: /sign in/i }).first().click();
    await page.getByLabel(/e-mail/i).fill('nobody-yet@example.test');
    await page.getByRole('button', { name: /sign in|continue/i }).last().click();
    await page.getByText('nobody-yet@example.test').waitFor();
    expect(page.url()).toContain('/no-access');
    await page.close();
  });
});
