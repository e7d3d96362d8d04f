import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { mkdirSync } from 'node:fs';
import { sendMail, waitForMail } from '../../server/lib/mail.js';

const SHOTS = process.env.SHOTS_DIR ?? '/tmp/shots-ui';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { uniq } from '../helpers/factories.js';

/**
 * In Chromium: the owner invites a person as technician at one shop and front desk at another; the
 * person follows the e-mailed link, signs in, and sees different actions at each shop.
 */
describe('browser: per-shop roles from invitation to the screen', () => {
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

  async function allowedAt(page: Page, shopName: string): Promise<string[]> {
    const list = page.getByRole('list', { name: `Allowed at ${shopName}` });
    await list.waitFor();
    return list.getByRole('listitem').allInnerTexts();
  }

  it('the invited person is a technician at Sacramento and front desk at Chicago, and the screen shows it', async () => {
    const email = `juno.faraday-${uniq()}@example.test`;

    // the owner invites from the People screen
    const ownerPage = await browser.newPage();
    await signInInBrowser(ownerPage, app.url, new RegExp(demoPeople[0].name));
    await ownerPage.getByRole('link', { name: 'People' }).first().click();
    await ownerPage.getByRole('link', { name: 'Invite someone' }).click();
    await ownerPage.getByLabel('E-mail address').fill(email);
    await ownerPage.getByLabel('Shop 1', { exact: true }).selectOption({ label: 'Harborline Sacramento' });
    await ownerPage.getByLabel('Role at shop 1').selectOption({ label: 'Technician' });
    await ownerPage.getByRole('button', { name: 'Add another shop' }).click();
    await ownerPage.getByLabel('Shop 2', { exact: true }).selectOption({ label: 'Harborline Chicago' });
    await ownerPage.getByRole('combobox', { name: 'Role at shop 2' }).selectOption({ label: 'Front desk' });
    await ownerPage.getByRole('button', { name: 'Send invitation' }).click();
    await ownerPage.getByText(`Invitation sent to ${email}`).waitFor();

    // the e-mail arrives at the catcher; the person opens its link in their own browser
    const mail = await waitForMail((m) => m.to.includes(email), { timeoutMs: 10_000 });
    const link = /(http:\/\/\S+\/invitations\/[A-Za-z0-9_-]{43})/.exec(mail.text)?.[1];
    expect(link).toBeTruthy();
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true });
    const page = await context.newPage();
    page.setDefaultTimeout(30_000);
    await page.goto(link!);
    await page.getByRole('heading', { name: /Join Harborline/ }).waitFor();
    expect(await page.getByText('Technician at Harborline Sacramento').count()).toBe(1);
    await page.getByRole('link', { name: 'Sign in to accept' }).click();
    await page.getByLabel(/e-mail/i).fill(email);
    await page.getByRole('button', { name: /sign in|continue/i }).last().click();
    // accepted on the way back: the app opens with exactly the two shops
    await page.getByRole('heading', { name: 'Your shops' }).waitFor();
    const switcher = page.getByLabel('Shop');
    const options = (await switcher.locator('option').allInnerTexts()).map((s) => s.split(' · ')[0]).sort();
    expect(options).toEqual(['Harborline Chicago', 'Harborline Sacramento']);

    await switcher.selectOption({ label: 'Harborline Sacramento · Sacramento' });
    const atBench = await allowedAt(page, 'Harborline Sacramento');
    expect(atBench).toContain('Move jobs through the bench stages');
    expect(atBench).toContain('Record pad maps');
    expect(atBench).not.toContain('Open jobs and write estimates');
    expect(atBench).not.toContain('Request transfers to other shops');

    await switcher.selectOption({ label: 'Harborline Chicago · Chicago' });
    const atDesk = await allowedAt(page, 'Harborline Chicago');
    expect(atDesk).toContain('Open jobs and write estimates');
    expect(atDesk).toContain('Register customers');
    expect(atDesk).toContain('Request transfers to other shops');
    expect(atDesk).not.toContain('Record pad maps');
    // not an owner: no People screen
    expect(await page.getByRole('link', { name: 'People' }).count()).toBe(0);

    // the owner's People screen now lists the person with both roles
    await ownerPage.getByRole('link', { name: 'All people' }).click();
    const row = ownerPage.getByRole('link', { name: new RegExp(email.replace(/[.]/g, '\\.')) });
    await row.waitFor();
    expect(await row.innerText()).toMatch(/Technician at Harborline Sacramento[\s\S]*Front desk at Harborline Chicago|Front desk at Harborline Chicago[\s\S]*Technician at Harborline Sacramento/);

    await context.close();
    await ownerPage.close();
  });

  it('the owner changes a role on the person’s page and the change holds on the next load', async () => {
    const page = await browser.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[0].name));
    await page.getByRole('link', { name: 'People' }).first().click();
    await page.getByRole('link', { name: new RegExp(demoPeople[2].name) }).click();
    await page.getByRole('heading', { level: 1, name: demoPeople[2].name }).waitFor();
    const role = page.getByRole('combobox', { name: 'Role at Harborline Seattle' });
    await role.selectOption({ label: 'Auditor' });
    await page.getByText('Role at Harborline Seattle changed to Auditor.').waitFor();
    await page.reload();
    expect(await page.getByRole('combobox', { name: 'Role at Harborline Seattle' }).inputValue()).toBe('auditor');
    // and back, so the demo person keeps her desk
    await page.getByRole('combobox', { name: 'Role at Harborline Seattle' }).selectOption({ label: 'Front desk' });
    await page.getByText('Role at Harborline Seattle changed to Front desk.').waitFor();
    await page.close();
  });
  it('the owner opens the caught invitation and a text-only notice without a crash, then reads the audit log in words and filters it', async () => {
    mkdirSync(SHOTS, { recursive: true });
    const subject = `Transfer on its way ${uniq()}`;
    await sendMail({ to: 'harbour.desk@example.test', subject, text: 'A baritone saxophone is on the next relay run to your shop.' });
    await waitForMail((m) => m.subject === subject, { timeoutMs: 10_000 });
    for (const width of [1280, 390]) {
      const context = await browser.newContext({ viewport: { width, height: 900 } });
      const page = await context.newPage();
      await signInInBrowser(page, app.url, new RegExp(demoPeople[0].name));
      page.setDefaultTimeout(30_000);
      const crashes: string[] = [];
      page.on('pageerror', (e) => crashes.push(e.message));
      await page.goto(`${app.url}/dev/mail`);
      await page.getByRole('link', { name: new RegExp(subject) }).click();
      const reader = page.getByRole('article', { name: subject });
      await reader.getByText('A baritone saxophone is on the next relay run to your shop.').waitFor();
      expect(await page.getByText('This screen stopped working').count()).toBe(0);
      // the invitation the first test of this file sent
      await page.goto(`${app.url}/dev/mail`); // on a phone the list and the message are separate views
      await page.getByRole('link', { name: /^Invitation to / }).first().click();
      const invite = page.getByRole('article');
      await invite.getByRole('button', { name: 'HTML' }).click();
      const frame = invite.locator('iframe');
      const sandbox = (await frame.getAttribute('sandbox')) ?? '';
      expect(sandbox).not.toMatch(/allow-same-origin|allow-scripts/);
      expect(await frame.getAttribute('srcdoc')).toContain('<base target="_blank">');
      await page.screenshot({ path: `${SHOTS}/dev-mail-${width}.png`, fullPage: true });
      expect(crashes).toEqual([]);

      await page.goto(`${app.url}/audit-log`);
      await page.getByRole('heading', { name: 'Audit log' }).waitFor();
      await page.getByText(/Times are in your time zone/).waitFor();
      const filters = page.getByRole('search', { name: 'Filter the log' });
      await filters.getByRole('combobox', { name: 'Person' }).selectOption({ label: demoPeople[2].name });
      await filters.getByRole('combobox', { name: 'Kind of change' }).selectOption({ label: 'Changed a role' });
      const changes = page.getByRole('list', { name: 'Changes' }).first();
      await changes.waitFor();
      const text = await page.locator('main').innerText();
      expect(text).toMatch(/Role: (Front desk|Auditor) → (Auditor|Front desk)/);
      expect(text).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-/);
      expect(text).not.toContain('"role"');
      expect(await filters.getByRole('combobox', { name: 'Kind of change' }).inputValue()).toBe('action:membership.updated');
      expect(await filters.getByRole('combobox', { name: 'Person' }).locator('option:checked').innerText()).toBe(demoPeople[2].name);
      if (width === 390) expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(390);
      await page.screenshot({ path: `${SHOTS}/audit-log-${width}.png`, fullPage: true });
      await context.close();
    }
  }, 240_000);
});
