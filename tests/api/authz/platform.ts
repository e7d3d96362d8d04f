import { SCOPES, type RouteCase } from './types.js';

/** Routes every visitor may call: the health check and the development mail page. */
const anyone = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES, anonymous: SCOPES };

export const cases: RouteCase[] = [
  // load balancers and monitors call it without a session
  { route: 'GET /api/health', scopeless: true, allow: anyone, build: () => ({ path: '/api/health' }) },
  // development only (not registered in production, 404 there): the person reading an invitation has no session yet
  { route: 'GET /api/dev/mail', scopeless: true, allow: anyone, build: () => ({ path: '/api/dev/mail' }) },
];
