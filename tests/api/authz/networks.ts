import { RelayRun, Shop, ShopClosingDay } from '../../../server/lib/models.js';
import { uniq } from '../../helpers/factories.js';
import { SCOPES, type RouteCase, type Scope } from './types.js';

/** Shops, skills and relay runs (server/modules/networks). */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
/** Setting up shops is the owner's alone; another network's records are not found. */
const ownerInNetwork = { owner: ['own', 'otherShop'] as Scope[] };

let codes = 0;
/** A different calendar day for every call, so each cell adds or removes a day of its own. */
let dayCount = Math.floor(Math.random() * 20_000);
const freshDay = () => new Date(Date.UTC(2031, 0, 1) + ++dayCount * 86_400_000).toISOString().slice(0, 10);
const freshCode = () => `M${String(++codes).padStart(3, '0')}${Math.floor(Math.random() * 1000)}`.slice(0, 8);

export const cases: RouteCase[] = [
  // lists are filtered to what each person may read (tests/api/networks/*.test.ts check the rows)
  { route: 'GET /api/shops/summary', scopeless: true, allow: signedIn, build: () => ({ path: '/api/shops/summary' }) },
  { route: 'GET /api/shops', scopeless: true, allow: signedIn, build: () => ({ path: '/api/shops' }) },
  {
    route: 'POST /api/shops',
    scopeless: true,
    allow: { owner: SCOPES },
    build: () => ({
      path: '/api/shops',
      body: { name: `Matrix bench ${uniq()}`, code: freshCode(), timeZone: 'America/Denver', openingDays: [1, 2, 3], laborRateCents: 8000 },
    }),
  },
  {
    // anyone with a role at the shop reads it; regional managers read every shop of the network
    route: 'GET /api/shops/:id',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own'], technician: ['own'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/shops/${world.ids[scope].shop}` }),
  },
  {
    route: 'PATCH /api/shops/:id',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({ path: `/api/shops/${world.ids[scope].shop}`, body: { phone: `+1 555 01${Math.floor(Math.random() * 90 + 10)}` } }),
  },
  {
    route: 'PUT /api/shops/:id/skills',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({
      path: `/api/shops/${world.ids[scope].shop}/skills`,
      body: { skills: [{ skillId: world.ids[scope].skill, weeklyBenchHours: 30 }] },
    }),
    foreignIds: { 'body.skills.0.skillId': 'skill' },
  },
  {
    route: 'PUT /api/shops/:id/technician-skills',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({
      path: `/api/shops/${world.ids[scope].shop}/technician-skills`,
      body: { userId: world.ids[scope].user, skills: [{ skillId: world.ids[scope].skill, weeklyHours: 12 }] },
    }),
    // the technician must work at the shop
    foreignIds: { 'body.userId': { kind: 'user', otherShop: 'refused' }, 'body.skills.0.skillId': 'skill' },
  },
  {
    // closing days are read with the shop
    route: 'GET /api/shops/:id/closing-days',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own'], technician: ['own'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/shops/${world.ids[scope].shop}/closing-days` }),
  },
  {
    // and set by the owner, like the rest of the shop
    route: 'POST /api/shops/:id/closing-days',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({ path: `/api/shops/${world.ids[scope].shop}/closing-days`, body: { date: freshDay(), reason: 'Stocktake' } }),
    foreignIds: {},
    verify: async ({ world, scope, built }) => {
      const { date } = built.body as { date: string };
      const row = await ShopClosingDay.findOne({ where: { shopId: world.ids[scope].shop, date } });
      if (!row) throw new Error(`closing day ${date} was not stored`);
    },
  },
  {
    route: 'DELETE /api/shops/:id/closing-days/:date',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => {
      const shop = await Shop.findOne({ where: { id: world.ids[scope].shop } });
      const day = await ShopClosingDay.create({ networkId: shop!.networkId, shopId: shop!.id, date: freshDay(), reason: 'Bench move' });
      return { path: `/api/shops/${shop!.id}/closing-days/${day.date}` };
    },
    verify: async ({ world, scope, built }) => {
      const date = built.path.split('/').pop()!;
      if (await ShopClosingDay.findOne({ where: { shopId: world.ids[scope].shop, date } })) throw new Error(`closing day ${date} is still there`);
    },
  },

  { route: 'GET /api/skills', scopeless: true, allow: signedIn, build: () => ({ path: '/api/skills' }) },
  {
    route: 'POST /api/skills',
    scopeless: true,
    allow: { owner: SCOPES },
    build: () => ({ path: '/api/skills', body: { code: `skill_${uniq()}`, name: 'Vintage flutes' } }),
  },
  {
    route: 'PATCH /api/skills/:id',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({ path: `/api/skills/${world.ids[scope].skill}`, body: { name: 'Low saxophones' } }),
  },

  {
    route: 'GET /api/relay-runs',
    scopeless: true,
    allow: signedIn,
    build: () => ({ path: '/api/relay-runs' }),
    foreignIds: { 'query.shopId': { kind: 'shop', filter: true } },
  },
  {
    // the run's shops are the scope's: another network's shops are not found
    route: 'POST /api/relay-runs',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({
      path: '/api/relay-runs',
      body: { fromShopId: world.ids[scope].shop, toShopId: world.ids[scope].destinationShop, weekdays: [5], departureTime: '16:00', transitHours: 8 },
    }),
    // `fromShopId` is the scope's target; a run to another shop of the network is what runs are for
    foreignIds: { 'body.toShopId': { kind: 'shop', otherShop: 'allowed' } },
  },
  {
    route: 'PATCH /api/relay-runs/:id',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({ path: `/api/relay-runs/${world.ids[scope].relayRun}`, body: { transitHours: 5 } }),
  },
  {
    route: 'DELETE /api/relay-runs/:id',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => {
      const source = await RelayRun.findOne({ where: { id: world.ids[scope].relayRun } });
      const run = await RelayRun.create({
        networkId: source!.networkId, fromShopId: source!.fromShopId, toShopId: source!.toShopId,
        weekdays: [1], departureTime: '09:00:00', transitHours: 4,
      });
      return { path: `/api/relay-runs/${run.id}` };
    },
  },
];
