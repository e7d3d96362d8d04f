import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';

describe('GET /api/shops/summary', () => {
  const app = buildApp();
  let ownerCookie: string;
  let deskCookie: string;
  let managerCookie: string;
  let shopA: { id: string };
  let shopB: { id: string };

  beforeAll(async () => {
    const net = await makeNetwork();
    shopA = await makeShop(net.id, { name: 'A bench' });
    shopB = await makeShop(net.id, { name: 'B bench' });
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const desk = await makeUser(net.id, [{ shopId: shopA.id, role: 'front_desk' }]);
    for (const stage of ['intake', 'intake', 'on_bench', 'released', 'waiting_for_parts'] as const) {
      await makeInstrumentWithJob(net.id, shopA.id, owner.id, { stage });
    }
    await makeInstrumentWithJob(net.id, shopB.id, owner.id, { stage: 'ready' });
    // another network's jobs never count
    const other = await makeNetwork();
    const otherShop = await makeShop(other.id, { name: 'A bench' });
    const otherOwner = await makeUser(other.id, [{ shopId: null, role: 'owner' }]);
    await makeInstrumentWithJob(other.id, otherShop.id, otherOwner.id, { stage: 'intake' });
    // a regional manager of A reads every shop of the network, but A is the one they run
    const manager = await makeUser(net.id, [{ shopId: shopA.id, role: 'regional_manager' }]);
    managerCookie = await signIn(app, manager.email);
    ownerCookie = await signIn(app, owner.email);
    deskCookie = await signIn(app, desk.email);
  });
  afterAll(closeServerResources);

  it('counts open jobs per stage for each of the owner’s shops (released is not open)', async () => {
    const res = await request(app).get('/api/shops/summary').set('Cookie', ownerCookie).expect(200);
    expect(res.body.shops).toHaveLength(2);
    const a = res.body.shops.find((s: { id: string }) => s.id === shopA.id);
    expect(a.openJobs).toBe(4);
    expect(a.jobsByStage).toEqual({ intake: 2, on_bench: 1, released: 1, waiting_for_parts: 1 });
    const b = res.body.shops.find((s: { id: string }) => s.id === shopB.id);
    expect(b.openJobs).toBe(1);
  });

  it('shows front desk only the shop they work at', async () => {
    const res = await request(app).get('/api/shops/summary').set('Cookie', deskCookie).expect(200);
    expect(res.body.shops.map((s: { id: string }) => s.id)).toEqual([shopA.id]);
  });

  it('lists for a regional manager only the shops they manage, not every shop they may read', async () => {
    const res = await request(app).get('/api/shops/summary').set('Cookie', managerCookie).expect(200);
    expect(res.body.shops.map((s: { id: string }) => s.id)).toEqual([shopA.id]);
    // they still read shop B
    await request(app).get(`/api/shops/${shopB.id}`).set('Cookie', managerCookie).expect(200);
  });

  it('needs sign-in', async () => {
    await request(app).get('/api/shops/summary').expect(401);
  });
});
