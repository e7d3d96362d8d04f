/**
 * Bench data: `npm run bench:data -- --instruments 1000000`.
 *
 * Builds a database of its own (BENCH_DATABASE_URL, by default `benchrelay_bench` on $PGPORT; the demo
 * database `benchrelay` is refused), drops what it held, migrates it, and fills it with four invented
 * networks: one large network of 60 shops and three smaller ones (12, 4 and 1 shops). At the default
 * size: 1,000,000 instruments in realistic serial shapes, 5,000,000 history events, 200,000 jobs of
 * which 5,000 are open at the large network's busiest shop, customers, and notices. Every count scales
 * with --instruments, so `--instruments 2000` is a run of a few seconds.
 *
 * Rows are made inside PostgreSQL with set-based `insert … select … from generate_series(…)`: no
 * row crosses the wire, which is faster than COPY of the same rows from Node. Ids are derived from a
 * name and a number (`bench_uuid`), so a job can name its instrument without a lookup. The secondary
 * indexes of the big tables are dropped for the load and built again after it (one sort instead of a
 * million index insertions), and so are their foreign keys, added back and so checked on every row
 * after it; primary and unique keys stay throughout.
 *
 * Then it makes one bench person per role at the busiest shop, each with a session row, and writes
 * .data/bench/<database>.json (ids, counts and session cookies) for the benchmarks, which go through the
 * real HTTP API as those people.
 */
import './lib/env.js';
import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import pg from 'pg';
import { BENCH_DATABASE, BENCH_DATABASE_URL } from './lib/env.js';
import { argValue } from './lib/stats.js';
import { mintSession } from './lib/sessions.js';
import { FIXTURES_PATH, type BenchFixtures } from './lib/fixtures.js';
import { config } from '../config.js';
import { INSTRUMENT_FAMILIES } from '../../shared/domain.js';

const NETWORKS = [
  { slug: 'bench-large', name: 'Bench large network', shops: 60, share: 0.7 },
  { slug: 'bench-mid', name: 'Bench middle network', shops: 12, share: 0.2 },
  { slug: 'bench-small', name: 'Bench small network', shops: 4, share: 0.08 },
  { slug: 'bench-single', name: 'Bench single shop', shops: 1, share: 0.02 },
];
const MAKERS = ['Aldmoor', 'Veyron Winds', 'Quellstone', 'Harrowgate & Finch', 'Brassmere', 'Oxlade Reedworks', 'Tamsin Vale', 'Corvell Band Works'];
const CITIES: Array<[string, string, number, number]> = [
  ['Denver', 'America/Denver', 39.7392, -104.9903], ['Salt Lake City', 'America/Denver', 40.7608, -111.891],
  ['Phoenix', 'America/Phoenix', 33.4484, -112.074], ['Chicago', 'America/Chicago', 41.8781, -87.6298],
  ['Portland', 'America/Los_Angeles', 45.5152, -122.6784], ['Boston', 'America/New_York', 42.3601, -71.0589],
];
const pgArray = (values: string[]) => `{${values.map((v) => `"${v.replace(/"/g, '\\"')}"`).join(',')}}`;

/** Instrument g of a network sits at shop (1 + …): one in ten at shop 1, the busiest, the rest spread. */
const SHOP_OF = (g: string, shops: string) => `(case when ${g} % 10 = 0 then 1 else 1 + ${g} % ${shops} end)`;

async function main() {
  const N = Number(argValue('instruments', process.env.BENCH_INSTRUMENTS ?? '1000000'));
  if (!Number.isInteger(N) || N < 1000) throw new Error('--instruments must be a whole number of at least 1000');
  const scale = N / 1_000_000;
  const started = performance.now();
  const step = (what: string) => {
    const s = ((performance.now() - started) / 1000).toFixed(1);
    console.log(`[${s.padStart(6)} s] ${what}`);
  };

  // a fresh database of its own every time: the demo database is never touched (lib/env.ts refuses it)
  const pgEnv = { ...process.env, PGPORT: new URL(BENCH_DATABASE_URL).port || '5432' };
  execFileSync('bash', ['docker-free-dev/postgres.sh', 'start'], { env: pgEnv, stdio: ['ignore', 'ignore', 'inherit'] });
  execFileSync('bash', ['docker-free-dev/postgres.sh', 'reset-db', BENCH_DATABASE], { env: pgEnv, stdio: ['ignore', 'ignore', 'inherit'] });
  const { migrateUp } = await import('../migrate.js');
  const { sequelize } = await import('../lib/db.js');
  await migrateUp();
  await sequelize.close();
  step(`database ${BENCH_DATABASE} created and migrated`);

  const pool = new pg.Pool({ connectionString: BENCH_DATABASE_URL, max: 2 });
  const db = await pool.connect();
  // rows come back as text or numbers; every use below reads them as such
  const q = (sql: string, params: unknown[] = []) => db.query<Record<string, string>>(sql, params);
  await q(`set synchronous_commit = off`);
  await q(`set maintenance_work_mem = '512MB'`);
  await q(`set work_mem = '128MB'`);
  // history event ids rise with their number, so five million of them go in at the right edge of the
  // primary key instead of at random places in it (the real ids are random, which matters little to reads)
  await q(`create or replace function bench_seq_uuid(n bigint, name text) returns uuid language sql immutable as $$
    select (lpad(to_hex(n), 12, '0') || '4' || substr(h, 14, 3) || '8' || substr(h, 18, 15))::uuid from md5(name) h $$`);
  await q(`create or replace function bench_uuid(name text) returns uuid language sql immutable as $$
    select (substr(h, 1, 12) || '4' || substr(h, 14, 3) || '8' || substr(h, 18, 15))::uuid from md5(name) h $$`);

  // secondary indexes of the big tables: dropped for the load, built again after it
  const big = ['instruments', 'history_events', 'jobs', 'customers', 'notifications'];
  const { rows: indexes } = await q(
    `select i.indexname, i.indexdef from pg_indexes i
      where i.schemaname = 'public' and i.tablename = any($1)
        and not exists (select 1 from pg_constraint c where c.conname = i.indexname)`,
    [big],
  );
  for (const ix of indexes) await q(`drop index ${ix.indexname}`);
  // and their foreign keys: added back after the load, when PostgreSQL checks every row in one join
  // instead of one lookup per row and key (the load is 5 to 10 times faster)
  const { rows: foreignKeys } = await q(
    `select c.conrelid::regclass::text as tbl, c.conname, pg_get_constraintdef(c.oid) as def
       from pg_constraint c where c.contype = 'f' and c.conrelid::regclass::text = any($1)`,
    [big],
  );
  for (const fk of foreignKeys) await q(`alter table ${fk.tbl} drop constraint ${fk.conname}`);

  const counts: Record<string, number> = { networks: 0, shops: 0, users: 0, customers: 0, instruments: 0, jobs: 0, openJobsBusiestShop: 0, historyEvents: 0, notifications: 0 };
  const totalJobs = Math.round(200_000 * scale);
  const totalEvents = Math.round(5_000_000 * scale);
  const openAtBusiest = Math.max(10, Math.round(5_000 * scale));

  for (const net of NETWORKS) {
    const n = Math.max(50, Math.round(N * net.share));
    const S = net.shops;
    const slug = net.slug;
    const {
      rows: [{ id: networkId }],
    } = await q(`insert into networks (name, slug) values ($1, $2) returning id`, [net.name, slug]);
    counts.networks++;

    await q(
      `insert into shops (network_id, id, name, code, city, latitude, longitude, time_zone, labor_rate_cents)
       select $1::uuid, bench_uuid($2 || ':shop:' || s), 'Bench shop ' || s || ' (' || c.city || ')', 'BS' || lpad(s::text, 3, '0'),
              c.city, c.lat, c.lon, c.tz, 8000 + (s % 5) * 500
         from generate_series(1, $3::int) s
         cross join lateral (select (($4::text[])[1 + s % 6]) as city, (($5::text[])[1 + s % 6]) as tz,
                                    (($6::numeric[])[1 + s % 6]) as lat, (($7::numeric[])[1 + s % 6]) as lon) c`,
      [networkId, slug, S, pgArray(CITIES.map((c) => c[0])), pgArray(CITIES.map((c) => c[1])), `{${CITIES.map((c) => c[2]).join(',')}}`, `{${CITIES.map((c) => c[3]).join(',')}}`],
    );
    counts.shops += S;
    await q(
      `insert into skills (network_id, id, code, name)
       select $1::uuid, bench_uuid($2 || ':skill:' || k), k, initcap(replace(k, '_', ' ')) from unnest($3::text[]) k`,
      [networkId, slug, '{repad,brass_dent,low_reed,flute_headjoint}'],
    );

    // people: an owner, a regional manager per ten shops, and per shop a front desk and two technicians;
    // at shop 1 also an auditor
    await q(
      `insert into users (network_id, id, email, name)
       select $1::uuid, bench_uuid($2 || ':user:' || who), who || '@' || $2 || '.bench.test', 'Bench ' || replace(who, '-', ' ')
         from (select 'owner' as who
               union all select 'manager-' || r from generate_series(1, ceil($3::int / 10.0)::int) r
               union all select 'desk-' || s from generate_series(1, $3::int) s
               union all select 'tech-' || s || '-' || t from generate_series(1, $3::int) s, generate_series(0, 1) t
               union all select 'auditor-1') people`,
      [networkId, slug, S],
    );
    await q(
      `insert into memberships (network_id, user_id, shop_id, role)
       select $1::uuid, bench_uuid($2 || ':user:owner'), null, 'owner'
       union all select $1::uuid, bench_uuid($2 || ':user:manager-' || (1 + (s - 1) / 10)), bench_uuid($2 || ':shop:' || s), 'regional_manager' from generate_series(1, $3::int) s
       union all select $1::uuid, bench_uuid($2 || ':user:desk-' || s), bench_uuid($2 || ':shop:' || s), 'front_desk' from generate_series(1, $3::int) s
       union all select $1::uuid, bench_uuid($2 || ':user:tech-' || s || '-' || t), bench_uuid($2 || ':shop:' || s), 'technician' from generate_series(1, $3::int) s, generate_series(0, 1) t
       union all select $1::uuid, bench_uuid($2 || ':user:auditor-1'), bench_uuid($2 || ':shop:1'), 'auditor'`,
      [networkId, slug, S],
    );
    const {
      rows: [{ n: users }],
    } = await q(`select count(*)::int as n from users where network_id = $1`, [networkId]);
    counts.users += Number(users);

    const C = Math.max(20, Math.round(n / 20));
    await q(
      `insert into customers (network_id, id, kind, name, contact_name, email, phone, home_shop_id)
       select $1::uuid, bench_uuid($2 || ':cust:' || c),
              (array['person', 'school', 'fleet'])[1 + c % 3],
              case c % 3 when 1 then 'Bench School District ' || c when 2 then 'Bench Rental Fleet ' || c else 'Bench Player ' || c end,
              'Contact ' || c, 'customer' || c || '@' || $2 || '.bench.test', '555-01' || lpad((c % 100)::text, 2, '0'),
              bench_uuid($2 || ':shop:' || (1 + c % $3::int))
         from generate_series(1, $4::int) c`,
      [networkId, slug, S, C],
    );
    counts.customers += C;
    step(`${slug}: ${S} shops, ${users} people, ${C.toLocaleString('en-US')} customers`);

    // (g * 7919) mod 10^8 is a bijection for g < 10^8, so serials are distinct while neighbouring rows
    // get unrelated digits, as real serials of one fleet do; eight makers, eight engraving styles
    await q(
      `insert into instruments (network_id, id, family, maker, maker_normalized, model, serial, serial_normalized,
                                owner_kind, owner_customer_id, current_shop_id, status, asset_tag, year_made, created_at, updated_at)
       select $1::uuid, bench_uuid($2 || ':inst:' || g),
              ($3::text[])[1 + g % ${INSTRUMENT_FAMILIES.length}], m.maker, lower(m.maker), 'Model ' || (g % 40), m.serial,
              upper(regexp_replace(m.serial, '[\\s./\\\\_-]+', '', 'g')),
              case when g % 5 < 2 then 'rental_fleet' when g % 5 = 2 then 'school' else 'customer' end,
              case when g % 5 < 2 then null else bench_uuid($2 || ':cust:' || (1 + (g * 31) % $6::int)) end,
              bench_uuid($2 || ':shop:' || ${SHOP_OF('g', '$5::int')}),
              case when g % 10 = 0 then 'in_shop' else 'in_service' end,
              case when g % 5 < 2 then upper(left($2, 1)) || 'F-' || g end,
              1960 + g % 65,
              now() - make_interval(days => (g % 3650)::int), now()
         from generate_series(1, $7::int) g
         cross join lateral (select lpad(((g::bigint * 7919 + $8::bigint) % 100000000)::text, 8, '0') as d) dd
         cross join lateral (select ($4::text[])[1 + g % 8] as maker,
                case g % 8
                  when 0 then 'AB-' || substr(d, 1, 4) || ' ' || substr(d, 5, 4)
                  when 1 then d
                  when 2 then 'Q ' || substr(d, 1, 3) || ' ' || substr(d, 4, 5)
                  when 3 then 'HF/' || d
                  when 4 then 'BM.' || substr(d, 1, 2) || '.' || substr(d, 3)
                  when 5 then 'ox ' || substr(d, 1, 5) || '-' || substr(d, 6)
                  when 6 then 'TV_' || d
                  else 'C' || substr(d, 2) end as serial) m`,
      [networkId, slug, pgArray([...INSTRUMENT_FAMILIES]), pgArray(MAKERS), S, C, n, NETWORKS.indexOf(net) * 13],
    );
    counts.instruments += n;
    step(`${slug}: ${n.toLocaleString('en-US')} instruments`);

    // jobs: at the large network the first `openAtBusiest` are open at shop 1 (instruments g = 10 j sit
    // there); the rest are nine in ten released, one in ten open, each at its instrument's shop
    const J = Math.max(20, Math.round(totalJobs * net.share));
    const openBusy = net === NETWORKS[0] ? Math.min(openAtBusiest, Math.floor(n / 10)) : 0;
    await q(
      `insert into jobs (network_id, id, number, instrument_id, shop_id, customer_id, stage, stage_before_hold, complaint,
                         promised_on, assigned_user_id, required_skill_id, estimated_hours, opened_by_user_id, opened_at,
                         ready_at, released_at, created_at, updated_at)
       select $1::uuid, bench_uuid($2 || ':job:' || j), j, bench_uuid($2 || ':inst:' || x.g), bench_uuid($2 || ':shop:' || x.shop),
              case when x.g % 5 < 2 then null else bench_uuid($2 || ':cust:' || (1 + (x.g * 31) % $5::int)) end,
              x.stage, case when x.stage in ('waiting_for_parts', 'in_transit') then 'on_bench' end,
              (array['Sticky G# pad', 'Leak test and repad', 'Dent in the bell', 'Stuck slide', 'Loose tenon cork', 'Spring replacement'])[1 + j % 6],
              (x.opened + make_interval(days => 10 + j % 20))::date,
              case when j % 4 = 0 then null else bench_uuid($2 || ':user:tech-' || x.shop || '-' || (j % 2)) end,
              case when j % 3 = 0 then bench_uuid($2 || ':skill:' || (array['repad', 'brass_dent', 'low_reed', 'flute_headjoint'])[1 + j % 4]) end,
              1 + (j % 8) * 0.5, bench_uuid($2 || ':user:desk-' || x.shop), x.opened,
              case when x.stage in ('ready', 'released') then x.opened + interval '9 days' end,
              case when x.stage = 'released' then x.opened + interval '12 days' end,
              x.opened, x.opened
         from generate_series(1, $3::int) j
         cross join lateral (
           select g, ${SHOP_OF('g', '$6::int')} as shop,
                  case when j <= $4::int or j % 10 = 0
                       then (array['intake', 'assessed', 'approved', 'on_bench', 'quality_check', 'ready', 'waiting_for_parts'])[1 + j % 7]
                       else 'released' end as stage,
                  now() - make_interval(days => (case when j <= $4::int or j % 10 = 0 then j % 60 else 60 + j % 3000 end)::int) as opened
             -- an open job elsewhere never lands at shop 1, whose open count is the board benchmark's
             from (select case when j <= $4::int then 10 * j
                               when j % 10 = 0 and (1 + (j::bigint * 7919) % $7::int) % 10 = 0 then (j::bigint * 7919) % $7::int
                               else 1 + (j::bigint * 7919) % $7::int end as g) gg
         ) x`,
      [networkId, slug, J, openBusy, C, S, n],
    );
    counts.jobs += J;
    if (openBusy) {
      const {
        rows: [{ n: open }],
      } = await q(`select count(*)::int as n from jobs where network_id = $1 and shop_id = bench_uuid($2 || ':shop:1') and stage <> 'released'`, [networkId, slug]);
      counts.openJobsBusiestShop = Number(open);
    }
    step(`${slug}: ${J.toLocaleString('en-US')} jobs${openBusy ? `, ${counts.openJobsBusiestShop.toLocaleString('en-US')} open at shop 1` : ''}`);

    // history: about five events per instrument, spread over ten years; instrument 10 (shop 1) is the
    // history benchmark's, and gets exactly 100 below
    const H = Math.max(100, Math.round(totalEvents * net.share));
    await q(
      `insert into history_events (network_id, id, instrument_id, shop_id, kind, summary, data, occurred_at, created_at)
       select $1::uuid, bench_seq_uuid(e, $2), bench_uuid($2 || ':inst:' || x.g), bench_uuid($2 || ':shop:' || ${SHOP_OF('x.g', '$4::int')}),
              k.kind, k.summary, '{}'::jsonb, now() - make_interval(mins => (e % 5256000)::int), now()
         from generate_series(1, $3::int) e
         cross join lateral (select case when (1 + (e::bigint * 104729) % $5::int) = 10 then 11 else 1 + (e::bigint * 104729) % $5::int end as g) x
         cross join lateral (select (array['intake', 'job_opened', 'stage_changed', 'stage_changed', 'note', 'transfer_received'])[1 + e % 6] as kind,
                                    (array['Taken in at the front desk', 'Job opened', 'Moved to On bench', 'Moved to Ready',
                                           'Customer asked for a call before any repad', 'Received from another shop'])[1 + e % 6] as summary) k`,
      [networkId, slug, H, S, n],
    );
    counts.historyEvents += H;
    if (net === NETWORKS[0]) {
      await q(
        `insert into history_events (network_id, id, instrument_id, job_id, shop_id, user_id, kind, summary, data, occurred_at)
         select $1::uuid, bench_uuid($2 || ':hist10:' || e), bench_uuid($2 || ':inst:10'), bench_uuid($2 || ':job:1'),
                bench_uuid($2 || ':shop:1'), bench_uuid($2 || ':user:tech-1-' || (e % 2)),
                (array['stage_changed', 'note', 'stage_changed', 'photo_added'])[1 + e % 4], 'Bench timeline event ' || e,
                jsonb_build_object('n', e), now() - make_interval(hours => e)
           from generate_series(1, 100) e`,
        [networkId, slug],
      );
      counts.historyEvents += 100;
    }
    step(`${slug}: ${H.toLocaleString('en-US')} history events`);

    // notices: twenty per person, a third unread
    await q(
      `insert into notifications (network_id, user_id, kind, title, body, read_at, created_at)
       select $1::uuid, u.id, (array['transfer_incoming', 'job_ready', 'estimate_awaiting_approval', 'transfer_overdue'])[1 + k % 4],
              'Bench notice ' || k, 'Job ' || k || ' needs a look', case when k % 3 = 0 then null else now() end,
              now() - make_interval(hours => k)
         from users u, generate_series(1, 20) k where u.network_id = $1`,
      [networkId],
    );
    counts.notifications += Number(users) * 20;
  }

  step(`building ${indexes.length} secondary indexes`);
  for (const ix of indexes) await q(ix.indexdef);
  step(`checking ${foreignKeys.length} foreign keys`);
  for (const fk of foreignKeys) await q(`alter table ${fk.tbl} add constraint ${fk.conname} ${fk.def}`);
  step('vacuum analyze');
  for (const t of [...big, 'shops', 'users', 'memberships', 'skills']) await q(`vacuum analyze ${t}`);

  const large = NETWORKS[0].slug;
  const {
    rows: [ids],
  } = await q(
    `select n.id as network_id, bench_uuid($1 || ':shop:1') as shop_id, bench_uuid($1 || ':inst:10') as instrument_id,
            (select count(*)::int from history_events h where h.network_id = n.id and h.instrument_id = bench_uuid($1 || ':inst:10')) as events
       from networks n where n.slug = $1`,
    [large],
  );
  const roles = { owner: 'owner', regional_manager: 'manager-1', front_desk: 'desk-1', technician: 'tech-1-0', auditor: 'auditor-1' } as const;
  const people = {} as BenchFixtures['people'];
  for (const [role, who] of Object.entries(roles) as Array<[keyof typeof roles, string]>) {
    const {
      rows: [{ id }],
    } = await q(`select bench_uuid($1) as id`, [`${large}:user:${who}`]);
    people[role] = { id, cookie: await mintSession(pool, { id, networkId: ids.network_id }, config.sessionSecret) };
  }
  db.release();
  await pool.end();

  const generationSeconds = (performance.now() - started) / 1000;
  const fixtures: BenchFixtures = {
    database: BENCH_DATABASE,
    instruments: N,
    createdAt: new Date().toISOString(),
    generationSeconds,
    counts,
    network: { id: ids.network_id, slug: large, shops: NETWORKS[0].shops },
    busiestShop: { id: ids.shop_id, openJobs: counts.openJobsBusiestShop },
    historyInstrument: { id: ids.instrument_id, events: Number(ids.events) },
    people,
  };
  fs.mkdirSync(path.dirname(FIXTURES_PATH), { recursive: true });
  fs.writeFileSync(FIXTURES_PATH, JSON.stringify(fixtures, null, 2));
  step('done');
  for (const [k, v] of Object.entries(counts)) console.log(`  ${k.padEnd(20)} ${v.toLocaleString('en-US')}`);
  console.log(`MEASURED bench-data-seconds = ${generationSeconds.toFixed(1)} s | limit <= 600 s | ratio ${(generationSeconds / 600).toFixed(2)}`);
  console.log(`fixtures: ${FIXTURES_PATH}`);
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
