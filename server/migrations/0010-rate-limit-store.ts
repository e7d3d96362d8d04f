import type { QueryInterface } from 'sequelize';

/**
 * The schema of the rate-limit counters (server/lib/rate-limit.ts): the tables and functions that the
 * PostgreSQL store of `@acpr/rate-limit-postgresql` 1.4.1 calls, as that version leaves them after its
 * own seven SQL steps. The package would run those steps itself, unawaited, from every store it builds
 * (and create the `uuid-ossp` extension and a `migrations` table of its own); here they run once, with
 * the app's other migrations, before any request is served. Ids come from the built-in
 * `gen_random_uuid()`, so no extension is needed.
 *
 * One `sessions` row per counter (its name is the limiter's prefix) is the current window; starting a
 * new window deletes the old row and, through the cascade, every count of the old window, so the tables
 * hold at most one window of counts.
 */
const upSql = `
create schema rate_limit;

create table rate_limit.sessions (
  id uuid primary key default gen_random_uuid(),
  name_ text unique,
  type_ text,
  registered_at timestamptz default now(),
  expires_at timestamptz
);

create table rate_limit.records_aggregated (
  key text not null,
  session_id uuid references rate_limit.sessions (id) on delete cascade,
  count integer default 1,
  constraint unique_session_key unique (session_id, key)
);

create function rate_limit.session_select(name_ text, type_ text)
returns table (id uuid, name_ text, type_ text, expires_at timestamptz) as
$bd$
  select id, name_, type_, expires_at from rate_limit.sessions where name_ = $1 and type_ = $2 limit 1;
$bd$ language sql;

create function rate_limit.session_reset(name_ text, type_ text, expires_at_ timestamptz)
returns table (id uuid, name_ text, type_ text) as
$bd$
  delete from rate_limit.sessions where name_ = $1 and type_ = $2;
  insert into rate_limit.sessions (name_, type_, expires_at) select $1, $2, $3 returning id, name_, type_;
$bd$ language sql;

-- the table lock makes "find the window or start a new one" a single step across all app processes
create function rate_limit.agg_increment(key_ text, prefix text, window_ms double precision, reference_time timestamptz default now())
returns record as
$bd$
declare
  in_session_id uuid;
  in_session_expiration timestamptz;
  session_type text = 'aggregated';
  record_count int = 0;
  ret record;
begin
  lock table rate_limit.sessions;
  select id, expires_at from rate_limit.session_select($2, session_type) where expires_at > $4
    into in_session_id, in_session_expiration;
  if in_session_id is null then
    in_session_expiration = to_timestamp(extract(epoch from $4) + $3 / 1000.0);
    select id from rate_limit.session_reset($2, session_type, in_session_expiration) into in_session_id;
  end if;
  insert into rate_limit.records_aggregated (key, session_id) values ($1, in_session_id)
    on conflict on constraint unique_session_key do update set count = records_aggregated.count + 1
    returning count into record_count;
  ret := (record_count, in_session_expiration);
  return ret;
end;
$bd$ language plpgsql;

create function rate_limit.agg_decrement(key_ text, prefix text, reference_time timestamptz default now())
returns void as
$bd$
declare
  in_session_id uuid;
begin
  select id from rate_limit.session_select($2, 'aggregated') where expires_at > $3 into in_session_id;
  update rate_limit.records_aggregated set count = greatest(0, count - 1) where key = $1 and session_id = in_session_id;
end;
$bd$ language plpgsql;

create function rate_limit.agg_reset_key(key_ text, prefix text, reference_time timestamptz default now())
returns void as
$bd$
declare
  in_session_id uuid;
begin
  select id from rate_limit.session_select($2, 'aggregated') where expires_at > $3 into in_session_id;
  delete from rate_limit.records_aggregated where key = $1 and session_id = in_session_id;
end;
$bd$ language plpgsql;

create function rate_limit.agg_reset_session(prefix text, reference_time timestamptz default now())
returns void as
$bd$
declare
  in_session_id uuid;
begin
  select id from rate_limit.session_select($1, 'aggregated') where expires_at > $2 into in_session_id;
  delete from rate_limit.records_aggregated where session_id = in_session_id;
end;
$bd$ language plpgsql;
`;

const downSql = `drop schema if exists rate_limit cascade;`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
