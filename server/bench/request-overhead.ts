/**
 * Per-request overhead: `npm run bench:overhead` (after `npm run bench:data`).
 *
 * Runs the app in a process of its own (lib/serve.ts) and sends it signed-in `GET /api/me` — a read
 * that does nothing but resolve the session, the person and their ability and describe them — from
 * autocannon; the server's own CPU time (`process.cpuUsage()` before and after, user + system) divided
 * by the number of answers is the per-request cost. `GET /api/health` (cached, no session) beside it
 * is the floor of Express, helmet and JSON. It also checks that the reads left the session row as it
 * was (its xmin): the touch is due at most once a minute, and a read writes nothing else.
 *
 *   --requests 3000   answers per measure (default)     --connections 8
 */
import './lib/env.js';
import pg from 'pg';
import { BENCH_DATABASE_URL } from './lib/env.js';
import { readFixtures } from './lib/fixtures.js';
import { httpLoad } from './lib/http-load.js';
import { mintSession } from './lib/sessions.js';
import { startBenchServer } from './lib/server-process.js';
import { argValue, figure, fmt, measured } from './lib/stats.js';
import { config } from '../config.js';

const REQUESTS = Number(argValue('requests', '3000'));
const CONNECTIONS = Number(argValue('connections', '8'));

/** The session row's version: xmin changes whenever the row is written. */
async function sessionRowVersion(pool: pg.Pool, cookie: string): Promise<string> {
  const sid = decodeURIComponent(cookie.split('=')[1]).slice(2).split('.')[0];
  const { rows } = await pool.query<{ v: string }>(`select xmin::text as v from session where sid = $1`, [sid]);
  return rows[0]?.v ?? 'gone';
}

async function main() {
  const fx = readFixtures();
  const pool = new pg.Pool({ connectionString: BENCH_DATABASE_URL, max: 2 });
  const cookie = await mintSession(pool, { id: fx.people.front_desk.id, networkId: fx.network.id }, config.sessionSecret);
  const server = await startBenchServer();
  try {
    console.log(`request overhead: ${REQUESTS} answers at ${CONNECTIONS} connections, bench data of ${fx.instruments.toLocaleString('en-US')} instruments`);
    const warm = await httpLoad({ url: server.url, connections: CONNECTIONS, amount: Math.min(500, REQUESTS), cookie, paths: ['/api/me'] });
    if (warm.errors) throw new Error(`GET /api/me answered ${warm.errors} errors while warming up`);

    const measure = async (path: string, sessionCookie?: string) => {
      const before = await server.cpuMicros();
      const load = await httpLoad({ url: server.url, connections: CONNECTIONS, amount: REQUESTS, cookie: sessionCookie, paths: [path] });
      const after = await server.cpuMicros();
      return { load, cpuMs: (after - before) / 1000 / load.requests };
    };

    const health = await measure('/api/health');
    // a fresh session for the measure: its touch is due once a minute from now, so a measure of t seconds
    // may write the row floor(t / 60) times and no more
    const fresh = await mintSession(pool, { id: fx.people.front_desk.id, networkId: fx.network.id }, config.sessionSecret);
    const minted = Date.now();
    const versionBefore = await sessionRowVersion(pool, fresh);
    const me = await measure('/api/me', fresh);
    const versionAfter = await sessionRowVersion(pool, fresh);
    const touchesAllowed = Math.floor((Date.now() - minted) / 60_000);
    if (me.load.errors) throw new Error(`GET /api/me answered ${me.load.errors} errors`);

    measured('overhead.health.cpu-per-request', health.cpuMs, 'ms', `${fmt(health.load.perSecond, 0)} req/s, p95 ${fmt(health.load.p95)} ms (floor: Express, helmet, JSON, no session)`);
    measured('overhead.me.throughput', me.load.perSecond, 'req/s', `p50 ${fmt(me.load.p50)} ms, p95 ${fmt(me.load.p95)} ms`);
    figure('overhead.me.cpu-per-request', me.cpuMs, 'ms', 2, '<=', 'server CPU (user+system) per signed-in GET /api/me');
    figure('overhead.me.session-row-writes', versionAfter === versionBefore ? 0 : 1, 'writes', touchesAllowed, '<=', `the session row while ${me.load.requests} reads went through it (touch at most once a minute)`);
  } finally {
    await server.stop();
    await pool.end();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
