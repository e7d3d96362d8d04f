import type { QueryInterface } from 'sequelize';

/**
 * Closing days the owner sets per shop (a stocktake, a move, the owner's own holiday), on top of the
 * opening weekdays and the public holidays of the shop's country and region. Promised dates and
 * business-day turnaround skip them. One row per shop and calendar day (the shop's own calendar).
 */
const upSql = `
create table shop_closing_days (
  network_id uuid not null references networks (id) on delete cascade,
  id uuid not null default gen_random_uuid(),
  shop_id uuid not null,
  date date not null,
  reason text not null check (length(reason) between 1 and 200),
  created_at timestamptz not null default now(),
  updated_at timestamptz not null default now(),
  primary key (network_id, id),
  unique (network_id, shop_id, date),
  foreign key (network_id, shop_id) references shops (network_id, id) on delete cascade
);
`;

const downSql = `drop table if exists shop_closing_days;`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
