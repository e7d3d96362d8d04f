import { createHash } from 'node:crypto';
import { subject } from '@casl/ability';
import { Op, QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { Job, Part, RelayRun, Shop, StockLevel, StockReservation } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { assertCan } from '../../lib/access.js';
import { badRequest, conflict, forbidden, notFound } from '../../lib/errors.js';
import type { PadCatalog } from '../../../shared/padmap/compute.js';
import type { PadKind } from '../../../shared/padmap/rules.js';
import { PartTransfer, type PartTransferState } from './models.js';
import { cautionsFor, normaliseHazards, type Hazard } from '../../../shared/safety/hazards.js';
import { notify, peopleAt } from '../notifications/index.js';

/**
 * Stock per shop, reservations for jobs, and parts sent between shops.
 *
 * `stock_levels.reserved` is the sum of the open reservations at that shop; it is only ever changed
 * by a relative `reserved ± n` in SQL inside the transaction that opens or releases a reservation,
 * so two benches saving at once cannot lose each other's count.
 */

type Tx = { transaction?: Transaction };

export interface PartSummary {
  partId: string;
  sku: string;
  name: string;
  kind: 'pad' | 'other';
  padKind: PadKind | null;
  diameterMm: number | null;
  thicknessMm: number | null;
  unitPriceCents: number;
}

const summaryOf = (p: Part): PartSummary => ({
  partId: p.id,
  sku: p.sku,
  name: p.name,
  kind: p.kind,
  padKind: p.padKind ?? null,
  diameterMm: p.diameterMm ?? null,
  thicknessMm: p.thicknessMm ?? null,
  unitPriceCents: p.unitPriceCents,
});

/** The network's pads, by kind, in the shape the pad map computation reads. */
export async function padCatalogFor(networkId: string, { transaction }: Tx = {}): Promise<PadCatalog> {
  const pads = await Part.findAll({ where: { networkId, kind: 'pad' }, order: [['diameterMm', 'ASC'], ['sku', 'ASC']], transaction });
  const catalog: PadCatalog = { self_leveling: [], glued: [] };
  for (const p of pads) {
    if (!p.padKind || p.diameterMm == null) continue;
    catalog[p.padKind as PadKind].push({
      diameterMm: p.diameterMm,
      thicknessMm: p.thicknessMm ?? null,
      partId: p.id,
      sku: p.sku,
      name: p.name,
      unitPriceCents: p.unitPriceCents,
    });
  }
  return catalog;
}

/** Adds `delta` (negative to release) to a shop's reserved count, creating the row at zero on hand. */
async function shiftReserved(networkId: string, shopId: string, partId: string, delta: number, transaction: Transaction) {
  await sequelize.query(
    `insert into stock_levels (network_id, shop_id, part_id, on_hand, reserved)
     values (:networkId, :shopId, :partId, 0, greatest(:delta, 0))
     on conflict (network_id, shop_id, part_id)
     do update set reserved = greatest(stock_levels.reserved + :delta, 0), updated_at = now()`,
    { replacements: { networkId, shopId, partId, delta }, transaction },
  );
}

/** Adds `delta` to a shop's count on hand; refuses to go below zero. */
async function shiftOnHand(networkId: string, shopId: string, partId: string, delta: number, transaction: Transaction): Promise<boolean> {
  // a CHECK applies to the row an INSERT proposes even when ON CONFLICT turns it into an update,
  // so taking parts off the shelf is a plain guarded UPDATE
  const sql =
    delta < 0
      ? `update stock_levels set on_hand = on_hand + :delta, updated_at = now()
          where network_id = :networkId and shop_id = :shopId and part_id = :partId and on_hand + :delta >= 0
          returning on_hand`
      : `insert into stock_levels (network_id, shop_id, part_id, on_hand, reserved)
         values (:networkId, :shopId, :partId, :delta, 0)
         on conflict (network_id, shop_id, part_id)
         do update set on_hand = stock_levels.on_hand + :delta, updated_at = now()
         returning on_hand`;
  const rows = await sequelize.query<{ on_hand: number }>(sql, {
    replacements: { networkId, shopId, partId, delta },
    transaction,
    type: QueryTypes.SELECT,
  });
  return rows.length > 0;
}

/**
 * Makes a job's open reservations of the parts in `scope` match `wanted` at `shopId`: unchanged lines
 * stay as they are, changed ones are released and reserved afresh, lines no longer wanted are released.
 * Reservations left at another shop (the job moved) are released and made again here.
 */
export async function syncJobReservations(args: {
  networkId: string;
  jobId: string;
  shopId: string;
  scope: Set<string>;
  wanted: Map<string, number>;
  transaction: Transaction;
  /** Who saved the change; they see the shortage on screen and are not sent a notice of it. */
  byUserId?: string | null;
}): Promise<{ reserved: number; released: number; newShortages: string[] }> {
  const { networkId, jobId, shopId, scope, wanted, transaction } = args;
  const shortBefore = await shortParts(networkId, shopId, [...wanted.keys()], transaction);
  const open = await StockReservation.findAll({
    where: { networkId, jobId, releasedAt: null },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  const byPart = new Map<string, StockReservation[]>();
  for (const r of open) {
    if (!scope.has(r.partId)) continue;
    byPart.set(r.partId, [...(byPart.get(r.partId) ?? []), r]);
  }
  let reserved = 0;
  let released = 0;
  const now = new Date();
  for (const partId of new Set([...byPart.keys(), ...wanted.keys()])) {
    const current = byPart.get(partId) ?? [];
    const want = wanted.get(partId) ?? 0;
    const unchanged = current.length === 1 && current[0].shopId === shopId && current[0].quantity === want;
    if (unchanged) continue;
    for (const r of current) {
      await r.update({ releasedAt: now }, { transaction });
      await shiftReserved(networkId, r.shopId, partId, -r.quantity, transaction);
      released += r.quantity;
    }
    if (want > 0) {
      await StockReservation.create({ networkId, jobId, shopId, partId, quantity: want }, { transaction });
      await shiftReserved(networkId, shopId, partId, want, transaction);
      reserved += want;
    }
  }
  const shortAfter = await shortParts(networkId, shopId, [...wanted.keys()], transaction);
  const newShortages = [...shortAfter.keys()].filter((partId) => !shortBefore.has(partId));
  if (newShortages.length) await noticeShortages({ networkId, shopId, jobId, partIds: newShortages, short: shortAfter, byUserId: args.byUserId ?? null, transaction });
  return { reserved, released, newShortages };
}

/** The parts (of `partIds`) a shop has reserved more of than it has on hand, with how many it is short. */
async function shortParts(networkId: string, shopId: string, partIds: string[], transaction: Transaction) {
  if (!partIds.length) return new Map<string, number>();
  const rows = await StockLevel.findAll({
    where: { networkId, shopId, partId: { [Op.in]: partIds } },
    attributes: ['partId', 'onHand', 'reserved'],
    transaction,
  });
  return new Map(rows.filter((r) => r.reserved > r.onHand).map((r) => [r.partId, r.reserved - r.onHand]));
}

/**
 * A job's reservation has just made a shop short of parts: its regional managers (who order) and
 * technicians (who may ask another shop for them) hear of it once per job, part and reservation change.
 */
async function noticeShortages(args: {
  networkId: string; shopId: string; jobId: string; partIds: string[]; short: Map<string, number>; byUserId: string | null; transaction: Transaction;
}) {
  const { networkId, shopId, jobId, partIds, short, transaction } = args;
  const [people, shop, job, parts] = await Promise.all([
    peopleAt(networkId, [shopId], ['regional_manager', 'technician'], transaction),
    Shop.findOne({ where: { networkId, id: shopId }, attributes: ['name'], transaction }),
    Job.findOne({ where: { networkId, id: jobId }, attributes: ['number'], transaction }),
    Part.findAll({ where: { networkId, id: { [Op.in]: partIds } }, attributes: ['id', 'sku', 'name'], order: [['sku', 'ASC']], transaction }),
  ]);
  const recipients = people.filter((id) => id !== args.byUserId);
  if (!recipients.length || !parts.length) return;
  const lines = parts.map((p) => `${p.name} (${p.sku}): short ${short.get(p.id)}`);
  const title = `${shop?.name ?? 'Your shop'} is short of ${parts.length === 1 ? parts[0].name : `${parts.length} parts`}`;
  const body = `Job ${job?.number ?? ''} reserved more than the shelf holds. ${lines.join('; ')}.`;
  // the open reservation ids make the key: a later change that makes the shop short again is a new notice
  const open = await StockReservation.findAll({
    where: { networkId, jobId, shopId, partId: { [Op.in]: partIds }, releasedAt: null },
    attributes: ['id'],
    order: [['id', 'ASC']],
    transaction,
  });
  const key = createHash('sha1').update(open.map((r) => r.id).join(',')).digest('hex');
  await notify(
    {
      networkId,
      kind: 'stock_shortage',
      userIds: recipients,
      title,
      body,
      link: `/stock?shop=${shopId}`,
      dedupeKey: `stock_shortage:${jobId}:${key}`,
      email: { subject: title, text: body },
      sendAfterCommit: true,
    },
    transaction,
  );
}

/** Releases every open reservation of a job (or only of the given parts): the parts go back on the shelf. */
export async function releaseJobReservations(
  networkId: string,
  jobId: string,
  { partIds, transaction }: { partIds?: Set<string>; transaction: Transaction },
): Promise<number> {
  const open = await StockReservation.findAll({ where: { networkId, jobId, releasedAt: null }, transaction, lock: transaction.LOCK.UPDATE });
  let released = 0;
  for (const r of open) {
    if (partIds && !partIds.has(r.partId)) continue;
    await r.update({ releasedAt: new Date() }, { transaction });
    await shiftReserved(networkId, r.shopId, r.partId, -r.quantity, transaction);
    released += r.quantity;
  }
  return released;
}

/** Route use case: a job's reservations released by someone who may update the job. */
export async function releaseReservationsOfJob(actor: Actor, jobId: string) {
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: jobId } });
  if (!job) throw notFound('That job');
  assertCan(actor.ability, 'read', 'Job', job.get({ plain: true }));
  assertCan(actor.ability, 'update', 'Job', job.get({ plain: true }), 'Only staff of the job’s shop can release its parts.');
  const released = await sequelize.transaction((transaction) => releaseJobReservations(actor.networkId, jobId, { transaction }));
  return { released, stock: await jobStockStatus(actor.networkId, jobId, job.shopId) };
}

// ---------------------------------------------------------------------------------------------
// Where to get parts from

const EARTH_RADIUS_KM = 6371.0088; // mean Earth radius (IUGG)

/** Great-circle distance by the haversine formula. */
export function greatCircleKm(a: { latitude: number | null; longitude: number | null }, b: { latitude: number | null; longitude: number | null }): number {
  if (a.latitude == null || a.longitude == null || b.latitude == null || b.longitude == null) return Number.POSITIVE_INFINITY;
  const rad = Math.PI / 180;
  const dLat = (b.latitude - a.latitude) * rad;
  const dLon = (b.longitude - a.longitude) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a.latitude * rad) * Math.cos(b.latitude * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * EARTH_RADIUS_KM * Math.asin(Math.min(1, Math.sqrt(h)));
}

export interface SourceSuggestion {
  shopId: string;
  shopName: string;
  /** What the shop can spare: on hand − reserved − already promised to other shops. */
  free: number;
  distanceKm: number | null;
  /** The shop has a relay run straight to the shop that is short. */
  relayRun: boolean;
  coversAll: boolean;
}

/**
 * For each part, the nearest other shop that can spare it: the nearest that covers the whole need,
 * or failing that the nearest that has any.
 */
export async function nearestSources(
  networkId: string,
  toShopId: string,
  needs: Map<string, number>,
  { transaction }: Tx = {},
): Promise<Map<string, SourceSuggestion>> {
  const result = new Map<string, SourceSuggestion>();
  if (!needs.size) return result;
  const shops = await Shop.findAll({ where: { networkId, active: true }, transaction });
  const here = shops.find((s) => s.id === toShopId);
  if (!here) return result;
  const rows = await sequelize.query<{ shop_id: string; part_id: string; free: number }>(
    `select sl.shop_id, sl.part_id,
            sl.on_hand - sl.reserved - coalesce((
              select sum(pt.quantity) from part_transfers pt
               where pt.network_id = sl.network_id and pt.from_shop_id = sl.shop_id
                 and pt.part_id = sl.part_id and pt.state = 'requested'), 0)::int as free
       from stock_levels sl
      where sl.network_id = :networkId and sl.shop_id <> :toShopId and sl.part_id in (:partIds)`,
    { type: QueryTypes.SELECT, replacements: { networkId, toShopId, partIds: [...needs.keys()] }, transaction },
  );
  const runs = await RelayRun.findAll({ where: { networkId, toShopId, active: true }, attributes: ['fromShopId'], transaction });
  const withRun = new Set(runs.map((r) => r.fromShopId));
  const shopById = new Map(shops.map((s) => [s.id, s]));
  for (const [partId, need] of needs) {
    const candidates = rows
      .filter((r) => r.part_id === partId && Number(r.free) > 0 && shopById.has(r.shop_id))
      .map((r) => {
        const shop = shopById.get(r.shop_id)!;
        const distance = greatCircleKm(here, shop);
        return {
          shopId: shop.id,
          shopName: shop.name,
          free: Number(r.free),
          distanceKm: Number.isFinite(distance) ? Math.round(distance) : null,
          relayRun: withRun.has(shop.id),
          coversAll: Number(r.free) >= need,
        };
      })
      .sort((a, b) => Number(b.coversAll) - Number(a.coversAll) || (a.distanceKm ?? Infinity) - (b.distanceKm ?? Infinity));
    if (candidates[0]) result.set(partId, candidates[0]);
  }
  return result;
}

// ---------------------------------------------------------------------------------------------
// A job's parts at its shop

export interface JobStockLine extends PartSummary {
  /** Reserved for this job. */
  quantity: number;
  onHand: number;
  /** Reserved at the shop for all jobs, this one included. */
  reservedAtShop: number;
  /** How many of this job's parts the shop's shelf cannot cover. */
  shortfall: number;
  /** Parts already on their way to the shop for this job. */
  requested: Array<{ id: string; fromShopId: string; fromShopName: string; quantity: number; state: PartTransferState }>;
  /** Shortfall not yet covered by a request. */
  uncovered: number;
  source: SourceSuggestion | null;
}

export async function jobStockStatus(networkId: string, jobId: string, shopId: string, { transaction }: Tx = {}): Promise<JobStockLine[]> {
  const reservations = await StockReservation.findAll({
    where: { networkId, jobId, shopId, releasedAt: null },
    include: [{ model: Part, as: 'part', required: true, where: { networkId } }],
    transaction,
  });
  if (!reservations.length) return [];
  const partIds = [...new Set(reservations.map((r) => r.partId))];
  const levels = await StockLevel.findAll({ where: { networkId, shopId, partId: { [Op.in]: partIds } }, transaction });
  const levelOf = new Map(levels.map((l) => [l.partId, l]));
  const open = await PartTransfer.findAll({
    where: { networkId, toShopId: shopId, jobId, partId: { [Op.in]: partIds }, state: { [Op.in]: ['requested', 'sent'] } },
    transaction,
  });
  const shops = new Map((await Shop.findAll({ where: { networkId }, attributes: ['id', 'name'], transaction })).map((s) => [s.id, s.name]));

  const perPart = new Map<string, { part: Part; quantity: number }>();
  for (const r of reservations) {
    const seen = perPart.get(r.partId);
    if (seen) seen.quantity += r.quantity;
    else perPart.set(r.partId, { part: r.part!, quantity: r.quantity });
  }
  const lines: JobStockLine[] = [];
  const needs = new Map<string, number>();
  for (const [partId, { part, quantity }] of perPart) {
    const level = levelOf.get(partId);
    const onHand = level?.onHand ?? 0;
    const reservedAtShop = level?.reserved ?? quantity;
    const shortfall = Math.min(quantity, Math.max(0, reservedAtShop - onHand));
    const requested = open
      .filter((t) => t.partId === partId)
      .map((t) => ({ id: t.id, fromShopId: t.fromShopId, fromShopName: shops.get(t.fromShopId) ?? '', quantity: t.quantity, state: t.state }));
    const uncovered = Math.max(0, shortfall - requested.reduce((sum, t) => sum + t.quantity, 0));
    if (uncovered > 0) needs.set(partId, uncovered);
    lines.push({ ...summaryOf(part), quantity, onHand, reservedAtShop, shortfall, requested, uncovered, source: null });
  }
  const sources = await nearestSources(networkId, shopId, needs, { transaction });
  for (const line of lines) line.source = sources.get(line.partId) ?? null;
  return lines.sort((a, b) => (a.padKind ?? '').localeCompare(b.padKind ?? '') || (a.diameterMm ?? 0) - (b.diameterMm ?? 0) || a.sku.localeCompare(b.sku));
}

/** Pad stock at one shop, for the pad map's live preview: what each size has free for this job. */
export async function padStockAt(networkId: string, shopId: string, jobId: string | null, { transaction }: Tx = {}) {
  const rows = await sequelize.query<{ part_id: string; on_hand: number; reserved: number; for_job: number }>(
    `select sl.part_id, sl.on_hand, sl.reserved,
            coalesce((select sum(r.quantity) from stock_reservations r
                       where r.network_id = sl.network_id and r.shop_id = sl.shop_id and r.part_id = sl.part_id
                         and r.job_id = :jobId and r.released_at is null), 0)::int as for_job
       from stock_levels sl
       join parts p on p.network_id = sl.network_id and p.id = sl.part_id and p.kind = 'pad'
      where sl.network_id = :networkId and sl.shop_id = :shopId`,
    { type: QueryTypes.SELECT, replacements: { networkId, shopId, jobId }, transaction },
  );
  return rows.map((r) => ({ partId: r.part_id, onHand: Number(r.on_hand), reserved: Number(r.reserved), reservedForJob: Number(r.for_job) }));
}

// ---------------------------------------------------------------------------------------------
// The stock page

async function shopInNetwork(networkId: string, shopId: string, transaction?: Transaction) {
  const shop = await Shop.findOne({ where: { networkId, id: shopId }, transaction });
  if (!shop) throw notFound('That shop');
  return shop;
}

export interface StockRow extends PartSummary {
  onHand: number;
  reserved: number;
  reorderPoint: number;
  /** on hand − reserved; negative is a shortage. */
  available: number;
  /** Reserved beyond what is on hand. */
  shortage: number;
  /** Requested or on the way from other shops. */
  incoming: number;
  belowReorderPoint: boolean;
  source: SourceSuggestion | null;
  /** The owner's hazard tags on this part (shown on every job line that uses it). */
  hazards: Hazard[];
}

export async function listStock(actor: Actor, query: { shopId: string; kind?: 'pad' | 'other'; attention?: boolean; q?: string }) {
  const shop = await shopInNetwork(actor.networkId, query.shopId);
  assertCan(actor.ability, 'read', 'Stock', { shopId: shop.id });
  const rows = await sequelize.query<{
    id: string; sku: string; name: string; kind: 'pad' | 'other'; pad_kind: PadKind | null; diameter_mm: string | null; thickness_mm: string | null;
    unit_price_cents: number; on_hand: number | null; reserved: number | null; reorder_point: number | null; incoming: number;
    hazards: Hazard[];
  }>(
    `select p.id, p.sku, p.name, p.kind, p.pad_kind, p.diameter_mm, p.thickness_mm, p.unit_price_cents, p.hazards,
            sl.on_hand, sl.reserved, sl.reorder_point,
            coalesce((select sum(pt.quantity) from part_transfers pt
                       where pt.network_id = p.network_id and pt.part_id = p.id and pt.to_shop_id = :shopId
                         and pt.state in ('requested', 'sent')), 0)::int as incoming
       from parts p
       left join stock_levels sl on sl.network_id = p.network_id and sl.part_id = p.id and sl.shop_id = :shopId
      where p.network_id = :networkId
        and (cast(:kind as text) is null or p.kind = :kind)
        and (cast(:q as text) is null or p.sku ilike :like or p.name ilike :like)
      order by p.kind desc, p.pad_kind nulls last, p.diameter_mm nulls last, p.sku`,
    {
      type: QueryTypes.SELECT,
      replacements: {
        networkId: actor.networkId, shopId: shop.id, kind: query.kind ?? null,
        q: query.q ? query.q : null, like: `%${(query.q ?? '').replace(/[\\%_]/g, (c) => `\\${c}`)}%`,
      },
    },
  );
  let stock: StockRow[] = rows.map((r) => {
    const onHand = r.on_hand ?? 0;
    const reserved = r.reserved ?? 0;
    const reorderPoint = r.reorder_point ?? 0;
    return {
      partId: r.id, sku: r.sku, name: r.name, kind: r.kind, padKind: r.pad_kind,
      diameterMm: r.diameter_mm == null ? null : Number(r.diameter_mm),
      thicknessMm: r.thickness_mm == null ? null : Number(r.thickness_mm),
      unitPriceCents: r.unit_price_cents,
      onHand, reserved, reorderPoint,
      available: onHand - reserved,
      shortage: Math.max(0, reserved - onHand),
      incoming: Number(r.incoming),
      belowReorderPoint: reorderPoint > 0 && onHand - reserved <= reorderPoint,
      source: null,
      hazards: normaliseHazards(r.hazards ?? []),
    };
  });
  if (query.attention) stock = stock.filter((r) => r.shortage > 0 || r.belowReorderPoint);
  const needs = new Map(stock.filter((r) => r.shortage - r.incoming > 0).map((r) => [r.partId, r.shortage - r.incoming]));
  const sources = await nearestSources(actor.networkId, shop.id, needs);
  for (const row of stock) row.source = sources.get(row.partId) ?? null;
  return {
    shop: { id: shop.id, name: shop.name },
    rows: stock,
    totals: {
      parts: stock.length,
      short: stock.filter((r) => r.shortage > 0).length,
      belowReorderPoint: stock.filter((r) => r.belowReorderPoint).length,
    },
    transfers: await partTransfersOf(actor.networkId, shop.id),
    can: {
      update: actor.ability.can('update', subjectOf(shop.id)),
      pack: actor.ability.can('pack', subjectOf(shop.id)),
      request: actor.ability.can('request', subjectOf(shop.id)),
      receive: actor.ability.can('receive', subjectOf(shop.id)),
      // parts are the network's, like the service catalog: their hazard tags are the owner's to set
      setHazards: actor.ability.can('update', 'ServiceCatalog'),
    },
  };
}

/** The owner tags a part with the hazards of using it (pad cement: adhesive and heat). */
export async function setPartHazards(actor: Actor, partId: string, hazards: Hazard[]) {
  const part = await Part.findOne({ where: { networkId: actor.networkId, id: partId } });
  if (!part) throw notFound('That part');
  assertCan(actor.ability, 'update', 'ServiceCatalog', undefined, 'Only the owner sets the hazards of parts.');
  await part.update({ hazards: normaliseHazards(hazards) });
  return { part: { id: part.id, sku: part.sku, name: part.name, hazards: part.hazards, cautions: cautionsFor(part.hazards) } };
}

const subjectOf = (shopId: string) => subject('Stock', { shopId }) as never;

export async function adjustStock(actor: Actor, shopId: string, partId: string, input: { onHand?: number; reorderPoint?: number }) {
  const shop = await shopInNetwork(actor.networkId, shopId);
  assertCan(actor.ability, 'read', 'Stock', { shopId: shop.id });
  assertCan(actor.ability, 'update', 'Stock', { shopId: shop.id }, 'Only a manager of this shop can change its counts.');
  const part = await Part.findOne({ where: { networkId: actor.networkId, id: partId } });
  if (!part) throw notFound('That part');
  await sequelize.transaction(async (transaction) => {
    const [level] = await StockLevel.findOrCreate({
      where: { networkId: actor.networkId, shopId: shop.id, partId: part.id },
      defaults: { networkId: actor.networkId, shopId: shop.id, partId: part.id, onHand: 0, reserved: 0, reorderPoint: 0 },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    await StockLevel.update(
      { ...(input.onHand != null ? { onHand: input.onHand } : {}), ...(input.reorderPoint != null ? { reorderPoint: input.reorderPoint } : {}) },
      { where: { networkId: actor.networkId, shopId: shop.id, partId: part.id }, transaction },
    );
    return level;
  });
  const fresh = await StockLevel.findOne({ where: { networkId: actor.networkId, shopId: shop.id, partId: part.id } });
  return { partId: part.id, shopId: shop.id, onHand: fresh!.onHand, reserved: fresh!.reserved, reorderPoint: fresh!.reorderPoint };
}

// ---------------------------------------------------------------------------------------------
// Parts between shops

export interface PartTransferView {
  id: string;
  state: PartTransferState;
  quantity: number;
  part: PartSummary;
  fromShop: { id: string; name: string };
  toShop: { id: string; name: string };
  jobId: string | null;
  jobNumber: number | null;
  relayRun: boolean;
  note: string | null;
  requestedAt: Date;
  sentAt: Date | null;
  receivedAt: Date | null;
}

async function viewsOf(networkId: string, transfers: PartTransfer[]): Promise<PartTransferView[]> {
  if (!transfers.length) return [];
  const shops = new Map((await Shop.findAll({ where: { networkId }, attributes: ['id', 'name'] })).map((s) => [s.id, s.name]));
  const jobIds = [...new Set(transfers.map((t) => t.jobId).filter((id): id is string => !!id))];
  const jobs = jobIds.length ? new Map((await Job.findAll({ where: { networkId, id: { [Op.in]: jobIds } }, attributes: ['id', 'number'] })).map((j) => [j.id, j.number])) : new Map<string, number>();
  return transfers.map((t) => ({
    id: t.id,
    state: t.state,
    quantity: t.quantity,
    part: summaryOf(t.part!),
    fromShop: { id: t.fromShopId, name: shops.get(t.fromShopId) ?? '' },
    toShop: { id: t.toShopId, name: shops.get(t.toShopId) ?? '' },
    jobId: t.jobId ?? null,
    jobNumber: t.jobId ? (jobs.get(t.jobId) ?? null) : null,
    relayRun: t.relayRunId != null,
    note: t.note ?? null,
    requestedAt: t.requestedAt,
    sentAt: t.sentAt ?? null,
    receivedAt: t.receivedAt ?? null,
  }));
}

/** Open and recent part transfers into and out of a shop. */
export async function partTransfersOf(networkId: string, shopId: string) {
  const since = new Date(Date.now() - 30 * 24 * 3_600_000);
  const rows = await PartTransfer.findAll({
    where: {
      networkId,
      [Op.and]: [
        { [Op.or]: [{ toShopId: shopId }, { fromShopId: shopId }] },
        { [Op.or]: [{ state: { [Op.in]: ['requested', 'sent'] } }, { updatedAt: { [Op.gte]: since } }] },
      ],
    },
    include: [{ model: Part, as: 'part', required: true, where: { networkId } }],
    order: [['requestedAt', 'DESC']],
    limit: 200,
  });
  const views = await viewsOf(networkId, rows);
  return { incoming: views.filter((v) => v.toShop.id === shopId), outgoing: views.filter((v) => v.fromShop.id === shopId) };
}

export async function requestPartTransfer(
  actor: Actor,
  input: { partId: string; fromShopId: string; toShopId: string; quantity: number; jobId?: string | null; note?: string | null },
) {
  if (input.fromShopId === input.toShopId) throw badRequest('Pick another shop to send the parts.', { fromShopId: 'Pick a shop other than the one that is short.' });
  const [from, to] = await Promise.all([shopInNetwork(actor.networkId, input.fromShopId), shopInNetwork(actor.networkId, input.toShopId)]);
  assertCan(actor.ability, 'request', 'Stock', { shopId: to.id }, 'Only staff of the shop that is short can ask for parts.');
  const part = await Part.findOne({ where: { networkId: actor.networkId, id: input.partId } });
  if (!part) throw notFound('That part');
  if (input.jobId) {
    const job = await Job.findOne({ where: { networkId: actor.networkId, id: input.jobId } });
    if (!job) throw notFound('That job');
    if (job.shopId !== to.id) throw badRequest('The job is at another shop.', { jobId: 'The job is not at the shop asking for parts.' });
  }
  const run = await RelayRun.findOne({ where: { networkId: actor.networkId, fromShopId: from.id, toShopId: to.id, active: true } });
  const transfer = await sequelize.transaction(async (transaction) => {
    const existing = await PartTransfer.findOne({
      where: { networkId: actor.networkId, partId: part.id, fromShopId: from.id, toShopId: to.id, jobId: input.jobId ?? null, state: { [Op.in]: ['requested', 'sent'] } },
      transaction,
      lock: transaction.LOCK.UPDATE,
    });
    // asking twice (a double click, two tabs) finds the first request instead of doubling it
    if (existing) return { row: existing, created: false };
    const row = await PartTransfer.create(
      {
        networkId: actor.networkId, partId: part.id, fromShopId: from.id, toShopId: to.id, jobId: input.jobId ?? null,
        quantity: input.quantity, relayRunId: run?.id ?? null, note: input.note ?? null, requestedByUserId: actor.id,
      },
      { transaction },
    );
    return { row, created: true };
  });
  const full = await PartTransfer.findOne({ where: { networkId: actor.networkId, id: transfer.row.id }, include: [{ model: Part, as: 'part' }] });
  return { transfer: (await viewsOf(actor.networkId, [full!]))[0], created: transfer.created };
}

async function loadTransfer(actor: Actor, id: string, transaction: Transaction) {
  const row = await PartTransfer.findOne({ where: { networkId: actor.networkId, id }, transaction, lock: transaction.LOCK.UPDATE });
  if (!row) throw notFound('That parts transfer');
  row.part = (await Part.findOne({ where: { networkId: actor.networkId, id: row.partId }, transaction }))!;
  const canSee =
    actor.ability.can('read', subjectOf(row.fromShopId)) || actor.ability.can('read', subjectOf(row.toShopId));
  if (!canSee) throw notFound('That parts transfer');
  return row;
}

/** The supplying shop packs the parts for the relay run: they leave its shelf now. */
export async function sendPartTransfer(actor: Actor, id: string) {
  const row = await sequelize.transaction(async (transaction) => {
    const t = await loadTransfer(actor, id, transaction);
    assertCan(actor.ability, 'pack', 'Stock', { shopId: t.fromShopId }, 'Only a manager of the sending shop can send these parts.');
    if (t.state !== 'requested') throw conflict(`This request is already ${t.state}.`);
    const ok = await shiftOnHand(actor.networkId, t.fromShopId, t.partId, -t.quantity, transaction);
    if (!ok) throw conflict('The sending shop does not have that many on hand.');
    await t.update({ state: 'sent', sentAt: new Date(), sentByUserId: actor.id }, { transaction });
    return t;
  });
  return (await viewsOf(actor.networkId, [row]))[0];
}

/** The shop that was short takes the parts in: they go on its shelf. */
export async function receivePartTransfer(actor: Actor, id: string) {
  const row = await sequelize.transaction(async (transaction) => {
    const t = await loadTransfer(actor, id, transaction);
    assertCan(actor.ability, 'receive', 'Stock', { shopId: t.toShopId }, 'Only staff of the receiving shop can take these parts in.');
    if (t.state !== 'sent') throw conflict(t.state === 'requested' ? 'These parts have not been sent yet.' : `This request is already ${t.state}.`);
    await shiftOnHand(actor.networkId, t.toShopId, t.partId, t.quantity, transaction);
    await t.update({ state: 'received', receivedAt: new Date(), receivedByUserId: actor.id }, { transaction });
    return t;
  });
  return (await viewsOf(actor.networkId, [row]))[0];
}

export async function cancelPartTransfer(actor: Actor, id: string) {
  const row = await sequelize.transaction(async (transaction) => {
    const t = await loadTransfer(actor, id, transaction);
    const may = actor.ability.can('request', subjectOf(t.toShopId)) || actor.ability.can('pack', subjectOf(t.fromShopId));
    if (!may) throw forbidden('Only the shops involved can cancel this request.');
    if (t.state !== 'requested') throw conflict('Only a request that has not been sent can be cancelled.');
    await t.update({ state: 'cancelled', cancelledAt: new Date(), cancelledByUserId: actor.id }, { transaction });
    return t;
  });
  return (await viewsOf(actor.networkId, [row]))[0];
}
