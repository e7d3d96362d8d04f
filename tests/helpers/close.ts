import { sequelize } from '../../server/lib/db.js';
import { sessionPool } from '../../server/lib/auth.js';
import { closeAppQueue } from '../../server/lib/queue.js';

/** Closes the pools a test file opened through the app, so the worker exits cleanly. */
export async function closeServerResources() {
  await closeAppQueue().catch(() => undefined);
  await sessionPool.end().catch(() => undefined);
  await sequelize.close().catch(() => undefined);
}
