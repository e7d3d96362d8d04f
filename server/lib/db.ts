import { Sequelize } from 'sequelize';
import { config } from '../config.js';
import { logger } from './logger.js';

/**
 * One Sequelize instance per process. Models register themselves on it at import
 * (server/modules/<area>/models.ts); `server/lib/models.ts` imports them all.
 */
export const sequelize = new Sequelize(config.databaseUrl, {
  dialect: 'postgres',
  logging: process.env.SQL_LOG ? (sql) => logger.debug(sql) : false,
  define: { underscored: true, timestamps: true },
  pool: { max: 10, idle: 10_000 },
});

export async function checkDatabase(): Promise<boolean> {
  try {
    await sequelize.query('select 1');
    return true;
  } catch {
    return false;
  }
}
