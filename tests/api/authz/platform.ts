import { SCOPES, type RouteCase } from './types.js';

/** Routes of the platform itself: the health check, the development mail page, the API's description. */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
const anyone = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES, anonymous: SCOPES };

export const cases: RouteCase[] = [
  // load balancers and monitors call it without a session
  { route: 'GET /api/health', scopeless: true, allow: anyone, build: () => ({ path: '/api/health' }) },
  // development only (not registered in production, 404 there): the person reading an invitation has no session yet
  { route: 'GET /api/dev/mail', scopeless: true, allow: anyone, build: () => ({ path: '/api/dev/mail' }) },
  // the API's description: every signed-in person, nobody without a session (server/openapi.ts)
  { route: 'GET /api/openapi.json', scopeless: true, allow: signedIn, build: () => ({ path: '/api/openapi.json' }) },
];
