import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { sessionPool } from '../../server/lib/auth.js';
import { makeNetwork, makeShop, makeUser } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { closeServerResources } from '../helpers/close.js';

const MINUTE = 60_000;
const HOUR = 60 * MINUTE;
const DAY = 24 * HOUR;

/**
 * Sessions end 12 hours after their last use and 7 days after sign-in however busy they are; the
 * session row is written at most once a minute, not on every request. Times are set directly in the
 * `session` table, as they would be after that much time, through the session store's own pool (so
 * `expire`, a timestamp without zone, is read and written in the store's time zone).
 */
describe('session lifetime', () => {
  const app = buildApp();
  let email: string;

  beforeAll(async () => {
    const network = await makeNetwork();
    const shop = await makeShop(network.id);
    email = (await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }])).email;
  });

  afterAll(closeServerResources);

  /** The session id inside the signed cookie `benchrelay.sid=s%3A<sid>.<signature>`. */
  const sidOf = (cookie: string) => decodeURIComponent(/benchrelay\.sid=([^;]+)/.exec(cookie)![1]).replace(/^s:/, '').replace(/\.[^.]+$/, '');

  async function row(sid: string) {
    const { rows } = await sessionPool.query<{ sess: string; expire: string }>(`select sess::text as sess, expire::text as expire from session where sid = $1`, [sid]);
    const r = rows[0];
    return r ? { sess: JSON.parse(r.sess) as Record<string, unknown>, expire: r.expire } : undefined;
  }

  /** Sets the stored sign-in and last-touch times (ms ago) and the row's expiry (an SQL interval from now). */
  async function age(sid: string, { signedInAgo, touchedAgo, expireIn }: { signedInAgo: number; touchedAgo: number; expireIn: string }) {
    const now = Date.now();
    await sessionPool.query(
      `update session
          set sess = (sess::jsonb || jsonb_build_object('signedInAt', $2::bigint, 'touchedAt', $3::bigint))::json,
              expire = now() + $4::interval
        where sid = $1`,
      [sid, now - signedInAgo, now - touchedAgo, expireIn],
    );
  }

  it('stores the sign-in time in the session', async () => {
    const before = Date.now();
    const cookie = await signIn(app, email);
    const stored = await row(sidOf(cookie));
    expect(stored!.sess.signedInAt).toBeGreaterThanOrEqual(before);
    expect(stored!.sess.signedInAt).toBeLessThanOrEqual(Date.now());
  });

  it('refuses and deletes a session older than 7 days even though it was used a minute ago', async () => {
    const cookie = await signIn(app, email);
    const sid = sidOf(cookie);
    await age(sid, { signedInAgo: 7 * DAY + MINUTE, touchedAgo: MINUTE, expireIn: '11 hours' });
    const res = await request(app).get('/api/me').set('Cookie', cookie).expect(401);
    expect(res.body.error.code).toBe('unauthenticated');
    expect(await row(sid)).toBeUndefined();
    // and it stays ended
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);
  });

  it('keeps a session of 6 days 23 hours that is in use', async () => {
    const cookie = await signIn(app, email);
    await age(sidOf(cookie), { signedInAgo: 7 * DAY - HOUR, touchedAgo: MINUTE, expireIn: '11 hours' });
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
  });

  it('does not rewrite the session row when it was touched less than a minute ago', async () => {
    const cookie = await signIn(app, email);
    const sid = sidOf(cookie);
    await age(sid, { signedInAgo: HOUR, touchedAgo: 20_000, expireIn: '6 hours' });
    const before = await row(sid);
    for (let i = 0; i < 3; i++) await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    const after = await row(sid);
    expect(after!.expire).toBe(before!.expire);
    expect(after!.sess.touchedAt).toBe(before!.sess.touchedAt);
  });

  it('touches the row (expiry 12 hours ahead) once the last touch is a minute old', async () => {
    const cookie = await signIn(app, email);
    const sid = sidOf(cookie);
    await age(sid, { signedInAgo: HOUR, touchedAgo: MINUTE + 5000, expireIn: '6 hours' });
    const before = await row(sid);
    const startedAt = Date.now();
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    const after = await row(sid);
    expect(after!.sess.touchedAt).toBeGreaterThanOrEqual(startedAt);
    expect(after!.expire > before!.expire).toBe(true);
    // about 12 hours from now, read in the database's own clock
    const { rows } = await sessionPool.query<{ hours: string }>(`select extract(epoch from (expire - now()::timestamp)) / 3600 as hours from session where sid = $1`, [sid]);
    expect(Number(rows[0].hours)).toBeGreaterThan(11.9);
    expect(Number(rows[0].hours)).toBeLessThanOrEqual(12.01);
  });

  it('still ends a session unused for 12 hours', async () => {
    const cookie = await signIn(app, email);
    const sid = sidOf(cookie);
    // the row's expiry has passed: the store no longer finds the session
    await age(sid, { signedInAgo: 13 * HOUR, touchedAgo: 12 * HOUR + MINUTE, expireIn: '-1 minute' });
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);

    // and a last use over 12 hours ago ends it even if the row's expiry were later
    const other = await signIn(app, email);
    const otherSid = sidOf(other);
    await age(otherSid, { signedInAgo: 13 * HOUR, touchedAgo: 12 * HOUR + MINUTE, expireIn: '1 hour' });
    await request(app).get('/api/me').set('Cookie', other).expect(401);
    expect(await row(otherSid)).toBeUndefined();
  });
});
