import type { QueryInterface } from 'sequelize';

/**
 * A person is bound to one identity-provider account: (issuer, subject), set at their first sign-in
 * and never overwritten by a later one (server/modules/members/service.ts, resolveSignIn). Rows bound
 * before this step have a subject but no issuer; their next sign-in with that same subject records
 * the issuer, and any other subject is refused.
 */
const upSql = `
alter table users add column oidc_issuer text;
alter table users add constraint users_issuer_needs_subject check (oidc_issuer is null or oidc_subject is not null);
alter table users drop constraint users_network_id_oidc_subject_key;
alter table users add constraint users_network_id_oidc_identity_key unique (network_id, oidc_issuer, oidc_subject);
create index users_oidc_identity_idx on users (oidc_issuer, oidc_subject) where oidc_subject is not null;
`;

const downSql = `
drop index if exists users_oidc_identity_idx;
alter table users drop constraint users_network_id_oidc_identity_key;
alter table users add constraint users_network_id_oidc_subject_key unique (network_id, oidc_subject);
alter table users drop constraint users_issuer_needs_subject;
alter table users drop column oidc_issuer;
`;

export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(upSql);
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query(downSql);
}
