import { QueryTypes } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { Network, User, Membership, Shop } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import type { SignedInIdentity } from '../../lib/oidc.js';
import { accessibleWhere } from '../../lib/access.js';
import { defineRulesFor } from '../../../shared/auth/ability.js';
import type { Role } from '../../../shared/domain.js';

/** Loads the person behind a session with their current roles; null when deactivated or gone. */
export async function loadActorRecord(userId: string, networkId: string): Promise<Omit<Actor, 'ability'> | null> {
  const user = await User.findOne({ where: { id: userId, networkId, active: true } });
  if (!user) return null;
  const memberships = await Membership.findAll({ where: { networkId, userId }, attributes: ['shopId', 'role'] });
  if (!memberships.length) return null;
  return {
    id: user.id,
    networkId,
    email: user.email,
    name: user.name,
    memberships: memberships.map((m) => ({ shopId: m.shopId ?? null, role: m.role as Role })),
  };
}

/**
 * Matches a signed-in identity to a person by e-mail. A person with no active membership
 * anywhere gets `null` and sees the "no access" page.
 */
export async function resolveSignIn(identity: SignedInIdentity): Promise<{ id: string; networkId: string } | null> {
  const rows = await sequelize.query<{ id: string; network_id: string }>(
    `select u.id, u.network_id
       from users u
      where u.email = :email and u.active
        and exists (select 1 from memberships m where m.network_id = u.network_id and m.user_id = u.id)
      order by u.created_at
      limit 1`,
    { type: QueryTypes.SELECT, replacements: { email: identity.email.toLowerCase() } },
  );
  const row = rows[0];
  if (!row) return null;
  await User.update(
    { oidcSubject: identity.subject, lastSignInAt: new Date() },
    { where: { id: row.id, networkId: row.network_id } },
  );
  return { id: row.id, networkId: row.network_id };
}

/** What the client needs to shape its screens: who, where, which shops, and the permission rules. */
export async function describeMe(actor: Actor) {
  const network = await Network.findByPk(actor.networkId);
  const shopWhere = accessibleWhere(actor.ability, 'read', 'Shop');
  const shops = shopWhere
    ? await Shop.findAll({ where: { ...shopWhere, networkId: actor.networkId }, order: [['name', 'ASC']] })
    : [];
  const shopNames = new Map(shops.map((s) => [s.id, s.name]));
  return {
    user: { id: actor.id, email: actor.email, name: actor.name },
    network: { id: actor.networkId, name: network?.name ?? '' },
    memberships: actor.memberships.map((m) => ({
      shopId: m.shopId,
      shopName: m.shopId ? (shopNames.get(m.shopId) ?? null) : null,
      role: m.role,
    })),
    shops: shops.map((s) => ({ id: s.id, name: s.name, city: s.city, timeZone: s.timeZone })),
    rules: defineRulesFor(actor),
  };
}
