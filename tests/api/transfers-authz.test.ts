import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { Skill, Transfer } from '../../server/lib/models.js';
import type { Role } from '../../shared/domain.js';
import { closeServerResources } from '../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { SCOPES, WHO, type RouteCase, type Scope, type ScopedIds, type Who, type World } from './authz/types.js';
import * as transferCases from './authz/transfers.js';
import * as notificationCases from './authz/notifications.js';

/**
 * The transfer and inbox routes' cells of the authorization matrix, run here against a world of the
 * same shape as the matrix's (one person per role at the `own` shop; records at `own`, at another shop
 * and in another network), so these cases are checked even where the full matrix is not.
 */
const SHOP_ROLES: Array<Exclude<Role, 'owner'>> = ['regional_manager', 'front_desk', 'technician', 'auditor'];

async function buildTransferWorld(app: ReturnType<typeof buildApp>): Promise<World> {
  const networkA = await makeNetwork();
  const networkB = await makeNetwork();
  const own = await makeShop(networkA.id);
  const other = await makeShop(networkA.id);
  const thirdA = await makeShop(networkA.id);
  const shopB = await makeShop(networkB.id);
  const thirdB = await makeShop(networkB.id);
  const users = {} as Record<Role, string>;
  const emails = {} as Record<Role, string>;
  const owner = await makeUser(networkA.id, [{ shopId: null, role: 'owner' }], { email: `owner-${uniq()}@matrix.test` });
  users.owner = owner.id;
  emails.owner = owner.email;
  for (const role of SHOP_ROLES) {
    const u = await makeUser(networkA.id, [{ shopId: own.id, role }], { email: `${role}-${uniq()}@matrix.test` });
    users[role] = u.id;
    emails[role] = u.email;
  }
  const ownerB = await makeUser(networkB.id, [{ shopId: null, role: 'owner' }]);
  const place = async (networkId: string, shopId: string, thirdId: string, actorId: string): Promise<ScopedIds> => {
    const staff = await makeUser(networkId, [{ shopId, role: 'technician' }]);
    const skill = await Skill.create({ networkId, code: `skill_${uniq()}`, name: 'Low saxophones' });
    const { instrument, job } = await makeInstrumentWithJob(networkId, shopId, actorId);
    const transfer = await Transfer.create({
      networkId, jobId: job.id, instrumentId: instrument.id, fromShopId: shopId, toShopId: thirdId, reason: 'Matrix', requestedByUserId: actorId,
    });
    return { shop: shopId, job: job.id, instrument: instrument.id, transfer: transfer.id, user: staff.id, skill: skill.id };
  };
  const ids = {
    own: await place(networkA.id, own.id, thirdA.id, owner.id),
    otherShop: await place(networkA.id, other.id, thirdA.id, owner.id),
    otherNetwork: await place(networkB.id, shopB.id, thirdB.id, ownerB.id),
  } as Record<Scope, ScopedIds>;
  const cookies = {} as Record<Role, string>;
  for (const role of ['owner', ...SHOP_ROLES] as Role[]) cookies[role] = await signIn(app, emails[role]);
  return { networkA: networkA.id, networkB: networkB.id, ids, cookies, users };
}

const cases: RouteCase[] = [...transferCases.cases, ...notificationCases.cases];

describe('authorization of the transfer and inbox routes', () => {
  const app = buildApp();
  let world: World;

  beforeAll(async () => {
    world = await buildTransferWorld(app);
    await transferCases.extendWorld(world);
  });
  afterAll(closeServerResources);

  describe.each(cases.map((c) => [c.route, c] as const))('%s', (route, c) => {
    const [method] = route.split(' ');
    const cells: Array<[Who, Scope]> = WHO.flatMap((who) => (c.scopeless ? [[who, 'own'] as [Who, Scope]] : SCOPES.map((s) => [who, s] as [Who, Scope])));
    it.each(cells)(`${route} — %s — %s`, async (who, scope) => {
      const allowed = c.scopeless ? (c.allow[who]?.length ?? 0) > 0 : (c.allow[who] ?? []).includes(scope);
      const built = await c.build({ world, scope, who });
      let req = request(app)[method.toLowerCase() as 'get' | 'post'](built.path);
      if (who !== 'anonymous') req = req.set('Cookie', world.cookies[who]);
      if (built.query) req = req.query(built.query);
      const res = built.body === undefined ? await req : await req.send(built.body as object);
      const seen = `${res.status} ${JSON.stringify(res.body).slice(0, 200)}`;
      if (allowed) {
        expect(res.status, seen).toBeGreaterThanOrEqual(200);
        expect(res.status, seen).toBeLessThan(400);
      } else if (who === 'anonymous') {
        expect(res.status, seen).toBe(401);
      } else if (scope === 'otherNetwork' && route.includes('/:')) {
        expect(res.status, seen).toBe(404);
      } else {
        expect([403, 404], seen).toContain(res.status);
      }
    });
  });
});
