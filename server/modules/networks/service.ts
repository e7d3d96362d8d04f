import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { sequelize } from '../../lib/db.js';
import { Membership, RelayRun, Shop, ShopClosingDay, ShopSkill, Skill, TechnicianSkill, User } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { isOwner } from '../../../shared/auth/ability.js';
import { badRequest, conflict, notFound } from '../../lib/errors.js';
import { OPEN_JOB_STAGES, type IsoWeekday } from '../../../shared/domain.js';
import type {
  ClosingDayInput,
  ClosingDayView,
  RelayRunUpdate,
  ShopSkillsInput,
  ShopUpdate,
  ShopValues,
  SkillInput,
  TechnicianSkillsInput,
  relayRunInputSchema,
} from '../../../shared/schemas/shops.js';
import { audit } from '../members/index.js';

/**
 * The home page's shops: those where the person holds a role (the owner: every shop), each with its open
 * jobs counted per stage (one aggregate query). A regional manager may read every shop of the network, but
 * their home lists the shops they manage.
 */
export async function shopSummaries(actor: Actor) {
  const where = accessibleWhere(actor.ability, 'read', 'Shop');
  if (!where) return [];
  const owner = actor.memberships.some((m) => m.role === 'owner');
  const ownShopIds = [...new Set(actor.memberships.map((m) => m.shopId).filter((id): id is string => !!id))];
  if (!owner && !ownShopIds.length) return [];
  const shops = await Shop.findAll({
    where: { [Op.and]: [where, { networkId: actor.networkId }, ...(owner ? [] : [{ id: { [Op.in]: ownShopIds } }])] },
    order: [['name', 'ASC']],
  });
  if (!shops.length) return [];
  const counts = await sequelize.query<{ shop_id: string; stage: string; n: string }>(
    `select shop_id, stage, count(*) as n
       from jobs
      where network_id = :networkId and shop_id in (:shopIds)
      group by shop_id, stage`,
    { type: QueryTypes.SELECT, replacements: { networkId: actor.networkId, shopIds: shops.map((s) => s.id) } },
  );
  return shops.map((s) => {
    const jobsByStage: Record<string, number> = {};
    for (const c of counts) if (c.shop_id === s.id) jobsByStage[c.stage] = Number(c.n); // COUNT comes back as a string
    const openJobs = OPEN_JOB_STAGES.reduce((sum, stage) => sum + (jobsByStage[stage] ?? 0), 0);
    return { id: s.id, name: s.name, city: s.city, timeZone: s.timeZone, openJobs, jobsByStage };
  });
}

// ---------------------------------------------------------------------------------------------
// Shops, skills, technicians' hours and relay runs

import type { ShopView } from '../../../shared/schemas/shops.js';
export type { ShopView };

export interface RelayRunView {
  id: string;
  fromShopId: string;
  fromShopName: string | null;
  toShopId: string;
  toShopName: string | null;
  weekdays: number[];
  departureTime: string;
  transitHours: number;
  active: boolean;
}

export interface ShopDetail extends ShopView {
  technicians: Array<{
    userId: string;
    name: string;
    /** Only for the owner, who manages people; a regional manager reading another shop sees names, not addresses. */
    email: string | null;
    active: boolean;
    skills: Array<{ skillId: string; name: string; weeklyHours: number }>;
  }>;
  relayRuns: RelayRunView[];
}

const SHOPS_DENIED = 'Only the network owner sets up shops.';

function shopView(shop: Shop): ShopView {
  return {
    id: shop.id,
    name: shop.name,
    code: shop.code,
    addressLine: shop.addressLine ?? null,
    city: shop.city ?? null,
    region: shop.region ?? null,
    postalCode: shop.postalCode ?? null,
    country: shop.country,
    latitude: shop.latitude ?? null,
    longitude: shop.longitude ?? null,
    timeZone: shop.timeZone,
    openingDays: (shop.openingDays ?? []).map(Number),
    laborRateCents: shop.laborRateCents,
    taxRateBasisPoints: shop.taxRateBasisPoints,
    phone: shop.phone ?? null,
    email: shop.email ?? null,
    active: shop.active,
    skills: (shop.shopSkills ?? [])
      .map((s) => ({ skillId: s.skillId, code: s.skill?.code ?? '', name: s.skill?.name ?? '', weeklyBenchHours: s.weeklyBenchHours }))
      .sort((a, b) => a.name.localeCompare(b.name)),
  };
}

const shopSkillsInclude = (networkId: string) => ({
  model: ShopSkill,
  as: 'shopSkills',
  where: { networkId },
  required: false,
  include: [{ model: Skill, as: 'skill', where: { networkId }, required: false }],
});

function shopSnapshot(shop: Shop) {
  const { skills: _skills, ...plain } = shopView(shop);
  return plain;
}

/** `HH:MM:SS` from the database, shown and edited as `HH:MM`. */
const hhmm = (time: string) => time.slice(0, 5);

function relayRunView(run: RelayRun): RelayRunView {
  return {
    id: run.id,
    fromShopId: run.fromShopId,
    fromShopName: run.fromShop?.name ?? null,
    toShopId: run.toShopId,
    toShopName: run.toShop?.name ?? null,
    weekdays: run.weekdays.map(Number),
    departureTime: hhmm(run.departureTime),
    transitHours: run.transitHours,
    active: run.active,
  };
}

/** The shops this person may read, with their skills. */
export async function listShops(actor: Actor): Promise<ShopView[]> {
  const where = accessibleWhere(actor.ability, 'read', 'Shop');
  if (!where) return [];
  const shops = await Shop.findAll({
    where: { ...where, networkId: actor.networkId },
    include: [shopSkillsInclude(actor.networkId)],
    order: [['name', 'ASC']],
  });
  return shops.map(shopView);
}

async function loadShop(actor: Actor, shopId: string, transaction?: Transaction): Promise<Shop> {
  const shop = await Shop.findOne({
    where: { networkId: actor.networkId, id: shopId },
    include: [shopSkillsInclude(actor.networkId)],
    transaction,
  });
  if (!shop) throw notFound('That shop');
  return shop;
}

const plainShop = (shop: Shop) => ({ id: shop.id, name: shop.name, active: shop.active });

/** One shop with its skills, its technicians' hours per skill and the relay runs from and to it. */
export async function getShop(actor: Actor, shopId: string, transaction?: Transaction): Promise<ShopDetail> {
  const shop = await loadShop(actor, shopId, transaction);
  assertCan(actor.ability, 'read', 'Shop', plainShop(shop), 'You have no role at that shop.');
  const { networkId } = actor;
  const seesEmails = isOwner(actor);
  const techs = await Membership.findAll({
    where: { networkId, shopId, role: 'technician' },
    include: [{ model: User, as: 'user', where: { networkId }, required: true }],
    transaction,
  });
  const hours = await TechnicianSkill.findAll({
    where: { networkId, shopId },
    include: [{ model: Skill, as: 'skill', where: { networkId }, required: false }],
    transaction,
  });
  const runWhere = accessibleWhere(actor.ability, 'read', 'RelayRun');
  const runs = runWhere
    ? await RelayRun.findAll({
        where: { [Op.and]: [runWhere, { networkId }, { [Op.or]: [{ fromShopId: shopId }, { toShopId: shopId }] }] },
        include: [
          { model: Shop, as: 'fromShop', where: { networkId }, required: false, attributes: ['id', 'name'] },
          { model: Shop, as: 'toShop', where: { networkId }, required: false, attributes: ['id', 'name'] },
        ],
        order: [['fromShopId', 'ASC'], ['toShopId', 'ASC'], ['departureTime', 'ASC']],
        transaction,
      })
    : [];
  return {
    ...shopView(shop),
    technicians: techs
      .map((m) => ({
        userId: m.userId,
        name: m.user!.name,
        email: seesEmails ? m.user!.email : null,
        active: m.user!.active,
        skills: hours
          .filter((h) => h.userId === m.userId)
          .map((h) => ({ skillId: h.skillId, name: h.skill?.name ?? '', weeklyHours: h.weeklyHours }))
          .sort((a, b) => a.name.localeCompare(b.name)),
      }))
      .sort((a, b) => a.name.localeCompare(b.name)),
    relayRuns: runs.map(relayRunView),
  };
}

function definedOnly(input: object) {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(input)) if (v !== undefined) out[k] = v;
  return out;
}

async function withCodeConflict<T>(code: string | undefined, work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if ((err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
      throw conflict(`Another shop already uses the code ${code ?? ''}.`, { code: 'Already used by another shop.' });
    }
    throw err;
  }
}

export async function createShop(actor: Actor, input: ShopValues): Promise<ShopDetail> {
  assertCan(actor.ability, 'create', 'Shop', undefined, SHOPS_DENIED);
  return withCodeConflict(input.code, () =>
    sequelize.transaction(async (transaction) => {
      const shop = await Shop.create({ ...(definedOnly(input) as ShopValues), networkId: actor.networkId } as never, { transaction });
      await audit(actor, 'shop.created', 'Shop', shop.id, null, shopSnapshot(shop), transaction);
      return getShop(actor, shop.id, transaction);
    }),
  );
}

export async function updateShop(actor: Actor, shopId: string, input: ShopUpdate): Promise<ShopDetail> {
  return withCodeConflict(input.code, () =>
    sequelize.transaction(async (transaction) => {
      const shop = await loadShop(actor, shopId, transaction);
      assertCan(actor.ability, 'update', 'Shop', plainShop(shop), SHOPS_DENIED);
      const before = shopSnapshot(shop);
      await shop.update(definedOnly(input), { transaction });
      await audit(actor, 'shop.updated', 'Shop', shop.id, before, shopSnapshot(shop), transaction);
      return getShop(actor, shop.id, transaction);
    }),
  );
}

async function checkSkills(networkId: string, skillIds: string[], transaction: Transaction) {
  if (!skillIds.length) return;
  const found = await Skill.findAll({ where: { networkId, id: { [Op.in]: skillIds } }, attributes: ['id'], transaction });
  // another network's skill id is answered like any unknown id
  if (found.length !== new Set(skillIds).size) throw notFound('That skill');
}

/** Replaces the skills a shop offers and the weekly bench hours it gives each (routing's capacity). */
export async function setShopSkills(actor: Actor, shopId: string, input: ShopSkillsInput): Promise<ShopDetail> {
  return sequelize.transaction(async (transaction) => {
    const shop = await loadShop(actor, shopId, transaction);
    assertCan(actor.ability, 'update', 'Shop', plainShop(shop), SHOPS_DENIED);
    await checkSkills(actor.networkId, input.skills.map((s) => s.skillId), transaction);
    const before = (shop.shopSkills ?? []).map((s) => ({ skillId: s.skillId, weeklyBenchHours: s.weeklyBenchHours }));
    await ShopSkill.destroy({ where: { networkId: actor.networkId, shopId }, transaction });
    if (input.skills.length) {
      await ShopSkill.bulkCreate(
        input.skills.map((s) => ({ networkId: actor.networkId, shopId, skillId: s.skillId, weeklyBenchHours: s.weeklyBenchHours })),
        { transaction },
      );
    }
    await audit(actor, 'shop.skills_set', 'Shop', shopId, { skills: before }, { skills: input.skills }, transaction);
    return getShop(actor, shopId, transaction);
  });
}

/** Replaces one technician's skills and weekly hours at a shop; they must hold the technician role there. */
export async function setTechnicianSkills(actor: Actor, shopId: string, input: TechnicianSkillsInput): Promise<ShopDetail> {
  return sequelize.transaction(async (transaction) => {
    const shop = await loadShop(actor, shopId, transaction);
    assertCan(actor.ability, 'update', 'Shop', plainShop(shop), SHOPS_DENIED);
    const role = await Membership.findOne({
      where: { networkId: actor.networkId, shopId, userId: input.userId, role: 'technician' },
      transaction,
    });
    if (!role) {
      throw badRequest('That person is not a technician at this shop.', { userId: 'Give this person the technician role here first.' });
    }
    await checkSkills(actor.networkId, input.skills.map((s) => s.skillId), transaction);
    const existing = await TechnicianSkill.findAll({ where: { networkId: actor.networkId, shopId, userId: input.userId }, transaction });
    const before = existing.map((t) => ({ skillId: t.skillId, weeklyHours: t.weeklyHours }));
    await TechnicianSkill.destroy({ where: { networkId: actor.networkId, shopId, userId: input.userId }, transaction });
    if (input.skills.length) {
      await TechnicianSkill.bulkCreate(
        input.skills.map((s) => ({ networkId: actor.networkId, shopId, userId: input.userId, skillId: s.skillId, weeklyHours: s.weeklyHours })),
        { transaction },
      );
    }
    await audit(
      actor, 'technician.skills_set', 'Shop', shopId,
      { userId: input.userId, skills: before }, { userId: input.userId, skills: input.skills }, transaction,
    );
    return getShop(actor, shopId, transaction);
  });
}

export interface SkillView {
  id: string;
  code: string;
  name: string;
}

const skillView = (s: Skill): SkillView => ({ id: s.id, code: s.code, name: s.name });

export async function listSkills(actor: Actor): Promise<SkillView[]> {
  const where = accessibleWhere(actor.ability, 'read', 'Skill');
  if (!where) return [];
  const skills = await Skill.findAll({ where: { ...where, networkId: actor.networkId }, order: [['name', 'ASC']] });
  return skills.map(skillView);
}

async function withSkillConflict<T>(work: () => Promise<T>): Promise<T> {
  try {
    return await work();
  } catch (err) {
    if ((err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
      throw conflict('Another skill already uses that code.', { code: 'Already used by another skill.' });
    }
    throw err;
  }
}

export async function createSkill(actor: Actor, input: SkillInput): Promise<SkillView> {
  assertCan(actor.ability, 'create', 'Skill', undefined, SHOPS_DENIED);
  return withSkillConflict(() =>
    sequelize.transaction(async (transaction) => {
      const skill = await Skill.create({ networkId: actor.networkId, code: input.code, name: input.name }, { transaction });
      await audit(actor, 'skill.created', 'Skill', skill.id, null, skillView(skill), transaction);
      return skillView(skill);
    }),
  );
}

export async function updateSkill(actor: Actor, skillId: string, input: Partial<SkillInput>): Promise<SkillView> {
  return withSkillConflict(() =>
    sequelize.transaction(async (transaction) => {
      const skill = await Skill.findOne({ where: { networkId: actor.networkId, id: skillId }, transaction });
      if (!skill) throw notFound('That skill');
      assertCan(actor.ability, 'update', 'Skill', skillView(skill) as unknown as Record<string, unknown>, SHOPS_DENIED);
      const before = skillView(skill);
      await skill.update(definedOnly(input), { transaction });
      await audit(actor, 'skill.updated', 'Skill', skill.id, before, skillView(skill), transaction);
      return skillView(skill);
    }),
  );
}

const runIncludes = (networkId: string) => [
  { model: Shop, as: 'fromShop', where: { networkId }, required: false, attributes: ['id', 'name'] },
  { model: Shop, as: 'toShop', where: { networkId }, required: false, attributes: ['id', 'name'] },
];

/** Relay runs this person may see (all for owner and regional managers; those touching their shops otherwise). */
export async function listRelayRuns(actor: Actor, query: { shopId?: string }): Promise<RelayRunView[]> {
  const where = accessibleWhere(actor.ability, 'read', 'RelayRun');
  if (!where) return [];
  const and: WhereOptions[] = [where, { networkId: actor.networkId }];
  if (query.shopId) and.push({ [Op.or]: [{ fromShopId: query.shopId }, { toShopId: query.shopId }] });
  const runs = await RelayRun.findAll({
    where: { [Op.and]: and },
    include: runIncludes(actor.networkId),
    order: [['fromShopId', 'ASC'], ['toShopId', 'ASC'], ['departureTime', 'ASC']],
  });
  return runs.map(relayRunView).sort((a, b) => `${a.fromShopName}${a.toShopName}`.localeCompare(`${b.fromShopName}${b.toShopName}`));
}

const runSnapshot = (r: RelayRun) => {
  const { fromShopName: _f, toShopName: _t, ...rest } = relayRunView(r);
  return rest;
};

async function loadRun(actor: Actor, id: string, transaction: Transaction): Promise<RelayRun> {
  const run = await RelayRun.findOne({ where: { networkId: actor.networkId, id }, include: runIncludes(actor.networkId), transaction });
  if (!run) throw notFound('That relay run');
  return run;
}

export async function createRelayRun(actor: Actor, input: z.output<typeof relayRunInputSchema>): Promise<RelayRunView> {
  return sequelize.transaction(async (transaction) => {
    const shops = await Shop.findAll({
      where: { networkId: actor.networkId, id: { [Op.in]: [input.fromShopId, input.toShopId] } },
      attributes: ['id'],
      transaction,
    });
    // another network's shop id is answered like any unknown id: its existence must not show
    if (shops.length !== 2) throw notFound('That shop');
    assertCan(actor.ability, 'create', 'RelayRun', { fromShopId: input.fromShopId, toShopId: input.toShopId }, SHOPS_DENIED);
    const created = await RelayRun.create(
      {
        networkId: actor.networkId,
        fromShopId: input.fromShopId,
        toShopId: input.toShopId,
        weekdays: input.weekdays as IsoWeekday[],
        departureTime: `${input.departureTime}:00`,
        transitHours: input.transitHours,
        active: input.active,
      },
      { transaction },
    );
    const run = await loadRun(actor, created.id, transaction);
    await audit(actor, 'relay_run.created', 'RelayRun', run.id, null, runSnapshot(run), transaction);
    return relayRunView(run);
  });
}

export async function updateRelayRun(actor: Actor, id: string, input: RelayRunUpdate): Promise<RelayRunView> {
  return sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, id, transaction);
    assertCan(actor.ability, 'update', 'RelayRun', runSnapshot(run), SHOPS_DENIED);
    const before = runSnapshot(run);
    const changes: Record<string, unknown> = {};
    if (input.weekdays) changes.weekdays = input.weekdays;
    if (input.departureTime) changes.departureTime = `${input.departureTime}:00`;
    if (input.transitHours !== undefined) changes.transitHours = input.transitHours;
    if (input.active !== undefined) changes.active = input.active;
    await run.update(changes, { transaction });
    const after = await loadRun(actor, id, transaction);
    await audit(actor, 'relay_run.updated', 'RelayRun', run.id, before, runSnapshot(after), transaction);
    return relayRunView(after);
  });
}

/**
 * Removes a relay run. Transfers that travelled on it keep their history, so a run that carried any
 * is kept and switched off instead.
 */
export async function removeRelayRun(actor: Actor, id: string): Promise<{ removed: boolean; run: RelayRunView }> {
  return sequelize.transaction(async (transaction) => {
    const run = await loadRun(actor, id, transaction);
    assertCan(actor.ability, 'delete', 'RelayRun', runSnapshot(run), SHOPS_DENIED);
    const before = runSnapshot(run);
    const [{ n }] = await sequelize.query<{ n: string }>(
      'select count(*) as n from transfers where network_id = :networkId and relay_run_id = :id',
      { type: QueryTypes.SELECT, replacements: { networkId: actor.networkId, id }, transaction },
    );
    if (Number(n) > 0) {
      await run.update({ active: false }, { transaction });
      await audit(actor, 'relay_run.deactivated', 'RelayRun', run.id, before, runSnapshot(run), transaction);
      return { removed: false, run: relayRunView(run) };
    }
    await run.destroy({ transaction });
    await audit(actor, 'relay_run.removed', 'RelayRun', run.id, before, null, transaction);
    return { removed: true, run: relayRunView(run) };
  });
}

// ---------------------------------------------------------------------------------------------
// Closing days: days the owner closes a shop besides its weekdays off and the public holidays

const closingDayView = (d: ShopClosingDay): ClosingDayView => ({ date: d.date, reason: d.reason });

/** A shop's closing days as 'YYYY-MM-DD', for promised-date counting (no access check: callers have one). */
export async function closedDaysOf(networkId: string, shopId: string, transaction?: Transaction): Promise<string[]> {
  const rows = await ShopClosingDay.findAll({ where: { networkId, shopId }, attributes: ['date'], order: [['date', 'ASC']], transaction });
  return rows.map((r) => r.date);
}

/** The closing days of a shop, oldest first; anyone who may read the shop may read them. */
export async function listClosingDays(actor: Actor, shopId: string): Promise<ClosingDayView[]> {
  const shop = await loadShop(actor, shopId);
  assertCan(actor.ability, 'read', 'Shop', plainShop(shop), 'You have no role at that shop.');
  const rows = await ShopClosingDay.findAll({ where: { networkId: actor.networkId, shopId: shop.id }, order: [['date', 'ASC']] });
  return rows.map(closingDayView);
}

const CLOSING_DAYS_DENIED = 'Only the network owner sets a shop’s closing days.';

/** Adds a closing day (the owner's alone, like editing the shop); a day already closed is a conflict. */
export async function addClosingDay(actor: Actor, shopId: string, input: ClosingDayInput & { reason: string }): Promise<ClosingDayView[]> {
  await sequelize.transaction(async (transaction) => {
    const shop = await loadShop(actor, shopId, transaction);
    assertCan(actor.ability, 'update', 'Shop', plainShop(shop), CLOSING_DAYS_DENIED);
    const existing = await ShopClosingDay.findOne({ where: { networkId: actor.networkId, shopId: shop.id, date: input.date }, transaction });
    if (existing) throw conflict(`${shop.name} is already closed on ${input.date}.`, { date: 'Already a closing day of this shop.' });
    try {
      const row = await ShopClosingDay.create({ networkId: actor.networkId, shopId: shop.id, date: input.date, reason: input.reason }, { transaction });
      await audit(actor, 'shop.closing_day_added', 'Shop', shop.id, null, closingDayView(row), transaction);
    } catch (err) {
      // two owners adding the same day at once: the unique constraint answers for the second
      if ((err as { name?: string }).name === 'SequelizeUniqueConstraintError') {
        throw conflict(`${shop.name} is already closed on ${input.date}.`, { date: 'Already a closing day of this shop.' });
      }
      throw err;
    }
  });
  return listClosingDays(actor, shopId);
}

/** Removes a closing day (the owner's alone); a day that is not a closing day of the shop is not found. */
export async function removeClosingDay(actor: Actor, shopId: string, date: string): Promise<ClosingDayView[]> {
  await sequelize.transaction(async (transaction) => {
    const shop = await loadShop(actor, shopId, transaction);
    assertCan(actor.ability, 'update', 'Shop', plainShop(shop), CLOSING_DAYS_DENIED);
    const row = await ShopClosingDay.findOne({ where: { networkId: actor.networkId, shopId: shop.id, date }, transaction, lock: transaction.LOCK.UPDATE });
    if (!row) throw notFound('That closing day');
    const before = closingDayView(row);
    await row.destroy({ transaction });
    await audit(actor, 'shop.closing_day_removed', 'Shop', shop.id, before, null, transaction);
  });
  return listClosingDays(actor, shopId);
}
