import type { QueryInterface } from 'sequelize';

/**
 * Indexes for the dashboard's aggregates (server/modules/reports/service.ts). Turnaround reads the
 * jobs that reached Ready in the last 30/90/365 days and the weekly intake chart the jobs opened in the
 * last 52 weeks; without these both scan every job of the network.
 */
const upSql = `
create index jobs_ready_at_idx on jobs (network_id, ready_at) where ready_at is not null;
create index jobs_opened_at_idx on jobs (network_id, opened_at);
create index transfers_in_flight_idx on transfers (network_id, expected_arrival_at) where state = 'in_transit';
`;

const downSql = `
drop index if exists transfers_in_flight_idx;
drop index if exists jobs_opened_at_idx;
drop index if exists jobs_ready_at_idx;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
