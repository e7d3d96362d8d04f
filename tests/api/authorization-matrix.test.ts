import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { buildWorld } from '../helpers/authz-world.js';
import { listRoutes } from '../helpers/list-routes.js';
import { closeServerResources } from '../helpers/close.js';
import { appQueue } from '../../server/lib/queue.js';
import { SCOPES, WHO, type AreaCases, type RouteCase, type Scope, type Who, type World } from './authz/types.js';

/**
 * Every API route × every role × every scope, against the running app on the real database.
 * Each area lists its routes in tests/api/authz/<area>.ts; a registered route without a case fails
 * here, so a new route cannot slip through unreviewed.
 */

// Routes the sign-in tests cover: browser redirects to and from the identity provider, not API calls.
const NOT_API = new Set(['GET /auth/login', 'GET /auth/callback']);
// The client's own catch-all that serves index.html (present when the client is built).
const isClientFallback = (route: string) => route.endsWith(' /{*splat}');

const modules = import.meta.glob<Partial<AreaCases>>('./authz/*.ts', { eager: true });
const areas = Object.entries(modules).filter(([file]) => !file.endsWith('/types.ts'));
const cases: RouteCase[] = areas.flatMap(([, mod]) => mod.cases ?? []);
const extenders = areas.flatMap(([, mod]) => (mod.extendWorld ? [mod.extendWorld] : []));

const app = buildApp();
const registered = listRoutes(app).filter((r) => !NOT_API.has(r) && !isClientFallback(r));

function expectation(c: RouteCase, who: Who, scope: Scope | null): 'allowed' | 'refused' {
  const scopes = c.allow[who];
  if (!scopes) return 'refused';
  if (c.scopeless || scope === null) return scopes.length > 0 ? 'allowed' : 'refused';
  return scopes.includes(scope) ? 'allowed' : 'refused';
}

/** What a refusal must look like for this cell (see types.ts). */
function refusalStatuses(c: RouteCase, who: Who, scope: Scope | null): number[] {
  if (who === 'anonymous') return [401];
  if (scope === 'otherNetwork' && c.route.includes('/:')) return [404];
  return [403, 404];
}

describe('authorization matrix', () => {
  let world: World;

  beforeAll(async () => {
    world = await buildWorld(app);
    for (const extend of extenders) await extend(world);
  });

  // The allowed cells queue real work (transfer steps, e-mails) that no worker here runs; later files
  // start workers of their own and must not inherit it.
  afterAll(async () => {
    await appQueue().obliterate({ force: true });
    await closeServerResources();
  });

  it('has a case for every registered route', () => {
    const covered = new Set(cases.map((c) => c.route));
    const missing = registered.filter((r) => !covered.has(r));
    expect(missing, `routes without a case in tests/api/authz/*.ts:\n  ${missing.join('\n  ')}`).toEqual([]);
  });

  it('has no case for a route that does not exist, and none twice', () => {
    const known = new Set(registered);
    const stale = cases.map((c) => c.route).filter((r) => !known.has(r));
    expect(stale, `cases for routes the app does not register:\n  ${stale.join('\n  ')}`).toEqual([]);
    const seen = new Set<string>();
    const twice = cases.map((c) => c.route).filter((r) => (seen.has(r) ? true : (seen.add(r), false)));
    expect(twice).toEqual([]);
  });

  const sorted = [...cases].sort((a, b) => a.route.localeCompare(b.route));
  describe.each(sorted.map((c) => [c.route, c] as const))('%s', (route, c) => {
    const [method] = route.split(' ');
    type Cell = [Who, Scope | null];
    const cells = WHO.flatMap((who): Cell[] => (c.scopeless ? [[who, null]] : SCOPES.map((scope): Cell => [who, scope])));
    const rows: Array<[string, Who, Scope | null, 'allowed' | 'refused']> = cells.map(([who, scope]) => {
      const outcome = expectation(c, who, scope);
      const name = scope ? `${route} — ${who} — ${scope} → ${outcome}` : `${route} — ${who} → ${outcome}`;
      return [name, who, scope, outcome];
    });

    it.each(rows)('%s', async (_name, who, scope, outcome) => {
      const built = await c.build({ world, scope: scope ?? 'own', who });
      let req = request(app)[method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete'](built.path);
      const cookie = built.cookie ?? (who === 'anonymous' ? undefined : world.cookies[who]);
      if (cookie) req = req.set('Cookie', cookie);
      if (built.query) req = req.query(built.query);
      const res = built.body === undefined ? await req : await req.send(built.body as object);
      const seen = `${res.status} ${JSON.stringify(res.body).slice(0, 300)}`;
      if (outcome === 'allowed') {
        expect(res.status, `expected 2xx/3xx, got ${seen}`).toBeGreaterThanOrEqual(200);
        expect(res.status, `expected 2xx/3xx, got ${seen}`).toBeLessThan(400);
      } else {
        expect(refusalStatuses(c, who, scope), `expected a refusal, got ${seen}`).toContain(res.status);
      }
    });
  });
});
