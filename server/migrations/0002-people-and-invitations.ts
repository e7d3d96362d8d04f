import type { QueryInterface } from 'sequelize';

/**
 * People and invitations.
 * - At most one open invitation per e-mail address in a network: inviting again replaces the
 *   earlier link (the service revokes it first), so only the newest link in anyone's inbox works.
 * - The owner reads the audit log of one record (a person, a shop) as well as the whole stream.
 */
const upSql = `
create unique index invitations_one_open_per_email_uq on invitations (network_id, email)
  where accepted_at is null and revoked_at is null;
create index audit_log_entity_idx on audit_log (network_id, entity, entity_id, at desc);
`;

const downSql = `
drop index if exists audit_log_entity_idx;
drop index if exists invitations_one_open_per_email_uq;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
