import { logger } from './logger.js';
import { promisify } from 'node:util';
import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import pg from 'pg';
import { config, type Config } from '../config.js';
import { abilityFor, type AppAbility } from '../../shared/auth/ability.js';
import type { Role } from '../../shared/domain.js';
import type { PendingSignIn } from './oidc.js';
import { unauthenticated, AppError } from './errors.js';

declare module 'express-session' {
  interface SessionData {
    /** The signed-in person; `id` is also indexed in the session table so sessions can be ended. */
    user?: { id: string; networkId: string };
    pendingSignIn?: PendingSignIn;
    idToken?: string;
    /** Who the identity provider said signed in (kept for accepting an invitation). */
    identity?: SessionIdentity;
    /** When the person signed in (ms since the epoch); the session ends SESSION_MAX_AGE_MS later whatever happens. */
    signedInAt?: number;
    /** When the session row's expiry was last pushed forward (ms); see sessionLifetime. */
    touchedAt?: number;
    /** Signed in at the provider, but this e-mail has no role in any shop. */
    noAccessEmail?: string;
  }
}

/** The identity provider's account behind a session, as checked at the callback. */
export interface SessionIdentity {
  issuer: string;
  subject: string;
  email: string;
  name: string;
  emailVerified: boolean;
}

/** A session unused this long ends (the session row's `expire`, and the cookie's lifetime). */
export const SESSION_IDLE_MS = 12 * 60 * 60 * 1000;
/** A session ends this long after sign-in even while it is used every minute. */
export const SESSION_MAX_AGE_MS = 7 * 24 * 60 * 60 * 1000;
/** The session row's expiry is pushed forward at most this often, not on every request. */
export const SESSION_TOUCH_EVERY_MS = 60 * 1000;

/** Who is asking, resolved freshly on every request so a role change or deactivation applies at once. */
export interface Actor {
  id: string;
  networkId: string;
  email: string;
  name: string;
  memberships: Array<{ shopId: string | null; role: Role }>;
  ability: AppAbility;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace -- adding `actor` to Express's own Request type goes through its namespace
  namespace Express {
    interface Request {
      actor?: Actor;
    }
  }
}

export const sessionPool = new pg.Pool({ connectionString: config.databaseUrl, max: 4 });
// An idle connection cut by the server (PostgreSQL restarting) is dropped by the pool, which then emits
// 'error'; without a listener that event would end the process. Requests meanwhile answer 503.
sessionPool.on('error', (err) => logger.warn({ err: err.message }, 'a session database connection was lost; the pool opens a new one'));

/**
 * Sessions in PostgreSQL. Not rolling, and the store never touches the row by itself (`disableTouch`):
 * express-session would otherwise rewrite the row on every request. sessionLifetime() pushes the
 * expiry forward instead, at most once a minute.
 */
export function sessionMiddleware(cfg: Config = config): RequestHandler {
  const PgStore = connectPgSimple(session);
  return session({
    name: 'benchrelay.sid',
    secret: cfg.sessionSecret,
    resave: false,
    saveUninitialized: false,
    rolling: false,
    store: new PgStore({
      pool: sessionPool,
      tableName: 'session',
      createTableIfMissing: false,
      pruneSessionInterval: 15 * 60,
      disableTouch: true,
    }),
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: cfg.appOrigin.startsWith('https://'),
      maxAge: SESSION_IDLE_MS,
    },
  });
}

/** Marks a session as signed in now: the start of its absolute lifetime and of its idle clock. */
export function startSessionClock(s: { signedInAt?: number; touchedAt?: number }, now = Date.now()) {
  s.signedInAt = now;
  s.touchedAt = now;
}

/**
 * Ends a signed-in session 7 days after sign-in or 12 hours after its last use, and otherwise keeps it
 * alive with at most one write a minute. The idle limit is also the row's `expire`, which the store
 * checks on every read; changing `touchedAt` marks the session modified, so express-session saves it
 * once (new `expire`, and a fresh cookie lifetime).
 */
export function sessionLifetime(): RequestHandler {
  return async (req, _res, next) => {
    const s = req.session;
    if (!s || !(s.user || s.noAccessEmail || s.identity)) return next();
    const now = Date.now();
    const signedInAt = typeof s.signedInAt === 'number' ? s.signedInAt : 0;
    const touchedAt = typeof s.touchedAt === 'number' ? s.touchedAt : 0;
    // a signed-in session without a sign-in time predates the limit: it ends like an old one
    if (now - signedInAt > SESSION_MAX_AGE_MS || now - touchedAt > SESSION_IDLE_MS) {
      // regenerate, not destroy: the old row is deleted and the request goes on with an empty session
      await promisify(s.regenerate.bind(s))();
      return next();
    }
    if (now - touchedAt >= SESSION_TOUCH_EVERY_MS) s.touchedAt = now;
    next();
  };
}

/** Ends every session of a person (deactivation); their next request is unauthenticated. */
export async function endSessionsOf(userId: string): Promise<number> {
  const res = await sessionPool.query(`delete from session where sess->'user'->>'id' = $1`, [userId]);
  return res.rowCount ?? 0;
}

export type ActorLoader = (userId: string, networkId: string) => Promise<Omit<Actor, 'ability'> | null>;

/** Resolves `req.actor` from the session; a deactivated or removed person loses the session. */
export function loadActor(loader: ActorLoader): RequestHandler {
  return async (req, _res, next) => {
    const who = req.session?.user;
    if (!who) return next();
    const found = await loader(who.id, who.networkId);
    if (!found) {
      delete req.session.user;
      return next();
    }
    req.actor = { ...found, ability: abilityFor(found) };
    next();
  };
}

export const requireActor: RequestHandler = (req, _res, next) => {
  if (req.actor) return next();
  if (req.session?.noAccessEmail) {
    return next(new AppError(403, 'no_access', 'This e-mail address has no role in any shop yet.', undefined, { email: req.session.noAccessEmail }));
  }
  next(unauthenticated());
};

export function actorOf(req: Express.Request): Actor {
  if (!req.actor) throw unauthenticated();
  return req.actor;
}
