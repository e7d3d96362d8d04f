import { sequelize } from '../../server/lib/db.js';
import { sessionPool } from '../../server/lib/auth.js';
import { closeAppQueue } from '../../server/lib/queue.js';
import { closeRateLimitStores } from '../../server/lib/rate-limit.js';

/** Closes the pools a test file opened through the app, so the worker exits cleanly. */
export async function closeServerResources() {
  await closeAppQueue().catch(() => undefined);
  await sessionPool.end().catch(() => undefined);
  await closeRateLimitStores();
  await sequelize.close().catch(() => undefined);
}
