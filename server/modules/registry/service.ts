import { randomInt } from 'node:crypto';
import { subject as asSubject } from '@casl/ability';
import { QueryTypes, Utils, type Transaction, type WhereOptions } from 'sequelize';
import Papa from 'papaparse';
import { sequelize } from '../../lib/db.js';
import { Customer, HistoryEvent, Instrument, Shop } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { AppError, badRequest, forbidden, notFound, zodFields } from '../../lib/errors.js';
import { findJobOpenedBy, openJob } from '../jobs/index.js';
import { INSTRUMENT_FAMILY_LABELS, OPEN_JOB_STAGES, type InstrumentFamily, type JobStage, type OwnerKind } from '../../../shared/domain.js';
import { normalizeMaker, normalizeSerial } from '../../../shared/serial.js';
import { osaDistance, singleEditVariants } from '../../../shared/serial-distance.js';
import {
  INSTRUMENT_STATUS_LABELS,
  importRowSchema,
  newInstrumentSchema,
  timelineFilterOf,
  type CustomerKind,
  type ImportRowResult,
  type InstrumentSearch,
  type InstrumentStatus,
  type MatchKind,
  type TimelineFilter,
  customerInputSchema,
  intakeSchema,
  importBatchSchema,
  HELD_ELSEWHERE_MESSAGE,
} from '../../../shared/schemas/registry.js';
import type { CustomerView, ImportBatchResult, InstrumentHit, IntakeResult, TimelineItem } from '../../../shared/registry.js';

export type { CustomerView, ImportBatchResult, InstrumentHit, IntakeResult, TimelineItem };
import type { z } from 'zod';
import { cautionsFor, isHeavyCase } from '../../../shared/safety/hazards.js';

// ---------------------------------------------------------------------------------------------
// Permissions as SQL

/**
 * The read rule for instruments as a SQL condition on alias `i`, for the hand-written search query.
 * Sequelize builds it from the same `accessibleWhere` every list uses (field names mapped, values
 * escaped), so the raw query cannot drift from the rules. `''` means no restriction.
 */
function instrumentReadCondition(actor: Actor): string {
  const where = accessibleWhere(actor.ability, 'read', 'Instrument');
  if (!where) throw forbidden('You cannot search the registry.');
  return whereToSql(where, 'i', Instrument);
}

function whereToSql(where: WhereOptions, alias: string, model: typeof Instrument | typeof Customer): string {
  // Utils.mapWhereFieldNames and getWhereConditions are what Model.findAll uses internally.
  const mapped = (Utils as unknown as { mapWhereFieldNames(w: WhereOptions, m: unknown): WhereOptions }).mapWhereFieldNames(where, model);
  const generator = (sequelize.getQueryInterface() as unknown as {
    queryGenerator: { getWhereConditions(w: WhereOptions, table: string, m: unknown): string };
  }).queryGenerator;
  return generator.getWhereConditions(mapped, alias, model) ?? '';
}

/** Shops whose customers the person may look up: those where a rule lets them read a customer. */
async function customerShops(actor: Actor, transaction?: Transaction): Promise<string[]> {
  const shops = await Shop.findAll({ where: { networkId: actor.networkId }, attributes: ['id'], transaction });
  return shops.map((s) => s.id).filter((id) => actor.ability.can('read', asSubject('Customer', { homeShopId: id }) as never));
}

// ---------------------------------------------------------------------------------------------
// Customer privacy

interface CustomerRow {
  id: string;
  kind: CustomerKind;
  name: string;
  contactName: string | null;
  email: string | null;
  phone: string | null;
  address: string | null;
  notes: string | null;
  homeShopId: string | null;
}

/** Whoever looks: a signed-in person (`Actor`), or a notice's recipient with the ability built for them. */
export type CustomerViewer = Pick<Actor, 'ability'>;

/** The fields the privacy rule reads; any customer row or join result can supply them. */
export interface CustomerRef {
  id: string;
  kind: CustomerKind;
  name: string;
  homeShopId: string | null;
}

/**
 * Whether a person may see a customer's contact details: the owner; staff and managers of a shop that
 * served the customer (a job of theirs at that shop, or the shop that registered them). The rules in
 * shared/auth/ability.ts name that shop `homeShopId`, so each serving shop is checked as if it were the
 * home shop. Work history never depends on this; only the contact fields do.
 */
export function maySeeContact(viewer: CustomerViewer, customer: CustomerRef, servedShopIds: Iterable<string>): boolean {
  const shops = new Set<string | null>([customer.homeShopId, ...servedShopIds]);
  for (const shopId of shops) {
    if (viewer.ability.can('read', asSubject('CustomerContact', { ...customer, homeShopId: shopId }) as never)) return true;
  }
  return false;
}

/**
 * THE rule for a customer's name, used by every answer that carries one (job board and page, reports and
 * their CSVs, invoices, the registry, notices and e-mails): a school or the fleet is an institution and
 * shows its name; a private person's name is personal data like their contact, so it leaves only to those
 * who may see that contact (`maySeeContact`). `null` means hidden: JSON carries null, files and e-mails
 * write PRIVATE_CUSTOMER_LABEL.
 */
export function visibleCustomerName(viewer: CustomerViewer, customer: CustomerRef, servedShopIds: Iterable<string>): string | null {
  if (customer.kind !== 'person') return customer.name;
  return maySeeContact(viewer, customer, servedShopIds) ? customer.name : null;
}

/**
 * `visibleCustomerName` for many customers at once (a list, a report): the shops that served each private
 * customer are read in one query. Keyed by customer id.
 */
export async function visibleCustomerNames(
  viewer: CustomerViewer & { networkId: string }, customers: Iterable<CustomerRef | null | undefined>, transaction?: Transaction,
): Promise<Map<string, string | null>> {
  const byId = new Map<string, CustomerRef>();
  for (const c of customers) if (c) byId.set(c.id, c);
  const people = [...byId.values()].filter((c) => c.kind === 'person').map((c) => c.id);
  const served = await servedShopsOf(viewer.networkId, people, transaction);
  return new Map([...byId.values()].map((c) => [c.id, visibleCustomerName(viewer, c, served.get(c.id) ?? [])]));
}

/** A customer as the viewer may see them (name and contact through the rules above), by id; null when none. */
export async function customerViewById(actor: Actor, customerId: string | null, transaction?: Transaction): Promise<CustomerView | null> {
  if (!customerId) return null;
  const c = await Customer.findOne({ where: { networkId: actor.networkId, id: customerId }, transaction });
  if (!c) return null;
  const served = await servedShopsOf(actor.networkId, [c.id], transaction);
  return customerView(actor, c.get({ plain: true }), served.get(c.id) ?? []);
}

async function servedShopsOf(networkId: string, customerIds: string[], transaction?: Transaction): Promise<Map<string, string[]>> {
  if (!customerIds.length) return new Map();
  const rows = await sequelize.query<{ customer_id: string; shops: string[] }>(
    `select customer_id, array_agg(distinct shop_id)::text[] as shops
       from jobs where network_id = :networkId and customer_id in (:customerIds)
      group by customer_id`,
    { replacements: { networkId, customerIds }, type: QueryTypes.SELECT, transaction },
  );
  return new Map(rows.map((r) => [r.customer_id, r.shops]));
}


/** The one place a customer is serialised: contact fields leave the server only when `maySeeContact`. */
function customerView(actor: CustomerViewer, c: CustomerRow, served: string[]): CustomerView {
  const contactVisible = maySeeContact(actor, c, served);
  return {
    id: c.id,
    kind: c.kind,
    name: visibleCustomerName(actor, c, served),
    contactVisible,
    contact: contactVisible
      ? { contactName: c.contactName, email: c.email, phone: c.phone, address: c.address, notes: c.notes }
      : null,
    homeShopId: c.homeShopId,
  };
}

// ---------------------------------------------------------------------------------------------
// Serial search

/**
 * Trigram similarity needed for a near miss, by the length of the normalised query. One wrong character
 * in the middle of a serial of n characters leaves (n-2) of its n+1 trigrams, a similarity of
 * (n-2)/(n+4): 0.4 at 6 characters, 0.45 at 7, 0.57 at 10. Shorter text is still being typed; the
 * prefix and fragment kinds answer it, and a near miss of four letters would match half the registry.
 * Worked from pg_trgm's documented trigram counting (two spaces before, one after each word); the 6-character
 * minimum is common practice for fuzzy lookups (shorter strings have too few trigrams to tell apart).
 */
export function similarityThreshold(length: number): number | null {
  if (length < 6) return null;
  if (length === 6) return 0.4;
  return 0.45;
}

/** Serials this long or longer get near misses (one edit away, and trigram look-alikes); shorter ones match too much. */
const NEAR_MISS_MIN_LENGTH = 6;

/** Trigram look-alikes are the fallback: when the literal kinds found this many, or any exact hit, they are enough (a working choice, invented). */
const ENOUGH_LITERAL_HITS = 3;


interface HitRow {
  id: string; family: InstrumentFamily; maker: string; model: string | null; serial: string; serial_normalized: string;
  asset_tag: string | null; status: InstrumentStatus; current_shop_id: string; current_shop_name: string;
  job_id: string | null; job_number: number | null; job_stage: JobStage | null; job_shop_id: string | null; job_shop_name: string | null;
  tier: number | null; score: number | null;
}

// tier 4: one edit away; tier 5: trigram look-alikes further off. Both are near misses to the person searching.
const TIER_MATCH: MatchKind[] = ['exact', 'asset_tag', 'prefix', 'contains', 'similar', 'similar'];
const escapeLike = (s: string) => s.replace(/[\\%_]/g, '\\$&');

const HIT_COLUMNS = `
  i.id, i.family, i.maker, i.model, i.serial, i.serial_normalized, i.asset_tag, i.status, i.current_shop_id,
  cs.name as current_shop_name,
  oj.id as job_id, oj.number as job_number, oj.stage as job_stage, oj.shop_id as job_shop_id, ojs.name as job_shop_name`;
const HIT_JOINS = `
  join shops cs on cs.network_id = i.network_id and cs.id = i.current_shop_id
  left join lateral (
    select j.id, j.number, j.stage, j.shop_id from jobs j
     where j.network_id = i.network_id and j.instrument_id = i.id and j.stage in (${OPEN_JOB_STAGES.map((s) => `'${s}'`).join(', ')})
     order by j.opened_at desc limit 1
  ) oj on true
  left join shops ojs on ojs.network_id = i.network_id and ojs.id = oj.shop_id`;

/**
 * Finds instruments by serial (or asset tag) across the whole network, ranked: exact normalised
 * serial, asset tag, serial prefix, serial containing the text, then near misses by trigram similarity.
 *
 * Written as a UNION of small queries, each with its own LIMIT, because each kind is served by a
 * different index: exact and prefix by the btree on (network_id, serial_normalized text_pattern_ops),
 * asset tags by their unique index, fragments and near misses by the GIN trigram index. One combined
 * WHERE with ORs would be planned as a scan of the network's rows. Near misses are asked for only
 * when the literal kinds found next to nothing: short or common trigrams make the similarity scan
 * recheck many rows, and while someone is still typing a prefix the literal kinds are what they want.
 * With no text, filters list in serial order. See server/bench/serial-search.ts and BENCHMARKS.md.
 */
export async function searchInstruments(actor: Actor, input: InstrumentSearch, maxRows?: number): Promise<InstrumentHit[]> {
  const literal = buildSearchQuery(actor, input, maxRows, { nearMisses: false });
  const first = rankNearMisses(input.q, (await sequelize.query<HitRow>(literal.sql, { replacements: literal.replacements, type: QueryTypes.SELECT })).map(toHit));
  const exact = first.some((h) => h.match === 'exact' || h.match === 'asset_tag');
  const fuzzy = buildSearchQuery(actor, input, maxRows, { nearMisses: true });
  if (exact || first.length >= ENOUGH_LITERAL_HITS || !fuzzy.threshold) return first;
  // `%` reads its threshold from a setting; set_config(..., true) keeps it to this transaction.
  const rows = await sequelize.transaction(async (transaction) => {
    await sequelize.query(`select set_config('pg_trgm.similarity_threshold', :threshold, true)`, {
      replacements: { threshold: String(fuzzy.threshold) }, type: QueryTypes.SELECT, transaction,
    });
    return sequelize.query<HitRow>(fuzzy.sql, { replacements: fuzzy.replacements, type: QueryTypes.SELECT, transaction });
  });
  return rankNearMisses(input.q, rows.map(toHit));
}

/**
 * Near misses ordered by edits from what was typed (optimal string alignment: a swapped pair is one edit),
 * then by trigram similarity; the literal kinds (exact, tag, prefix, contains) keep their order ahead of them.
 */
function rankNearMisses(typed: string, hits: InstrumentHit[]): InstrumentHit[] {
  const q = normalizeSerial(typed);
  const edits = new Map(hits.filter((h) => h.match === 'similar').map((h) => [h.id, osaDistance(q, h.serialNormalized)]));
  const literal = hits.filter((h) => h.match !== 'similar');
  const similar = hits
    .filter((h) => h.match === 'similar')
    .sort((a, b) => edits.get(a.id)! - edits.get(b.id)! || b.score - a.score || a.serialNormalized.localeCompare(b.serialNormalized));
  return [...literal, ...similar];
}

/** The search as SQL (exported for the benchmark, which EXPLAINs it). */
export function buildSearchQuery(actor: Actor, input: InstrumentSearch, maxRows?: number, options = { nearMisses: true }) {
  const readCondition = instrumentReadCondition(actor);
  const limit = maxRows ?? input.limit;
  const raw = input.q.trim();
  const q = normalizeSerial(raw);
  const replacements: Record<string, unknown> = {
    networkId: actor.networkId, limit, q, prefix: `${escapeLike(q)}%`, contains: `%${escapeLike(q)}%`,
    tag: raw.toUpperCase(), family: input.family, shopId: input.shopId, ownerCustomerId: input.ownerCustomerId, status: input.status,
  };
  const filters = [
    input.family ? 'i.family = :family' : '',
    input.shopId ? 'i.current_shop_id = :shopId' : '',
    input.ownerCustomerId ? 'i.owner_customer_id = :ownerCustomerId' : '',
    input.status ? 'i.status = :status' : '',
    readCondition ? `(${readCondition})` : '',
  ].filter(Boolean);
  const and = filters.map((f) => ` and ${f}`).join('');

  if (!q && !raw) {
    const sql = `select ${HIT_COLUMNS}, null::int as tier, null::real as score
         from instruments i ${HIT_JOINS}
        where i.network_id = :networkId${and}
        order by i.serial_normalized, i.maker_normalized
        limit :limit`;
    return { sql, replacements, threshold: null };
  }

  const threshold = options.nearMisses ? similarityThreshold(q.length) : null;
  // one edit away (swap of neighbours, a character changed, dropped or added): exact lookups in the serial index,
  // always run for 6+ characters since they are cheap and a swap keeps too few trigrams for the `%` branch
  const variants = q.length >= NEAR_MISS_MIN_LENGTH ? singleEditVariants(q) : [];
  if (variants.length) replacements.variants = variants;
  const branches = [
    q ? `(select i.id, 0 as tier from instruments i where i.network_id = :networkId and i.serial_normalized = :q${and} limit :limit)` : '',
    raw ? `(select i.id, 1 from instruments i where i.network_id = :networkId and i.asset_tag = :tag${and} limit 1)` : '',
    q ? `(select i.id, 2 from instruments i where i.network_id = :networkId and i.serial_normalized like :prefix and i.serial_normalized <> :q${and}
           order by i.serial_normalized limit :limit)` : '',
    q.length >= 3 ? `(select i.id, 3 from instruments i where i.network_id = :networkId and i.serial_normalized like :contains
           and i.serial_normalized not like :prefix${and} limit :limit)` : '',
    variants.length ? `(select i.id, 4 from instruments i where i.network_id = :networkId and i.serial_normalized in (:variants)${and}
           limit :limit)` : '',
    threshold ? `(select i.id, 5 from instruments i where i.network_id = :networkId and i.serial_normalized % :q${and}
           order by i.serial_normalized <-> :q limit :limit)` : '',
  ].filter(Boolean);

  const sql = `
    with hits as (${branches.join('\n union all ')}),
    best as (select id, min(tier) as tier from hits group by id)
    select ${HIT_COLUMNS}, b.tier, similarity(i.serial_normalized, :q) as score
      from best b
      join instruments i on i.network_id = :networkId and i.id = b.id
      ${HIT_JOINS}
     order by b.tier, score desc, i.serial_normalized, i.maker_normalized
     limit :limit`;
  return { sql, replacements, threshold };
}

function toHit(r: HitRow): InstrumentHit {
  return {
    id: r.id, family: r.family, maker: r.maker, model: r.model, serial: r.serial, serialNormalized: r.serial_normalized,
    assetTag: r.asset_tag, status: r.status,
    currentShop: { id: r.current_shop_id, name: r.current_shop_name },
    openJob: r.job_id
      ? { id: r.job_id, number: Number(r.job_number), stage: r.job_stage as JobStage, shopId: r.job_shop_id as string, shopName: r.job_shop_name ?? '' }
      : null,
    match: r.tier == null ? null : TIER_MATCH[r.tier],
    score: r.score == null ? 0 : Number(r.score),
  };
}

/** Spreadsheet programs run cells that start like a formula; a leading apostrophe keeps them text. */
function csvCell(value: string | number | null | undefined): string {
  if (value == null) return '';
  const s = String(value);
  return /^[=+\-@\t\r]/.test(s) ? `'${s}` : s;
}

export const EXPORT_MAX_ROWS = 10_000;

/** The rows of a search as CSV, in the columns the fleet import reads back. */
export async function exportInstrumentsCsv(actor: Actor, input: InstrumentSearch): Promise<string> {
  const hits = await searchInstruments(actor, input, input.q.trim() ? 1_000 : EXPORT_MAX_ROWS);
  return Papa.unparse({
    fields: ['Serial number', 'Maker', 'Model', 'Family', 'Asset tag', 'Status', 'Current shop', 'Open job', 'Job stage'],
    data: hits.map((h) => [
      csvCell(h.serial), csvCell(h.maker), csvCell(h.model), INSTRUMENT_FAMILY_LABELS[h.family], csvCell(h.assetTag),
      INSTRUMENT_STATUS_LABELS[h.status], csvCell(h.currentShop.name), h.openJob ? h.openJob.number : '', h.openJob ? h.openJob.stage : '',
    ]),
  });
}

/** Before registering: is this serial known under this maker (a duplicate) or under other makers (a warning)? */
export async function checkSerial(actor: Actor, input: { serial: string; maker: string }) {
  const readCondition = instrumentReadCondition(actor);
  const rows = await sequelize.query<HitRow & { maker_normalized: string }>(
    `select ${HIT_COLUMNS}, i.maker_normalized, 0 as tier, 1.0 as score
       from instruments i ${HIT_JOINS}
      where i.network_id = :networkId and i.serial_normalized = :q${readCondition ? ` and (${readCondition})` : ''}
      order by i.maker_normalized limit 20`,
    { replacements: { networkId: actor.networkId, q: normalizeSerial(input.serial) }, type: QueryTypes.SELECT },
  );
  const maker = normalizeMaker(input.maker);
  const same = rows.find((r) => maker && r.maker_normalized === maker);
  return {
    serialNormalized: normalizeSerial(input.serial),
    sameMaker: same ? toHit(same) : null,
    otherMakers: rows.filter((r) => r !== same).map(toHit),
  };
}

// ---------------------------------------------------------------------------------------------
// The instrument page

async function loadReadableInstrument(actor: Actor, id: string, transaction?: Transaction): Promise<Instrument> {
  const instrument = await Instrument.findOne({ where: { networkId: actor.networkId, id }, transaction });
  if (!instrument) throw notFound('That instrument');
  assertCan(actor.ability, 'read', 'Instrument', instrument.get({ plain: true }), 'You cannot see this instrument.');
  return instrument;
}

export async function getInstrument(actor: Actor, id: string) {
  const instrument = await loadReadableInstrument(actor, id);
  const networkId = actor.networkId;
  const shops = await Shop.findAll({ where: { networkId }, attributes: ['id', 'name', 'timeZone'] });
  const shopById = new Map(shops.map((s) => [s.id, s]));
  const shopRef = (shopId: string | null) => {
    const s = shopId ? shopById.get(shopId) : undefined;
    return s ? { id: s.id, name: s.name, timeZone: s.timeZone } : null;
  };

  let owner: CustomerView | null = null;
  if (instrument.ownerCustomerId) {
    const c = await Customer.findOne({ where: { networkId, id: instrument.ownerCustomerId } });
    if (c) {
      const served = await servedShopsOf(networkId, [c.id]);
      owner = customerView(actor, c.get({ plain: true }), served.get(c.id) ?? []);
    }
  }

  const jobs = await sequelize.query<{
    id: string; number: number; shop_id: string; stage: JobStage; complaint: string; promised_on: string | null;
    opened_at: Date; ready_at: Date | null; released_at: Date | null;
  }>(
    `select id, number, shop_id, stage, complaint, promised_on::text as promised_on, opened_at, ready_at, released_at
       from jobs where network_id = :networkId and instrument_id = :id order by opened_at desc`,
    { replacements: { networkId, id }, type: QueryTypes.SELECT },
  );
  const jobViews = jobs.map((j) => ({
    id: j.id, number: Number(j.number), shop: shopRef(j.shop_id), stage: j.stage, complaint: j.complaint, promisedOn: j.promised_on,
    openedAt: j.opened_at, readyAt: j.ready_at, releasedAt: j.released_at, open: j.stage !== 'released',
  }));
  const sameSerial = await checkSerial(actor, { serial: instrument.serial, maker: instrument.maker });
  // on the road it is at neither shop: say which run it is on and when it is expected
  const [onRoad] = await sequelize.query<{
    id: string; from_shop_id: string; to_shop_id: string; departed_at: Date | null; expected_arrival_at: Date | null; relay_run_id: string | null;
  }>(
    `select id, from_shop_id, to_shop_id, departed_at, expected_arrival_at, relay_run_id
       from transfers where network_id = :networkId and instrument_id = :id and state = 'in_transit' limit 1`,
    { replacements: { networkId, id }, type: QueryTypes.SELECT },
  );

  return {
    instrument: {
      id: instrument.id, family: instrument.family, maker: instrument.maker, model: instrument.model, serial: instrument.serial,
      serialNormalized: instrument.serialNormalized, assetTag: instrument.assetTag, status: instrument.status,
      yearMade: instrument.yearMade, notes: instrument.notes, ownerKind: instrument.ownerKind,
      currentShop: shopRef(instrument.currentShopId), createdAt: instrument.createdAt,
      heavyCaseFlag: instrument.heavyCase, heavyCase: isHeavyCase(instrument.family, instrument.heavyCase),
      canUpdate: actor.ability.can('update', asSubject('Instrument', { currentShopId: instrument.currentShopId }) as never),
    },
    owner,
    openJob: jobViews.find((j) => j.open) ?? null,
    jobs: jobViews,
    otherMakers: sameSerial.otherMakers,
    onRoad: onRoad
      ? {
          transferId: onRoad.id, fromShop: shopRef(onRoad.from_shop_id), toShop: shopRef(onRoad.to_shop_id),
          departedAt: onRoad.departed_at, expectedArrivalAt: onRoad.expected_arrival_at, onRelayRun: !!onRoad.relay_run_id,
        }
      : null,
  };
}


/**
 * The desk marks an instrument that travels in a heavy case whatever its family, so intake, hand-back and
 * transfers show the lifting caution for it. Written to the timeline, as every change to an instrument is.
 */
export async function setHeavyCase(actor: Actor, id: string, heavyCase: boolean) {
  await sequelize.transaction(async (transaction) => {
    const instrument = await loadReadableInstrument(actor, id, transaction);
    assertCan(actor.ability, 'update', 'Instrument', { currentShopId: instrument.currentShopId }, 'Only the shop that holds this instrument can change it.');
    if (instrument.heavyCase === heavyCase) return;
    await instrument.update({ heavyCase }, { transaction });
    await HistoryEvent.create(
      {
        networkId: actor.networkId, instrumentId: instrument.id, shopId: instrument.currentShopId, userId: actor.id, kind: 'details_changed',
        summary: heavyCase ? 'Marked as travelling in a heavy case' : 'No longer marked as travelling in a heavy case',
        data: { changes: { heavyCase: { from: !heavyCase, to: heavyCase } } },
      },
      { transaction },
    );
  });
  return getInstrument(actor, id);
}

export const TIMELINE_MAX = 1_000;

/**
 * One timeline across every shop, newest first: the history events, plus photos, documents and pad maps
 * from their own tables. Whoever may read the instrument sees all of it; no customer contact is in it.
 */
export async function getTimeline(actor: Actor, id: string, filters?: TimelineFilter[]): Promise<TimelineItem[]> {
  await loadReadableInstrument(actor, id);
  const rows = await sequelize.query<{
    source: TimelineItem['source']; id: string; kind: string; at: Date; summary: string; data: Record<string, unknown>;
    shop_id: string | null; shop_name: string | null; shop_time_zone: string | null; person: string | null;
    job_id: string | null; job_number: number | null;
  }>(
    `with items as (
       select 'history' as source, h.id, h.kind, h.occurred_at as at, h.summary, h.data, h.shop_id, h.user_id, h.job_id
         from history_events h where h.network_id = :networkId and h.instrument_id = :id
       union all
       select 'attachment', a.id, a.kind, a.created_at, coalesce(a.caption, ''),
              jsonb_build_object('tag', a.tag, 'contentType', a.content_type, 'sizeBytes', a.size_bytes),
              a.shop_id, a.uploaded_by_user_id, a.job_id
         from attachments a where a.network_id = :networkId and a.instrument_id = :id and a.status = 'stored'
       union all
       select 'pad_map', p.id, 'pad_map', p.created_at, '',
              jsonb_build_object('keys', jsonb_array_length(p.entries), 'unitSystem', p.unit_system),
              p.shop_id, p.created_by_user_id, p.job_id
         from pad_maps p where p.network_id = :networkId and p.instrument_id = :id
     )
     select it.source, it.id, it.kind, it.at, it.summary, it.data,
            it.shop_id, s.name as shop_name, s.time_zone as shop_time_zone, u.name as person,
            it.job_id, j.number as job_number
       from items it
       left join shops s on s.network_id = :networkId and s.id = it.shop_id
       left join users u on u.network_id = :networkId and u.id = it.user_id
       left join jobs j on j.network_id = :networkId and j.id = it.job_id
      order by it.at desc, it.id
      limit ${TIMELINE_MAX}`,
    { replacements: { networkId: actor.networkId, id }, type: QueryTypes.SELECT },
  );

  // Features that record a photo or a pad map may also write a history event for it; show the row once.
  const fromTables = new Set(rows.filter((r) => r.source !== 'history').map((r) => r.id));
  const duplicate = (r: (typeof rows)[number]) =>
    r.source === 'history' &&
    [r.data?.attachmentId, r.data?.padMapId].some((ref) => typeof ref === 'string' && fromTables.has(ref));

  const wanted = filters?.length ? new Set(filters) : null;
  return rows
    .filter((r) => !duplicate(r))
    .map((r): TimelineItem => {
      const filter = timelineFilterOf(r.kind);
      return {
        id: r.id, source: r.source, kind: r.kind, filter, at: new Date(r.at).toISOString(),
        summary: r.summary || defaultSummary(r.kind, r.data),
        shop: r.shop_id ? { id: r.shop_id, name: r.shop_name ?? '', timeZone: r.shop_time_zone ?? 'UTC' } : null,
        person: r.person, job: r.job_id ? { id: r.job_id, number: Number(r.job_number) } : null,
        data: r.data ?? {},
      };
    })
    .filter((item) => !wanted || wanted.has(item.filter));
}

function defaultSummary(kind: string, data: Record<string, unknown>): string {
  if (kind === 'photo') return typeof data.tag === 'string' && data.tag ? `Photo (${data.tag})` : 'Photo';
  if (kind === 'document') return 'Document';
  if (kind === 'pad_map') return `Pad map of ${Number(data.keys ?? 0)} keys`;
  return kind.replace(/_/g, ' ');
}

// ---------------------------------------------------------------------------------------------
// Customers

interface CustomerSearchRow {
  id: string; kind: CustomerKind; name: string; contact_name: string | null; email: string | null; phone: string | null;
  address: string | null; notes: string | null; home_shop_id: string | null; served: string[] | null;
}

const rowToCustomer = (r: CustomerSearchRow): CustomerRow => ({
  id: r.id, kind: r.kind, name: r.name, contactName: r.contact_name, email: r.email, phone: r.phone, address: r.address,
  notes: r.notes, homeShopId: r.home_shop_id,
});

/** Customers of the shops the person works for (registered there or served there), by name, e-mail or phone. */
export async function searchCustomers(actor: Actor, input: { q: string; limit: number }): Promise<CustomerView[]> {
  if (!accessibleWhere(actor.ability, 'read', 'Customer')) throw forbidden('You cannot look up customers.');
  const shops = await customerShops(actor);
  if (!shops.length) return [];
  const q = input.q.trim();
  const digits = q.replace(/\D/g, '');
  const rows = await sequelize.query<CustomerSearchRow>(
    `select c.id, c.kind, c.name, c.contact_name, c.email, c.phone, c.address, c.notes, c.home_shop_id,
            (select array_agg(distinct j.shop_id)::text[] from jobs j where j.network_id = c.network_id and j.customer_id = c.id) as served
       from customers c
      where c.network_id = :networkId
        and (c.home_shop_id in (:shops)
             or exists (select 1 from jobs j where j.network_id = c.network_id and j.customer_id = c.id and j.shop_id in (:shops)))
        and (:q = '' or c.name ilike :like or c.name % :q or c.email ilike :like or c.contact_name ilike :like
             ${digits.length >= 4 ? `or regexp_replace(coalesce(c.phone, ''), '[^0-9]', '', 'g') like :digits` : ''})
      order by (c.name ilike :startsWith) desc, similarity(c.name, :q) desc, c.name
      limit :limit`,
    {
      replacements: {
        networkId: actor.networkId, shops, q, like: `%${escapeLike(q)}%`, startsWith: `${escapeLike(q)}%`,
        digits: `%${digits}%`, limit: input.limit,
      },
      type: QueryTypes.SELECT,
    },
  );
  return rows.map((r) => customerView(actor, rowToCustomer(r), r.served ?? []));
}

async function createCustomerIn(
  actor: Actor, shopId: string, input: z.output<typeof customerInputSchema>, transaction: Transaction,
): Promise<Customer> {
  assertCan(actor.ability, 'create', 'Customer', { homeShopId: shopId }, 'You cannot add customers at this shop.');
  return Customer.create(
    {
      networkId: actor.networkId, kind: input.kind, name: input.name, contactName: input.contactName ?? null,
      email: input.email?.toLowerCase() ?? null, phone: input.phone ?? null, address: input.address ?? null,
      notes: input.notes ?? null, homeShopId: shopId,
    },
    { transaction },
  );
}

export async function createCustomer(actor: Actor, input: z.output<typeof customerInputSchema> & { shopId: string }): Promise<CustomerView> {
  return sequelize.transaction(async (transaction) => {
    const shop = await Shop.findOne({ where: { networkId: actor.networkId, id: input.shopId }, transaction });
    if (!shop) throw notFound('That shop');
    const customer = await createCustomerIn(actor, shop.id, input, transaction);
    return customerView(actor, customer.get({ plain: true }), []);
  });
}

/**
 * A customer the person may attach to a job or an instrument: one they can already look up (read on
 * `Customer` for the customer's home shop or a shop that served them, the rule of the customer search).
 * Being the owner on record of a picked instrument is not enough: a job at the person's shop makes that
 * shop a serving shop, which would open the customer's contact to it. Anyone else is "not found".
 */
async function loadUsableCustomer(actor: Actor, id: string, transaction?: Transaction): Promise<Customer> {
  const refused = () =>
    new AppError(404, 'not_found', 'That customer was not found among your shops’ customers.', {
      customer: 'Pick a customer of your shops, or add the customer here.',
    });
  const customer = await Customer.findOne({ where: { networkId: actor.networkId, id }, transaction });
  if (!customer) throw refused();
  const served = (await servedShopsOf(actor.networkId, [customer.id], transaction)).get(customer.id) ?? [];
  const shops = new Set([customer.homeShopId, ...served]);
  const usable = [...shops].some((shopId) => actor.ability.can('read', asSubject('Customer', { homeShopId: shopId }) as never));
  if (!usable) throw refused();
  return customer;
}

// ---------------------------------------------------------------------------------------------
// Registering and intake

// No 0/O or 1/I: tags are read aloud and typed from worn labels.
const TAG_ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZ23456789';
export function newAssetTag(): string {
  const pick = () => TAG_ALPHABET[randomInt(TAG_ALPHABET.length)];
  const part = () => Array.from({ length: 4 }, pick).join('');
  return `BR-${part()}-${part()}`;
}

const normaliseTag = (tag: string | undefined) => (tag ? tag.trim().toUpperCase().replace(/\s+/g, ' ') : undefined);

async function assetTagTaken(networkId: string, tag: string, exceptId: string | null, transaction?: Transaction) {
  const row = await Instrument.findOne({ where: { networkId, assetTag: tag }, attributes: ['id', 'serial', 'maker'], transaction });
  return row && row.id !== exceptId ? row : null;
}

/** The same serial under the same maker is one instrument: refuse a second registration and point at it. */
async function assertNotRegistered(actor: Actor, maker: string, serial: string, transaction?: Transaction) {
  const existing = await Instrument.findOne({
    where: { networkId: actor.networkId, makerNormalized: normalizeMaker(maker), serialNormalized: normalizeSerial(serial) },
    attributes: ['id', 'serial', 'maker'],
    transaction,
  });
  if (existing) {
    throw new AppError(409, 'already_registered', `${existing.maker} ${existing.serial} is already in the registry; pick it instead.`,
      { 'instrument.new.serial': 'This serial is already registered under this maker.' }, { instrumentId: existing.id });
  }
}


/**
 * The front desk's intake in one transaction: the instrument (picked or registered), the customer
 * (picked, the owner on record, or new), and the job. All or nothing, so a failure leaves no orphan
 * instrument or customer behind; the request key makes a double submit open one job.
 */
export async function intake(actor: Actor, input: z.output<typeof intakeSchema>): Promise<IntakeResult> {
  return sequelize.transaction(async (transaction) => {
    const t = { transaction };
    const networkId = actor.networkId;
    await sequelize.query('select pg_advisory_xact_lock(hashtext(:key))', {
      replacements: { key: `intake:${networkId}:${input.requestKey}` }, type: QueryTypes.SELECT, ...t,
    });
    const earlier = await findJobOpenedBy(actor, input.requestKey, transaction);
    if (earlier) {
      const inst = await Instrument.findOne({ where: { networkId, id: earlier.instrumentId }, ...t });
      const heavy = isHeavyCase(inst!.family, inst!.heavyCase);
      return {
        job: { id: earlier.id, number: earlier.number, stage: earlier.stage, shopId: earlier.shopId },
        instrument: { id: inst!.id, serial: inst!.serial, maker: inst!.maker, assetTag: inst!.assetTag, heavyCase: heavy },
        customerId: earlier.customerId, warnings: [], cautions: heavy ? cautionsFor(['heavy_lift']) : [], replayed: true,
      };
    }

    const shop = await Shop.findOne({ where: { networkId, id: input.shopId }, ...t });
    if (!shop) throw notFound('That shop');
    assertCan(actor.ability, 'create', 'Job', { shopId: shop.id }, `You cannot take instruments in at ${shop.name}.`);

    const warnings: string[] = [];
    let instrument: Instrument | null = null;
    let newInstrument: z.output<typeof newInstrumentSchema> | null = null;
    if ('id' in input.instrument) {
      instrument = await loadReadableInstrument(actor, input.instrument.id, transaction);
    } else {
      newInstrument = input.instrument.new;
      assertCan(actor.ability, 'create', 'Instrument', undefined, 'You cannot register instruments.');
      await assertNotRegistered(actor, newInstrument.maker, newInstrument.serial, transaction);
      const others = await checkSerial(actor, { serial: newInstrument.serial, maker: newInstrument.maker });
      for (const o of others.otherMakers) {
        warnings.push(`The serial ${o.serial} is also registered under ${o.maker} (${INSTRUMENT_FAMILY_LABELS[o.family].toLowerCase()}); check the maker.`);
      }
    }

    let customerId: string | null = null;
    if (input.customer && 'id' in input.customer) {
      customerId = (await loadUsableCustomer(actor, input.customer.id, transaction)).id;
    } else if (input.customer && 'new' in input.customer) {
      customerId = (await createCustomerIn(actor, shop.id, input.customer.new, transaction)).id;
    }

    if (newInstrument) {
      const ownerKind: OwnerKind = newInstrument.ownerKind;
      if (ownerKind !== 'rental_fleet' && !customerId) {
        throw badRequest('Some fields need attention.', { customer: 'Choose or add the owner of this instrument.' });
      }
      const tag = normaliseTag(newInstrument.assetTag);
      if (tag && (await assetTagTaken(networkId, tag, null, transaction))) {
        throw badRequest('Some fields need attention.', { 'instrument.new.assetTag': 'This asset tag is already on another instrument.' });
      }
      instrument = await Instrument.create(
        {
          networkId, family: newInstrument.family, maker: newInstrument.maker, model: newInstrument.model ?? null,
          serial: newInstrument.serial, yearMade: newInstrument.yearMade ?? null, notes: newInstrument.notes ?? null,
          assetTag: tag ?? newAssetTag(), ownerKind, ownerCustomerId: ownerKind === 'rental_fleet' ? null : customerId,
          currentShopId: shop.id, status: 'in_shop', heavyCase: newInstrument.heavyCase ?? false,
        },
        t,
      );
      await appendHistory(
        {
          networkId, instrumentId: instrument.id, jobId: null, shopId: shop.id, userId: actor.id, kind: 'registered',
          summary: `Registered at ${shop.name}`, data: { serial: instrument.serial, maker: instrument.maker },
          idempotencyKey: `registered:${instrument.id}`,
        },
        t.transaction,
      );
    }

    const job = await openJob(
      actor,
      {
        instrumentId: instrument!.id, shopId: shop.id, customerId, complaint: input.job.complaint,
        conditionNotes: input.job.conditionNotes ?? null, promisedOn: input.job.promisedOn ?? null, requestKey: input.requestKey,
      },
      transaction,
    );
    const heavy = isHeavyCase(instrument!.family, instrument!.heavyCase);
    return {
      job: { id: job.id, number: job.number, stage: job.stage, shopId: job.shopId },
      instrument: { id: instrument!.id, serial: instrument!.serial, maker: instrument!.maker, assetTag: instrument!.assetTag, heavyCase: heavy },
      customerId, warnings, cautions: heavy ? cautionsFor(['heavy_lift']) : [], replayed: false,
    };
  });
}

// ---------------------------------------------------------------------------------------------
// Fleet import


/**
 * One batch of a fleet file (the client applies the column mapping and sends a few hundred rows at a
 * time). Each row is validated with the shared schema and matched on its own by (network, maker,
 * serial), so a bad row never blocks the good ones and importing the same file again changes nothing.
 * New instruments are registered at the batch's shop. An existing instrument keeps its current shop and
 * is changed only where the person may update it there; a row naming an instrument held elsewhere is
 * reported and changes nothing. With `dryRun` (the preview) every row is checked the same way and
 * nothing is written.
 */
export async function importInstruments(actor: Actor, batch: z.output<typeof importBatchSchema>): Promise<ImportBatchResult> {
  const networkId = actor.networkId;
  const shop = await Shop.findOne({ where: { networkId, id: batch.shopId } });
  if (!shop) throw notFound('That shop');
  assertCan(actor.ability, 'create', 'Instrument', undefined, 'You cannot register instruments.');
  // importing places instruments at a shop: only someone who takes work in there may do it
  assertCan(actor.ability, 'create', 'Job', { shopId: shop.id }, `You cannot register instruments at ${shop.name}.`);
  let ownerCustomerId: string | null = null;
  if (batch.ownerCustomerId) {
    try {
      ownerCustomerId = (await loadUsableCustomer(actor, batch.ownerCustomerId)).id;
    } catch {
      throw badRequest('Some fields need attention.', { ownerCustomerId: 'Choose a school or customer of your shops.' });
    }
  }

  const shopNames = new Map((await Shop.findAll({ where: { networkId }, attributes: ['id', 'name'] })).map((s) => [s.id, s.name]));
  const context: ImportContext = { actor, shop, ownerCustomerId, ownerKind: batch.ownerKind, dryRun: batch.dryRun, shopNames };
  const results: ImportRowResult[] = [];
  const seen = new Map<string, number>();
  for (const [index, candidate] of batch.rows.entries()) {
    const rowNumber = typeof candidate.row === 'number' ? candidate.row : index + 2;
    const parsed = importRowSchema.safeParse({ ...unquoteCells(candidate), row: rowNumber });
    if (!parsed.success) {
      results.push({ row: rowNumber, outcome: 'error', errors: zodFields(parsed.error) });
      continue;
    }
    const row = parsed.data;
    const key = `${normalizeMaker(row.maker)}\u0000${normalizeSerial(row.serial)}`;
    const first = seen.get(key);
    if (first !== undefined) {
      results.push({ row: row.row, outcome: 'error', errors: { serial: `Same serial and maker as row ${first}.` } });
      continue;
    }
    seen.set(key, row.row);
    results.push(await importRow(context, row));
  }
  const counts = { created: 0, updated: 0, unchanged: 0, held_elsewhere: 0, error: 0 };
  for (const r of results) counts[r.outcome]++;
  return { results, counts, dryRun: batch.dryRun };
}

/** Undo the apostrophe our own CSV export puts before formula-like cells, so an export re-imports as it was. */
function unquoteCells(row: Record<string, unknown>): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(row)) out[k] = typeof v === 'string' && /^'[=+\-@\t\r]/.test(v) ? v.slice(1) : v;
  return out;
}

interface ImportContext {
  actor: Actor;
  shop: Shop;
  ownerCustomerId: string | null;
  ownerKind: OwnerKind;
  dryRun: boolean;
  shopNames: Map<string, string>;
}

type ImportRow = z.output<typeof importRowSchema>;

/** The fields a fleet row may change on a known instrument, with the names the history event uses. */
const IMPORT_CHANGE_FIELDS = [
  ['family', 'family'], ['model', 'model'], ['assetTag', 'asset tag'], ['yearMade', 'year made'], ['notes', 'notes'],
  ['ownerKind', 'owner kind'], ['ownerCustomerId', 'owner'],
] as const;
type ImportChangeField = (typeof IMPORT_CHANGE_FIELDS)[number][0];

/** What the row would change on the instrument: blank optional cells keep what is on record. */
function importChanges(instrument: Instrument, row: ImportRow, tag: string | undefined, ctx: ImportContext) {
  const wanted: Record<ImportChangeField, unknown> = {
    family: row.family,
    model: row.model ?? instrument.model,
    assetTag: tag ?? instrument.assetTag,
    yearMade: row.yearMade ?? instrument.yearMade,
    notes: row.notes ?? instrument.notes,
    ownerKind: ctx.ownerKind,
    ownerCustomerId: ctx.ownerCustomerId,
  };
  const changes: Partial<Record<ImportChangeField, { from: unknown; to: unknown }>> = {};
  for (const [field] of IMPORT_CHANGE_FIELDS) {
    const from = instrument[field] ?? null;
    const to = wanted[field] ?? null;
    if (from !== to) changes[field] = { from, to };
  }
  return changes;
}

const mayUpdate = (actor: Actor, instrument: Instrument) =>
  actor.ability.can('update', asSubject('Instrument', instrument.get({ plain: true }) as Record<string, unknown>));

function heldElsewhere(ctx: ImportContext, row: ImportRow, instrument: Instrument): ImportRowResult {
  const name = ctx.shopNames.get(instrument.currentShopId) ?? 'another shop';
  return {
    row: row.row, outcome: 'held_elsewhere', instrumentId: instrument.id, message: HELD_ELSEWHERE_MESSAGE,
    heldBy: { id: instrument.currentShopId, name },
  };
}

async function importRow(ctx: ImportContext, row: ImportRow, attempt = 0): Promise<ImportRowResult> {
  const { actor, shop } = ctx;
  const networkId = actor.networkId;
  const tag = normaliseTag(row.assetTag);
  const where = { networkId, makerNormalized: normalizeMaker(row.maker), serialNormalized: normalizeSerial(row.serial) };
  const existing = await Instrument.findOne({ where });
  // a shop's instruments are changed only by people who may update them there
  if (existing && !mayUpdate(actor, existing)) return heldElsewhere(ctx, row, existing);
  if (tag) {
    const holder = await assetTagTaken(networkId, tag, existing?.id ?? null);
    if (holder) return { row: row.row, outcome: 'error', errors: { assetTag: `Asset tag ${tag} is already on ${holder.maker} ${holder.serial}.` } };
  }
  try {
    if (!existing) {
      if (ctx.dryRun) return { row: row.row, outcome: 'created' };
      const created = await sequelize.transaction(async (transaction) => {
        // do nothing on a conflict: another import registered it a moment ago, and this row becomes an update
        const rows = await sequelize.query<{ id: string }>(
          `insert into instruments (network_id, family, maker, maker_normalized, model, serial, serial_normalized,
                                    owner_kind, owner_customer_id, current_shop_id, status, asset_tag, year_made, notes)
           values (:networkId, :family, :maker, :makerNormalized, :model, :serial, :serialNormalized,
                   :ownerKind, :ownerCustomerId, :shopId, 'in_service', :tag, :yearMade, :notes)
           on conflict (network_id, maker_normalized, serial_normalized) do nothing
           returning id`,
          {
            replacements: {
              ...where, family: row.family, maker: row.maker, model: row.model ?? null, serial: row.serial,
              ownerKind: ctx.ownerKind, ownerCustomerId: ctx.ownerCustomerId, shopId: shop.id, tag: tag ?? newAssetTag(),
              yearMade: row.yearMade ?? null, notes: row.notes ?? null,
            },
            type: QueryTypes.SELECT, transaction,
          },
        );
        const id = rows[0]?.id;
        if (!id) return null;
        await appendHistory(
          {
            networkId, instrumentId: id, jobId: null, shopId: shop.id, userId: actor.id, kind: 'registered',
            summary: `Registered at ${shop.name} from a fleet import`, data: { row: row.row }, idempotencyKey: `registered:${id}`,
          },
          transaction,
        );
        return id;
      });
      if (created) return { row: row.row, outcome: 'created', instrumentId: created };
      if (attempt > 0) throw new Error('fleet import: instrument neither inserted nor found');
      return importRow(ctx, row, attempt + 1);
    }

    const planned = importChanges(existing, row, tag, ctx);
    if (!Object.keys(planned).length) return { row: row.row, outcome: 'unchanged', instrumentId: existing.id };
    if (ctx.dryRun) return { row: row.row, outcome: 'updated', instrumentId: existing.id, changed: Object.keys(planned) };

    return await sequelize.transaction(async (transaction): Promise<ImportRowResult> => {
      // the row as it is now, locked: it may have moved shop or changed since it was read
      const locked = await Instrument.findOne({ where: { networkId, id: existing.id }, transaction, lock: transaction.LOCK.UPDATE });
      if (!locked) throw notFound('That instrument');
      if (!mayUpdate(actor, locked)) return heldElsewhere(ctx, row, locked);
      const changes = importChanges(locked, row, tag, ctx);
      const fields = Object.keys(changes) as ImportChangeField[];
      if (!fields.length) return { row: row.row, outcome: 'unchanged', instrumentId: locked.id };
      await locked.update(Object.fromEntries(fields.map((f) => [f, changes[f]!.to])) as Partial<Instrument>, { transaction });
      const labels = IMPORT_CHANGE_FIELDS.filter(([f]) => fields.includes(f)).map(([, label]) => label);
      await appendHistory(
        {
          networkId, instrumentId: locked.id, jobId: null, shopId: shop.id, userId: actor.id, kind: 'details_changed',
          summary: `Details changed by a fleet import at ${shop.name}: ${labels.join(', ')}`,
          data: { source: 'fleet_import', row: row.row, changes },
        },
        transaction,
      );
      return { row: row.row, outcome: 'updated', instrumentId: locked.id, changed: fields };
    });
  } catch (err) {
    const e = err as { name?: string; parent?: { constraint?: string } };
    if (e.name === 'SequelizeUniqueConstraintError' || e.parent?.constraint) {
      return { row: row.row, outcome: 'error', errors: { assetTag: 'This asset tag is already on another instrument.' } };
    }
    throw err;
  }
}


/** One entry on an instrument's work history, as modules hand it to the registry. */
export interface HistoryEntry {
  networkId: string;
  instrumentId: string;
  jobId: string | null;
  shopId: string | null;
  userId: string | null;
  kind: string;
  summary: string;
  data: Record<string, unknown>;
  /** When it happened, when that is not now (a transfer step records the time of the step). */
  occurredAt?: Date;
  /** A key that makes the entry once only (a retried queue job finds it and stops). */
  idempotencyKey?: string | null;
}

/**
 * The one way to write an instrument's work history. The registry owns the history; every module
 * (jobs, pad maps, files, transfers, the demo seed) writes to it through here, inside its own
 * transaction. tests/server/table-owners.test.ts keeps it that way.
 */
export async function appendHistory(entry: HistoryEntry, transaction?: Transaction) {
  return HistoryEvent.create(entry, { transaction });
}

/** Several entries in one statement (the demo seed, a fleet import). */
export async function appendHistoryMany(entries: readonly HistoryEntry[], transaction?: Transaction) {
  if (!entries.length) return [];
  return HistoryEvent.bulkCreate([...entries], { transaction });
}

/**
 * Where an instrument is and what is happening to it: the registry owns instruments, so a job's intake
 * and release and a transfer's hand-over and receipt record it through here, in their own transaction.
 * A loaded row is updated in place, so the caller's copy stays current.
 */
export async function setInstrumentWhereabouts(
  instrument: Instrument | { networkId: string; id: string },
  change: { status: Instrument['status']; currentShopId?: string },
  transaction?: Transaction,
) {
  if (instrument instanceof Instrument) {
    await instrument.update(change, { transaction });
    return;
  }
  await Instrument.update(change, { where: { networkId: instrument.networkId, id: instrument.id }, transaction });
}
