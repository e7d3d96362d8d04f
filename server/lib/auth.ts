import type { RequestHandler } from 'express';
import session from 'express-session';
import connectPgSimple from 'connect-pg-simple';
import pg from 'pg';
import { config } from '../config.js';
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
    /** Signed in at the provider, but this e-mail has no role in any shop. */
    noAccessEmail?: string;
  }
}

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
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      actor?: Actor;
    }
  }
}

export const sessionPool = new pg.Pool({ connectionString: config.databaseUrl, max: 4 });

export function sessionMiddleware(): RequestHandler {
  const PgStore = connectPgSimple(session);
  return session({
    name: 'benchrelay.sid',
    secret: config.sessionSecret,
    resave: false,
    saveUninitialized: false,
    rolling: true,
    store: new PgStore({ pool: sessionPool, tableName: 'session', createTableIfMissing: false, pruneSessionInterval: 15 * 60 }),
    cookie: {
      httpOnly: true,
      sameSite: 'lax',
      secure: config.appOrigin.startsWith('https://'),
      maxAge: 12 * 60 * 60 * 1000,
    },
  });
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
