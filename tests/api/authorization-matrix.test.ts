import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { buildWorld } from '../helpers/authz-world.js';
import { listRoutes } from '../helpers/list-routes.js';
import { closeServerResources } from '../helpers/close.js';
import { makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { appQueue } from '../../server/lib/queue.js';
import { sequelize } from '../../server/lib/db.js';
import { Invitation, User } from '../../server/lib/models.js';
import type { Role } from '../../shared/domain.js';
import {
  SCOPES,
  WHO,
  type AreaCases,
  type BuiltRequest,
  type ForeignId,
  type IdField,
  type RouteCase,
  type Scope,
  type Who,
  type World,
} from './authz/types.js';
import { createHash, randomBytes } from 'node:crypto';

/**
 * Every API route × every role × every scope, against the running app on the real database.
 * Each area lists its routes in tests/api/authz/<area>.ts; a registered route without a case fails
 * here, so a new route cannot slip through unreviewed. On top of the role × scope grid:
 * - mixed scopes: every id a case declares in `foreignIds` is sent from another shop and another network
 *   while the rest of the request stays at the person's own shop;
 * - answers are read: a private customer's name and contact, and staff e-mails, never reach someone who
 *   may not see them (in JSON, CSV or text);
 * - personas: a person with two roles at two shops, a deactivated person's old session, and a session
 *   signed in without any role;
 * - "allowed" means a 2xx (or the case's own status), and a refused write changes no row.
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

type Outcome = 'allowed' | 'refused';
type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';
const ROLES = WHO.filter((w): w is Role => w !== 'anonymous');
const DEFAULT_ALLOWED = [200, 201, 202, 204];
const MIXED_REFUSALS = [400, 403, 404, 422];

function expectation(c: RouteCase, who: Who, scope: Scope | null): Outcome {
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

const allowedStatuses = (c: RouteCase) => (c.status === undefined ? DEFAULT_ALLOWED : [c.status].flat());
const isWrite = (c: RouteCase) => !c.route.startsWith('GET ');
const asForeign = (d: ForeignId | ForeignId['kind']): ForeignId => (typeof d === 'string' ? { kind: d } : d);

/**
 * What must never appear in an answer to `who` about `scope`, by the registry's rule: another network's
 * private customer and staff are never seen; another shop's private customer (name, e-mail, phone,
 * address) and staff e-mail only by the owner. The person's own shop's customer is theirs to serve.
 */
function forbiddenFor(world: World, c: RouteCase, who: Who, scope: Scope, seesOtherShop = who === 'owner'): string[] {
  const out = [...world.secrets.otherNetwork.customer, world.secrets.otherNetwork.staffEmail];
  const showCustomer = seesOtherShop || (c.mayShowCustomer?.({ scope, who }) ?? false);
  if (!showCustomer) out.push(...world.secrets.otherShop.customer);
  if (!seesOtherShop) out.push(world.secrets.otherShop.staffEmail);
  if (c.forbiddenInBody) out.push(...c.forbiddenInBody({ world, scope, who }));
  return out;
}

/** The answer as text, whatever its type: JSON, CSV, plain text or a file. */
function answerText(res: request.Response): string {
  if (typeof res.text === 'string' && res.text.length) return res.text;
  if (Buffer.isBuffer(res.body)) return res.body.toString('latin1');
  return JSON.stringify(res.body ?? '');
}

function expectNothingForbidden(text: string, forbidden: string[], seen: string) {
  const leaked = forbidden.filter((s) => s && text.includes(s));
  expect(leaked, `the answer carries what this person may not see (${seen})`).toEqual([]);
}

// ---- "nothing changed": a fingerprint of every tenant table's rows of the matrix's two networks ----

let fingerprintSql = '';
async function prepareFingerprint(world: World) {
  const [tables] = (await sequelize.query(
    `select table_name from information_schema.columns
      where table_schema = 'public' and column_name = 'network_id' and table_name <> 'session'
      order by table_name`,
  )) as [Array<{ table_name: string }>, unknown];
  const nets = `('${world.networkA}', '${world.networkB}')`;
  fingerprintSql = [
    // a row inserted or updated gets a newer xmin; a deleted one lowers the count
    `select 'networks' as t, count(*)::text as n, coalesce(max(xmin::text::bigint), 0)::text as h from networks x where id in ${nets}`,
    ...tables.map(
      ({ table_name: t }) =>
        `select '${t}', count(*)::text, coalesce(max(xmin::text::bigint), 0)::text from "${t}" x where network_id in ${nets}`,
    ),
  ].join(' union all ');
}

async function fingerprint(): Promise<Record<string, string>> {
  const [rows] = (await sequelize.query(fingerprintSql)) as [Array<{ t: string; n: string; h: string }>, unknown];
  return Object.fromEntries(rows.map((r) => [r.t, `${r.n}:${r.h}`]));
}

function changedTables(before: Record<string, string>, after: Record<string, string>): string[] {
  return Object.keys({ ...before, ...after }).filter((t) => before[t] !== after[t]);
}

// ---- sending a built request ----

async function send(c: RouteCase, built: BuiltRequest, cookie: string | undefined) {
  const [method] = c.route.split(' ');
  let req = request(app)[method.toLowerCase() as Method](built.path);
  if (cookie) req = req.set('Cookie', cookie);
  if (built.query) req = req.query(built.query);
  return built.body === undefined ? await req : await req.send(built.body as object);
}

const describeAnswer = (res: request.Response) => `${res.status} ${answerText(res).slice(0, 300)}`;

/** Sets `body.a.b.0.c` / `query.x` (or swaps a path id) on a copy of the request, creating objects on the way. */
function withField(world: World, built: BuiltRequest, field: IdField, d: ForeignId, value: string): BuiltRequest {
  const [where, ...path] = field.split('.');
  const copy: BuiltRequest = structuredClone({ ...built });
  if (where === 'path') {
    // `path.<n>`: the n-th segment of the path (a fresh record the case made, e.g. a job's line)
    if (/^\d+$/.test(path[0])) {
      const segments = copy.path.split('/');
      expect(segments[Number(path[0])], `${field}: the path has no such segment`).toMatch(UUID);
      segments[Number(path[0])] = value;
      copy.path = segments.join('/');
      return copy;
    }
    const ownId = world.ids.own[d.kind];
    expect(copy.path, `${field}: the path carries no ${d.kind} of the own scope`).toContain(ownId);
    copy.path = copy.path.replace(ownId, value);
    return copy;
  }
  if (d.with) copy.body = { ...(copy.body ?? {}), ...d.with };
  if (where === 'query') {
    copy.query = { ...(copy.query ?? {}), [path.join('.')]: value };
    return copy;
  }
  copy.body = copy.body ?? {};
  let node = copy.body as Record<string, unknown>;
  for (const key of path.slice(0, -1)) {
    if (node[key] === undefined || node[key] === null) node[key] = {};
    node = node[key] as Record<string, unknown>;
  }
  node[path[path.length - 1]] = value;
  return copy;
}

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
/** Paths of every uuid-valued leaf in a body or query. */
function idLeaves(value: unknown, prefix: string): string[] {
  if (typeof value === 'string') return UUID.test(value) ? [prefix] : [];
  if (Array.isArray(value)) return value.flatMap((v, i) => idLeaves(v, `${prefix}.${i}`));
  if (value && typeof value === 'object') return Object.entries(value).flatMap(([k, v]) => idLeaves(v, `${prefix}.${k}`));
  return [];
}

describe('authorization matrix', () => {
  let world: World;

  beforeAll(async () => {
    world = await buildWorld(app);
    for (const extend of extenders) await extend(world);
    await prepareFingerprint(world);
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

  it('declares the ids of every route whose body or query carries one (`foreignIds`, or `{}` for a deliberate none)', async () => {
    const undeclared: string[] = [];
    for (const c of cases) {
      if (c.foreignIds !== undefined) continue;
      const built = await c.build({ world, scope: 'own', who: 'owner' });
      const ids = [...idLeaves(built.body, 'body'), ...idLeaves(built.query, 'query')];
      if (ids.length) undeclared.push(`${c.route}: ${ids.join(', ')}`);
    }
    expect(undeclared, `cases whose request carries ids without a foreignIds declaration:\n  ${undeclared.join('\n  ')}`).toEqual([]);
  });

  it("reads answers that do carry the secrets it looks for: the owner sees another shop's private customer on its board", async () => {
    const res = await request(app).get('/api/jobs').query({ shop: world.ids.otherShop.shop, stage: 'all' }).set('Cookie', world.cookies.owner);
    expect(res.status).toBe(200);
    expect(res.text).toContain(world.secrets.otherShop.customer[0]);
  });

  const sorted = [...cases].sort((a, b) => a.route.localeCompare(b.route));

  describe.each(sorted.map((c) => [c.route, c] as const))('%s', (route, c) => {
    type Cell = [Who, Scope | null];
    const cells = WHO.flatMap((who): Cell[] => (c.scopeless ? [[who, null]] : SCOPES.map((scope): Cell => [who, scope])));
    const rows: Array<[string, Who, Scope | null, Outcome]> = cells.map(([who, scope]) => {
      const outcome = expectation(c, who, scope);
      const name = scope ? `${route} — ${who} — ${scope} → ${outcome}` : `${route} — ${who} → ${outcome}`;
      return [name, who, scope, outcome];
    });

    it.each(rows)('%s', async (_name, who, scope, outcome) => {
      const built = await c.build({ world, scope: scope ?? 'own', who });
      const cookie = built.cookie ?? (who === 'anonymous' ? undefined : world.cookies[who]);
      // anonymous calls stop at the session check; the personas below watch rows for sessions that do not count
      const watch = outcome === 'refused' && isWrite(c) && who !== 'anonymous';
      const before = watch ? await fingerprint() : null;
      const res = await send(c, built, cookie);
      const seen = describeAnswer(res);
      if (outcome === 'allowed') {
        expect(allowedStatuses(c), `expected ${allowedStatuses(c).join('/')}, got ${seen}`).toContain(res.status);
        await c.verify?.({ world, scope: scope ?? 'own', who, built, res: { status: res.status, body: res.body, text: answerText(res) } });
      } else {
        expect(refusalStatuses(c, who, scope), `expected a refusal, got ${seen}`).toContain(res.status);
      }
      if (before) expect(changedTables(before, await fingerprint()), `a refused ${route} changed rows`).toEqual([]);
      expectNothingForbidden(answerText(res), forbiddenFor(world, c, who, scope ?? 'own'), `${who} at ${scope ?? 'scopeless'}`);
    });
  });

  // ---- mixed scopes: the request is at the person's own shop, one id in it is not ----

  type MixedRow = [string, RouteCase, Role, IdField, ForeignId, Exclude<Scope, 'own'>, Outcome];
  const mixedRows: MixedRow[] = sorted.flatMap((c) =>
    Object.entries(c.foreignIds ?? {}).flatMap(([field, decl]) => {
      const d = asForeign(decl as ForeignId | ForeignId['kind']);
      const whoAtOwn = ROLES.filter((who) => expectation(c, who, c.scopeless ? null : 'own') === 'allowed');
      return whoAtOwn.flatMap((who) => {
        const out: MixedRow[] = [[`${c.route} — ${who} — ${field} of another network → refused`, c, who, field as IdField, d, 'otherNetwork', 'refused']];
        if (d.otherShop) {
          const outcome: Outcome = d.otherShop === 'allowed' || (d.otherShop === 'ownerOnly' && who === 'owner') ? 'allowed' : 'refused';
          out.push([`${c.route} — ${who} — ${field} of another shop → ${outcome}`, c, who, field as IdField, d, 'otherShop', outcome]);
        }
        return out;
      });
    }),
  );

  // Refusals first: an allowed cell (the owner naming another shop's customer at intake) can make the
  // person's shop one that serves that customer, after which the refusal would no longer be owed.
  mixedRows.sort((a, b) => (a[6] === b[6] ? 0 : a[6] === 'refused' ? -1 : 1));

  describe('mixed scopes', () => {
    it.each(mixedRows)('%s', async (_name, c, who, field, d, foreignScope, outcome) => {
      const base = await c.build({ world, scope: 'own', who });
      const foreignId = world.ids[foreignScope][d.kind];
      expect(foreignId, `the world has no ${d.kind} for ${foreignScope}`).toBeTruthy();
      const built = withField(world, base, field, d, foreignId);
      const before = isWrite(c) ? await fingerprint() : null;
      const res = await send(c, built, built.cookie ?? world.cookies[who]);
      const seen = describeAnswer(res);
      if (outcome === 'allowed') {
        expect(allowedStatuses(c), `expected ${allowedStatuses(c).join('/')}, got ${seen}`).toContain(res.status);
      } else {
        const accepted = d.filter && !isWrite(c) ? [...MIXED_REFUSALS, ...allowedStatuses(c)] : MIXED_REFUSALS;
        expect(accepted, `expected a refusal, got ${seen}`).toContain(res.status);
        if (before) expect(changedTables(before, await fingerprint()), `a refused ${c.route} changed rows`).toEqual([]);
      }
      expectNothingForbidden(answerText(res), forbiddenFor(world, c, who, 'own'), `${who}, ${field} of ${foreignScope}`);
    });
  });

  // ---- personas ----

  describe('a person with two roles at two shops (technician at one, front desk at the other)', () => {
    let dual: { id: string; cookie: string };
    beforeAll(async () => {
      const user = await makeUser(world.networkA, [
        { shopId: world.ids.own.shop, role: 'technician' },
        { shopId: world.ids.otherShop.shop, role: 'front_desk' },
      ], { email: `dual-${uniq()}@matrix.test` });
      dual = { id: user.id, cookie: await signIn(app, user.email) };
    });

    /** At each shop the person acts in the role held there; rights add up across the two. */
    type DualRow = [string, RouteCase, Scope | null, Role, Outcome];
    const dualRows: DualRow[] = sorted.flatMap((c): DualRow[] => {
      if (c.scopeless) {
        const outcome: Outcome = expectation(c, 'technician', null) === 'allowed' || expectation(c, 'front_desk', null) === 'allowed' ? 'allowed' : 'refused';
        return [[`${c.route} — two roles → ${outcome}`, c, null, 'technician', outcome]];
      }
      const either = (a: [Role, Scope], b: [Role, Scope]): Outcome =>
        expectation(c, ...a) === 'allowed' || expectation(c, ...b) === 'allowed' ? 'allowed' : 'refused';
      const atOwn = either(['technician', 'own'], ['front_desk', c.scopeIsPerson ? 'own' : 'otherShop']);
      const atOther = c.scopeIsPerson ? expectation(c, 'front_desk', 'otherShop') : either(['front_desk', 'own'], ['technician', 'otherShop']);
      const atNetwork = either(['technician', 'otherNetwork'], ['front_desk', 'otherNetwork']);
      return [
        [`${c.route} — at the shop where they are technician → ${atOwn}`, c, 'own', 'technician', atOwn],
        [`${c.route} — at the shop where they are front desk → ${atOther}`, c, 'otherShop', 'front_desk', atOther],
        [`${c.route} — in another network → ${atNetwork}`, c, 'otherNetwork', 'technician', atNetwork],
      ];
    });

    it.each(dualRows)('%s', async (_name, c, scope, roleThere, outcome) => {
      const asDual: World = {
        ...world,
        users: { ...world.users, technician: dual.id, front_desk: dual.id },
        cookies: { ...world.cookies, technician: dual.cookie, front_desk: dual.cookie },
        signInAs: async (role) => (role === 'technician' || role === 'front_desk' ? signIn(app, (await User.findByPk(dual.id))!.email) : world.signInAs(role)),
      };
      const built = await c.build({ world: asDual, scope: scope ?? 'own', who: roleThere });
      const watch = outcome === 'refused' && isWrite(c);
      const before = watch ? await fingerprint() : null;
      const res = await send(c, built, built.cookie ?? dual.cookie);
      const seen = describeAnswer(res);
      if (outcome === 'allowed') expect(allowedStatuses(c), `expected ${allowedStatuses(c).join('/')}, got ${seen}`).toContain(res.status);
      else expect(refusalStatuses(c, roleThere, scope), `expected a refusal, got ${seen}`).toContain(res.status);
      if (before) expect(changedTables(before, await fingerprint()), `a refused ${c.route} changed rows`).toEqual([]);
      // both shops' customers are theirs to serve; another network's never
      expectNothingForbidden(answerText(res), forbiddenFor(world, c, roleThere, scope ?? 'own', true), `two roles at ${scope}`);
    });
  });

  describe("a deactivated person's old session", () => {
    let cookie: string;
    beforeAll(async () => {
      const user = await makeUser(world.networkA, [{ shopId: world.ids.own.shop, role: 'regional_manager' }], { email: `gone-${uniq()}@matrix.test` });
      cookie = await signIn(app, user.email);
      const me = await request(app).get('/api/me').set('Cookie', cookie);
      expect(me.status).toBe(200);
      // deactivated straight in the database: the session row stays, the person must still be shut out
      await user.update({ active: false, deactivatedAt: new Date() });
    });

    const goneRows = sorted.map((c): [string, RouteCase, Outcome] => {
      const outcome = expectation(c, 'anonymous', c.scopeless ? null : 'own');
      return [`${c.route} → ${outcome === 'allowed' ? 'as anyone' : '401'}`, c, outcome];
    });

    it.each(goneRows)('%s', async (_name, c, outcome) => {
      const built = await c.build({ world, scope: 'own', who: 'regional_manager' });
      const before = isWrite(c) ? await fingerprint() : null;
      // the old cookie, even where the case would bring a fresh session of its own
      const res = await send(c, built, cookie);
      const seen = describeAnswer(res);
      if (outcome === 'allowed') expect(allowedStatuses(c), `expected ${allowedStatuses(c).join('/')}, got ${seen}`).toContain(res.status);
      else expect(res.status, `expected 401, got ${seen}`).toBe(401);
      if (before && outcome === 'refused') expect(changedTables(before, await fingerprint()), `${c.route} changed rows`).toEqual([]);
      expectNothingForbidden(answerText(res), [...world.secrets.own.customer, ...forbiddenFor(world, c, 'anonymous', 'own')], 'deactivated');
    });
  });

  describe('a session signed in without any role', () => {
    let cookie: string;
    const email = `nobody-${uniq()}@matrix.test`;
    beforeAll(async () => {
      cookie = await signIn(app, email);
    });

    it('is told it has no access yet, with the e-mail it signed in with', async () => {
      const res = await request(app).get('/api/me').set('Cookie', cookie);
      expect(res.status).toBe(403);
      expect(res.body.error).toMatchObject({ code: 'no_access', email });
    });

    // meant for them: anything public, /api/me's "no access" answer, and accepting their own invitation
    const noneRows = sorted
      .filter((c) => c.route !== 'GET /api/me')
      .map((c): [string, RouteCase, Outcome] => {
        const outcome = expectation(c, 'anonymous', c.scopeless ? null : 'own');
        return [`${c.route} → ${outcome === 'allowed' ? 'as anyone' : '401/403'}`, c, outcome];
      });

    it.each(noneRows)('%s', async (_name, c, outcome) => {
      const built = await c.build({ world, scope: 'own', who: 'front_desk' });
      const before = isWrite(c) ? await fingerprint() : null;
      const res = await send(c, built, c.route === 'POST /auth/logout' ? await signIn(app, email) : cookie);
      const seen = describeAnswer(res);
      if (outcome === 'allowed') expect(allowedStatuses(c), `expected ${allowedStatuses(c).join('/')}, got ${seen}`).toContain(res.status);
      else expect([401, 403], `expected 401 or 403, got ${seen}`).toContain(res.status);
      if (before && outcome === 'refused') expect(changedTables(before, await fingerprint()), `${c.route} changed rows`).toEqual([]);
      expectNothingForbidden(answerText(res), [...world.secrets.own.customer, ...forbiddenFor(world, c, 'anonymous', 'own')], 'no role');
    });

    it('accepts an invitation to their own e-mail, and then holds the role it gives', async () => {
      const fresh = await signIn(app, email);
      const token = randomBytes(32).toString('base64url');
      await Invitation.create({
        networkId: world.networkA, email, roles: [{ shopId: world.ids.own.shop, role: 'auditor' }],
        tokenHash: createHash('sha256').update(token).digest('hex'), invitedByUserId: world.users.owner,
        expiresAt: new Date(Date.now() + 3600_000),
      });
      expect((await request(app).get(`/api/invitations/preview/${token}`).set('Cookie', fresh)).status).toBe(200);
      const accepted = await request(app).post('/api/invitations/accept').set('Cookie', fresh).send({ token });
      expect(accepted.status, describeAnswer(accepted)).toBe(200);
      const cookieAfter = accepted.headers['set-cookie']?.[0]?.split(';')[0] ?? fresh;
      const me = await request(app).get('/api/me').set('Cookie', cookieAfter);
      expect(me.status).toBe(200);
      expect(JSON.stringify(me.body)).toContain(world.ids.own.shop);
    });
  });
});
