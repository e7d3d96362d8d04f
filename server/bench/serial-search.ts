/**
 * Serial search at scale: `npm run bench:search`.
 *
 * Generates BENCH_INSTRUMENTS instruments (default 1,000,000) in a network of its own in the database
 * named by DATABASE_URL, in eight serial styles (dashes, spaces, slashes, dots, underscores, lower case,
 * bare digits), with an open job on one instrument in a hundred. It then times the registry's own search
 * function (the code path the API runs, transaction and all) on five kinds of query a front desk types,
 * prints p50/p95/max per kind, checks that the intended instrument is found, and shows which index
 * each part of the query used.
 *
 *   BENCH_INSTRUMENTS=200000 npm run bench:search     a smaller run
 *   BENCH_QUERIES=300                                  queries per kind (default 200)
 *   BENCH_KEEP=1                                       keep the generated network for the next run
 *
 * A network from an earlier run with BENCH_KEEP=1 and the same size is reused, so only the first run
 * pays for generation (about a minute and a half per million rows on two cores).
 */
import os from 'node:os';
import { performance } from 'node:perf_hooks';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../lib/db.js';
import { Membership, Network, Shop, User } from '../lib/models.js';
import { abilityFor } from '../../shared/auth/ability.js';
import { INSTRUMENT_FAMILIES } from '../../shared/domain.js';
import { normalizeSerial } from '../../shared/serial.js';
import type { Actor } from '../lib/auth.js';
import { buildSearchQuery, searchInstruments } from '../modules/registry/service.js';
import { instrumentSearchSchema } from '../../shared/schemas/registry.js';

const N = Number(process.env.BENCH_INSTRUMENTS ?? 1_000_000);
const QUERIES = Number(process.env.BENCH_QUERIES ?? 200);
const KEEP = process.env.BENCH_KEEP === '1';
const SLUG = `bench-serial-search-${N}`;

const MAKERS = ['Aldmoor', 'Skelmire Winds', 'Quellstone', 'Harrowgate & Finch', 'Brassmere', 'Oxlade Reedworks', 'Tamsin Vale', 'Corvell Band Works'];

// (g * 7919) mod 10^8 is a bijection for g < 10^8 (7919 is prime to 10^8), so every serial is distinct
// while neighbouring rows get unrelated digits, as real serials of one fleet do.
const GENERATE_SQL = `
insert into instruments (network_id, family, maker, maker_normalized, model, serial, serial_normalized,
                         owner_kind, current_shop_id, status, asset_tag)
select :networkId,
       (:families::text[])[1 + g % ${INSTRUMENT_FAMILIES.length}],
       m.maker, lower(m.maker), 'Model ' || (g % 40), m.serial,
       upper(regexp_replace(m.serial, '[\\s./\\\\_-]+', '', 'g')),
       'rental_fleet', (:shops::uuid[])[1 + g % 5], 'in_service', 'BN-' || g
  from generate_series(1, :n) g
  cross join lateral (select lpad(((g::bigint * 7919) % 100000000)::text, 8, '0') as d) dd
  cross join lateral (select (:makers::text[])[1 + g % 8] as maker,
         case g % 8
           when 0 then 'AB-' || substr(d, 1, 4) || ' ' || substr(d, 5, 4)
           when 1 then d
           when 2 then 'Q ' || substr(d, 1, 3) || ' ' || substr(d, 4, 5)
           when 3 then 'HF/' || d
           when 4 then 'BM.' || substr(d, 1, 2) || '.' || substr(d, 3)
           when 5 then 'ox ' || substr(d, 1, 5) || '-' || substr(d, 6)
           when 6 then 'TV_' || d
           else d end as serial) m`;

const pgArray = (values: string[]) => `{${values.map((v) => `"${v.replace(/"/g, '\\"')}"`).join(',')}}`;

async function prepare(): Promise<{ networkId: string; actor: Actor; generatedMs: number | null }> {
  let network = await Network.findOne({ where: { slug: SLUG } });
  let generatedMs: number | null = null;
  if (network) {
    const [{ n }] = await sequelize.query<{ n: number }>('select count(*)::int as n from instruments where network_id = :id', {
      replacements: { id: network.id }, type: QueryTypes.SELECT,
    });
    if (n !== N) {
      await network.destroy();
      network = null;
    }
  }
  if (!network) {
    network = await Network.create({ name: `Serial search benchmark (${N})`, slug: SLUG });
    const shops = await Shop.bulkCreate(
      [1, 2, 3, 4, 5].map((i) => ({
        networkId: network!.id, name: `Bench shop ${i}`, code: `BS${i}`, timeZone: 'America/Denver', laborRateCents: 9000,
        openingDays: [1, 2, 3, 4, 5] as Shop['openingDays'],
      })),
    );
    const user = await User.create({ networkId: network.id, email: 'bench@benchrelay.test', name: 'Bench runner' });
    await Membership.create({ networkId: network.id, userId: user.id, shopId: null, role: 'owner' });
    const started = performance.now();
    console.log(`generating ${N.toLocaleString('en-US')} instruments…`);
    await sequelize.query(GENERATE_SQL, {
      replacements: {
        networkId: network.id, n: N, families: pgArray([...INSTRUMENT_FAMILIES]), makers: pgArray(MAKERS),
        shops: pgArray(shops.map((s) => s.id)),
      },
    });
    // one open job per hundred instruments, so the result's "open job" lookup has rows to find
    await sequelize.query(
      `insert into jobs (network_id, number, instrument_id, shop_id, stage, complaint, opened_by_user_id)
       select i.network_id, row_number() over (order by i.id), i.id, i.current_shop_id, 'on_bench', 'Benchmark job', :userId
         from instruments i where i.network_id = :networkId and abs(hashtext(i.id::text)) % 100 = 0`,
      { replacements: { networkId: network.id, userId: user.id } },
    );
    await sequelize.query('vacuum analyze instruments');
    await sequelize.query('vacuum analyze jobs');
    generatedMs = performance.now() - started;
  }
  const owner = await Membership.findOne({ where: { networkId: network.id, role: 'owner' } });
  const user = await User.findOne({ where: { networkId: network.id, id: owner!.userId } });
  const memberships = [{ shopId: null, role: 'owner' as const }];
  const actor: Actor = {
    id: user!.id, networkId: network.id, email: user!.email, name: user!.name, memberships,
    ability: abilityFor({ id: user!.id, memberships }),
  };
  return { networkId: network.id, actor, generatedMs };
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

interface Sample { id: string; serial: string; normalized: string }

function retype(serial: string, rand: () => number): string {
  // what a person types from the engraving: other case, other separators
  const n = normalizeSerial(serial);
  const cut = 2 + Math.floor(rand() * (n.length - 3));
  const sep = [' ', '-', '.', ' - '][Math.floor(rand() * 4)];
  const text = `${n.slice(0, cut)}${sep}${n.slice(cut)}`;
  return rand() < 0.5 ? text.toLowerCase() : text;
}

function typo(normalized: string, rand: () => number): string {
  const at = 2 + Math.floor(rand() * (normalized.length - 3));
  const digits = '0123456789';
  let c = normalized[at];
  while (c === normalized[at]) c = digits[Math.floor(rand() * 10)];
  return normalized.slice(0, at) + c + normalized.slice(at + 1);
}

function swapNeighbours(normalized: string, rand: () => number): string {
  let at = Math.floor(rand() * (normalized.length - 1));
  for (let tries = 0; normalized[at] === normalized[at + 1] && tries < normalized.length; tries++) at = (at + 1) % (normalized.length - 1);
  return normalized.slice(0, at) + normalized[at + 1] + normalized[at] + normalized.slice(at + 2);
}

function dropOne(normalized: string, rand: () => number): string {
  const at = Math.floor(rand() * normalized.length);
  return normalized.slice(0, at) + normalized.slice(at + 1);
}

function addOne(normalized: string, rand: () => number): string {
  const at = Math.floor(rand() * (normalized.length + 1));
  return normalized.slice(0, at) + '0123456789'[Math.floor(rand() * 10)] + normalized.slice(at);
}

const percentile = (sorted: number[], p: number) => sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];

async function main() {
  const { networkId, actor, generatedMs } = await prepare();
  const samples = await sequelize.query<Sample>(
    `select id, serial, serial_normalized as normalized from instruments tablesample system (1)
      where network_id = :networkId limit :n`,
    { replacements: { networkId, n: QUERIES }, type: QueryTypes.SELECT },
  );
  const rand = prng(8_675_309);
  const kinds: Array<{ name: string; query: (s: Sample) => string; expect?: 'first' | 'found' }> = [
    { name: 'exact, retyped (case, separators)', query: (s) => retype(s.serial, rand), expect: 'first' },
    { name: 'prefix while typing (4–7 chars)', query: (s) => s.normalized.slice(0, 4 + Math.floor(rand() * 4)) },
    { name: 'one-character typo', query: (s) => typo(s.normalized, rand), expect: 'found' },
    { name: 'neighbours swapped', query: (s) => swapNeighbours(s.normalized, rand), expect: 'found' },
    { name: 'one character dropped', query: (s) => dropOne(s.normalized, rand), expect: 'found' },
    { name: 'one character added', query: (s) => addOne(s.normalized, rand), expect: 'found' },
    { name: 'fragment from the middle (5 chars)', query: (s) => s.normalized.slice(3, 8) },
    { name: 'not in the registry', query: () => `ZZ${Math.floor(rand() * 1e6)}Q` },
  ];

  for (const s of samples.slice(0, 20)) await searchInstruments(actor, instrumentSearchSchema.parse({ q: s.serial })); // warm up

  const report: string[] = [];
  const all: number[] = [];
  for (const kind of kinds) {
    const times: number[] = [];
    let hits = 0;
    for (const s of samples) {
      const q = kind.query(s);
      const started = performance.now();
      const results = await searchInstruments(actor, instrumentSearchSchema.parse({ q, limit: 20 }));
      times.push(performance.now() - started);
      if (kind.expect === 'first' && results[0]?.id === s.id) hits++;
      if (kind.expect === 'found' && results.some((r) => r.id === s.id)) hits++;
    }
    times.sort((a, b) => a - b);
    all.push(...times);
    const found = kind.expect ? `${((hits / samples.length) * 100).toFixed(1)} % ${kind.expect === 'first' ? 'ranked first' : 'found'}` : '';
    report.push(`| ${kind.name} | ${times.length} | ${percentile(times, 50).toFixed(1)} | ${percentile(times, 95).toFixed(1)} | ${times.at(-1)!.toFixed(1)} | ${found} |`);
  }
  all.sort((a, b) => a - b);

  // which index serves each part of the query
  const plans: string[] = [];
  for (const q of [samples[0].normalized, samples[1].normalized.slice(0, 5), typo(samples[2].normalized, rand)]) {
    const { sql, replacements, threshold } = buildSearchQuery(actor, instrumentSearchSchema.parse({ q }), undefined, { nearMisses: true });
    const plan = await sequelize.transaction(async (transaction) => {
      if (threshold) {
        await sequelize.query(`select set_config('pg_trgm.similarity_threshold', :t, true)`, {
          replacements: { t: String(threshold) }, type: QueryTypes.SELECT, transaction,
        });
      }
      const rows = await sequelize.query<{ 'QUERY PLAN': string }>(`explain ${sql}`, { replacements, type: QueryTypes.SELECT, transaction });
      return rows.map((r) => r['QUERY PLAN']).join('\n');
    });
    const used = [...new Set([...plan.matchAll(/(?:Index Scan|Index Only Scan|Bitmap Index Scan) (?:Backward )?using (\w+)|Bitmap Index Scan on (\w+)/g)].map((m) => m[1] ?? m[2]))];
    const seqScan = /Seq Scan on instruments/.test(plan);
    plans.push(`- \`${q}\`: ${used.join(', ')}${seqScan ? ' — and a SEQUENTIAL SCAN of instruments' : ''}`);
  }

  const [{ version }] = await sequelize.query<{ version: string }>('select version()', { type: QueryTypes.SELECT });
  const cpu = os.cpus()[0]?.model ?? 'unknown CPU';
  console.log(`
## Serial search, ${N.toLocaleString('en-US')} instruments — ${new Date().toISOString().slice(0, 10)}

Machine: ${os.cpus().length} cores (${cpu}), ${(os.totalmem() / 2 ** 30).toFixed(1)} GiB RAM, ${version.split(',')[0]}.
${generatedMs ? `Generation: ${(generatedMs / 1000).toFixed(0)} s (insert, indexes, vacuum analyze).` : 'Generation: reused from an earlier run.'}
Each query is one call of the registry's \`searchInstruments\` (transaction, similarity threshold, ranked UNION, open-job lookup), limit 20, ms:

| query | n | p50 | p95 | max | correct |
|---|---:|---:|---:|---:|---|
${report.join('\n')}
| **all** | ${all.length} | ${percentile(all, 50).toFixed(1)} | ${percentile(all, 95).toFixed(1)} | ${all.at(-1)!.toFixed(1)} | |

Indexes in the plans:
${plans.join('\n')}
`);

  if (!KEEP) {
    await sequelize.query('delete from networks where id = :networkId', { replacements: { networkId } });
    console.log('(generated network removed; BENCH_KEEP=1 keeps it for the next run)');
  }
}

main()
  .then(() => sequelize.close())
  .catch(async (err) => {
    console.error(err);
    await sequelize.close();
    process.exit(1);
  });
