import type { QueryInterface } from 'sequelize';

/**
 * What came in with the instrument, ticked at the counter (case, mouthpiece, ligature, neck, strap, reeds,
 * swab) and anything else typed, so the claim ticket and the hand-back list the same things.
 */
const upSql = `
alter table jobs
  add column accessories text[] not null default '{}',
  add column accessories_other text check (accessories_other is null or length(accessories_other) <= 500);
`;

const downSql = `alter table jobs drop column if exists accessories_other, drop column if exists accessories;`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
