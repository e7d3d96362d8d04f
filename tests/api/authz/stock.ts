import { Part, Shop } from '../../../server/lib/models.js';
import { PartTransfer } from '../../../server/modules/stock/models.js';
import { makeShop, uniq } from '../../helpers/factories.js';
import { setStock } from '../../helpers/pad-catalog.js';
import { SCOPES, type RouteCase, type Scope, type World } from './types.js';

/** Stock, reservations and parts between shops (server/modules/stock); tests/api/padmaps-stock.test.ts checks the counts. */
const networkOf = (world: World, scope: Scope) => (scope === 'otherNetwork' ? world.networkB : world.networkA);

/** Per scope: a pad, and a shop of that scope's network where nobody in the matrix holds a role. */
const makePad = (networkId: string) =>
  Part.create({
    networkId, sku: `PAD-S-MX-${uniq()}`, name: 'Self-leveling pad 30.0 mm × 3.6 mm', kind: 'pad', padKind: 'self_leveling', diameterMm: 30, thicknessMm: 3.6, unitPriceCents: 600,
  });

export async function extendWorld(world: World) {
  for (const scope of SCOPES) {
    const networkId = networkOf(world, scope);
    const pad = await makePad(networkId);
    const partsShop: Shop = await makeShop(networkId, { name: `Parts bench ${uniq()}` });
    world.ids[scope].pad = pad.id;
    world.ids[scope].partsShop = partsShop.id;
  }
}

async function freshTransfer(world: World, scope: Scope, direction: 'out' | 'in', state: 'requested' | 'sent') {
  const ids = world.ids[scope];
  const networkId = networkOf(world, scope);
  const [fromShopId, toShopId] = direction === 'out' ? [ids.shop, ids.partsShop] : [ids.partsShop, ids.shop];
  // a fresh part each time: only one open request per part between two shops is allowed
  const pad = await makePad(networkId);
  await setStock(networkId, fromShopId, pad.id, 5);
  const transfer = await PartTransfer.create({
    networkId, partId: pad.id, fromShopId, toShopId, quantity: 1, requestedByUserId: ids.user, state,
    ...(state === 'sent' ? { sentAt: new Date() } : {}),
    note: `matrix ${uniq()}`,
  });
  return transfer.id;
}

export const cases: RouteCase[] = [
  {
    route: 'GET /api/stock',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'], technician: ['own'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: '/api/stock', query: { shopId: world.ids[scope].shop } }),
    // `shopId` is the scope's target
    foreignIds: {},
  },
  {
    route: 'PATCH /api/stock/:shopId/parts/:partId',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/stock/${world.ids[scope].shop}/parts/${world.ids[scope].pad}`, body: { reorderPoint: 2 } }),
    // one's own shop, another network's part
    foreignIds: { 'path.partId': 'pad' },
  },
  {
    // parts belong to the network, like the service catalog: only the owner sets their hazard tags
    route: 'PUT /api/parts/:partId/hazards',
    allow: { owner: ['own', 'otherShop'] },
    build: ({ world, scope }) => ({ path: `/api/parts/${world.ids[scope].pad}/hazards`, body: { hazards: ['adhesive'] } }),
    foreignIds: {},
    verify: async ({ world, scope }) => {
      const part = await Part.findOne({ where: { networkId: networkOf(world, scope), id: world.ids[scope].pad } });
      if (!part?.hazards.includes('adhesive')) throw new Error('the hazard tag was not stored');
    },
  },
  {
    // the shop that is short asks (a repeat finds the open request and answers 200)
    route: 'POST /api/stock/part-transfers',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], technician: ['own'] },
    build: ({ world, scope }) => ({
      path: '/api/stock/part-transfers',
      body: { partId: world.ids[scope].pad, fromShopId: world.ids[scope].partsShop, toShopId: world.ids[scope].shop, quantity: 1 },
    }),
    // `toShopId` is the scope's target: the shop that is short
    foreignIds: { 'body.partId': 'pad', 'body.fromShopId': 'partsShop', 'body.jobId': { kind: 'job', otherShop: 'refused' } },
  },
  {
    // the sending shop's manager packs the parts
    route: 'POST /api/stock/part-transfers/:id/send',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'] },
    build: async ({ world, scope }) => ({ path: `/api/stock/part-transfers/${await freshTransfer(world, scope, 'out', 'requested')}/send` }),
  },
  {
    // the receiving shop's bench takes them in
    route: 'POST /api/stock/part-transfers/:id/receive',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], technician: ['own'] },
    build: async ({ world, scope }) => ({ path: `/api/stock/part-transfers/${await freshTransfer(world, scope, 'in', 'sent')}/receive` }),
  },
  {
    route: 'POST /api/stock/part-transfers/:id/cancel',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], technician: ['own'] },
    build: async ({ world, scope }) => ({ path: `/api/stock/part-transfers/${await freshTransfer(world, scope, 'in', 'requested')}/cancel` }),
  },
  {
    // whoever may update the job may put its reserved parts back
    route: 'POST /api/jobs/:jobId/reservations/release',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'], technician: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/jobs/${world.ids[scope].job}/reservations/release` }),
  },
];
