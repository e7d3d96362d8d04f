import type { QueryInterface } from 'sequelize';

/**
 * Parts sent between shops of a network: when a saved pad map leaves a shop short, a technician asks
 * the nearest shop that has the pads to send them on the next relay run. Same shape of life as an
 * instrument transfer (requested → sent → received, or cancelled), but it moves stock, not a job,
 * so it has its own table. Tenant discipline as in 0001: composite keys and foreign keys.
 */
const upSql = `
create table part_transfers (
  network_id uuid not null references networks (id) on delete cascade,
  id uuid not null default gen_random_uuid(),
  part_id uuid not null,
  from_shop_id uuid not null, -- the shop that has the parts and sends them
  to_shop_id uuid not null, -- the shop that is short
  job_id uuid, -- the job whose reservation ran short, when there is one
  quantity integer not null check (quantity > 0),
  state text not null default 'requested' check (state in ('requested', 'sent', 'received', 'cancelled')),
  relay_run_id uuid,
  note text,
  requested_by_user_id uuid not null,
  sent_by_user_id uuid,
  received_by_user_id uuid,
  cancelled_by_user_id uuid,
  requested_at timestamptz not null default now(),
  sent_at timestamptz,
  received_at timestamptz,
  cancelled_at timestamptz,
  created_at timestamptz not null default now(),
  updated_at timestamptz not null default now(),
  primary key (network_id, id),
  check (from_shop_id <> to_shop_id),
  check ((state in ('sent', 'received')) = (sent_at is not null)),
  check ((state = 'received') = (received_at is not null)),
  foreign key (network_id, part_id) references parts (network_id, id),
  foreign key (network_id, from_shop_id) references shops (network_id, id),
  foreign key (network_id, to_shop_id) references shops (network_id, id),
  foreign key (network_id, job_id) references jobs (network_id, id) on delete set null (job_id),
  foreign key (network_id, relay_run_id) references relay_runs (network_id, id),
  foreign key (network_id, requested_by_user_id) references users (network_id, id),
  foreign key (network_id, sent_by_user_id) references users (network_id, id),
  foreign key (network_id, received_by_user_id) references users (network_id, id),
  foreign key (network_id, cancelled_by_user_id) references users (network_id, id)
);
create index part_transfers_to_shop_idx on part_transfers (network_id, to_shop_id, state);
create index part_transfers_from_shop_idx on part_transfers (network_id, from_shop_id, state);
create index part_transfers_job_idx on part_transfers (network_id, job_id) where job_id is not null;
-- one open request per part between two shops for a job; asking twice just finds the first
create unique index part_transfers_one_open_uq on part_transfers (network_id, part_id, from_shop_id, to_shop_id, coalesce(job_id, '00000000-0000-0000-0000-000000000000'::uuid))
  where state in ('requested', 'sent');
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query('drop table if exists part_transfers;');
}
