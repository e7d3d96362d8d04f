import { DEFAULT_PAD_RULES } from '../../../shared/padmap/rules.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import { SCOPES, type RouteCase, type Scope, type World } from './types.js';

/** Pad maps and pad rules (server/modules/padmaps). tests/api/padmaps.test.ts checks what comes back. */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
const networkOf = (world: World, scope: Scope) => (scope === 'otherNetwork' ? world.networkB : world.networkA);

export const cases: RouteCase[] = [
  { route: 'GET /api/pad-rules', scopeless: true, allow: signedIn, build: () => ({ path: '/api/pad-rules' }) },
  {
    route: 'PUT /api/pad-rules',
    scopeless: true,
    allow: { owner: SCOPES },
    build: () => ({ path: '/api/pad-rules', body: { ...DEFAULT_PAD_RULES, stemHeightsMm: [...DEFAULT_PAD_RULES.stemHeightsMm] } }),
  },
  {
    route: 'GET /api/pad-maps/suggestions',
    scopeless: true,
    allow: signedIn,
    build: () => ({ path: '/api/pad-maps/suggestions', query: { family: 'alto_saxophone', maker: 'Testmaker', model: 'Testmodel' } }),
  },
  {
    // everyone who reads the job reads its pad map; auditors only at their shops
    route: 'GET /api/jobs/:jobId/pad-map',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/jobs/${world.ids[scope].job}/pad-map` }),
  },
  {
    // the bench records it: technicians and managers of the job's shop, and the owner
    route: 'PUT /api/jobs/:jobId/pad-map',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own'], technician: ['own'] },
    build: async ({ world, scope }) => {
      const { job } = await makeInstrumentWithJob(networkOf(world, scope), world.ids[scope].shop, world.ids[scope].user, { stage: 'on_bench' });
      return {
        path: `/api/jobs/${job.id}/pad-map`,
        body: { unitSystem: 'mm', entries: [{ keyId: 'low_c', padKind: 'self_leveling', cupDiameter: '30.5', cupDepth: '4' }] },
      };
    },
  },
  {
    route: 'GET /api/instruments/:instrumentId/pad-map',
    allow: { owner: ['own', 'otherShop'], regional_manager: ['own', 'otherShop'], front_desk: ['own', 'otherShop'], technician: ['own', 'otherShop'], auditor: ['own'] },
    build: ({ world, scope }) => ({ path: `/api/instruments/${world.ids[scope].instrument}/pad-map` }),
  },
];
