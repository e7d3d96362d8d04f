import { Notification } from '../../../server/lib/models.js';
import { SCOPES, type RouteCase } from './types.js';

/** The inbox (server/modules/notifications): everyone reads and marks only their own notices. */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
const ownOnly = { owner: ['own'], regional_manager: ['own'], front_desk: ['own'], technician: ['own'], auditor: ['own'] } satisfies RouteCase['allow'];

export const cases: RouteCase[] = [
  { route: 'GET /api/notifications', scopeless: true, allow: signedIn, build: () => ({ path: '/api/notifications' }) },
  { route: 'GET /api/notifications/unread-count', scopeless: true, allow: signedIn, build: () => ({ path: '/api/notifications/unread-count' }) },
  // marks only the caller's own notices read: there is no target to reach into another shop or network
  { route: 'POST /api/notifications/read-all', scopeless: true, allow: signedIn, build: () => ({ path: '/api/notifications/read-all', body: {} }) },
  { route: 'GET /api/notification-preferences', scopeless: true, allow: signedIn, build: () => ({ path: '/api/notification-preferences' }) },
  {
    route: 'PUT /api/notification-preferences',
    scopeless: true,
    allow: signedIn,
    build: () => ({ path: '/api/notification-preferences', body: { preferences: [{ kind: 'job_ready', email: false }] } }),
  },
  {
    // `own`: a notice of the person asking; `otherShop`: someone else's in the same network; `otherNetwork`: another network's
    route: 'POST /api/notifications/:id/read',
    allow: ownOnly,
    scopeIsPerson: true,
    build: async ({ world, scope, who }) => {
      const networkId = scope === 'otherNetwork' ? world.networkB : world.networkA;
      const userId = scope === 'own' ? world.users[who === 'anonymous' ? 'owner' : who] : world.ids[scope].user;
      const n = await Notification.create({ networkId, userId, kind: 'transfer_incoming', title: 'Matrix notice', body: '', link: null });
      return { path: `/api/notifications/${n.id}/read`, body: {} };
    },
  },
];
