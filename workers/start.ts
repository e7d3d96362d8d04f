import { startWorker } from './processors.js';
import { logger } from '../server/lib/logger.js';
import { queueBackendKind } from '../server/lib/queue.js';
import { installProcessHandlers } from '../server/lib/errors.js';

/** A worker as its own process (`npm run worker`), for the Redis backend where workers scale out. */
installProcessHandlers();
const worker = startWorker(Number(process.env.WORKER_CONCURRENCY ?? 8));
logger.info({ backend: queueBackendKind() }, 'worker started');

async function stop(signal: string) {
  logger.info({ signal }, 'worker stopping');
  await worker.close();
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
