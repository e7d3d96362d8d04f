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

/** The serial of the scope's instrument that its private customer owns and that has a job. */
const serialOf = async (world: World, scope: Scope) => (await Instrument.findByPk(world.ids[scope].instrument))!.serial;
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
    // another shop's instrument, owned by that shop's private customer: the hit may show the work, not the owner
    build: async ({ world }) => ({ path: '/api/instruments/search', query: { q: await serialOf(world, 'otherShop') } }),
    allow: allRoles(everyScope),
    foreignIds: { 'query.shopId': { kind: 'shop', filter: true }, 'query.ownerCustomerId': { kind: 'customer', filter: true } },
  },
  {
    route: 'GET /api/instruments/export.csv',
    scopeless: true,
    build: async ({ world }) => ({ path: '/api/instruments/export.csv', query: { q: await serialOf(world, 'otherShop') } }),
    allow: allRoles(everyScope),
    foreignIds: { 'query.shopId': { kind: 'shop', filter: true }, 'query.ownerCustomerId': { kind: 'customer', filter: true } },
  },
  {
    route: 'GET /api/instruments/serial-check',
    scopeless: true,
    build: () => ({ path: '/api/instruments/serial-check', query: { serial: 'AZ-1', maker: 'Matrix Winds' } }),
    allow: allRoles(everyScope),
  },
  {
    route: 'GET /api/instruments/:id',
    build: ({ world, scope }) => ({ path: `/api/instruments/${world.ids[scope].instrument}` }),
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
  },
  {
    // the shop that holds the instrument marks its heavy case
    route: 'PATCH /api/instruments/:id/heavy-case',
    build: ({ world, scope }) => ({ path: `/api/instruments/${world.ids[scope].instrument}/heavy-case`, body: { heavyCase: true } }),
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], front_desk: ['own'] },
    foreignIds: {},
    verify: async ({ world, scope }) => {
      const instrument = await Instrument.findByPk(world.ids[scope].instrument);
      if (!instrument?.heavyCase) throw new Error('the heavy-case flag was not stored');
    },
  },
  {
    route: 'GET /api/instruments/:id/timeline',
    build: ({ world, scope }) => ({ path: `/api/instruments/${world.ids[scope].instrument}/timeline` }),
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
  },
  {
    route: 'POST /api/instruments/import',
    build: ({ world, scope }) => ({
      path: '/api/instruments/import',
      body: { shopId: world.ids[scope].shop, ownerKind: 'rental_fleet', rows: [{ row: 2, serial: serial(), maker: 'Matrix Winds', family: 'flute' }] },
    }),
    allow: intakeAllow,
    // `shopId` is the scope's target; the owner named must be a customer the person may use
    foreignIds: { 'body.ownerCustomerId': { kind: 'foreignCustomer', otherShop: 'ownerOnly', with: { ownerKind: 'customer' } } },
  },
  {
    route: 'GET /api/customers',
    scopeless: true,
    // asks by another shop's private customer's name: only the owner may find them
    build: ({ world }) => ({ path: '/api/customers', query: { q: world.secrets.otherShop.customer[0] } }),
    allow: { owner: everyScope, regional_manager: everyScope, front_desk: everyScope, auditor: everyScope },
  },
  {
    route: 'POST /api/customers',
    build: ({ world, scope }) => ({ path: '/api/customers', body: { shopId: world.ids[scope].shop, kind: 'person', name: 'Matrix Player' } }),
    allow: intakeAllow,
    // `shopId` is the scope's target
    foreignIds: {},
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
    // `shopId` is the scope's target; an instrument of any shop may come to the desk, a customer only one the person may use
    foreignIds: {
      'body.instrument.id': 'registryInstrument',
      'body.customer.id': { kind: 'foreignCustomer', otherShop: 'ownerOnly' },
    },
  },
];
