import type { QueryInterface } from 'sequelize';
import {
  ALL_JOB_STAGES,
  INSTRUMENT_FAMILIES,
  JOB_HOLDS,
  JOB_STAGES,
  NOTIFICATION_KINDS,
  OWNER_KINDS,
  ROLES,
  TRANSFER_STATES,
} from '../../shared/domain.js';

/**
 * The whole schema as plain SQL so it can be reviewed as a database administrator would read it.
 *
 * Tenancy (ARCHITECTURE.md): every tenant table carries `network_id`, its primary key is
 * `(network_id, id)`, every unique constraint includes `network_id`, and every foreign key between tenant
 * tables is composite. A row can therefore never point at another network's row, and the tables can be
 * distributed by `network_id` later without reshaping keys.
 *
 * Foreign keys between tenant tables are NO ACTION (checked at the end of the statement), and every
 * `network_id` cascades from `networks`: deleting a network removes all of its rows in one statement,
 * which is how a tenant is offboarded and how tests clean up after themselves.
 */

// Values come from shared/domain.ts (constants, never user input), so quoting them here is safe.
const list = (values: readonly string[]) => values.map((v) => `'${v}'`).join(', ');

const tenant = `network_id uuid not null references networks (id) on delete cascade`;
const idColumn = `id uuid not null default gen_random_uuid()`;
const stamps = `created_at timestamptz not null default now(),
  updated_at timestamptz not null default now()`;
const fk = (column: string, table: string) =>
  `foreign key (network_id, ${column}) references ${table} (network_id, id)`;

const upSql = `
create extension if not exists pg_trgm;
create extension if not exists pgcrypto;

create table networks (
  id uuid primary key default gen_random_uuid(),
  name text not null check (btrim(name) <> ''),
  slug text not null unique check (slug ~ '^[a-z0-9][a-z0-9-]*$'),
  -- network-wide rules (pad rules, numbering, defaults) that do not deserve columns yet
  settings jsonb not null default '{}' check (jsonb_typeof(settings) = 'object'),
  ${stamps}
);

create table shops (
  ${tenant},
  ${idColumn},
  name text not null check (btrim(name) <> ''),
  code text not null check (code ~ '^[A-Z0-9]{2,8}$'),
  address_line text,
  city text,
  region text,
  postal_code text,
  country text not null default 'US',
  latitude numeric(9,6) check (latitude between -90 and 90),
  longitude numeric(9,6) check (longitude between -180 and 180),
  time_zone text not null, -- IANA name, e.g. America/Denver; times are shown in it, stored in UTC
  opening_days smallint[] not null default '{1,2,3,4,5}'
    check (opening_days <@ '{1,2,3,4,5,6,7}'::smallint[]), -- ISO weekdays, Monday = 1
  labor_rate_cents integer not null check (labor_rate_cents >= 0),
  tax_rate_basis_points integer not null default 0 check (tax_rate_basis_points between 0 and 10000),
  phone text,
  email text,
  active boolean not null default true,
  ${stamps},
  primary key (network_id, id),
  unique (network_id, code)
);

create table skills (
  ${tenant},
  ${idColumn},
  code text not null check (code ~ '^[a-z0-9_]+$'),
  name text not null,
  ${stamps},
  primary key (network_id, id),
  unique (network_id, code)
);

create table shop_skills (
  ${tenant},
  shop_id uuid not null,
  skill_id uuid not null,
  weekly_bench_hours numeric(6,2) not null check (weekly_bench_hours >= 0),
  ${stamps},
  primary key (network_id, shop_id, skill_id),
  ${fk('shop_id', 'shops')} on delete cascade,
  ${fk('skill_id', 'skills')} on delete cascade
);

create table users (
  ${tenant},
  ${idColumn},
  -- stored lower-cased so the unique constraint is case-insensitive without citext
  email text not null check (email = lower(email) and position('@' in email) > 1),
  name text not null,
  active boolean not null default true,
  oidc_subject text,
  last_sign_in_at timestamptz,
  deactivated_at timestamptz,
  ${stamps},
  primary key (network_id, id),
  unique (network_id, email),
  unique (network_id, oidc_subject)
);
-- sign-in starts from an e-mail address before the network is known
create index users_email_idx on users (email);

create table memberships (
  ${tenant},
  ${idColumn},
  user_id uuid not null,
  shop_id uuid, -- null only for the network-wide owner role
  role text not null check (role in (${list(ROLES)})),
  ${stamps},
  primary key (network_id, id),
  unique (network_id, user_id, shop_id),
  check ((role = 'owner') = (shop_id is null)),
  ${fk('user_id', 'users')} on delete cascade,
  ${fk('shop_id', 'shops')} on delete cascade
);
-- the unique constraint above treats nulls as distinct; one network-wide membership per user
create unique index memberships_network_wide_uq on memberships (network_id, user_id) where shop_id is null;
create index memberships_shop_idx on memberships (network_id, shop_id);

create table technician_skills (
  ${tenant},
  ${idColumn},
  user_id uuid not null,
  shop_id uuid not null,
  skill_id uuid not null,
  weekly_hours numeric(6,2) not null check (weekly_hours >= 0),
  ${stamps},
  primary key (network_id, id),
  unique (network_id, user_id, shop_id, skill_id),
  ${fk('user_id', 'users')} on delete cascade,
  ${fk('shop_id', 'shops')} on delete cascade,
  ${fk('skill_id', 'skills')} on delete cascade
);
create index technician_skills_shop_idx on technician_skills (network_id, shop_id, skill_id);

create table invitations (
  ${tenant},
  ${idColumn},
  email text not null check (email = lower(email)),
  -- only a hash is kept: the token in the e-mail link is the secret
  token_hash text not null unique,
  roles jsonb not null default '[]' check (jsonb_typeof(roles) = 'array'), -- [{ shopId: uuid | null, role }]
  invited_by_user_id uuid not null,
  expires_at timestamptz not null,
  accepted_at timestamptz,
  accepted_user_id uuid,
  revoked_at timestamptz,
  ${stamps},
  primary key (network_id, id),
  ${fk('invited_by_user_id', 'users')},
  ${fk('accepted_user_id', 'users')}
);
create index invitations_email_idx on invitations (network_id, email);

create table customers (
  ${tenant},
  ${idColumn},
  kind text not null check (kind in ('person', 'school', 'fleet')),
  name text not null check (btrim(name) <> ''),
  contact_name text,
  email text,
  phone text,
  address text,
  home_shop_id uuid,
  notes text,
  ${stamps},
  primary key (network_id, id),
  ${fk('home_shop_id', 'shops')}
);
create index customers_name_trgm_idx on customers using gin (name gin_trgm_ops);
create index customers_home_shop_idx on customers (network_id, home_shop_id);

create table instruments (
  ${tenant},
  ${idColumn},
  family text not null check (family in (${list(INSTRUMENT_FAMILIES)})),
  maker text not null,
  model text,
  serial text not null,
  serial_normalized text not null check (serial_normalized <> ''), -- shared/serial.ts normalizeSerial
  maker_normalized text not null, -- shared/serial.ts normalizeMaker
  owner_kind text not null check (owner_kind in (${list(OWNER_KINDS)})),
  owner_customer_id uuid,
  current_shop_id uuid not null,
  status text not null default 'in_shop' check (status in ('in_service', 'in_shop', 'in_transit', 'retired')),
  asset_tag text,
  year_made integer check (year_made between 1800 and 2200),
  notes text,
  ${stamps},
  primary key (network_id, id),
  -- the same serial can be engraved by two makers; within one maker it names one instrument
  unique (network_id, maker_normalized, serial_normalized),
  unique (network_id, asset_tag),
  check (owner_kind = 'rental_fleet' or owner_customer_id is not null),
  ${fk('owner_customer_id', 'customers')},
  ${fk('current_shop_id', 'shops')}
);
-- exact and prefix serial search (text_pattern_ops serves LIKE 'AB10%' whatever the collation)
create index instruments_serial_prefix_idx on instruments (network_id, serial_normalized text_pattern_ops);
-- near misses and fragments from the middle of a serial (similarity, LIKE '%1042%') on a million rows
create index instruments_serial_trgm_idx on instruments using gin (serial_normalized gin_trgm_ops);
create index instruments_current_shop_idx on instruments (network_id, current_shop_id);
create index instruments_owner_idx on instruments (network_id, owner_customer_id);

create table service_catalog (
  ${tenant},
  ${idColumn},
  name text not null check (btrim(name) <> ''),
  family text check (family in (${list(INSTRUMENT_FAMILIES)})), -- null: any family
  standard_hours numeric(6,2) not null check (standard_hours >= 0),
  skill_id uuid,
  active boolean not null default true,
  ${stamps},
  primary key (network_id, id),
  ${fk('skill_id', 'skills')}
);

create table parts (
  ${tenant},
  ${idColumn},
  sku text not null,
  name text not null,
  kind text not null check (kind in ('pad', 'other')),
  pad_kind text check (pad_kind in ('self_leveling', 'glued')),
  diameter_mm numeric(6,2) check (diameter_mm > 0),
  thickness_mm numeric(5,2) check (thickness_mm > 0),
  unit_price_cents integer not null check (unit_price_cents >= 0),
  ${stamps},
  primary key (network_id, id),
  unique (network_id, sku),
  -- a pad is chosen by kind and diameter, so both must be known; other parts have neither
  check (case when kind = 'pad' then pad_kind is not null and diameter_mm is not null else pad_kind is null end)
);
create index parts_pad_lookup_idx on parts (network_id, pad_kind, diameter_mm) where kind = 'pad';

create table jobs (
  ${tenant},
  ${idColumn},
  number integer not null check (number > 0), -- the job number people say on the phone
  instrument_id uuid not null,
  shop_id uuid not null,
  customer_id uuid,
  stage text not null default 'intake' check (stage in (${list(ALL_JOB_STAGES)})),
  -- a hold remembers the main stage to resume; main stages never carry one
  stage_before_hold text check (stage_before_hold in (${list(JOB_STAGES)})),
  complaint text not null default '',
  condition_notes text,
  promised_on date,
  assigned_user_id uuid,
  required_skill_id uuid,
  estimated_hours numeric(6,2) check (estimated_hours >= 0),
  estimate_approved_at timestamptz,
  estimate_approved_by_name text,
  estimate_approval_method text check (estimate_approval_method in ('in_person', 'phone', 'email')),
  opened_by_user_id uuid not null,
  opened_at timestamptz not null default now(),
  ready_at timestamptz,
  released_at timestamptz,
  ${stamps},
  primary key (network_id, id),
  unique (network_id, number),
  check ((stage in (${list(JOB_HOLDS)})) = (stage_before_hold is not null)),
  check (stage <> 'released' or released_at is not null),
  ${fk('instrument_id', 'instruments')},
  ${fk('shop_id', 'shops')},
  ${fk('customer_id', 'customers')},
  ${fk('assigned_user_id', 'users')},
  ${fk('required_skill_id', 'skills')},
  ${fk('opened_by_user_id', 'users')}
);
create index jobs_board_idx on jobs (network_id, shop_id, stage);
create index jobs_instrument_idx on jobs (network_id, instrument_id);
create index jobs_assignee_idx on jobs (network_id, assigned_user_id) where stage <> 'released';
create index jobs_promised_idx on jobs (network_id, promised_on) where stage <> 'released';
create index jobs_released_idx on jobs (network_id, released_at) where released_at is not null;

create table job_line_items (
  ${tenant},
  ${idColumn},
  job_id uuid not null,
  kind text not null check (kind in ('labor', 'part')),
  catalog_item_id uuid,
  part_id uuid,
  description text not null,
  hours numeric(6,2) check (hours >= 0),
  rate_cents integer check (rate_cents >= 0),
  quantity numeric(8,2) check (quantity > 0),
  unit_price_cents integer check (unit_price_cents >= 0),
  position integer not null default 0,
  ${stamps},
  primary key (network_id, id),
  check (kind <> 'labor' or (hours is not null and rate_cents is not null)),
  check (kind <> 'part' or (quantity is not null and unit_price_cents is not null)),
  ${fk('job_id', 'jobs')} on delete cascade,
  ${fk('catalog_item_id', 'service_catalog')},
  ${fk('part_id', 'parts')}
);
create index job_line_items_job_idx on job_line_items (network_id, job_id, position);

create table time_logs (
  ${tenant},
  ${idColumn},
  job_id uuid not null,
  user_id uuid not null,
  minutes integer not null check (minutes > 0),
  worked_on date not null,
  note text,
  ${stamps},
  primary key (network_id, id),
  ${fk('job_id', 'jobs')} on delete cascade,
  ${fk('user_id', 'users')}
);
create index time_logs_job_idx on time_logs (network_id, job_id);
create index time_logs_user_idx on time_logs (network_id, user_id, worked_on);

create table history_events (
  ${tenant},
  ${idColumn},
  instrument_id uuid not null,
  job_id uuid,
  shop_id uuid,
  user_id uuid,
  kind text not null, -- intake, job_opened, stage_changed, transfer_*, photo_added, pad_map_saved, note, …
  summary text not null,
  data jsonb not null default '{}',
  occurred_at timestamptz not null default now(),
  -- a retried worker step writes the same key, so it can never record an event twice
  idempotency_key text,
  created_at timestamptz not null default now(),
  primary key (network_id, id),
  unique (network_id, idempotency_key),
  ${fk('instrument_id', 'instruments')},
  ${fk('job_id', 'jobs')},
  ${fk('shop_id', 'shops')},
  ${fk('user_id', 'users')}
);
create index history_events_timeline_idx on history_events (network_id, instrument_id, occurred_at desc);
create index history_events_job_idx on history_events (network_id, job_id) where job_id is not null;

create table attachments (
  ${tenant},
  ${idColumn},
  job_id uuid,
  instrument_id uuid not null,
  shop_id uuid not null, -- where it was recorded; permissions and the timeline go by shop
  kind text not null check (kind in ('photo', 'document')),
  tag text check (tag in ('before', 'after', 'detail')),
  caption text,
  object_key text not null,
  thumbnail_key text,
  content_type text not null,
  size_bytes bigint not null check (size_bytes >= 0),
  status text not null default 'pending' check (status in ('pending', 'stored', 'failed')),
  uploaded_by_user_id uuid not null,
  ${stamps},
  primary key (network_id, id),
  unique (network_id, object_key),
  check (kind = 'photo' or tag is null),
  ${fk('job_id', 'jobs')},
  ${fk('instrument_id', 'instruments')},
  ${fk('shop_id', 'shops')},
  ${fk('uploaded_by_user_id', 'users')}
);
create index attachments_instrument_idx on attachments (network_id, instrument_id);
create index attachments_job_idx on attachments (network_id, job_id) where job_id is not null;

create table relay_runs (
  ${tenant},
  ${idColumn},
  from_shop_id uuid not null,
  to_shop_id uuid not null,
  weekdays smallint[] not null
    check (cardinality(weekdays) > 0 and weekdays <@ '{1,2,3,4,5,6,7}'::smallint[]), -- ISO weekdays
  departure_time time not null, -- local time at the origin shop (its time_zone)
  transit_hours numeric(5,2) not null check (transit_hours > 0),
  active boolean not null default true,
  ${stamps},
  primary key (network_id, id),
  check (from_shop_id <> to_shop_id),
  ${fk('from_shop_id', 'shops')},
  ${fk('to_shop_id', 'shops')}
);
create index relay_runs_route_idx on relay_runs (network_id, from_shop_id, to_shop_id);

create table transfers (
  ${tenant},
  ${idColumn},
  job_id uuid not null,
  instrument_id uuid not null,
  from_shop_id uuid not null,
  to_shop_id uuid not null,
  state text not null default 'requested' check (state in (${list(TRANSFER_STATES)})),
  reason text not null,
  requested_by_user_id uuid not null,
  approved_by_user_id uuid, -- the manager who decided (approved or rejected)
  packed_by_user_id uuid,
  received_by_user_id uuid,
  relay_run_id uuid,
  decision_note text,
  requested_at timestamptz not null default now(),
  approved_at timestamptz,
  packed_at timestamptz,
  departed_at timestamptz,
  expected_arrival_at timestamptz,
  received_at timestamptz,
  manifest_key text,
  ${stamps},
  primary key (network_id, id),
  check (from_shop_id <> to_shop_id),
  ${fk('job_id', 'jobs')},
  ${fk('instrument_id', 'instruments')},
  ${fk('from_shop_id', 'shops')},
  ${fk('to_shop_id', 'shops')},
  ${fk('requested_by_user_id', 'users')},
  ${fk('approved_by_user_id', 'users')},
  ${fk('packed_by_user_id', 'users')},
  ${fk('received_by_user_id', 'users')},
  ${fk('relay_run_id', 'relay_runs')}
);
create index transfers_state_idx on transfers (network_id, state);
create index transfers_job_idx on transfers (network_id, job_id);
create index transfers_to_shop_idx on transfers (network_id, to_shop_id, state);
create index transfers_from_shop_idx on transfers (network_id, from_shop_id, state);
-- an instrument travels one way at a time: at most one unfinished transfer per job
create unique index transfers_one_open_per_job_uq on transfers (network_id, job_id)
  where state in ('requested', 'approved', 'packed', 'in_transit');

create table stock_levels (
  ${tenant},
  shop_id uuid not null,
  part_id uuid not null,
  on_hand integer not null default 0 check (on_hand >= 0),
  reserved integer not null default 0 check (reserved >= 0), -- may exceed on_hand: that is a shortage
  reorder_point integer not null default 0 check (reorder_point >= 0),
  ${stamps},
  primary key (network_id, shop_id, part_id),
  ${fk('shop_id', 'shops')} on delete cascade,
  ${fk('part_id', 'parts')} on delete cascade
);

create table stock_reservations (
  ${tenant},
  ${idColumn},
  job_id uuid not null,
  shop_id uuid not null,
  part_id uuid not null,
  quantity integer not null check (quantity > 0),
  released_at timestamptz,
  ${stamps},
  primary key (network_id, id),
  ${fk('job_id', 'jobs')} on delete cascade,
  ${fk('shop_id', 'shops')},
  ${fk('part_id', 'parts')}
);
create index stock_reservations_job_idx on stock_reservations (network_id, job_id);
create index stock_reservations_open_idx on stock_reservations (network_id, shop_id, part_id)
  where released_at is null;

create table pad_maps (
  ${tenant},
  ${idColumn},
  instrument_id uuid not null,
  job_id uuid,
  shop_id uuid not null, -- where the pad cups were measured
  unit_system text not null check (unit_system in ('mm', 'in')), -- what the technician typed; values are mm
  entries jsonb not null default '[]' check (jsonb_typeof(entries) = 'array'),
  results jsonb not null default '[]' check (jsonb_typeof(results) = 'array'),
  created_by_user_id uuid not null,
  ${stamps},
  primary key (network_id, id),
  ${fk('instrument_id', 'instruments')},
  ${fk('job_id', 'jobs')},
  ${fk('shop_id', 'shops')},
  ${fk('created_by_user_id', 'users')}
);
create index pad_maps_instrument_idx on pad_maps (network_id, instrument_id, created_at desc);

create table notifications (
  ${tenant},
  ${idColumn},
  user_id uuid not null,
  kind text not null check (kind in (${list(NOTIFICATION_KINDS)})),
  title text not null,
  body text not null default '',
  link text,
  read_at timestamptz,
  -- a retried worker step writes the same key, so nobody is told twice
  dedupe_key text,
  created_at timestamptz not null default now(),
  primary key (network_id, id),
  unique (network_id, dedupe_key),
  ${fk('user_id', 'users')} on delete cascade
);
create index notifications_inbox_idx on notifications (network_id, user_id, read_at);

create table notification_preferences (
  ${tenant},
  user_id uuid not null,
  kind text not null check (kind in (${list(NOTIFICATION_KINDS)})),
  email boolean not null default true,
  ${stamps},
  primary key (network_id, user_id, kind),
  ${fk('user_id', 'users')} on delete cascade
);

create table outbox (
  ${tenant},
  ${idColumn},
  kind text not null, -- 'email'
  dedupe_key text not null,
  payload jsonb not null,
  attempts integer not null default 0 check (attempts >= 0),
  last_error text,
  sent_at timestamptz,
  created_at timestamptz not null default now(),
  primary key (network_id, id),
  unique (network_id, dedupe_key)
);
create index outbox_pending_idx on outbox (created_at) where sent_at is null;

create table audit_log (
  ${tenant},
  ${idColumn},
  actor_user_id uuid,
  action text not null,
  entity text not null,
  entity_id text, -- text: some entities have composite keys
  before jsonb,
  after jsonb,
  at timestamptz not null default now(),
  primary key (network_id, id),
  ${fk('actor_user_id', 'users')}
);
create index audit_log_at_idx on audit_log (network_id, at desc);

-- connect-pg-simple's own table (its documented layout); not a tenant table
create table session (
  sid varchar not null primary key,
  sess json not null,
  expire timestamp(6) not null
);
create index session_expire_idx on session (expire);
-- ending every session of a deactivated user: delete from session where sess->'user'->>'id' = $1
create index session_user_idx on session ((sess -> 'user' ->> 'id'));
`;

// Reverse order of creation; each table goes before the tables it references.
const tablesInReverse = [
  'session', 'audit_log', 'outbox', 'notification_preferences', 'notifications', 'pad_maps',
  'stock_reservations', 'stock_levels', 'transfers', 'relay_runs', 'attachments', 'history_events',
  'time_logs', 'job_line_items', 'jobs', 'parts', 'service_catalog', 'instruments', 'customers',
  'invitations', 'technician_skills', 'memberships', 'users', 'shop_skills', 'skills', 'shops', 'networks',
];

const downSql = `
${tablesInReverse.map((t) => `drop table if exists ${t};`).join('\n')}
drop extension if exists pgcrypto;
drop extension if exists pg_trgm;
`;

// One multi-statement query runs as one implicit transaction: the schema appears whole or not at all.
export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
