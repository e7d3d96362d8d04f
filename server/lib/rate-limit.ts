import type { Request, RequestHandler } from 'express';
import { ipKeyGenerator, rateLimit, type RateLimitInfo } from 'express-rate-limit';
import { PostgresStore } from '@acpr/rate-limit-postgresql';
import { config, type Config } from '../config.js';
import { AppError } from './errors.js';
import { logger } from './logger.js';

export type RateLimits = Config['rateLimits'];
export type LimitedDoor = 'signIn' | 'invitations' | 'search' | 'imports' | 'uploads' | 'customerLinks';

const DOORS: Record<LimitedDoor, { what: string; perPerson: boolean }> = {
  // before sign-in there is no person: the address is who guesses codes and invitation tokens
  signIn: { what: 'sign-in attempts', perPerson: false },
  invitations: { what: 'invitation requests', perPerson: false },
  search: { what: 'searches', perPerson: true },
  imports: { what: 'imports', perPerson: true },
  uploads: { what: 'uploads', perPerson: true },
  // the customer's page has no account: the address is who would guess tokens
  customerLinks: { what: 'requests for this page', perPerson: false },
};

/** Every store this process opened, so tests and shutdown can end their pools. */
const openStores = new Set<PostgresStore>();

/**
 * The package's PostgreSQL store, without what its constructor does besides keeping the settings: it
 * starts the package's own schema migration and does not wait for it (one more connection for every
 * store built, and a rejection nobody handles when the database is away). Migration 0010 creates that
 * schema with the app's other migrations instead. The package's own `init` opens the pool and its
 * `increment`/`decrement`/`resetKey` do the counting.
 */
function postgresStore(prefix: string, databaseUrl: string): PostgresStore {
  const store = Object.create(PostgresStore.prototype) as PostgresStore;
  // every count takes a table lock (see the migration), so a second connection per door is plenty
  store.config = { connectionString: databaseUrl, max: 2, idleTimeoutMillis: 10_000, allowExitOnIdle: true };
  store.prefix = prefix;
  return store;
}

function secondsUntil(resetTime: Date | undefined, windowMs: number): number {
  const ms = resetTime ? resetTime.getTime() - Date.now() : windowMs;
  return Math.max(1, Math.ceil(ms / 1000));
}

/**
 * One limiter per door, counted in PostgreSQL so that every app process on the database shares the
 * count. Built per app: a test can build apps with low limits while the rest of the suite runs high.
 * Over the limit the answer is 429 `rate_limited` with `Retry-After` and the `RateLimit` headers.
 */
export function rateLimiters(limits: RateLimits = config.rateLimits, databaseUrl = config.databaseUrl): Record<LimitedDoor, RequestHandler> {
  const build = (door: LimitedDoor): RequestHandler => {
    const { what, perPerson } = DOORS[door];
    const store = postgresStore(`${limits.namespace}:${door}`, databaseUrl);
    const limiter = rateLimit({
      windowMs: limits.windowMs,
      limit: limits[door],
      store,
      standardHeaders: 'draft-8',
      legacyHeaders: false,
      identifier: door,
      // the address comes from req.ip, which honours `trust proxy` (server/app.ts)
      keyGenerator: (req) => (perPerson && req.actor ? `person:${req.actor.id}` : `ip:${ipKeyGenerator(req.ip ?? 'unknown')}`),
      handler: (req, _res, next) => {
        const info = (req as Request & { rateLimit?: RateLimitInfo }).rateLimit;
        const seconds = secondsUntil(info?.resetTime, limits.windowMs);
        const message = `Too many ${what} — try again in ${seconds} ${seconds === 1 ? 'second' : 'seconds'}.`;
        next(new AppError(429, 'rate_limited', message, undefined, { retryAfterSeconds: seconds }));
      },
      logger: {
        warn: (err, message) => logger.warn({ err }, message ?? 'rate limit'),
        error: (err, message) => logger.error({ err }, message ?? 'rate limit'),
      },
    });
    // a dropped idle connection must not end the process (pg pools emit 'error' with no listener otherwise)
    (store.pool as { on(event: 'error', fn: (err: Error) => void): void }).on('error', (err) => logger.warn({ err: err.message }, 'rate-limit pool'));
    openStores.add(store);
    return limiter;
  };
  return { signIn: build('signIn'), invitations: build('invitations'), search: build('search'), imports: build('imports'), uploads: build('uploads'), customerLinks: build('customerLinks') };
}

/** Ends the pools of every limiter built in this process. */
export async function closeRateLimitStores(): Promise<void> {
  const stores = [...openStores];
  openStores.clear();
  await Promise.all(stores.map((s) => (s.pool as { end(): Promise<void> }).end().catch(() => undefined)));
}
