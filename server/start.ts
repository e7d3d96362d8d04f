import type { Server } from 'node:http';
import { config, productionConfigProblem } from './config.js';
import { buildApp } from './app.js';
import { migrateUp } from './migrate.js';
import { sequelize } from './lib/db.js';
import { logger } from './lib/logger.js';
import { sessionPool } from './lib/auth.js';
import { closeAppQueue, queueBackendKind } from './lib/queue.js';
import { closeRateLimitStores } from './lib/rate-limit.js';
import { installProcessHandlers } from './lib/errors.js';
import { ensureBucket } from './lib/storage.js';
import { loadDemoNetwork } from './seed/demo.js';
import { scheduleStartupWork, startWorker } from '../workers/processors.js';

/**
 * Listens on config.port after migrating; loads the demo network once (outside production unless
 * LOAD_DEMO=false, in production only with LOAD_DEMO=true); runs the queue worker in-process on the
 * PostgreSQL backend (EMBEDDED_WORKER=false to opt out). In production it refuses to start, before
 * touching the database, while a secret is a development default (productionConfigProblem).
 */
export async function start() {
  const problem = productionConfigProblem(process.env);
  if (problem) {
    console.error(problem);
    process.exit(1);
  }
  installProcessHandlers();
  const applied = await migrateUp();
  if (applied.length) logger.info({ applied }, 'migrations applied');
  if (config.loadDemo) {
    const demo = await loadDemoNetwork();
    logger.info(demo.created ? 'demo network loaded' : 'demo network already present');
  }
  await ensureBucket().catch((err: unknown) => logger.warn({ err: err instanceof Error ? err.message : String(err) }, 'object storage not reachable yet'));
  const worker = config.embeddedWorker ? startWorker() : undefined;
  if (worker) scheduleStartupWork().catch((err: unknown) => logger.warn({ err: err instanceof Error ? err.message : String(err) }, 'startup work not scheduled'));
  const app = buildApp();
  const server: Server = await new Promise((resolve) => {
    const s = app.listen(config.port, () => resolve(s));
  });
  logger.info({ url: config.appOrigin, queue: queueBackendKind(), worker: worker ? 'embedded' : 'separate' }, 'Benchrelay is listening');
  console.log(`Benchrelay is ready at ${config.appOrigin}`);

  let stopping = false;
  const stop = async (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'shutting down');
    server.close();
    server.closeAllConnections();
    await worker?.close().catch(() => undefined);
    await closeAppQueue().catch(() => undefined);
    await sessionPool.end().catch(() => undefined);
    await closeRateLimitStores();
    await sequelize.close().catch(() => undefined);
    process.exit(0);
  };
  process.on('SIGINT', () => void stop('SIGINT'));
  process.on('SIGTERM', () => void stop('SIGTERM'));
  return server;
}

start().catch((err) => {
  logger.fatal({ err }, 'start failed');
  console.error(err);
  process.exit(1);
});
