import type { QueryInterface } from 'sequelize';

/**
 * An estimate approval's history event named who approved (the customer or their contact person), and the
 * timeline is read across the network. From now on the event says only how it was approved; the name stays
 * on the job, shown where the customer's contact is. This rewrites the events written before. Not undone:
 * the names are still on their jobs (`jobs.estimate_approved_by_name`).
 */
const upSql = `
update history_events
   set summary = regexp_replace(summary, ' by .* \\(([^()]*)\\)$', ' (\\1)'),
       data = data - 'approvedByName'
 where kind = 'estimate_approved'
   and (data ? 'approvedByName' or summary like '% approved by %');
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down(): Promise<void> {
  // nothing to restore: the history keeps the shorter wording
}
