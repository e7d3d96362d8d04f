import { expect } from 'vitest';
import { Transfer } from '../../../server/lib/models.js';
import { writeManifest } from '../../../server/modules/transfers/service.js';
import type { TransferState } from '../../../shared/domain.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import { SCOPES, type RouteCase, type Scope, type World } from './types.js';

/**
 * Transfers (server/modules/transfers). Each scope's record lives at that scope's shop; the world's
 * transfer goes from it to a third shop where none of the matrix people holds a role. Steps that change
 * a transfer get a fresh transfer in the right state for every cell, so each cell starts alike.
 */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
/** Requesting, packing and handing over: the owner anywhere, a manager or front desk at their shop. */
const originSide = { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'] } satisfies RouteCase['allow'];
/** Deciding: the owner, or a manager over one of the two shops. */
const deciders = { owner: ['own', 'otherShop'], regional_manager: ['own'] } satisfies RouteCase['allow'];

async function placeOf(world: World, scope: Scope) {
  const networkId = scope === 'otherNetwork' ? world.networkB : world.networkA;
  const base = await Transfer.findOne({ where: { networkId, id: world.ids[scope].transfer } });
  if (!base) throw new Error(`the matrix world has no transfer for scope ${scope}`);
  return { networkId, shopId: world.ids[scope].shop, thirdShopId: base.toShopId, requesterId: base.requestedByUserId };
}

/** A transfer in `state`; `direction: 'in'` brings it from the third shop to the scope's shop. */
async function freshTransfer(world: World, scope: Scope, state: TransferState, direction: 'out' | 'in' = 'out') {
  const p = await placeOf(world, scope);
  const [fromShopId, toShopId] = direction === 'out' ? [p.shopId, p.thirdShopId] : [p.thirdShopId, p.shopId];
  const { instrument, job } = await makeInstrumentWithJob(p.networkId, fromShopId, p.requesterId, {
    stage: state === 'in_transit' ? 'in_transit' : 'approved',
  });
  const decided = state !== 'requested' ? { approvedByUserId: p.requesterId, approvedAt: new Date() } : {};
  const transfer = await Transfer.create({
    networkId: p.networkId, jobId: job.id, instrumentId: instrument.id, fromShopId, toShopId, state,
    reason: 'Authorization matrix', requestedByUserId: p.requesterId, ...decided,
  });
  return { transfer, instrument, job };
}

/** Per scope, a packed transfer with its manifest: the manifest is made at packing and only read by the API. */
const packedWithManifest: Partial<Record<Scope, string>> = {};

export async function extendWorld(world: World) {
  for (const scope of SCOPES) {
    const networkId = scope === 'otherNetwork' ? world.networkB : world.networkA;
    const { transfer } = await freshTransfer(world, scope, 'packed');
    await transfer.update({ packedAt: new Date(), packedByUserId: transfer.requestedByUserId });
    await writeManifest(networkId, transfer.id);
    packedWithManifest[scope] = transfer.id;
  }
}

export const cases: RouteCase[] = [
  // lists are filtered to what each person may read (tests/api/transfers.test.ts)
  {
    route: 'GET /api/transfers',
    scopeless: true,
    allow: signedIn,
    build: () => ({ path: '/api/transfers' }),
    foreignIds: { 'query.shopId': { kind: 'shop', filter: true } },
  },
  {
    route: 'GET /api/transfers/recommendation',
    allow: originSide,
    build: ({ world, scope }) => ({
      path: '/api/transfers/recommendation',
      query: { jobId: world.ids[scope].job, ...(world.ids[scope].skill ? { skillId: world.ids[scope].skill } : {}) },
    }),
    // `jobId` is the scope's target
    foreignIds: { 'query.skillId': 'skill' },
  },
  {
    route: 'GET /api/transfers/requestable-jobs',
    allow: originSide,
    build: ({ world, scope }) => ({ path: '/api/transfers/requestable-jobs', query: { shopId: world.ids[scope].shop } }),
    // `shopId` is the scope's target
    foreignIds: {},
  },
  {
    route: 'POST /api/transfers',
    allow: originSide,
    build: async ({ world, scope }) => {
      const p = await placeOf(world, scope);
      const { job } = await makeInstrumentWithJob(p.networkId, p.shopId, p.requesterId, { stage: 'assessed' });
      return { path: '/api/transfers', body: { jobId: job.id, toShopId: p.thirdShopId, reason: 'Authorization matrix' } };
    },
    // `jobId` is the scope's target; sending to another shop of the network is what a transfer is for
    foreignIds: { 'body.toShopId': { kind: 'shop', otherShop: 'allowed' } },
    verify: async ({ res }) => {
      const id = (res.body as { id?: string }).id;
      expect(id && (await Transfer.findByPk(id))?.state).toBe('requested');
    },
  },
  {
    route: 'GET /api/transfers/:id',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own'], technician: ['own'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/transfers/${world.ids[scope].transfer}` }),
  },
  {
    route: 'GET /api/transfers/:id/manifest',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own'], technician: ['own'], auditor: ['own'] },
    build: ({ scope }) => ({ path: `/api/transfers/${packedWithManifest[scope]}/manifest` }),
  },
  {
    route: 'POST /api/transfers/:id/approve',
    allow: deciders,
    build: async ({ world, scope }) => ({ path: `/api/transfers/${(await freshTransfer(world, scope, 'requested')).transfer.id}/approve`, body: {} }),
  },
  {
    route: 'POST /api/transfers/:id/reject',
    allow: deciders,
    build: async ({ world, scope }) => ({
      path: `/api/transfers/${(await freshTransfer(world, scope, 'requested')).transfer.id}/reject`,
      body: { reason: 'Authorization matrix' },
    }),
  },
  {
    // requested by the owner: front desk may cancel only their own requests
    route: 'POST /api/transfers/:id/cancel',
    allow: deciders,
    build: async ({ world, scope }) => ({
      path: `/api/transfers/${(await freshTransfer(world, scope, 'requested')).transfer.id}/cancel`,
      body: { reason: 'Authorization matrix' },
    }),
  },
  {
    route: 'POST /api/transfers/:id/pack',
    allow: originSide,
    build: async ({ world, scope }) => ({ path: `/api/transfers/${(await freshTransfer(world, scope, 'approved')).transfer.id}/pack`, body: {} }),
    // a relay run must run between the transfer's two shops
    foreignIds: { 'body.relayRunId': { kind: 'relayRun', otherShop: 'refused' } },
  },
  {
    route: 'POST /api/transfers/:id/hand-over',
    allow: originSide,
    build: async ({ world, scope }) => ({ path: `/api/transfers/${(await freshTransfer(world, scope, 'packed')).transfer.id}/hand-over`, body: {} }),
    foreignIds: { 'body.relayRunId': { kind: 'relayRun', otherShop: 'refused' } },
  },
  {
    // incoming to the scope's shop: receiving is done at the destination
    route: 'POST /api/transfers/:id/receive',
    allow: originSide,
    build: async ({ world, scope }) => {
      const { transfer, instrument } = await freshTransfer(world, scope, 'in_transit', 'in');
      return { path: `/api/transfers/${transfer.id}/receive`, body: { serial: instrument.serial, method: 'typed' } };
    },
  },
];
