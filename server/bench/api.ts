/**
 * The hot read paths over HTTP, each beside its own SQL: `npm run bench:api` (after `npm run bench:data`).
 *
 * For every request the benchmark sends, it first calls the same service function in this process and
 * records the statements Sequelize sends for it (transaction and settings included). The HTTP side is
 * the real app in a process of its own (session, actor, ability, rate limiter, route, service, JSON)
 * loaded by autocannon as the busiest shop's front desk; the raw side replays exactly those statements
 * through `pg` at the same concurrency. The HTTP throughput over the raw throughput is what the app's
 * own layers cost.
 *
 *   serial search   exact (retyped), prefix while typing, one character changed, neighbours swapped,
 *                   fragment from the middle, not in the registry — at 8 and 32 connections
 *   history         GET /api/instruments/:id/timeline of the instrument with 100 events
 *   job board       GET /api/jobs at the busiest shop (its open jobs), pages 1–5, and filtered
 *
 * EXPLAIN (ANALYZE, BUFFERS) of one statement set per benchmark is written to .data/bench/explain.md.
 *
 *   --requests 2000   answers per measure (default)     --queries 40   serials per search kind
 */
import './lib/env.js';
import fs from 'node:fs';
import path from 'node:path';
import pg from 'pg';
import { BENCH_DATABASE_URL } from './lib/env.js';
import { readFixtures } from './lib/fixtures.js';
import { httpLoad } from './lib/http-load.js';
import { mintSession } from './lib/sessions.js';
import { startBenchServer, type BenchServer } from './lib/server-process.js';
import { argValue, figure, fmt, measured, runConcurrent, type LoadResult } from './lib/stats.js';
import { config } from '../config.js';
import { sequelize } from '../lib/db.js';
import type { Actor } from '../lib/auth.js';
import { loadActorRecord } from '../modules/members/service.js';
import { getTimeline, searchInstruments } from '../modules/registry/service.js';
import { jobBoard } from '../modules/jobs/service.js';
import { abilityFor } from '../../shared/auth/ability.js';
import { instrumentSearchSchema } from '../../shared/schemas/registry.js';
import { boardQuerySchema } from '../../shared/jobs/schemas.js';

const REQUESTS = Number(argValue('requests', '2000'));
const QUERIES = Number(argValue('queries', '40'));
const EXPLAIN_PATH = path.resolve('.data/bench/explain.md');

/** The statements a service call sends, in order (Sequelize's logging hook sees each one). */
async function statementsOf(fn: () => Promise<unknown>): Promise<string[]> {
  const seen: string[] = [];
  const options = (sequelize as unknown as { options: { logging: unknown } }).options;
  const before = options.logging;
  options.logging = (line: string) => void seen.push(line.replace(/^Executing \([^)]*\): /, ''));
  try {
    await fn();
  } finally {
    options.logging = before;
  }
  return seen;
}

/** Replays each request's statements on one pooled connection, like the app's one request. */
function rawRunner(pool: pg.Pool, sets: string[][]) {
  return async (i: number) => {
    const client = await pool.connect();
    try {
      for (const sql of sets[i % sets.length]) await client.query(sql);
    } finally {
      client.release();
    }
  };
}

const explains: string[] = [];
async function explain(pool: pg.Pool, title: string, statements: string[]) {
  const client = await pool.connect();
  try {
    explains.push(`### ${title}\n`);
    for (const sql of statements) {
      if (/^(START TRANSACTION|COMMIT|ROLLBACK|SET )/i.test(sql.trim()) || /set_config\(/.test(sql)) {
        await client.query(sql);
        continue;
      }
      const { rows } = await client.query<{ 'QUERY PLAN': string }>(`explain (analyze, buffers) ${sql.replace(/;\s*$/, '')}`);
      explains.push('```sql\n' + sql.trim() + '\n```\n```\n' + rows.map((r) => r['QUERY PLAN']).join('\n') + '\n```\n');
    }
  } finally {
    await client.query('rollback').catch(() => undefined);
    client.release();
  }
}

/** Small deterministic generator so two runs type the same queries (mulberry32). */
function prng(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

async function searchQueries(pool: pg.Pool, networkId: string): Promise<Record<string, string[]>> {
  const { rows } = await pool.query<{ serial: string; norm: string }>(
    `select serial, serial_normalized as norm from instruments where network_id = $1 order by md5(id::text) limit $2`,
    [networkId, QUERIES * 4],
  );
  const rnd = prng(42);
  const pick = (i: number) => rows[i % rows.length];
  const digits = '0123456789';
  const kinds: Record<string, string[]> = { exact: [], prefix: [], typo: [], swap: [], fragment: [], miss: [] };
  for (let i = 0; i < QUERIES; i++) {
    const a = pick(i);
    kinds.exact.push(a.serial.toLowerCase().replace(/[\s./_-]+/g, ' '));
    const b = pick(QUERIES + i).norm;
    kinds.prefix.push(b.slice(0, 4 + (i % 4)));
    const c = pick(2 * QUERIES + i).norm;
    const at = Math.max(2, Math.floor(rnd() * c.length));
    const swapped = c.slice(0, at - 1) + c[at] + c[at - 1] + c.slice(at + 1);
    kinds.swap.push(swapped === c ? c.slice(0, -2) + c.at(-1) + c.at(-2) : swapped);
    const d = pick(3 * QUERIES + i).norm;
    const pos = d.length - 1 - Math.floor(rnd() * 4);
    const other = digits[(digits.indexOf(d[pos]) + 1 + Math.floor(rnd() * 8)) % 10] ?? 'X';
    kinds.typo.push(d.slice(0, pos) + other + d.slice(pos + 1));
    kinds.fragment.push(a.norm.slice(Math.max(0, a.norm.length - 7), Math.max(5, a.norm.length - 2)));
    kinds.miss.push(`ZQ${String(Math.floor(rnd() * 1e8)).padStart(8, '0')}`);
  }
  return kinds;
}

interface Comparison {
  name: string;
  http: LoadResult;
  raw: LoadResult;
  p95Limit: number | null;
}

async function compare(
  server: BenchServer, pool: pg.Pool, cookie: string, name: string, connections: number, paths: string[], sets: string[][], p95Limit: number | null,
): Promise<Comparison> {
  const http = await httpLoad({ url: server.url, connections, amount: REQUESTS, cookie, paths });
  if (http.errors) throw new Error(`${name}: ${http.errors} HTTP errors`);
  const raw = await runConcurrent(connections, REQUESTS, rawRunner(pool, sets));
  measured(`${name}.http`, http.perSecond, 'req/s', `p50 ${fmt(http.p50)} ms, p95 ${fmt(http.p95)} ms, max ${fmt(http.max)} ms`);
  measured(`${name}.sql`, raw.perSecond, 'req/s', `p50 ${fmt(raw.p50)} ms, p95 ${fmt(raw.p95)} ms, max ${fmt(raw.max)} ms`);
  if (p95Limit !== null) figure(`${name}.http.p95`, http.p95, 'ms', p95Limit, '<=');
  figure(`${name}.http-share-of-sql-throughput`, (http.perSecond / raw.perSecond) * 100, '%', 50, '>=');
  return { name, http, raw, p95Limit };
}

async function main() {
  const fx = readFixtures();
  const person = fx.people.front_desk;
  const record = await loadActorRecord(person.id, fx.network.id);
  if (!record) throw new Error('the bench front desk is missing: run bench:data again');
  const actor: Actor = { ...record, ability: abilityFor(record) };
  const setupPool = new pg.Pool({ connectionString: BENCH_DATABASE_URL, max: 2 });
  const cookie = await mintSession(setupPool, { id: person.id, networkId: fx.network.id }, config.sessionSecret);
  console.log(`api: ${fx.instruments.toLocaleString('en-US')} instruments, ${REQUESTS} answers per measure, as the busiest shop's front desk`);

  // --- the requests and their statements
  const kinds = await searchQueries(setupPool, fx.network.id);
  const search: Array<{ kind: string; path: string; statements: string[] }> = [];
  for (const [kind, queries] of Object.entries(kinds)) {
    for (const q of queries) {
      const input = instrumentSearchSchema.parse({ q });
      const statements = await statementsOf(() => searchInstruments(actor, input));
      search.push({ kind, path: `/api/instruments/search?q=${encodeURIComponent(q)}`, statements });
    }
  }
  const historyStatements = await statementsOf(() => getTimeline(actor, fx.historyInstrument.id));
  const boardQueries: Array<Record<string, string>> = [
    ...[1, 2, 3, 4, 5].map((page) => ({ shop: fx.busiestShop.id, page: String(page) })),
    { shop: fx.busiestShop.id, stage: 'on_bench' },
    { shop: fx.busiestShop.id, technician: 'unassigned' },
    { shop: fx.busiestShop.id, family: 'alto_saxophone' },
    { shop: fx.busiestShop.id, overdue: 'true' },
  ];
  const board = [];
  for (const query of boardQueries) {
    const statements = await statementsOf(() => jobBoard(actor, boardQuerySchema.parse(query)));
    board.push({ path: `/api/jobs?${new URLSearchParams(query).toString()}`, statements });
  }

  // --- explain one of each
  for (const kind of Object.keys(kinds)) {
    const one = search.find((s) => s.kind === kind)!;
    await explain(setupPool, `Serial search, ${kind}: ${decodeURIComponent(one.path)}`, one.statements);
  }
  await explain(setupPool, `Instrument history (${fx.historyInstrument.events} events)`, historyStatements);
  await explain(setupPool, `Job board, page 1 of the open jobs (${fx.busiestShop.openJobs} open)`, board[0].statements);
  await explain(setupPool, 'Job board, filtered: unassigned', board[6].statements);
  fs.mkdirSync(path.dirname(EXPLAIN_PATH), { recursive: true });
  fs.writeFileSync(EXPLAIN_PATH, `# EXPLAIN (ANALYZE, BUFFERS), ${new Date().toISOString()}, ${fx.instruments} instruments\n\n${explains.join('\n')}`);
  await setupPool.end();
  await sequelize.close();

  // --- load
  const server = await startBenchServer();
  const pool = new pg.Pool({ connectionString: BENCH_DATABASE_URL, max: 32 });
  try {
    await httpLoad({ url: server.url, connections: 8, amount: Math.min(300, REQUESTS), cookie, paths: search.map((s) => s.path) });
    const results: Comparison[] = [];
    for (const connections of [8, 32]) {
      results.push(await compare(server, pool, cookie, `search.all.c${connections}`, connections, search.map((s) => s.path), search.map((s) => s.statements), connections === 8 ? 30 : null));
    }
    for (const kind of Object.keys(kinds)) {
      const mine = search.filter((s) => s.kind === kind);
      const http = await httpLoad({ url: server.url, connections: 8, amount: Math.max(50, Math.round(REQUESTS / 4)), cookie, paths: mine.map((s) => s.path) });
      measured(`search.${kind}.c8.http`, http.perSecond, 'req/s', `p50 ${fmt(http.p50)} ms, p95 ${fmt(http.p95)} ms, max ${fmt(http.max)} ms`);
    }
    results.push(await compare(server, pool, cookie, 'history.c8', 8, [`/api/instruments/${fx.historyInstrument.id}/timeline`], [historyStatements], 40));
    results.push(await compare(server, pool, cookie, 'job-board.c8', 8, board.map((b) => b.path), board.map((b) => b.statements), 40));
    console.log(`explain: ${EXPLAIN_PATH}`);
  } finally {
    await server.stop();
    await pool.end();
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
