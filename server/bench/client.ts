/**
 * The client as a new visitor gets it: `npm run bench:client` (after `npm run bench:data`).
 *
 * 1. Builds the client with Vite's manifest into .data/bench/client and prints the gzip size of the
 *    initial script (the entry and every chunk it imports statically) beside its limit, and of each
 *    page's own chunks (what a visit to that page adds to the initial script).
 * 2. Serves that build from the app on the bench data and opens it in headless Chromium (Debian's, as
 *    the browser tests launch it), signed in as the busiest shop's front desk, each time in a fresh
 *    browser context (cold cache): the time from navigation until the registry's serial field takes a
 *    typed character, and until the job board shows its first job card.
 *
 *   --runs 3     cold loads per page (the median is the figure)      --no-browser   sizes only
 */
import './lib/env.js';
import fs from 'node:fs';
import path from 'node:path';
import zlib from 'node:zlib';
import { performance } from 'node:perf_hooks';
import pg from 'pg';
import { chromium } from 'playwright-core';
import { build, type Manifest } from 'vite';
import { BENCH_DATABASE_URL } from './lib/env.js';
import { readFixtures } from './lib/fixtures.js';
import { mintSession, SESSION_COOKIE } from './lib/sessions.js';
import { startBenchServer } from './lib/server-process.js';
import { argValue, figure, fmt, measured, percentile } from './lib/stats.js';
import { config } from '../config.js';

const RUNS = Number(argValue('runs', '3'));
const BROWSER = !process.argv.includes('--no-browser');
const OUT = path.resolve('.data/bench/client');

const gzipKb = (file: string) => zlib.gzipSync(fs.readFileSync(path.join(OUT, file)), { level: 9 }).length / 1024;

/** Every file a manifest entry loads before it runs: itself and its static imports, recursively. */
function staticClosure(manifest: Manifest, key: string, seen = new Set<string>()): Set<string> {
  if (seen.has(key)) return seen;
  seen.add(key);
  for (const imported of manifest[key].imports ?? []) staticClosure(manifest, imported, seen);
  return seen;
}

async function sizes(): Promise<void> {
  await build({ root: process.cwd(), logLevel: 'error', build: { outDir: OUT, emptyOutDir: true, manifest: true } });
  const manifest = JSON.parse(fs.readFileSync(path.join(OUT, '.vite/manifest.json'), 'utf8')) as Manifest;
  const initialKeys = staticClosure(manifest, 'index.html');
  const initialJs = [...initialKeys].map((k) => manifest[k].file).filter((f) => f.endsWith('.js'));
  const initialCss = [...initialKeys].flatMap((k) => manifest[k].css ?? []);
  const initialKb = initialJs.reduce((sum, f) => sum + gzipKb(f), 0);
  figure('client.initial-script.gzip', initialKb, 'KB', 200, '<=', `${initialJs.length} file(s): ${initialJs.join(', ')}`);
  measured('client.initial-css.gzip', initialCss.reduce((sum, f) => sum + gzipKb(f), 0), 'KB');

  const pages = Object.entries(manifest).filter(([key, chunk]) => chunk.isDynamicEntry && key.startsWith('src/app/routes/'));
  for (const [key] of pages.sort(([a], [b]) => a.localeCompare(b))) {
    const own = [...staticClosure(manifest, key)].filter((k) => !initialKeys.has(k)).map((k) => manifest[k].file).filter((f) => f.endsWith('.js'));
    const kb = own.reduce((sum, f) => sum + gzipKb(f), 0);
    measured(`client.page.${path.basename(key, '.tsx')}.gzip`, kb, 'KB', `${own.length} chunk(s) on top of the initial script`);
  }
}

async function timings(): Promise<void> {
  const fx = readFixtures();
  const pool = new pg.Pool({ connectionString: BENCH_DATABASE_URL, max: 1 });
  const cookie = await mintSession(pool, { id: fx.people.front_desk.id, networkId: fx.network.id }, config.sessionSecret);
  await pool.end();
  const sid = decodeURIComponent(cookie.slice(SESSION_COOKIE.length + 1));
  const server = await startBenchServer({ CLIENT_DIR: OUT });
  const browser = await chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: [
      '--no-sandbox', '--disable-gpu', '--disable-dev-shm-usage', '--disable-background-networking',
      '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic',
    ],
  });
  try {
    const coldLoad = async (pathAndQuery: string, ready: (page: import('playwright-core').Page) => Promise<void>) => {
      const context = await browser.newContext();
      await context.addCookies([{ name: SESSION_COOKIE, value: sid, url: server.url }]);
      const page = await context.newPage();
      page.setDefaultTimeout(30_000);
      const t0 = performance.now();
      await page.goto(`${server.url}${pathAndQuery}`, { waitUntil: 'commit' });
      await ready(page);
      const ms = performance.now() - t0;
      await context.close();
      return ms;
    };
    const registry: number[] = [];
    const board: number[] = [];
    for (let i = 0; i < RUNS; i++) {
      registry.push(
        await coldLoad(`/registry?shop=${fx.busiestShop.id}`, async (page) => {
          // typed until it stays: while the page settles its address (the shop in `?shop=`), an early
          // keystroke can be replaced, and "accepts input" means the character is still there
          const field = page.getByRole('combobox', { name: /serial number/i });
          const deadline = performance.now() + 30_000;
          for (;;) {
            await field.fill('1');
            await page.waitForTimeout(20);
            if ((await field.inputValue()) === '1') break;
            if (performance.now() > deadline) throw new Error('the serial field never kept the typed character');
          }
        }),
      );
      board.push(
        await coldLoad(`/jobs?shop=${fx.busiestShop.id}`, async (page) => {
          await page.locator('main ul.grid > li').first().waitFor();
        }),
      );
    }
    registry.sort((a, b) => a - b);
    board.sort((a, b) => a - b);
    figure('client.registry.usable', percentile(registry, 50) / 1000, 's', 1, '<=', `median of ${RUNS} cold loads (all: ${registry.map((t) => fmt(t / 1000, 2)).join(', ')} s)`);
    figure('client.job-board.cards', percentile(board, 50) / 1000, 's', 1, '<=', `median of ${RUNS} cold loads, ${fx.busiestShop.openJobs.toLocaleString('en-US')} open jobs (all: ${board.map((t) => fmt(t / 1000, 2)).join(', ')} s)`);
  } finally {
    await browser.close();
    await server.stop();
  }
}

async function main() {
  await sizes();
  if (BROWSER) await timings();
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
