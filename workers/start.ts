import { scheduleStartupWork, startWorker } from './processors.js';
import { logger } from '../server/lib/logger.js';
import { closeAppQueue, queueBackendKind } from '../server/lib/queue.js';
import { installProcessHandlers } from '../server/lib/errors.js';
import { productionConfigProblem } from '../server/config.js';

/** A worker as its own process (`npm run worker`), for the Redis backend where workers scale out. */
const problem = productionConfigProblem(process.env);
if (problem) {
  console.error(problem);
  process.exit(1);
}
installProcessHandlers();
const worker = startWorker(Number(process.env.WORKER_CONCURRENCY ?? 8), {
  lockDuration: Number(process.env.WORKER_LOCK_MS) || undefined,
  stalledInterval: Number(process.env.WORKER_STALLED_INTERVAL_MS) || undefined,
});
scheduleStartupWork().catch((err: unknown) => logger.warn({ err: err instanceof Error ? err.message : String(err) }, 'startup work not scheduled'));
logger.info({ backend: queueBackendKind() }, 'worker started');

async function stop(signal: string) {
  logger.info({ signal }, 'worker stopping');
  await worker.close();
  await closeAppQueue().catch(() => undefined);
  process.exit(0);
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));
