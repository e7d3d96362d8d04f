import { SCOPES, type RouteCase } from './types.js';

/** Shops, skills and relay runs (server/modules/networks). */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };

export const cases: RouteCase[] = [
  // the list is filtered to the shops each person may read (tests/api/networks/shops.test.ts)
  { route: 'GET /api/shops/summary', scopeless: true, allow: signedIn, build: () => ({ path: '/api/shops/summary' }) },
];
