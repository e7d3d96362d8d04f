import type { QueryInterface } from 'sequelize';

/**
 * The ETag of an attachment's object as it was when the API confirmed it (server/modules/files).
 * Together with size_bytes it pins the version every later read accepts; rows stored before this
 * have none and are read with the size cap alone.
 */
export async function up({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query('alter table attachments add column etag text');
}

export async function down({ context }: { context: QueryInterface }): Promise<void> {
  await context.sequelize.query('alter table attachments drop column if exists etag');
}
