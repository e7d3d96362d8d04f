import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Express } from 'express';
import { buildApp } from '../../server/app.js';
import { config, loadConfig } from '../../server/config.js';
import type { RateLimits } from '../../server/lib/rate-limit.js';
import { Instrument } from '../../server/lib/models.js';
import { closeServerResources } from '../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';

/**
 * The doors an attacker or a runaway script would hammer answer 429 past their limit. Each describe
 * builds its apps with low limits under a namespace of its own, so the counts start at zero and the
 * rest of the suite (high limits from tests/helpers/test-env.ts) is never slowed down. Two apps on the
 * same database stand for two app processes: their requests count together.
 */
const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));
const lowLimits = (over: Partial<RateLimits>): RateLimits => ({ ...config.rateLimits, namespace: `test-${uniq()}`, ...over });

/** The wait a 429 names, checked against its headers; the window is a minute unless a test says otherwise. */
function expectRateLimited(res: request.Response, what: string, door: string, limit: number, windowSeconds = 60) {
  expect(res.status).toBe(429);
  const match = new RegExp(`^Too many ${what} — try again in (\\d+) seconds?\\.$`).exec(res.body.error?.message ?? '');
  expect(res.body.error, JSON.stringify(res.body)).toMatchObject({ code: 'rate_limited' });
  expect(match, res.body.error.message).not.toBeNull();
  const seconds = Number(match![1]);
  expect(seconds).toBeGreaterThanOrEqual(1);
  expect(seconds).toBeLessThanOrEqual(windowSeconds);
  expect(res.body.error.retryAfterSeconds).toBe(seconds);
  // Retry-After and the message are computed a moment apart: they may differ by the second that passed
  expect(Math.abs(Number(res.headers['retry-after']) - seconds)).toBeLessThanOrEqual(1);
  expect(res.headers.ratelimit).toMatch(new RegExp(`^"${door}"; r=0; t=\\d+$`));
  expect(res.headers['ratelimit-policy']).toMatch(new RegExp(`^"${door}"; q=${limit}; w=${windowSeconds}; pk=`));
}

afterAll(closeServerResources);

describe('search: counted per person, shared by every app process', () => {
  let appA: Express;
  let appB: Express;
  let deskCookie: string;
  let otherDeskCookie: string;

  beforeAll(async () => {
    const limits = lowLimits({ search: 3 });
    appA = buildApp({ rateLimits: limits });
    appB = buildApp({ rateLimits: limits });
    const net = await makeNetwork();
    const shop = await makeShop(net.id);
    const desk = await makeUser(net.id, [{ shopId: shop.id, role: 'front_desk' }]);
    const otherDesk = await makeUser(net.id, [{ shopId: shop.id, role: 'front_desk' }]);
    deskCookie = await signIn(appA, desk.email);
    otherDeskCookie = await signIn(appB, otherDesk.email);
  });

  const search = (app: Express, cookie: string) => request(app).get('/api/instruments/search').query({ q: 'AB104' }).set('Cookie', cookie);

  it('answers 429 with the wait once a person passes the limit across two apps on one database', async () => {
    expect((await search(appA, deskCookie)).status).toBe(200);
    expect((await search(appB, deskCookie)).status).toBe(200);
    const third = await search(appA, deskCookie);
    expect(third.status).toBe(200);
    expect(third.headers.ratelimit).toMatch(/^"search"; r=0; t=\d+$/);

    // each app alone has seen fewer than four: only a shared count stops the fourth
    expectRateLimited(await search(appB, deskCookie), 'searches', 'search', 3);
    expectRateLimited(await search(appA, deskCookie), 'searches', 'search', 3);
    // the customer search and the serial check draw on the same allowance
    expectRateLimited(await request(appA).get('/api/customers').query({ q: 'Ha' }).set('Cookie', deskCookie), 'searches', 'search', 3);
    expectRateLimited(
      await request(appB).get('/api/instruments/serial-check').query({ serial: 'AB104', maker: 'Aldmoor' }).set('Cookie', deskCookie),
      'searches', 'search', 3,
    );
  });

  it('counts each person on their own, though both ask from the same address', async () => {
    const res = await search(appA, otherDeskCookie);
    expect(res.status).toBe(200);
    expect(res.body).toHaveProperty('results');
  });
});

describe('sign-in start and callback: counted per address', () => {
  it('stops the third sign-in request from one address and lets another address through', async () => {
    const app = buildApp({ rateLimits: lowLimits({ signIn: 2 }) });
    await request(app).get('/auth/login').expect(302);
    await request(app).get('/auth/callback').query({ code: 'guess', state: 'guess' }).expect(302);
    expectRateLimited(await request(app).get('/auth/login'), 'sign-in attempts', 'signIn', 2);
    expectRateLimited(await request(app).get('/auth/callback').query({ code: 'guess', state: 'guess' }), 'sign-in attempts', 'signIn', 2);

    // behind the loopback proxy (trust proxy) the forwarded address is the client's own
    const elsewhere = await request(app).get('/auth/login').set('X-Forwarded-For', '192.0.2.44');
    expect(elsewhere.status).toBe(302);
    expect(elsewhere.headers.location.startsWith(config.oidc.issuer)).toBe(true);
  });
});

describe('invitation links: preview and accept counted per address', () => {
  it('stops a token guesser after the limit, on preview and accept alike', async () => {
    const app = buildApp({ rateLimits: lowLimits({ invitations: 2 }) });
    const guess = () => randomUUID().replace(/-/g, '');
    expect((await request(app).get(`/api/invitations/preview/${guess()}`)).status).toBe(404);
    expect((await request(app).post('/api/invitations/accept').send({ token: guess() })).status).toBeLessThan(429);
    expectRateLimited(await request(app).get(`/api/invitations/preview/${guess()}`), 'invitation requests', 'invitations', 2);
    expectRateLimited(await request(app).post('/api/invitations/accept').send({ token: guess() }), 'invitation requests', 'invitations', 2);
  });
});

describe('imports and uploads: counted per person', () => {
  let app: Express;
  let cookie: string;
  let shopId: string;
  let networkId: string;

  beforeAll(async () => {
    app = buildApp({ rateLimits: lowLimits({ imports: 1, uploads: 2 }) });
    const net = await makeNetwork();
    networkId = net.id;
    const shop = await makeShop(net.id);
    shopId = shop.id;
    const desk = await makeUser(net.id, [{ shopId: shop.id, role: 'front_desk' }]);
    cookie = await signIn(app, desk.email);
  });

  it('refuses a second fleet import within the window, the refused batch not imported', async () => {
    const batch = (serial: string) => ({ shopId, ownerKind: 'rental_fleet', rows: [{ row: 2, family: 'trumpet', maker: 'Corvell Band Works', serial }] });
    const first = await request(app).post('/api/instruments/import').set('Cookie', cookie).send(batch('RL-1001'));
    expect(first.status).toBe(200);
    expect(first.body.counts).toMatchObject({ created: 1 });
    expectRateLimited(await request(app).post('/api/instruments/import').set('Cookie', cookie).send(batch('RL-1002')), 'imports', 'imports', 1);
    expect(await Instrument.count({ where: { networkId } })).toBe(1);
  });

  it('refuses upload links past the limit, new uploads and renewed links alike', async () => {
    const noJob = randomUUID();
    for (let n = 0; n < 2; n++) {
      const res = await request(app).post(`/api/jobs/${noJob}/attachments`).set('Cookie', cookie).send({});
      expect(res.status).not.toBe(429);
    }
    expectRateLimited(await request(app).post(`/api/jobs/${noJob}/attachments`).set('Cookie', cookie).send({}), 'uploads', 'uploads', 2);
    expectRateLimited(await request(app).post(`/api/attachments/${randomUUID()}/upload-url`).set('Cookie', cookie), 'uploads', 'uploads', 2);
  });
});

describe('the window', () => {
  it('lets the person in again once the window has passed', async () => {
    const app = buildApp({ rateLimits: lowLimits({ invitations: 1, windowMs: 1500 }) });
    const preview = () => request(app).get(`/api/invitations/preview/${randomUUID().replace(/-/g, '')}`);
    expect((await preview()).status).toBe(404);
    const refused = await preview();
    expectRateLimited(refused, 'invitation requests', 'invitations', 1, 2);
    await sleep(1600);
    expect((await preview()).status).toBe(404);
    expectRateLimited(await preview(), 'invitation requests', 'invitations', 1, 2);
  });
});

describe('limits from the environment', () => {
  it('reads each limit and the window, with defaults for a busy counter', () => {
    expect(loadConfig({}).rateLimits).toMatchObject({ windowMs: 60_000, signIn: 30, invitations: 20, search: 120, imports: 20, uploads: 60 });
    const set = loadConfig({ RATE_LIMIT_SEARCH: '300', RATE_LIMIT_WINDOW_MS: '30000', RATE_LIMIT_UPLOADS: '5' }).rateLimits;
    expect(set).toMatchObject({ search: 300, windowMs: 30_000, uploads: 5 });
    expect(loadConfig({}).healthCacheMs).toBe(5_000);
    expect(loadConfig({ HEALTH_CACHE_MS: '0' }).healthCacheMs).toBe(0);
  });

  it('refuses to start on a limit that is not a whole number, naming the variable', () => {
    expect(() => loadConfig({ RATE_LIMIT_SEARCH: 'lots' })).toThrow(/RATE_LIMIT_SEARCH/);
    expect(() => loadConfig({ RATE_LIMIT_SIGN_IN: '0' })).toThrow(/RATE_LIMIT_SIGN_IN/);
    expect(() => loadConfig({ RATE_LIMIT_WINDOW_MS: '1.5' })).toThrow(/RATE_LIMIT_WINDOW_MS/);
  });

  it('never trusts every client to name its own address', () => {
    expect(loadConfig({}).trustProxy).toBe('loopback');
    expect(loadConfig({ TRUST_PROXY: '10.0.0.0/8' }).trustProxy).toBe('10.0.0.0/8');
    expect(loadConfig({ TRUST_PROXY: '1' }).trustProxy).toBe(1);
    expect(() => loadConfig({ TRUST_PROXY: 'true' })).toThrow(/TRUST_PROXY/);
  });
});
