import { sequelize } from '../../server/lib/db.js';

/**
 * A row count and an md5 checksum of every table's whole content, for "a refused request changed
 * nothing". Left out, because their rows change on requests that change nothing of a network's data:
 * - `public.session`: express-session touches a signed-in person's row on use (at most once a minute,
 *   server/lib/auth.ts), and sign-in writes a new one;
 * - schema `rate_limit`: every counted request (sign-in, search, uploads, imports) bumps a counter.
 * Everything else counts, the queue's own schema (`bullmq`) included: a refused step must not queue work.
 */
export const SKIPPED_TABLES = ['public.session', 'rate_limit.*'];

let sql = '';

async function checksumSql(): Promise<string> {
  if (sql) return sql;
  const [tables] = (await sequelize.query(
    `select table_schema as s, table_name as t from information_schema.tables
      where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema', 'rate_limit')
        and not (table_schema = 'public' and table_name in ('session', 'SequelizeMeta'))
      order by 1, 2`,
  )) as [Array<{ s: string; t: string }>, unknown];
  sql = tables
    .map(
      ({ s, t }) =>
        `select '${s}.${t}' as t, count(*)::text || ':' || coalesce(md5(string_agg(x::text, '|' order by x::text)), '-') as c from "${s}"."${t}" x`,
    )
    .join(' union all ');
  return sql;
}

/** `{ 'public.jobs': '<rows>:<md5>', … }` for every table but the skipped ones. */
export async function tableChecksums(): Promise<Record<string, string>> {
  const [rows] = (await sequelize.query(await checksumSql())) as [Array<{ t: string; c: string }>, unknown];
  return Object.fromEntries(rows.map((r) => [r.t, r.c]));
}

/** Tables whose count or checksum differs between two snapshots. */
export function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  return Object.keys({ ...before, ...after }).filter((t) => before[t] !== after[t]);
}

/** Forget the table list (a test that adds tables, e.g. after migrating a fresh database). */
export function resetChecksumTables() {
  sql = '';
}
