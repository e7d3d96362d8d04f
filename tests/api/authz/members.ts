import { SCOPES, type RouteCase } from './types.js';

/** Sign-in session, people, roles, invitations and the audit log (server/modules/members). */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };

export const cases: RouteCase[] = [
  { route: 'GET /api/me', scopeless: true, allow: signedIn, build: () => ({ path: '/api/me' }) },
  {
    // signing out is harmless for anyone; each cell uses a fresh session so the world's stay valid
    route: 'POST /auth/logout',
    scopeless: true,
    allow: { ...signedIn, anonymous: SCOPES },
    build: async ({ world, who }) => ({ path: '/auth/logout', cookie: who === 'anonymous' ? undefined : await world.signInAs(who) }),
  },
];
