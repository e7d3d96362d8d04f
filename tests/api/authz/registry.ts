import { randomUUID } from 'node:crypto';
import { Instrument } from '../../../server/lib/models.js';
import { SCOPES, type RouteCase, type Scope, type Who, type World } from './types.js';

/**
 * The registry's routes in the authorization matrix. Reading the registry is network-wide for every
 * shop role except auditors (who read what their shop holds); registering, intake and customers are
 * for the front desk and managers of the shop concerned, and the owner everywhere.
 */

const everyScope = [...SCOPES];
const allRoles = (scopes: Scope[]): Partial<Record<Who, Scope[]>> => ({
  owner: scopes, regional_manager: scopes, front_desk: scopes, technician: scopes, auditor: scopes,
});
/** Who takes work in at a shop: the owner anywhere, managers and front desk at their own shop. */
const intakeAllow: Partial<Record<Who, Scope[]>> = { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'] };

const instrumentOf = (world: World, scope: Scope) => world.ids[scope].registryInstrument;
const serial = () => `AZ-${randomUUID().slice(0, 8)}`;

export async function extendWorld(world: World): Promise<void> {
  for (const scope of SCOPES) {
    const instrument = await Instrument.create({
      networkId: scope === 'otherNetwork' ? world.networkB : world.networkA,
      family: 'flute', maker: 'Matrix Winds', serial: serial(), ownerKind: 'rental_fleet',
      currentShopId: world.ids[scope].shop,
    });
    world.ids[scope].registryInstrument = instrument.id;
  }
}

export const cases: RouteCase[] = [
  {
    route: 'GET /api/instruments/search',
    scopeless: true,
    build: () => ({ path: '/api/instruments/search', query: { q: 'AZ' } }),
    allow: allRoles(everyScope),
  },
  {
    route: 'GET /api/instruments/export.csv',
    scopeless: true,
    build: () => ({ path: '/api/instruments/export.csv', query: { q: 'AZ' } }),
    allow: allRoles(everyScope),
  },
  {
    route: 'GET /api/instruments/serial-check',
    scopeless: true,
    build: () => ({ path: '/api/instruments/serial-check', query: { serial: 'AZ-1', maker: 'Matrix Winds' } }),
    allow: allRoles(everyScope),
  },
  {
    route: 'GET /api/instruments/:id',
    build: ({ world, scope }) => ({ path: `/api/instruments/${instrumentOf(world, scope)}` }),
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
  },
  {
    route: 'GET /api/instruments/:id/timeline',
    build: ({ world, scope }) => ({ path: `/api/instruments/${instrumentOf(world, scope)}/timeline` }),
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
  },
  {
    route: 'POST /api/instruments/import',
    build: ({ world, scope }) => ({
      path: '/api/instruments/import',
      body: { shopId: world.ids[scope].shop, ownerKind: 'rental_fleet', rows: [{ row: 2, serial: serial(), maker: 'Matrix Winds', family: 'flute' }] },
    }),
    allow: intakeAllow,
  },
  {
    route: 'GET /api/customers',
    scopeless: true,
    build: () => ({ path: '/api/customers', query: { q: 'a' } }),
    allow: { owner: everyScope, regional_manager: everyScope, front_desk: everyScope, auditor: everyScope },
  },
  {
    route: 'POST /api/customers',
    build: ({ world, scope }) => ({ path: '/api/customers', body: { shopId: world.ids[scope].shop, kind: 'person', name: 'Matrix Player' } }),
    allow: intakeAllow,
  },
  {
    route: 'POST /api/intake',
    build: ({ world, scope }) => ({
      path: '/api/intake',
      body: {
        shopId: world.ids[scope].shop,
        requestKey: randomUUID(),
        instrument: { new: { serial: serial(), maker: 'Matrix Winds', family: 'flute', ownerKind: 'rental_fleet' } },
        customer: null,
        job: { complaint: 'Matrix check-in' },
      },
    }),
    allow: intakeAllow,
  },
];
