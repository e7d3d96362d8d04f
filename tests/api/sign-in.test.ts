import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { sequelize } from '../../server/lib/db.js';
import { User } from '../../server/lib/models.js';
import { makeNetwork, makeShop, makeUser } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { closeServerResources } from '../helpers/close.js';

/** Sign-in end to end through the identity provider stand-in (code flow + PKCE), sessions in PostgreSQL. */
describe('sign-in', () => {
  const app = buildApp();
  let owner: User;
  let tech: User;
  let shopA: { id: string; name: string };
  let shopB: { id: string; name: string };
  let networkName: string;

  beforeAll(async () => {
    const network = await makeNetwork();
    networkName = network.name;
    shopA = await makeShop(network.id, { name: 'Alder Street Bench' });
    shopB = await makeShop(network.id, { name: 'Quarry Road Bench' });
    await makeShop(network.id, { name: 'Not Hers' });
    owner = await makeUser(network.id, [{ shopId: null, role: 'owner' }]);
    tech = await makeUser(network.id, [
      { shopId: shopA.id, role: 'technician' },
      { shopId: shopB.id, role: 'front_desk' },
    ]);
  });

  it('answers /api/me with 401 before sign-in', async () => {
    const res = await request(app).get('/api/me').expect(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('signs a person in and /api/me returns their network, per-shop roles, shops and rules', async () => {
    const cookie = await signIn(app, tech.email);
    const res = await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    expect(res.body.user).toMatchObject({ id: tech.id, email: tech.email });
    expect(res.body.network.name).toBe(networkName);
    expect(res.body.memberships).toEqual(
      expect.arrayContaining([
        { shopId: shopA.id, shopName: 'Alder Street Bench', role: 'technician' },
        { shopId: shopB.id, shopName: 'Quarry Road Bench', role: 'front_desk' },
      ]),
    );
    // only the shops she works at, not the third shop of the network
    expect(res.body.shops.map((s: { name: string }) => s.name).sort()).toEqual(['Alder Street Bench', 'Quarry Road Bench']);
    expect(res.body.rules.length).toBeGreaterThan(0);
    const stored = await User.findByPk(tech.id);
    expect(stored?.oidcSubject).toBe(tech.email);
  });

  it('gives a new session id at sign-in (no session fixation)', async () => {
    const first = await request(app).get('/auth/login').expect(302);
    const before = String(first.headers['set-cookie']).split(';')[0];
    const after = await signIn(app, owner.email);
    expect(after).not.toBe(before);
    // the session lives in PostgreSQL
    const [rows] = await sequelize.query(`select count(*)::int as n from session where sess->'user'->>'id' = :id`, {
      replacements: { id: owner.id },
    });
    expect((rows as Array<{ n: number }>)[0].n).toBeGreaterThan(0);
  });

  it('shows "no access" for an e-mail with no membership, not an error', async () => {
    const cookie = await signIn(app, 'stranger@example.test');
    const res = await request(app).get('/api/me').set('Cookie', cookie).expect(403);
    expect(res.body.error).toMatchObject({ code: 'no_access', email: 'stranger@example.test' });
  });

  it('signs out: the session is gone and the provider logout URL is returned', async () => {
    const cookie = await signIn(app, owner.email);
    await request(app).get('/api/me').set('Cookie', cookie).expect(200);
    const out = await request(app).post('/auth/logout').set('Cookie', cookie).expect(200);
    expect(out.body.redirectTo).toContain(process.env.OIDC_ISSUER);
    await request(app).get('/api/me').set('Cookie', cookie).expect(401);
  });

  it('refuses a callback without a pending sign-in', async () => {
    const res = await request(app).get('/auth/callback?code=made-up&state=made-up').expect(302);
    expect(res.headers.location).toBe('/sign-in?error=expired');
  });

  afterAll(async () => {
    await closeServerResources();
  });
});
