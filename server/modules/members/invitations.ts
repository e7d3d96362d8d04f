import { createHash, randomBytes } from 'node:crypto';
import { Op, type Transaction } from 'sequelize';
import { config } from '../../config.js';
import { sequelize } from '../../lib/db.js';
import { Invitation, Membership, Network, Shop, User } from '../../lib/models.js';
import type { InvitedRole } from './models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { AppError, conflict, forbidden, notFound } from '../../lib/errors.js';
import { logger } from '../../lib/logger.js';
import { sendMail } from '../../lib/mail.js';
import { ROLE_LABELS, type Role } from '../../../shared/domain.js';
import {
  INVITATION_VALID_DAYS,
  type InvitationCreate,
  type InvitationStatus,
} from '../../../shared/schemas/people.js';
import { audit } from './service.js';
import { formatDateTime } from '../../../shared/time/format.js';
import { notify } from '../notifications/index.js';

/**
 * Invitations by e-mail. The link carries a random token; only its SHA-256 hash is stored, so a copy
 * of the database cannot be turned into working links. A link works once, until it expires or the
 * owner revokes it, and only for the e-mail address it was sent to.
 */

const DAY_MS = 24 * 3600_000;
const DENIED = 'Only the network owner invites people.';

export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex');
const newToken = () => randomBytes(32).toString('base64url');
export const invitationLink = (token: string) => `${config.appOrigin}/invitations/${token}`;

export interface InvitationView {
  id: string;
  email: string;
  roles: Array<{ shopId: string | null; shopName: string | null; role: Role }>;
  status: InvitationStatus;
  expiresAt: string;
  createdAt: string;
  acceptedAt: string | null;
  invitedBy: { id: string; name: string } | null;
}

export function invitationStatus(inv: Pick<Invitation, 'acceptedAt' | 'revokedAt' | 'expiresAt'>, now = new Date()): InvitationStatus {
  if (inv.acceptedAt) return 'accepted';
  if (inv.revokedAt) return 'revoked';
  if (new Date(inv.expiresAt) <= now) return 'expired';
  return 'pending';
}

async function shopNames(networkId: string, roles: InvitedRole[], transaction?: Transaction): Promise<Map<string, string>> {
  const ids = roles.map((r) => r.shopId).filter((id): id is string => !!id);
  if (!ids.length) return new Map();
  const shops = await Shop.findAll({ where: { networkId, id: { [Op.in]: ids } }, attributes: ['id', 'name'], transaction });
  return new Map(shops.map((s) => [s.id, s.name]));
}

function view(inv: Invitation, names: Map<string, string>): InvitationView {
  return {
    id: inv.id,
    email: inv.email,
    roles: inv.roles.map((r) => ({ shopId: r.shopId, shopName: r.shopId ? (names.get(r.shopId) ?? null) : null, role: r.role })),
    status: invitationStatus(inv),
    expiresAt: new Date(inv.expiresAt).toISOString(),
    createdAt: new Date(inv.createdAt).toISOString(),
    acceptedAt: inv.acceptedAt ? new Date(inv.acceptedAt).toISOString() : null,
    invitedBy: inv.invitedBy ? { id: inv.invitedBy.id, name: inv.invitedBy.name } : null,
  };
}

const snapshot = (inv: Invitation) => ({
  id: inv.id,
  email: inv.email,
  roles: inv.roles,
  expiresAt: inv.expiresAt,
  acceptedAt: inv.acceptedAt ?? null,
  revokedAt: inv.revokedAt ?? null,
});

function describeRoles(roles: InvitedRole[], names: Map<string, string>): string[] {
  return roles.map((r) => (r.shopId ? `${ROLE_LABELS[r.role]} at ${names.get(r.shopId) ?? 'a shop'}` : `${ROLE_LABELS[r.role]} of the whole network`));
}

const escapeHtml = (s: string) => s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

async function sendInvitationMail(inv: Invitation, token: string, networkName: string, inviterName: string, names: Map<string, string>) {
  const link = invitationLink(token);
  const roles = describeRoles(inv.roles, names);
  const until = formatDateTime(inv.expiresAt, 'UTC');
  const text = [
    `${inviterName} invites you to ${networkName} on Benchrelay.`,
    '',
    'Your roles:',
    ...roles.map((r) => `  - ${r}`),
    '',
    `Accept the invitation: ${link}`,
    '',
    `Sign in with this e-mail address (${inv.email}). The link works once and until ${until}.`,
    'If you did not expect this invitation, ignore this message.',
  ].join('\n');
  const html = `<p>${escapeHtml(inviterName)} invites you to <strong>${escapeHtml(networkName)}</strong> on Benchrelay.</p>
<p>Your roles:</p><ul>${roles.map((r) => `<li>${escapeHtml(r)}</li>`).join('')}</ul>
<p><a href="${escapeHtml(link)}">Accept the invitation</a></p>
<p>Sign in with this e-mail address (${escapeHtml(inv.email)}). The link works once and until ${escapeHtml(until)}.<br>
If you did not expect this invitation, ignore this message.</p>`;
  try {
    await sendMail({ to: inv.email, subject: `Invitation to ${networkName} on Benchrelay`, text, html });
    return true;
  } catch (err) {
    // the invitation stands; the owner sees that the mail failed and can send it again
    logger.warn({ err: (err as Error).message, invitationId: inv.id }, 'invitation mail failed');
    return false;
  }
}

/** Open invitations (pending or expired, neither accepted nor revoked), newest first. */
export async function listInvitations(actor: Actor): Promise<InvitationView[]> {
  const allowed = accessibleWhere(actor.ability, 'read', 'Invitation');
  if (!allowed) throw forbidden(DENIED);
  const rows = await Invitation.findAll({
    where: { ...allowed, networkId: actor.networkId, acceptedAt: null, revokedAt: null },
    include: [{ model: User, as: 'invitedBy', where: { networkId: actor.networkId }, required: false, attributes: ['id', 'name'] }],
    order: [['createdAt', 'DESC']],
  });
  const names = await shopNames(actor.networkId, rows.flatMap((r) => r.roles));
  return rows.map((r) => view(r, names));
}

/** Invites an e-mail address with roles per shop; an earlier open invitation to it is replaced. */
export async function createInvitation(actor: Actor, input: InvitationCreate): Promise<{ invitation: InvitationView; mailed: boolean }> {
  assertCan(actor.ability, 'create', 'Invitation', undefined, DENIED);
  const token = newToken();
  const { inv, names } = await sequelize.transaction(async (transaction) => {
    const names = await shopNames(actor.networkId, input.roles, transaction);
    // another network's shop id is answered like any unknown id: its existence must not show
    if (input.roles.some((r) => r.shopId && !names.has(r.shopId))) throw notFound('That shop');

    const existing = await User.findOne({
      where: { networkId: actor.networkId, email: input.email },
      include: [{ model: Membership, as: 'memberships', where: { networkId: actor.networkId }, required: false }],
      transaction,
    });
    if (existing?.active && existing.memberships?.length) {
      throw conflict(`${existing.name} is already a member. Change their roles on the People screen.`, {
        email: 'Already a member of this network.',
      });
    }

    const open = await Invitation.findAll({
      where: { networkId: actor.networkId, email: input.email, acceptedAt: null, revokedAt: null },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    for (const old of open) {
      const before = snapshot(old);
      await old.update({ revokedAt: new Date() }, { transaction });
      await audit(actor, 'invitation.replaced', 'Invitation', old.id, before, snapshot(old), transaction);
    }

    const inv = await Invitation.create(
      {
        networkId: actor.networkId,
        email: input.email,
        tokenHash: hashToken(token),
        roles: input.roles.map((r) => ({ shopId: r.shopId, role: r.role })),
        invitedByUserId: actor.id,
        expiresAt: new Date(Date.now() + INVITATION_VALID_DAYS * DAY_MS),
      },
      { transaction },
    );
    await audit(actor, 'invitation.created', 'Invitation', inv.id, null, snapshot(inv), transaction);
    return { inv, names };
  });
  const network = await Network.findByPk(actor.networkId);
  const mailed = await sendInvitationMail(inv, token, network?.name ?? 'your network', actor.name, names);
  inv.invitedBy = { id: actor.id, name: actor.name } as User;
  return { invitation: view(inv, names), mailed };
}

async function loadInvitation(actor: Actor, id: string, transaction: Transaction): Promise<Invitation> {
  const inv = await Invitation.findOne({ where: { networkId: actor.networkId, id }, transaction, lock: transaction.LOCK.UPDATE });
  if (!inv) throw notFound('That invitation');
  return inv;
}

/** Withdraws an open invitation: its link stops working. */
export async function revokeInvitation(actor: Actor, id: string): Promise<InvitationView> {
  return sequelize.transaction(async (transaction) => {
    const inv = await loadInvitation(actor, id, transaction);
    assertCan(actor.ability, 'delete', 'Invitation', inv.get({ plain: true }), DENIED);
    if (inv.acceptedAt) throw conflict('That invitation was already accepted. Change the person\u2019s roles instead.');
    if (!inv.revokedAt) {
      const before = snapshot(inv);
      await inv.update({ revokedAt: new Date() }, { transaction });
      await audit(actor, 'invitation.revoked', 'Invitation', inv.id, before, snapshot(inv), transaction);
    }
    return view(inv, await shopNames(actor.networkId, inv.roles, transaction));
  });
}

/** Sends an open invitation again with a new link and a new expiry; the old link stops working. */
export async function resendInvitation(actor: Actor, id: string): Promise<{ invitation: InvitationView; mailed: boolean }> {
  const token = newToken();
  const { inv, names } = await sequelize.transaction(async (transaction) => {
    const inv = await loadInvitation(actor, id, transaction);
    assertCan(actor.ability, 'update', 'Invitation', inv.get({ plain: true }), DENIED);
    if (inv.acceptedAt || inv.revokedAt) throw conflict('Only an open invitation can be sent again. Invite the person anew.');
    const before = snapshot(inv);
    await inv.update({ tokenHash: hashToken(token), expiresAt: new Date(Date.now() + INVITATION_VALID_DAYS * DAY_MS) }, { transaction });
    await audit(actor, 'invitation.resent', 'Invitation', inv.id, before, snapshot(inv), transaction);
    return { inv, names: await shopNames(actor.networkId, inv.roles, transaction) };
  });
  const network = await Network.findByPk(actor.networkId);
  const mailed = await sendInvitationMail(inv, token, network?.name ?? 'your network', actor.name, names);
  return { invitation: view(inv, names), mailed };
}

export interface InvitationPreview {
  email: string;
  networkName: string;
  invitedByName: string | null;
  roles: Array<{ shopName: string | null; role: Role }>;
  status: InvitationStatus;
  expiresAt: string;
}

/** What the person holding a link sees before signing in. The token is the only key; no session needed. */
export async function previewInvitation(token: string): Promise<InvitationPreview> {
  const inv = await Invitation.findOne({ where: { tokenHash: hashToken(token) } });
  if (!inv) throw new AppError(404, 'invitation_not_found', 'This invitation link is not valid. Ask for a new invitation.');
  const [network, inviter, names] = await Promise.all([
    Network.findByPk(inv.networkId),
    User.findOne({ where: { networkId: inv.networkId, id: inv.invitedByUserId }, attributes: ['name'] }),
    shopNames(inv.networkId, inv.roles),
  ]);
  return {
    email: inv.email,
    networkName: network?.name ?? '',
    invitedByName: inviter?.name ?? null,
    roles: inv.roles.map((r) => ({ shopName: r.shopId ? (names.get(r.shopId) ?? null) : null, role: r.role })),
    status: invitationStatus(inv),
    expiresAt: new Date(inv.expiresAt).toISOString(),
  };
}

/** The identity that accepts: the identity provider account of the session, as checked at sign-in. */
export interface AcceptingIdentity {
  issuer: string;
  subject: string;
  email: string;
  emailVerified: boolean;
  name?: string;
}

const GONE: Record<Exclude<InvitationStatus, 'pending'>, [string, string]> = {
  accepted: ['invitation_used', 'This invitation was already used. Sign in to reach your shops, or ask for a new invitation.'],
  revoked: ['invitation_revoked', 'This invitation was withdrawn. Ask the owner for a new one.'],
  expired: ['invitation_expired', 'This invitation has expired. Ask the owner to send it again.'],
};

const UNVERIFIED = (email: string) =>
  new AppError(403, 'email_unverified', `Your sign-in provider has not confirmed that ${email} is your address, so this invitation cannot be accepted yet. Confirm the address with your provider, then open the invitation again.`);
const MISMATCH = (email: string) =>
  new AppError(403, 'identity_mismatch', `${email} already signs in to this network with a different account. Sign out and sign in with that account, or ask the network's owner.`);

/**
 * Binds the invitation's roles to the signed-in account, whose e-mail must be the invited one and
 * verified by the identity provider, creating the person if needed and binding them to the account
 * (issuer + subject) as a first sign-in does; a person already bound to another account is refused
 * (audited, nothing changed). Marks the link used. Returns the session to sign in as.
 */
export async function acceptInvitation(identity: AcceptingIdentity, token: string): Promise<{ userId: string; networkId: string }> {
  let refused: { networkId: string; userId: string } | undefined;
  const result = await sequelize.transaction(async (transaction) => {
    const inv = await Invitation.findOne({ where: { tokenHash: hashToken(token) }, transaction, lock: transaction.LOCK.UPDATE });
    if (!inv) throw new AppError(404, 'invitation_not_found', 'This invitation link is not valid. Ask for a new invitation.');
    const status = invitationStatus(inv);
    if (status !== 'pending') throw new AppError(410, GONE[status][0], GONE[status][1]);
    const email = identity.email.trim().toLowerCase();
    if (email !== inv.email) {
      throw new AppError(403, 'invitation_wrong_email', `This invitation was sent to ${inv.email}, but you are signed in as ${email}. Sign out and sign in with the invited address.`, undefined, {
        invitedEmail: inv.email,
        signedInEmail: email,
      });
    }
    if (!identity.emailVerified) throw UNVERIFIED(email);
    const networkId = inv.networkId;
    let user = await User.findOne({ where: { networkId, email }, transaction, lock: transaction.LOCK.UPDATE });
    const boundElsewhere = await User.findOne({
      where: { networkId, oidcIssuer: identity.issuer, oidcSubject: identity.subject, ...(user ? { id: { [Op.ne]: user.id } } : {}) },
      attributes: ['id'],
      transaction,
    });
    const boundToOther = user?.oidcSubject != null && (user.oidcSubject !== identity.subject || (user.oidcIssuer != null && user.oidcIssuer !== identity.issuer));
    if (boundElsewhere || boundToOther) {
      refused = { networkId, userId: user?.id ?? boundElsewhere!.id };
      return null;
    }
    if (!user) {
      user = await User.create(
        { networkId, email, name: identity.name?.trim() || email.split('@')[0], oidcIssuer: identity.issuer, oidcSubject: identity.subject },
        { transaction },
      );
    } else {
      const before = { active: user.active, oidcIssuer: user.oidcIssuer ?? null, oidcSubject: user.oidcSubject ?? null };
      await user.update({ active: true, deactivatedAt: null, oidcIssuer: identity.issuer, oidcSubject: identity.subject }, { transaction });
      if (!before.active || before.oidcIssuer !== identity.issuer || before.oidcSubject !== identity.subject) {
        await audit({ id: user.id, networkId }, before.active ? 'sign_in.bound' : 'user.reactivated', 'User', user.id, before, { active: true, oidcIssuer: identity.issuer, oidcSubject: identity.subject }, transaction);
      }
    }
    const who = { id: user.id, networkId };
    const names = await shopNames(networkId, inv.roles, transaction);
    for (const r of inv.roles) {
      // a shop closed since the invitation went out is skipped rather than failing the whole acceptance
      if (r.shopId && !names.has(r.shopId)) continue;
      const existing = await Membership.findOne({ where: { networkId, userId: user.id, shopId: r.shopId ?? { [Op.is]: null } }, transaction });
      if (existing) {
        if (existing.role !== r.role) {
          const before = { id: existing.id, userId: existing.userId, shopId: existing.shopId, role: existing.role };
          await existing.update({ role: r.role }, { transaction });
          await audit(who, 'membership.updated', 'Membership', existing.id, before, { ...before, role: r.role }, transaction);
        }
      } else {
        const m = await Membership.create({ networkId, userId: user.id, shopId: r.shopId, role: r.role }, { transaction });
        await audit(who, 'membership.created', 'Membership', m.id, null, { id: m.id, userId: m.userId, shopId: m.shopId, role: m.role }, transaction);
      }
    }
    const before = snapshot(inv);
    await inv.update({ acceptedAt: new Date(), acceptedUserId: user.id }, { transaction });
    await audit(who, 'invitation.accepted', 'Invitation', inv.id, before, snapshot(inv), transaction);
    const roleText = describeRoles(inv.roles, names).join('; ');
    await notify(
      {
        networkId,
        kind: 'invitation_accepted',
        userIds: [inv.invitedByUserId],
        title: `${user.name} accepted your invitation`,
        body: roleText,
        link: '/people',
        dedupeKey: `invitation_accepted:${inv.id}`,
        email: { subject: `${user.name} joined Benchrelay`, text: `${user.name} (${user.email}) accepted your invitation: ${roleText}.` },
        sendAfterCommit: true,
      },
      transaction,
    );
    return { userId: user.id, networkId };
  });
  if (!result) {
    const r = refused!;
    await audit({ id: null, networkId: r.networkId }, 'sign_in.refused', 'User', r.userId, null, {
      reason: 'identity_mismatch',
      via: 'invitation',
      email: identity.email,
      issuer: identity.issuer,
      subject: identity.subject,
      emailVerified: identity.emailVerified,
    });
    throw MISMATCH(identity.email);
  }
  return result;
}
