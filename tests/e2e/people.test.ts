import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { waitForMail } from '../../server/lib/mail.js';
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
});
