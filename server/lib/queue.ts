import {
  Queue as RedisQueue,
  Worker as RedisWorker,
  RedisConnection,
  createIORedisClient,
  withBackend,
  createPostgresBackend,
  type Processor,
  type WorkerOptions,
  type QueueOptions,
} from 'bullmq';
import { Redis as IORedis } from 'ioredis';
import { config } from '../config.js';

/** The one queue the app uses; job names say what each job does (see workers/processors.ts). */
export const QUEUE_NAME = 'benchrelay';

/**
 * BullMQ on PostgreSQL by default (its own `bullmq` schema in the app's database, no extra server);
 * BullMQ on Redis when REDIS_URL is set. Both expose the same Queue and Worker classes.
 */
function backend() {
  if (config.redisUrl) {
    const url = new URL(config.redisUrl);
    // connection *options*, not an ioredis instance, so BullMQ closes what it opens
    const connection = {
      host: url.hostname,
      port: Number(url.port || 6379),
      password: url.password || undefined,
      username: url.username || undefined,
      db: url.pathname.length > 1 ? Number(url.pathname.slice(1)) : 0,
      maxRetriesPerRequest: null,
    };
    // BullMQ loads its optional ioredis driver with require(), which native ESM (tsx, Vitest) lacks; a factory
    // hands it the client instead, and BullMQ still owns and closes each connection it makes from options.
    RedisConnection.clientFactory ??= (opts) => createIORedisClient(new IORedis(opts));
    return { kind: 'redis' as const, Queue: RedisQueue, Worker: RedisWorker, connection };
  }
  const pgClasses = withBackend(createPostgresBackend);
  const connection = { connectionString: config.databaseUrl, migrate: true, max: 5 };
  return { kind: 'postgres' as const, Queue: pgClasses.Queue, Worker: pgClasses.Worker, connection };
}

export const queueBackendKind = () => (config.redisUrl ? 'redis' : 'postgres');

export function createQueue(name = QUEUE_NAME, opts: Omit<QueueOptions, 'connection'> = {}) {
  const b = backend();
  // both backends' classes share one API; TypeScript cannot unify their generic constructors
  const QueueClass = b.Queue as unknown as typeof RedisQueue;
  return new QueueClass(name, { ...opts, connection: b.connection });
}

export function createWorker<D = unknown, R = unknown>(
  name: string,
  processor: Processor<D, R>,
  opts: Omit<WorkerOptions, 'connection'> = {},
) {
  const b = backend();
  const WorkerClass = b.Worker as unknown as typeof RedisWorker;
  return new WorkerClass<D, R>(name, processor, { concurrency: 4, ...opts, connection: b.connection });
}

let shared: RedisQueue | undefined;
/** The process-wide producer for QUEUE_NAME. */
export function appQueue(): RedisQueue {
  shared ??= createQueue();
  return shared;
}

export async function closeAppQueue() {
  const q = shared;
  shared = undefined;
  await q?.close();
}

export async function checkQueue(timeoutMs = 2000): Promise<boolean> {
  try {
    await Promise.race([
      appQueue().getJobCounts('waiting', 'active', 'failed'),
      new Promise((_, reject) => setTimeout(() => reject(new Error('queue check timed out')), timeoutMs)),
    ]);
    return true;
  } catch {
    return false;
  }
}
