import type { QueryInterface } from 'sequelize';

/**
 * Transfers: the hand-over is kept apart from the relay run's departure (a Saturday hand-over for a
 * Tuesday run leaves on Tuesday), and the pack step records what travels: contents and accessories,
 * how many cases, and the condition on departure, for the manifest.
 *
 * Jobs: the estimate has a version that every change of lines, tax or total moves on, and the approval
 * records which version and which total the customer approved, so a later raise asks for a new approval.
 */
const upSql = `
alter table transfers
  add column handed_over_at timestamptz,
  add column case_count integer check (case_count is null or case_count between 1 and 20),
  add column contents text,
  add column departure_condition text;
alter table jobs
  add column estimate_version integer not null default 0,
  add column approved_total_cents integer check (approved_total_cents is null or approved_total_cents >= 0),
  add column approved_estimate_version integer;
`;

const downSql = `
alter table jobs drop column if exists approved_estimate_version, drop column if exists approved_total_cents, drop column if exists estimate_version;
alter table transfers drop column if exists departure_condition, drop column if exists contents, drop column if exists case_count, drop column if exists handed_over_at;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
