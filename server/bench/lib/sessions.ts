/**
 * Bench sessions: a session row written straight into the session table, and the signed cookie that
 * names it, exactly as express-session signs its cookie (`s:` + id + `.` + HMAC-SHA256, base64 without
 * padding). The benchmarks then go through the real HTTP API as that person: session read, actor,
 * ability, route, service.
 */
import crypto from 'node:crypto';
import type pg from 'pg';
import { SESSION_IDLE_MS } from '../../lib/auth.js';

export const SESSION_COOKIE = 'benchrelay.sid';

export function signedCookie(sid: string, secret: string): string {
  const mac = crypto.createHmac('sha256', secret).update(sid).digest('base64').replace(/=+$/, '');
  return `${SESSION_COOKIE}=${encodeURIComponent(`s:${sid}.${mac}`)}`;
}

export async function mintSession(pool: pg.Pool, user: { id: string; networkId: string }, secret: string): Promise<string> {
  const sid = crypto.randomBytes(24).toString('base64url');
  const now = Date.now();
  const expires = new Date(now + SESSION_IDLE_MS);
  const sess = {
    cookie: { originalMaxAge: SESSION_IDLE_MS, expires: expires.toISOString(), httpOnly: true, path: '/', sameSite: 'lax' },
    user: { id: user.id, networkId: user.networkId },
    signedInAt: now,
    touchedAt: now,
  };
  await pool.query('insert into session (sid, sess, expire) values ($1, $2, $3)', [sid, JSON.stringify(sess), expires]);
  return signedCookie(sid, secret);
}
