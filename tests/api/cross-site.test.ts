import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { loadConfig } from '../../server/config.js';
import { User } from '../../server/lib/models.js';
import { makeNetwork, makeShop, makeUser } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { closeServerResources } from '../helpers/close.js';

/**
 * A page of another site makes the signed-in browser send a state-changing request (a form post needs
 * no script and, for a POST with no body, no content type at all). The app refuses every POST, PUT,
 * PATCH and DELETE that the browser marks as coming from elsewhere.
 */
describe('cross-site requests', () => {
  const app = buildApp();
  const own = process.env.APP_ORIGIN!;
  let networkId: string;
  let ownerCookie: string;
  let target: User;

  beforeAll(async () => {
    const network = await makeNetwork();
    networkId = network.id;
    const shop = await makeShop(networkId);
    const owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
    target = await makeUser(networkId, [{ shopId: shop.id, role: 'technician' }], { name: 'Rowan Keel' });
    ownerCookie = await signIn(app, owner.email);
  });

  afterAll(closeServerResources);

  const stored = () => User.findOne({ where: { networkId, id: target.id } });

  it('ATTACK: a body-less POST from another origin with a valid session cookie is refused and changes nothing', async () => {
    const res = await request(app)
      .post(`/api/people/${target.id}/deactivate`)
      .set('Cookie', ownerCookie)
      .set('Origin', 'https://evil.example');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('cross_site');
    expect(res.body.error.message).toMatch(/another site/);
    expect((await stored())!.active).toBe(true);
  });

  it('ATTACK: Sec-Fetch-Site cross-site or same-site is refused (PATCH, DELETE too)', async () => {
    const patch = await request(app)
      .patch(`/api/people/${target.id}`)
      .set('Cookie', ownerCookie)
      .set('Sec-Fetch-Site', 'cross-site')
      .send({ name: 'Renamed by another site' });
    expect(patch.status).toBe(403);
    expect(patch.body.error.code).toBe('cross_site');
    const sibling = await request(app)
      .patch(`/api/people/${target.id}`)
      .set('Cookie', ownerCookie)
      .set('Sec-Fetch-Site', 'same-site')
      .send({ name: 'Renamed by a sibling site' });
    expect(sibling.status).toBe(403);
    const del = await request(app).delete(`/api/memberships/${target.id}`).set('Cookie', ownerCookie).set('Sec-Fetch-Site', 'cross-site');
    expect(del.status).toBe(403);
    expect((await stored())!.name).toBe('Rowan Keel');
  });

  it('ATTACK: Origin: null (a sandboxed frame, a data: page) is refused', async () => {
    const res = await request(app).post(`/api/people/${target.id}/deactivate`).set('Cookie', ownerCookie).set('Origin', 'null');
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('cross_site');
    expect((await stored())!.active).toBe(true);
  });

  it('ATTACK: the own origin as a prefix of another host, or in Sec-Fetch-Site\u2019s absence a foreign Referer, is refused', async () => {
    const prefix = await request(app).post(`/api/people/${target.id}/deactivate`).set('Cookie', ownerCookie).set('Origin', `${own}.evil.example`);
    expect(prefix.status).toBe(403);
    const referer = await request(app).post(`/api/people/${target.id}/deactivate`).set('Cookie', ownerCookie).set('Referer', 'https://evil.example/page');
    expect(referer.status).toBe(403);
    expect((await stored())!.active).toBe(true);
  });

  it('ATTACK: sign-out from another site is refused too (the session stays)', async () => {
    await request(app).post('/auth/logout').set('Cookie', ownerCookie).set('Origin', 'https://evil.example').expect(403);
    await request(app).get('/api/me').set('Cookie', ownerCookie).expect(200);
  });

  it('the app\u2019s own pages work: same Origin with Sec-Fetch-Site same-origin, or a same-origin Referer', async () => {
    const renamed = await request(app)
      .patch(`/api/people/${target.id}`)
      .set('Cookie', ownerCookie)
      .set('Origin', own)
      .set('Sec-Fetch-Site', 'same-origin')
      .send({ name: 'Rowan Keel-Ashby' });
    expect(renamed.status, JSON.stringify(renamed.body)).toBe(200);
    expect((await stored())!.name).toBe('Rowan Keel-Ashby');
    const back = await request(app)
      .patch(`/api/people/${target.id}`)
      .set('Cookie', ownerCookie)
      .set('Referer', `${own}/people/${target.id}`)
      .send({ name: 'Rowan Keel' });
    expect(back.status).toBe(200);
  });

  it('a request with neither Origin, Sec-Fetch-Site nor Referer did not come from a browser page, and is served', async () => {
    const res = await request(app).patch(`/api/people/${target.id}`).set('Cookie', ownerCookie).send({ name: 'Rowan Keel' });
    expect(res.status).toBe(200);
  });

  it('reads are not affected: a GET with a foreign Origin is answered', async () => {
    await request(app).get('/api/me').set('Cookie', ownerCookie).set('Origin', 'https://evil.example').set('Sec-Fetch-Site', 'cross-site').expect(200);
  });

  it('outside production the Vite dev server\u2019s origin may post (its proxy forwards the browser\u2019s Origin); in production it may not', async () => {
    const dev = await request(app)
      .patch(`/api/people/${target.id}`)
      .set('Cookie', ownerCookie)
      .set('Origin', 'http://localhost:5173')
      .set('Sec-Fetch-Site', 'same-origin')
      .send({ name: 'Rowan Keel' });
    expect(dev.status).toBe(200);

    const production = loadConfig({
      ...process.env,
      NODE_ENV: 'production',
      APP_ORIGIN: 'https://bench.example',
      ALLOWED_ORIGINS: 'https://desk.bench.example',
    });
    expect(production.allowedOrigins).toEqual(['https://bench.example', 'https://desk.bench.example']);
    const prodApp = buildApp({ config: production });
    const refused = await request(prodApp).post('/auth/logout').set('Origin', 'http://localhost:5173');
    expect(refused.status).toBe(403);
    const listed = await request(prodApp).post('/auth/logout').set('Origin', 'https://desk.bench.example').set('Sec-Fetch-Site', 'same-origin');
    expect(listed.status).toBe(200);
  });
});
