import { Op } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Browser, Page } from 'playwright-core';
import { describeViolations, seriousViolations } from '../helpers/axe.js';
import { launchBrowser, startAppServer, signInInBrowser } from '../helpers/browser.js';
import { closeServerResources } from '../helpers/close.js';
import { uniq } from '../helpers/factories.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { demoPeople } from '../../server/seed/demo-people.js';
import { Notification, NotificationPreference, User } from '../../server/lib/models.js';
import { notify } from '../../server/modules/notifications/service.js';

/**
 * The inbox in Chromium: the header's unread count, a notice arriving without a reload, mark one read,
 * follow a notice to its job, mark all read, choose e-mail per kind, and axe-core on every screen.
 * Rows this file changes in the shared demo network are put back afterwards.
 */
describe('browser: notifications inbox', { timeout: 120_000 }, () => {
  let browser: Browser;
  let app: { url: string; close(): Promise<void> };
  let networkId: string;
  const touchedUsers: string[] = [];
  const unreadBefore = new Map<string, string[]>();

  beforeAll(async () => {
    networkId = (await loadDemoNetwork()).networkId;
    app = await startAppServer();
    browser = await launchBrowser();
  });

  afterAll(async () => {
    // leave the demo inboxes and choices as the seed made them
    for (const [userId, ids] of unreadBefore) {
      await Notification.destroy({ where: { networkId, userId, dedupeKey: { [Op.like]: 'e2e-inbox:%' } } });
      await Notification.update({ readAt: null }, { where: { networkId, userId, id: { [Op.in]: ids } } });
    }
    if (touchedUsers.length) await NotificationPreference.destroy({ where: { networkId, userId: { [Op.in]: touchedUsers } } });
    await browser?.close();
    await app?.close();
    await closeServerResources();
  });

  async function person(index: number) {
    const user = (await User.findOne({ where: { networkId, email: demoPeople[index].email } }))!;
    if (!unreadBefore.has(user.id)) {
      const unread = await Notification.findAll({ where: { networkId, userId: user.id, readAt: null }, attributes: ['id'] });
      unreadBefore.set(user.id, unread.map((n) => n.id));
      touchedUsers.push(user.id);
    }
    return user;
  }

  const badge = (page: Page) => page.getByTestId('inbox-link');
  const unreadInDb = (userId: string) => Notification.count({ where: { networkId, userId, readAt: null } });

  it('front desk: the header counts unread notices, a new one appears without a reload, and reading brings the count down', async () => {
    const priya = await person(2);
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, bypassCSP: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[2].name));
    page.setDefaultTimeout(30_000);

    const startUnread = await unreadInDb(priya.id);
    expect(startUnread).toBeGreaterThan(0);
    await badge(page).getByText(`${startUnread} unread`).waitFor();
    await badge(page).click();
    await page.waitForURL((u) => u.pathname === '/inbox');
    await page.getByRole('heading', { level: 1, name: 'Inbox' }).waitFor();
    await page.getByTestId('notice').first().waitFor();
    expect(await page.locator('[data-testid="notice"][data-unread="true"]').count()).toBe(startUnread);

    const inboxViolations = await seriousViolations(page);
    expect(inboxViolations, describeViolations(inboxViolations)).toEqual([]);

    // a notice made on the server while the page is open shows up by itself; the page is not reloaded
    await page.evaluate(() => ((window as unknown as { stillHere: boolean }).stillHere = true));
    const title = `Incoming transfer test ${uniq()}`;
    await notify({
      networkId, kind: 'transfer_incoming', userIds: [priya.id], title, body: 'A test tenor saxophone is on its way.', link: '/transfers', dedupeKey: `e2e-inbox:${title}`,
    });
    await page.getByRole('heading', { name: title }).waitFor({ timeout: 40_000 });
    await badge(page).getByText(`${startUnread + 1} unread`).waitFor({ timeout: 40_000 });
    expect(await page.evaluate(() => (window as unknown as { stillHere?: boolean }).stillHere)).toBe(true);

    // mark that one read: its button goes, the count drops
    await page.getByTestId('notice').filter({ hasText: title }).getByRole('button', { name: /^Mark read/ }).click();
    await badge(page).getByText(`${startUnread} unread`).waitFor();
    expect(await unreadInDb(priya.id)).toBe(startUnread);

    // following a notice opens the job and marks the notice read
    const ready = page.locator('[data-testid="notice"][data-unread="true"]').filter({ hasText: 'is ready to collect' }).first();
    const link = ready.getByRole('link');
    const href = (await link.getAttribute('href'))!;
    expect(href).toMatch(/^\/jobs\/[0-9a-f-]{36}\?shop=/);
    await link.click();
    await page.waitForURL((u) => u.pathname === href.split('?')[0]);
    await page.getByRole('heading', { level: 1, name: /Job \d+/ }).waitFor();
    await badge(page).getByText(`${startUnread - 1} unread`).waitFor();

    // mark all read from the inbox
    await badge(page).click();
    await page.getByRole('button', { name: 'Mark all read' }).click();
    await page.getByTestId('inbox-unread').getByText('Nothing unread').waitFor();
    await badge(page).getByText('nothing unread').waitFor({ state: 'attached' });
    expect(await unreadInDb(priya.id)).toBe(0);
    expect(await page.getByRole('button', { name: 'Mark all read' }).isDisabled()).toBe(true);
    await page.getByRole('button', { name: 'Unread' }).click();
    await page.getByRole('heading', { name: 'Nothing unread' }).waitFor();
    await context.close();
  });

  it('front desk: chooses which notices also come by e-mail, and the choice is saved', async () => {
    const priya = await person(2);
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, bypassCSP: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[2].name));
    page.setDefaultTimeout(30_000);
    await page.goto(`${app.url}/inbox`);
    await page.getByRole('link', { name: 'E-mail settings' }).click();
    await page.getByRole('heading', { level: 1, name: 'E-mail settings' }).waitFor();
    await page.getByText(priya.email).waitFor();

    const jobsReady = page.getByRole('checkbox', { name: /Jobs ready/ });
    const transfers = page.getByRole('checkbox', { name: /^Transfers/ });
    expect(await jobsReady.isChecked()).toBe(false); // inbox only by default
    expect(await transfers.isChecked()).toBe(true); // e-mailed by default
    const save = page.getByRole('button', { name: 'Save settings' });
    expect(await save.isDisabled()).toBe(true); // nothing changed yet

    const violations = await seriousViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);

    // keyboard only: tab to the box, space to tick it, then save
    await jobsReady.focus();
    await page.keyboard.press('Space');
    await transfers.uncheck();
    await save.click();
    await page.getByRole('status').filter({ hasText: 'Saved.' }).waitFor();
    const rows = await NotificationPreference.findAll({ where: { networkId, userId: priya.id }, order: [['kind', 'ASC']] });
    const chosen = Object.fromEntries(rows.map((r) => [r.kind, r.email]));
    expect(chosen).toMatchObject({ job_ready: true, transfer_incoming: false, transfer_overdue: true, estimate_awaiting_approval: false });

    // the choices are there on the next visit
    await page.reload();
    await page.getByRole('checkbox', { name: /Jobs ready/ }).waitFor();
    expect(await page.getByRole('checkbox', { name: /Jobs ready/ }).isChecked()).toBe(true);
    expect(await page.getByRole('checkbox', { name: /^Transfers/ }).isChecked()).toBe(false);
    await context.close();
  });

  it('on a phone the inbox stays in the header beside the menu, fits the screen and passes axe-core', async () => {
    const mateo = await person(3);
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, isMobile: true, hasTouch: true, bypassCSP: true });
    const page = await context.newPage();
    await signInInBrowser(page, app.url, new RegExp(demoPeople[3].name));
    page.setDefaultTimeout(30_000);
    const unread = await unreadInDb(mateo.id);
    expect(unread).toBeGreaterThan(0);
    // visible without opening the menu
    await badge(page).getByText(`${unread} unread`).waitFor({ state: 'attached' });
    expect(await badge(page).isVisible()).toBe(true);
    expect(await page.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(false);
    await page.screenshot({ path: '.data/test-inbox-phone.png' }).catch(() => undefined);
    await badge(page).tap();
    await page.getByRole('heading', { level: 1, name: 'Inbox' }).waitFor();
    await page.getByTestId('notice').first().waitFor();
    const overflow = await page.evaluate(() => document.documentElement.scrollWidth - window.innerWidth);
    expect(overflow).toBeLessThanOrEqual(0);
    const violations = await seriousViolations(page);
    expect(violations, describeViolations(violations)).toEqual([]);
    await context.close();
  });
});
