import type { Server } from 'node:http';
import { chromium, type Browser, type Page } from 'playwright-core';
import { buildApp } from '../../server/app.js';
import { TEST_PORTS } from './test-env.js';

/** Debian's Chromium, no browser download; flags keep it off the network and quiet in a sandbox. */
export async function launchBrowser(): Promise<Browser> {
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic',
    ],
  });
}

/** The real app (API + built client) on the test port, as the identity provider expects it. */
export async function startAppServer(): Promise<{ url: string; close(): Promise<void> }> {
  const app = buildApp();
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(TEST_PORTS.app, '127.0.0.1', () => resolve(s));
  });
  return {
    url: `http://localhost:${TEST_PORTS.app}`,
    close: () =>
      new Promise((resolve) => {
        server.closeAllConnections();
        server.close(() => resolve());
      }),
  };
}

/** Signs in from the app's own sign-in screen by picking a person on the provider's page. */
export async function signInInBrowser(page: Page, appUrl: string, personName: string | RegExp) {
  page.setDefaultTimeout(20_000);
  await page.goto(`${appUrl}/`);
  await page.getByRole('link', { name: /sign in/i }).first().click();
  await page.getByRole('button', { name: personName }).click();
  await page.waitForURL((u) => u.href.startsWith(appUrl) && !u.pathname.startsWith('/auth'));
}
