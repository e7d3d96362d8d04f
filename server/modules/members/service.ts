import { Op, QueryTypes, literal, UniqueConstraintError, type Transaction, type WhereOptions } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { AuditLog, Invitation, Network, User, Membership, Shop, Skill, TechnicianSkill } from '../../lib/models.js';
import { endSessionsOf, type Actor } from '../../lib/auth.js';
import type { SignedInIdentity } from '../../lib/oidc.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { AppError, badRequest, conflict, forbidden, notFound } from '../../lib/errors.js';
import { defineRulesFor } from '../../../shared/auth/ability.js';
import type { Role } from '../../../shared/domain.js';
import type { AuditLogQuery, MembershipUpdate, PeopleQuery, PersonUpdate, RoleAssignment } from '../../../shared/schemas/people.js';

/**
 * Loads the person behind a session with their current roles; null when deactivated or gone. This runs
 * on every signed-in request, so it is one query (person and memberships together), not one per table.
 */
export async function loadActorRecord(userId: string, networkId: string): Promise<Omit<Actor, 'ability'> | null> {
  const rows = await sequelize.query<{ email: string; name: string; memberships: Array<{ shopId: string | null; role: Role }> }>(
    `select u.email, u.name,
            json_agg(json_build_object('shopId', m.shop_id, 'role', m.role) order by m.shop_id nulls first, m.role) as memberships
       from users u
       join memberships m on m.network_id = u.network_id and m.user_id = u.id
      where u.id = :userId and u.network_id = :networkId and u.active
      group by u.network_id, u.id`,
    { type: QueryTypes.SELECT, replacements: { userId, networkId } },
  );
  const row = rows[0];
  if (!row) return null;
  return { id: userId, networkId, email: row.email, name: row.name, memberships: row.memberships };
}

/** Why a sign-in was refused; the sign-in page explains each in plain words (`/sign-in?error=…`). */
export type SignInRefusal = 'identity_mismatch' | 'email_unverified';

export type SignInOutcome =
  | { kind: 'member'; id: string; networkId: string }
  | { kind: 'no_access' }
  | { kind: 'refused'; reason: SignInRefusal };

/**
 * Matches a signed-in identity provider account to a person. A person is known by the account
 * (issuer + subject) bound at their first sign-in; the e-mail address only finds a person who has
 * no account bound yet, and binding needs the provider to vouch for the address (`email_verified`).
 * Another account that carries a bound person's address is refused and the attempt is audited,
 * with nothing else changed. A person with no active membership anywhere gets `no_access`.
 */
export async function resolveSignIn(identity: SignedInIdentity): Promise<SignInOutcome> {
  const known = await sequelize.query<{ id: string; network_id: string }>(
    `select u.id, u.network_id
       from users u
      where u.oidc_issuer = :issuer and u.oidc_subject = :subject and u.active
        and exists (select 1 from memberships m where m.network_id = u.network_id and m.user_id = u.id)
      order by u.created_at
      limit 1`,
    { type: QueryTypes.SELECT, replacements: { issuer: identity.issuer, subject: identity.subject } },
  );
  if (known[0]) {
    await User.update({ lastSignInAt: new Date() }, { where: { id: known[0].id, networkId: known[0].network_id } });
    return { kind: 'member', id: known[0].id, networkId: known[0].network_id };
  }

  const byEmail = await sequelize.query<{ id: string; network_id: string; oidc_issuer: string | null; oidc_subject: string | null }>(
    `select u.id, u.network_id, u.oidc_issuer, u.oidc_subject
       from users u
      where u.email = :email and u.active
        and exists (select 1 from memberships m where m.network_id = u.network_id and m.user_id = u.id)
      order by u.created_at
      limit 1`,
    { type: QueryTypes.SELECT, replacements: { email: identity.email.toLowerCase() } },
  );
  const row = byEmail[0];
  if (!row) return { kind: 'no_access' };
  const who = { id: row.id, networkId: row.network_id };

  const refuse = async (reason: SignInRefusal): Promise<SignInOutcome> => {
    // no actor: whoever holds that account is not (yet) known to be this person
    await audit({ id: null, networkId: row.network_id }, 'sign_in.refused', 'User', row.id, null, {
      reason,
      email: identity.email,
      issuer: identity.issuer,
      subject: identity.subject,
      emailVerified: identity.emailVerified,
    });
    return { kind: 'refused', reason };
  };

  if (row.oidc_subject !== null) {
    // bound before issuers were stored: the same subject may sign in (and records its issuer), no other
    if (row.oidc_issuer === null && row.oidc_subject === identity.subject) {
      const [count] = await User.update(
        { oidcIssuer: identity.issuer, lastSignInAt: new Date() },
        { where: { id: row.id, networkId: row.network_id, oidcIssuer: null, oidcSubject: identity.subject } },
      );
      if (count === 1) return { kind: 'member', ...who };
    }
    return refuse('identity_mismatch');
  }

  if (!identity.emailVerified) return refuse('email_unverified');
  try {
    const bound = await sequelize.transaction(async (transaction) => {
      // `oidcSubject: null` in the where: of two first sign-ins at once, only one binds
      const [count] = await User.update(
        { oidcIssuer: identity.issuer, oidcSubject: identity.subject, lastSignInAt: new Date() },
        { where: { id: row.id, networkId: row.network_id, oidcSubject: null }, transaction },
      );
      if (count !== 1) return false;
      await audit(who, 'sign_in.bound', 'User', row.id, { oidcIssuer: null, oidcSubject: null }, { oidcIssuer: identity.issuer, oidcSubject: identity.subject }, transaction);
      return true;
    });
    if (!bound) return refuse('identity_mismatch');
  } catch (err) {
    // this account is already bound to another person of the network (deactivated, or a changed address)
    if (err instanceof UniqueConstraintError) return refuse('identity_mismatch');
    throw err;
  }
  return { kind: 'member', ...who };
}

/** What the client needs to shape its screens: who, where, which shops, and the permission rules. */
export async function describeMe(actor: Actor) {
  const shopWhere = accessibleWhere(actor.ability, 'read', 'Shop');
  // the network's name rides along with the shops: one query, plain rows (this answers on every page load)
  const networkName = literal(`(select n.name from networks n where n.id = ${sequelize.escape(actor.networkId)})`);
  const shops = shopWhere
    ? ((await Shop.findAll({
        where: { ...shopWhere, networkId: actor.networkId },
        attributes: ['id', 'name', 'city', 'timeZone', [networkName, 'networkName']],
        order: [['name', 'ASC']],
        raw: true,
      })) as unknown as Array<{ id: string; name: string; city: string | null; timeZone: string; networkName: string }>)
    : [];
  const name = shops.length ? shops[0].networkName : ((await Network.findByPk(actor.networkId, { attributes: ['name'], raw: true }))?.name ?? '');
  const shopNames = new Map(shops.map((s) => [s.id, s.name]));
  return {
    user: { id: actor.id, email: actor.email, name: actor.name },
    network: { id: actor.networkId, name },
    memberships: actor.memberships.map((m) => ({
      shopId: m.shopId,
      shopName: m.shopId ? (shopNames.get(m.shopId) ?? null) : null,
      role: m.role,
    })),
    shops: shops.map((s) => ({ id: s.id, name: s.name, city: s.city, timeZone: s.timeZone })),
    rules: defineRulesFor(actor),
  };
}

// ---------------------------------------------------------------------------------------------
// Audit log

/** Who did it: a signed-in person, or (for an accepted invitation) the person who just joined. */
export interface AuditActor {
  id: string | null;
  networkId: string;
}

/** A plain JSON copy of a row or value, so the log keeps what it was even after the row changes. */
function snapshot(value: unknown): Record<string, unknown> | null {
  if (value == null) return null;
  const plain = typeof (value as { toJSON?: unknown }).toJSON === 'function' ? (value as { toJSON(): unknown }).toJSON() : value;
  const json = JSON.parse(JSON.stringify(plain)) as unknown;
  return json && typeof json === 'object' && !Array.isArray(json) ? (json as Record<string, unknown>) : { value: json };
}

/**
 * Records one change: who, what, on which record, the state before and after. Call it inside the
 * transaction of the change itself, so a change is never stored without its entry (or the reverse).
 */
export async function audit(
  actor: AuditActor,
  action: string,
  entity: string,
  entityId: string | null,
  before: unknown,
  after: unknown,
  transaction?: Transaction,
): Promise<void> {
  await AuditLog.create(
    { networkId: actor.networkId, actorUserId: actor.id, action, entity, entityId, before: snapshot(before), after: snapshot(after) },
    { transaction },
  );
}

export interface AuditEntry {
  id: string;
  /** The record in words ("Mira Stavros at North Bench"), so the log reads without looking ids up. */
  subject: string;
  at: string;
  actor: { id: string; name: string; email: string } | null;
  action: string;
  entity: string;
  entityId: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

const encodeCursor = (at: string, id: string) => Buffer.from(`${at}|${id}`).toString('base64url');
function decodeCursor(cursor: string): { at: string; id: string } {
  const [at, id] = Buffer.from(cursor, 'base64url').toString('utf8').split('|');
  if (!at || !id || Number.isNaN(Date.parse(at)) || !/^[0-9a-f-]{36}$/i.test(id)) throw badRequest('That page of the log is not valid.', { cursor: 'Not a valid cursor.' });
  return { at, id };
}

/**
 * Names for the records a page of the log mentions, looked up in two queries (people, shops) rather
 * than stored in every entry, so a renamed shop reads with its current name.
 */
async function auditLabeller(networkId: string, rows: Array<{ entity: string; entity_id: string | null; before: Record<string, unknown> | null; after: Record<string, unknown> | null }>) {
  const userIds = new Set<string>();
  const shopIds = new Set<string>();
  const skillIds = new Set<string>();
  const isId = (v: unknown): v is string => typeof v === 'string' && /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i.test(v);
  const list = (v: unknown): Array<Record<string, unknown>> =>
    Array.isArray(v) ? v.filter((x): x is Record<string, unknown> => !!x && typeof x === 'object') : [];
  for (const r of rows) {
    if (r.entity === 'User' && isId(r.entity_id)) userIds.add(r.entity_id);
    if (r.entity === 'Shop' && isId(r.entity_id)) shopIds.add(r.entity_id);
    for (const snap of [r.before ?? {}, r.after ?? {}]) {
      for (const key of ['userId', 'invitedByUserId', 'acceptedByUserId']) if (isId(snap[key])) userIds.add(snap[key]);
      for (const key of ['shopId', 'fromShopId', 'toShopId', 'homeShopId']) if (isId(snap[key])) shopIds.add(snap[key]);
      for (const role of list(snap.roles)) if (isId(role.shopId)) shopIds.add(role.shopId);
      for (const skill of list(snap.skills)) if (isId(skill.skillId)) skillIds.add(skill.skillId);
    }
  }
  const [users, shops, skills] = await Promise.all([
    userIds.size ? User.findAll({ where: { networkId, id: [...userIds] }, attributes: ['id', 'name'] }) : [],
    shopIds.size ? Shop.findAll({ where: { networkId, id: [...shopIds] }, attributes: ['id', 'name'] }) : [],
    skillIds.size ? Skill.findAll({ where: { networkId, id: [...skillIds] }, attributes: ['id', 'name'] }) : [],
  ]);
  const userName = new Map(users.map((u) => [u.id, u.name]));
  const shopName = new Map(shops.map((x) => [x.id, x.name]));
  /** Every id the page's before and after values mention, with today's name, so the log reads in words. */
  const names: Record<string, string> = Object.fromEntries([
    ...users.map((u) => [u.id, u.name] as const),
    ...shops.map((x) => [x.id, x.name] as const),
    ...skills.map((k) => [k.id, k.name] as const),
  ]);
  const label = (entity: string, entityId: string | null, snap: Record<string, unknown> | null): string => {
    const s = snap ?? {};
    const shop = (id: unknown) => (typeof id === 'string' ? (shopName.get(id) ?? 'a removed shop') : 'the whole network');
    const text = (value: unknown, fallback: string) => (typeof value === 'string' ? value : fallback);
    switch (entity) {
      case 'User':
        return userName.get(entityId ?? '') ?? text(s.name, 'a person');
      case 'Membership':
        return `${userName.get(String(s.userId)) ?? 'a person'} at ${shop(s.shopId)}`;
      case 'Invitation':
        return text(s.email, 'an invitation');
      case 'Shop':
        return shopName.get(entityId ?? '') ?? text(s.name, 'a shop');
      case 'RelayRun':
        return `${shop(s.fromShopId)} → ${shop(s.toShopId)}`;
      case 'Skill':
        return text(s.name, 'a skill');
      default:
        return entityId ?? entity;
    }
  };
  return { label, names };
}

/** The owner reads the log newest first, a page at a time, optionally for one record. */
export async function listAuditLog(actor: Actor, query: AuditLogQuery): Promise<{ entries: AuditEntry[]; nextCursor: string | null; names: Record<string, string> }> {
  if (!accessibleWhere(actor.ability, 'read', 'AuditLog')) throw forbidden('Only the network owner reads the audit log.');
  const conditions = ['a.network_id = :networkId'];
  const replacements: Record<string, unknown> = { networkId: actor.networkId, limit: query.limit + 1 };
  if (query.entity) {
    conditions.push('a.entity = :entity');
    replacements.entity = query.entity;
  }
  if (query.entityId) {
    conditions.push('a.entity_id = :entityId');
    replacements.entityId = query.entityId;
  }
  if (query.action) {
    conditions.push('a.action = :action');
    replacements.action = query.action;
  }
  if (query.personId) {
    // by the person, or about them: their account, their roles, their hours at a shop
    conditions.push(`(a.actor_user_id = :personId::uuid
      or (a.entity = 'User' and a.entity_id = :personId)
      or a.before->>'userId' = :personId or a.after->>'userId' = :personId)`);
    replacements.personId = query.personId;
  }
  if (query.shopId) {
    const about = (side: 'before' | 'after') =>
      `a.${side}->>'shopId' = :shopId or a.${side}->>'fromShopId' = :shopId or a.${side}->>'toShopId' = :shopId
       or (jsonb_typeof(a.${side}->'roles') = 'array' and a.${side}->'roles' @> jsonb_build_array(jsonb_build_object('shopId', :shopId::text)))`;
    conditions.push(`((a.entity = 'Shop' and a.entity_id = :shopId) or ${about('before')} or ${about('after')})`);
    replacements.shopId = query.shopId;
  }
  if (query.from) {
    conditions.push('a.at >= :from::timestamptz');
    replacements.from = query.from;
  }
  if (query.to) {
    conditions.push('a.at < :to::timestamptz');
    replacements.to = query.to;
  }
  if (query.cursor) {
    const c = decodeCursor(query.cursor);
    // keyset on (at, id): stable while new entries arrive; `at` text keeps PostgreSQL's microseconds
    conditions.push('(a.at, a.id) < (:cursorAt::timestamptz, :cursorId::uuid)');
    replacements.cursorAt = c.at;
    replacements.cursorId = c.id;
  }
  const rows = await sequelize.query<{
    id: string; at: Date; at_text: string; action: string; entity: string; entity_id: string | null;
    before: Record<string, unknown> | null; after: Record<string, unknown> | null;
    actor_user_id: string | null; actor_name: string | null; actor_email: string | null;
  }>(
    `select a.id, a.at, a.at::text as at_text, a.action, a.entity, a.entity_id, a.before, a.after,
            a.actor_user_id, u.name as actor_name, u.email as actor_email
       from audit_log a
       left join users u on u.network_id = a.network_id and u.id = a.actor_user_id
      where ${conditions.join(' and ')}
      order by a.at desc, a.id desc
      limit :limit`,
    { type: QueryTypes.SELECT, replacements },
  );
  const page = rows.slice(0, query.limit);
  const last = page[page.length - 1];
  const { label, names } = await auditLabeller(actor.networkId, page);
  return {
    names,
    entries: page.map((r) => ({
      id: r.id,
      subject: label(r.entity, r.entity_id, r.before ?? r.after),
      at: new Date(r.at).toISOString(),
      actor: r.actor_user_id ? { id: r.actor_user_id, name: r.actor_name ?? '', email: r.actor_email ?? '' } : null,
      action: r.action,
      entity: r.entity,
      entityId: r.entity_id,
      before: r.before,
      after: r.after,
    })),
    nextCursor: rows.length > query.limit && last ? encodeCursor(last.at_text, last.id) : null,
  };
}

// ---------------------------------------------------------------------------------------------
// People and their roles

export interface PersonView {
  id: string;
  name: string;
  email: string;
  active: boolean;
  deactivatedAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
  memberships: Array<{ id: string; shopId: string | null; shopName: string | null; role: Role }>;
  skills?: Array<{ shopId: string; shopName: string | null; skillId: string; skillName: string | null; weeklyHours: number }>;
}

const iso = (d: Date | null | undefined) => (d ? new Date(d).toISOString() : null);

function personView(user: User, detail = false): PersonView {
  const memberships = [...(user.memberships ?? [])]
    .map((m) => ({ id: m.id, shopId: m.shopId ?? null, shopName: m.shop?.name ?? null, role: m.role }))
    // the network-wide role first, then shops by name
    .sort((a, b) => (a.shopId === null ? -1 : b.shopId === null ? 1 : (a.shopName ?? '').localeCompare(b.shopName ?? '')));
  return {
    id: user.id,
    name: user.name,
    email: user.email,
    active: user.active,
    deactivatedAt: iso(user.deactivatedAt),
    lastSignInAt: iso(user.lastSignInAt),
    createdAt: iso(user.createdAt)!,
    memberships,
    ...(detail
      ? {
          skills: (user.technicianSkills ?? []).map((t) => ({
            shopId: t.shopId,
            shopName: t.shop?.name ?? null,
            skillId: t.skillId,
            skillName: t.skill?.name ?? null,
            weeklyHours: t.weeklyHours,
          })),
        }
      : {}),
  };
}

const membershipInclude = (networkId: string) => ({
  model: Membership,
  as: 'memberships',
  where: { networkId },
  required: false,
  include: [{ model: Shop, as: 'shop', where: { networkId }, required: false, attributes: ['id', 'name'] }],
});

async function loadPerson(actor: Actor, userId: string, detail = false, transaction?: Transaction): Promise<User> {
  const user = await User.findOne({
    where: { networkId: actor.networkId, id: userId },
    include: [
      membershipInclude(actor.networkId),
      ...(detail
        ? [{
            model: TechnicianSkill,
            as: 'technicianSkills',
            where: { networkId: actor.networkId },
            required: false,
            include: [
              { model: Shop, as: 'shop', where: { networkId: actor.networkId }, required: false, attributes: ['id', 'name'] },
              { model: Skill, as: 'skill', where: { networkId: actor.networkId }, required: false, attributes: ['id', 'name'] },
            ],
          }]
        : []),
    ],
    transaction,
  });
  if (!user) throw notFound('That person');
  return user;
}

const PEOPLE_DENIED = 'Only the network owner manages people and their roles.';

/** Everyone in the network with their roles per shop (owner only). */
export async function listPeople(actor: Actor, query: PeopleQuery): Promise<PersonView[]> {
  const allowed = accessibleWhere(actor.ability, 'read', 'User');
  if (!allowed) throw forbidden(PEOPLE_DENIED);
  const where: WhereOptions = { ...allowed, networkId: actor.networkId };
  const and: WhereOptions[] = [where];
  if (query.status === 'active') and.push({ active: true });
  if (query.status === 'inactive') and.push({ active: false });
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
    and.push({ [Op.or]: [{ name: { [Op.iLike]: like } }, { email: { [Op.iLike]: like } }] });
  }
  if (query.shopId) {
    const atShop = await Membership.findAll({ where: { networkId: actor.networkId, shopId: query.shopId }, attributes: ['userId'] });
    and.push({ id: { [Op.in]: atShop.map((m) => m.userId) } });
  }
  const users = await User.findAll({
    where: { [Op.and]: and },
    include: [membershipInclude(actor.networkId)],
    order: [['name', 'ASC'], ['email', 'ASC']],
  });
  return users.map((u) => personView(u));
}

export async function getPerson(actor: Actor, userId: string): Promise<PersonView> {
  const user = await loadPerson(actor, userId, true);
  assertCan(actor.ability, 'read', 'User', user.get({ plain: true }), PEOPLE_DENIED);
  return personView(user, true);
}

export async function updatePerson(actor: Actor, userId: string, input: PersonUpdate): Promise<PersonView> {
  return sequelize.transaction(async (transaction) => {
    const user = await loadPerson(actor, userId, false, transaction);
    assertCan(actor.ability, 'update', 'User', user.get({ plain: true }), PEOPLE_DENIED);
    const before = { name: user.name };
    await user.update({ name: input.name }, { transaction });
    await audit(actor, 'person.updated', 'User', user.id, before, { name: user.name }, transaction);
    return personView(await loadPerson(actor, userId, true, transaction), true);
  });
}

/**
 * Serialises every change that could leave a network without an active owner (removing an owner
 * role, deactivating an owner): two owners demoting each other at the same moment cannot both win.
 */
export async function lockOwners(networkId: string, transaction: Transaction) {
  await sequelize.query(`select pg_advisory_xact_lock(hashtext('benchrelay:owners:' || :networkId))`, {
    replacements: { networkId },
    transaction,
  });
}

async function activeOwnerIds(networkId: string, transaction: Transaction): Promise<string[]> {
  const rows = await sequelize.query<{ id: string }>(
    `select u.id from memberships m join users u on u.network_id = m.network_id and u.id = m.user_id
      where m.network_id = :networkId and m.role = 'owner' and u.active`,
    { type: QueryTypes.SELECT, replacements: { networkId }, transaction },
  );
  return rows.map((r) => r.id);
}

const LAST_OWNER = 'A network always keeps at least one active owner. Make someone else owner first.';

function membershipSnapshot(m: Membership) {
  return { id: m.id, userId: m.userId, shopId: m.shopId ?? null, role: m.role };
}

/** Gives a person a role at a shop (or the network-wide owner role); an existing role there is replaced. */
export async function assignRole(actor: Actor, userId: string, input: RoleAssignment): Promise<PersonView> {
  return sequelize.transaction(async (transaction) => {
    const user = await loadPerson(actor, userId, false, transaction);
    assertCan(actor.ability, 'update', 'User', user.get({ plain: true }), PEOPLE_DENIED);
    if (input.shopId) {
      const shop = await Shop.findOne({ where: { networkId: actor.networkId, id: input.shopId }, transaction });
      if (!shop) throw notFound('That shop');
    }
    const existing = await Membership.findOne({
      where: { networkId: actor.networkId, userId, shopId: input.shopId ?? { [Op.is]: null } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    if (existing) {
      assertCan(actor.ability, 'update', 'Membership', membershipSnapshot(existing), PEOPLE_DENIED);
      if (existing.role !== input.role) {
        const before = membershipSnapshot(existing);
        await existing.update({ role: input.role }, { transaction });
        await audit(actor, 'membership.updated', 'Membership', existing.id, before, membershipSnapshot(existing), transaction);
      }
    } else {
      assertCan(actor.ability, 'create', 'Membership', { userId, shopId: input.shopId, role: input.role }, PEOPLE_DENIED);
      const created = await Membership.create(
        { networkId: actor.networkId, userId, shopId: input.shopId, role: input.role },
        { transaction },
      );
      await audit(actor, 'membership.created', 'Membership', created.id, null, membershipSnapshot(created), transaction);
    }
    return personView(await loadPerson(actor, userId, true, transaction), true);
  });
}

async function loadMembership(actor: Actor, membershipId: string, transaction: Transaction): Promise<Membership> {
  const m = await Membership.findOne({ where: { networkId: actor.networkId, id: membershipId }, transaction, lock: transaction.LOCK.UPDATE });
  if (!m) throw notFound('That role');
  return m;
}

/** Changes the role a person holds at one shop. The owner role is not changed here (see removeMembership). */
export async function changeMembership(actor: Actor, membershipId: string, input: MembershipUpdate): Promise<PersonView> {
  return sequelize.transaction(async (transaction) => {
    const m = await loadMembership(actor, membershipId, transaction);
    assertCan(actor.ability, 'update', 'Membership', membershipSnapshot(m), PEOPLE_DENIED);
    if (m.role === 'owner') {
      throw conflict('The owner role covers the whole network. Give shop roles first, then remove the owner role.');
    }
    if (m.role !== input.role) {
      const before = membershipSnapshot(m);
      await m.update({ role: input.role }, { transaction });
      await audit(actor, 'membership.updated', 'Membership', m.id, before, membershipSnapshot(m), transaction);
    }
    return personView(await loadPerson(actor, m.userId, true, transaction), true);
  });
}

/** Removes one role; the last active owner's owner role stays. */
export async function removeMembership(actor: Actor, membershipId: string): Promise<PersonView> {
  return sequelize.transaction(async (transaction) => {
    await lockOwners(actor.networkId, transaction);
    const m = await loadMembership(actor, membershipId, transaction);
    assertCan(actor.ability, 'delete', 'Membership', membershipSnapshot(m), PEOPLE_DENIED);
    if (m.role === 'owner') {
      const owners = await activeOwnerIds(actor.networkId, transaction);
      if (owners.length <= 1 && owners.includes(m.userId)) throw new AppError(409, 'last_owner', LAST_OWNER);
    }
    const before = membershipSnapshot(m);
    await m.destroy({ transaction });
    await audit(actor, 'membership.removed', 'Membership', m.id, before, null, transaction);
    return personView(await loadPerson(actor, m.userId, true, transaction), true);
  });
}

/** Deactivates a person: they cannot sign in and every session they have ends at once. */
export async function deactivatePerson(actor: Actor, userId: string): Promise<{ person: PersonView; endedSessions: number }> {
  const person = await sequelize.transaction(async (transaction) => {
    await lockOwners(actor.networkId, transaction);
    const user = await loadPerson(actor, userId, false, transaction);
    assertCan(actor.ability, 'update', 'User', user.get({ plain: true }), PEOPLE_DENIED);
    if (user.id === actor.id) throw conflict('You cannot deactivate yourself. Another owner can.');
    if (!user.active) return personView(await loadPerson(actor, userId, true, transaction), true);
    const owners = await activeOwnerIds(actor.networkId, transaction);
    if (owners.includes(user.id) && owners.length <= 1) throw new AppError(409, 'last_owner', LAST_OWNER);
    await user.update({ active: false, deactivatedAt: new Date() }, { transaction });
    await audit(actor, 'person.deactivated', 'User', user.id, { active: true }, { active: false, deactivatedAt: user.deactivatedAt }, transaction);
    // an open invitation would let them walk back in on their own; reactivating is the owner's call
    const open = await Invitation.findAll({ where: { networkId: actor.networkId, email: user.email, acceptedAt: null, revokedAt: null }, transaction });
    for (const inv of open) {
      const before = { id: inv.id, email: inv.email, revokedAt: null };
      await inv.update({ revokedAt: new Date() }, { transaction });
      await audit(actor, 'invitation.revoked', 'Invitation', inv.id, before, { ...before, revokedAt: inv.revokedAt }, transaction);
    }
    return personView(await loadPerson(actor, userId, true, transaction), true);
  });
  // after the commit, so a session cannot slip in between; loadActor refuses an inactive person anyway
  const endedSessions = await endSessionsOf(userId);
  return { person, endedSessions };
}

export async function reactivatePerson(actor: Actor, userId: string): Promise<PersonView> {
  return sequelize.transaction(async (transaction) => {
    const user = await loadPerson(actor, userId, false, transaction);
    assertCan(actor.ability, 'update', 'User', user.get({ plain: true }), PEOPLE_DENIED);
    if (user.active) return personView(await loadPerson(actor, userId, true, transaction), true);
    const before = { active: false, deactivatedAt: iso(user.deactivatedAt) };
    await user.update({ active: true, deactivatedAt: null }, { transaction });
    await audit(actor, 'person.reactivated', 'User', user.id, before, { active: true }, transaction);
    return personView(await loadPerson(actor, userId, true, transaction), true);
  });
}
