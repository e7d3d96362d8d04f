import { createHash, randomBytes } from 'node:crypto';
import { Invitation, Membership } from '../../../server/lib/models.js';
import { makeUser, uniq } from '../../helpers/factories.js';
import { expect } from 'vitest';
import { SCOPES, type RouteCase, type Scope, type World } from './types.js';

/** Sign-in session, people, roles, invitations and the audit log (server/modules/members). */
const signedIn = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES };
/** People and invitations are the owner's alone; another network's records are not found. */
const ownerInNetwork = { owner: ['own', 'otherShop'] as Scope[] };

const networkOf = (world: World, scope: Scope) => (scope === 'otherNetwork' ? world.networkB : world.networkA);

/** A fresh person with a role at the scope's shop, so a mutating cell never changes the shared world. */
async function freshStaff(world: World, scope: Scope) {
  const user = await makeUser(networkOf(world, scope), [{ shopId: world.ids[scope].shop, role: 'technician' }]);
  const membership = await Membership.findOne({ where: { networkId: user.networkId, userId: user.id } });
  return { user, membership: membership! };
}

/** A fresh open invitation to the scope's shop, with the token its link carries. */
async function freshInvitation(world: World, scope: Scope) {
  const token = randomBytes(32).toString('base64url');
  const networkId = networkOf(world, scope);
  const inviter = scope === 'otherNetwork' ? (await makeUser(networkId, [{ shopId: null, role: 'owner' }])).id : world.users.owner;
  const invitation = await Invitation.create({
    networkId,
    email: `invitee-${uniq()}@matrix.test`,
    roles: [{ shopId: world.ids[scope].shop, role: 'front_desk' }],
    tokenHash: createHash('sha256').update(token).digest('hex'),
    invitedByUserId: inviter,
    expiresAt: new Date(Date.now() + 24 * 3600_000),
  });
  return { invitation, token };
}

export const cases: RouteCase[] = [
  { route: 'GET /api/me', scopeless: true, allow: signedIn, build: () => ({ path: '/api/me' }) },
  {
    // signing out is harmless for anyone; each cell uses a fresh session so the world's stay valid
    route: 'POST /auth/logout',
    scopeless: true,
    allow: { ...signedIn, anonymous: SCOPES },
    build: async ({ world, who }) => ({ path: '/auth/logout', cookie: who === 'anonymous' ? undefined : await world.signInAs(who) }),
  },

  // people and roles
  {
    route: 'GET /api/people',
    scopeless: true,
    allow: { owner: SCOPES },
    build: () => ({ path: '/api/people' }),
    foreignIds: { 'query.shopId': { kind: 'shop', filter: true } },
  },
  {
    route: 'GET /api/people/:id',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({ path: `/api/people/${world.ids[scope].user}` }),
  },
  {
    route: 'PATCH /api/people/:id',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/people/${(await freshStaff(world, scope)).user.id}`, body: { name: `Renamed ${uniq()}` } }),
  },
  {
    route: 'POST /api/people/:id/memberships',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({
      path: `/api/people/${(await freshStaff(world, scope)).user.id}/memberships`,
      body: { shopId: world.ids[scope].shop, role: 'front_desk' },
    }),
    // a role at another shop of the network is the owner's to give; another network's shop is not found
    foreignIds: { 'body.shopId': { kind: 'shop', otherShop: 'allowed' } },
    verify: async ({ built }) => {
      const userId = built.path.split('/')[3];
      const roles = await Membership.findAll({ where: { userId } });
      expect(roles.map((m) => m.role)).toContain('front_desk');
    },
  },
  {
    route: 'POST /api/people/:id/deactivate',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/people/${(await freshStaff(world, scope)).user.id}/deactivate` }),
  },
  {
    route: 'POST /api/people/:id/reactivate',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => {
      const { user } = await freshStaff(world, scope);
      await user.update({ active: false, deactivatedAt: new Date() });
      return { path: `/api/people/${user.id}/reactivate` };
    },
  },
  {
    route: 'PATCH /api/memberships/:id',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/memberships/${(await freshStaff(world, scope)).membership.id}`, body: { role: 'auditor' } }),
  },
  {
    route: 'DELETE /api/memberships/:id',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/memberships/${(await freshStaff(world, scope)).membership.id}` }),
  },
  { route: 'GET /api/audit-log', scopeless: true, allow: { owner: SCOPES }, build: () => ({ path: '/api/audit-log' }) },

  // invitations
  { route: 'GET /api/invitations', scopeless: true, allow: { owner: SCOPES }, build: () => ({ path: '/api/invitations' }) },
  {
    // the roles name the scope's shop: another network's shop is not found
    route: 'POST /api/invitations',
    allow: ownerInNetwork,
    build: ({ world, scope }) => ({
      path: '/api/invitations',
      body: {
        email: `new-${uniq()}@matrix.test`,
        roles: [{ shopId: world.ids[scope].shop, role: 'technician' }, { shopId: world.ids[scope].destinationShop, role: 'auditor' }],
      },
    }),
    // the second role at another network's shop, beside one at the scope's
    foreignIds: { 'body.roles.1.shopId': { kind: 'shop' } },
  },
  {
    route: 'DELETE /api/invitations/:id',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/invitations/${(await freshInvitation(world, scope)).invitation.id}` }),
  },
  {
    route: 'POST /api/invitations/:id/resend',
    allow: ownerInNetwork,
    build: async ({ world, scope }) => ({ path: `/api/invitations/${(await freshInvitation(world, scope)).invitation.id}/resend` }),
  },
  {
    // public: the token in the link is the key, and the invited person has no session yet
    route: 'GET /api/invitations/preview/:token',
    allow: { ...signedIn, anonymous: SCOPES },
    build: async ({ world, scope }) => ({ path: `/api/invitations/preview/${(await freshInvitation(world, scope)).token}` }),
  },
  {
    // only the invited e-mail may accept; none of the matrix people is the invitee
    // (accepting for the right e-mail is tested in tests/api/members/invitations.test.ts)
    route: 'POST /api/invitations/accept',
    allow: {},
    build: async ({ world, scope }) => ({ path: '/api/invitations/accept', body: { token: (await freshInvitation(world, scope)).token } }),
  },
];
