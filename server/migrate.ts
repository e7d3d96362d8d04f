import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface } from 'sequelize';
import { sequelize } from './lib/db.js';
import { migrations } from './migrations/index.js';

export type Migration = (params: { context: QueryInterface }) => Promise<void>;

export function migrator() {
  return new Umzug({
    migrations: migrations.map((m) => ({
      name: m.name,
      up: (params: { context: QueryInterface }) => m.up(params),
      down: (params: { context: QueryInterface }) => m.down(params),
    })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  });
}

/**
 * Runs pending migrations under an advisory lock so that two processes starting at once
 * (app and a worker, or parallel test files) never race on the schema.
 */
export async function migrateUp(): Promise<string[]> {
  const t = await sequelize.transaction();
  try {
    await sequelize.query('select pg_advisory_xact_lock(4242001)', { transaction: t });
    const done = await migrator().up();
    await t.commit();
    return done.map((m) => m.name);
  } catch (err) {
    await t.rollback();
    throw err;
  }
}

if (process.argv[1] && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const cmd = process.argv[2] ?? 'up';
  const run = cmd === 'down' ? migrator().down().then((m) => m.map((x) => x.name)) : migrateUp();
  run
    .then((names) => {
      console.log(names.length ? `migrations ${cmd}: ${names.join(', ')}` : 'migrations: nothing to do');
      return sequelize.close();
    })
    .catch((err) => {
      console.error(err);
      process.exit(1);
    });
}
