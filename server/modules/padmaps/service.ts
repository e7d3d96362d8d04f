import { subject } from '@casl/ability';
import { Op, fn, col, where as sqlWhere, type Transaction, type WhereOptions } from 'sequelize';
import type { z } from 'zod';
import { sequelize } from '../../lib/db.js';
import { AuditLog, Instrument, Job, Network, PadMap, ServiceCatalogItem, Shop, User } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { badRequest, conflict, notFound } from '../../lib/errors.js';
import { INSTRUMENT_FAMILY_LABELS, type InstrumentFamily } from '../../../shared/domain.js';
import { normalizeMaker } from '../../../shared/serial.js';
import { computePadMap, partsListOf, type KeyResult, type PadCatalog } from '../../../shared/padmap/compute.js';
import { readEntries, type savePadMapSchema, type StoredEntry } from '../../../shared/padmap/entries.js';
import { padKeysFor } from '../../../shared/padmap/keys.js';
import { isEstimateFrozen } from '../../../shared/jobs/stage-machine.js';
import { padRulesSchema, resolvePadRules, type PadRules } from '../../../shared/padmap/rules.js';
import { suggestFromMaps, type EarlierMap, type Suggestions } from '../../../shared/padmap/suggest.js';
import { jobStockStatus, padCatalogFor, padStockAt, syncJobReservations } from '../stock/index.js';
import { assertEstimateOpen, replacePartLines } from '../jobs/index.js';
import { appendHistory } from '../registry/index.js';

/**
 * Pad maps: the per-key measurements of a repad and the pads chosen for them. A map is kept with the
 * instrument (and the job it was made for), becomes the job's pad line items and reserves the pads at
 * the job's shop, all in one transaction. The arithmetic is shared/padmap, the same the screen previews.
 */

// ---------------------------------------------------------------------------------------------
// Pad rules

async function networkOf(actor: Actor, transaction?: Transaction) {
  const network = await Network.findByPk(actor.networkId, { transaction });
  if (!network) throw notFound('Your network');
  return network;
}

export async function getPadRules(actor: Actor): Promise<PadRules> {
  const network = await networkOf(actor);
  return resolvePadRules(network.settings?.padRules);
}

export async function updatePadRules(actor: Actor, input: z.output<typeof padRulesSchema>): Promise<PadRules> {
  assertCan(actor.ability, 'update', 'Network', undefined, 'Only the owner sets the network’s pad rules.');
  return sequelize.transaction(async (transaction) => {
    const network = await Network.findByPk(actor.networkId, { transaction, lock: transaction.LOCK.UPDATE });
    if (!network) throw notFound('Your network');
    const before = resolvePadRules(network.settings?.padRules);
    await network.update({ settings: { ...(network.settings ?? {}), padRules: input } }, { transaction });
    await AuditLog.create(
      { networkId: actor.networkId, actorUserId: actor.id, action: 'pad_rules.updated', entity: 'network', entityId: actor.networkId, before: { padRules: before }, after: { padRules: input } },
      { transaction },
    );
    return resolvePadRules(input);
  });
}

// ---------------------------------------------------------------------------------------------
// Reading pad maps

export interface PadMapView {
  id: string;
  instrumentId: string;
  jobId: string | null;
  jobNumber: number | null;
  shopId: string;
  shopName: string;
  unitSystem: 'mm' | 'in';
  entries: StoredEntry[];
  results: KeyResult[];
  createdBy: string;
  createdAt: Date;
  updatedAt: Date;
}

async function viewOf(networkId: string, map: PadMap, transaction?: Transaction): Promise<PadMapView> {
  const [shop, user, job] = await Promise.all([
    Shop.findOne({ where: { networkId, id: map.shopId }, attributes: ['name'], transaction }),
    User.findOne({ where: { networkId, id: map.createdByUserId }, attributes: ['name'], transaction }),
    map.jobId ? Job.findOne({ where: { networkId, id: map.jobId }, attributes: ['number'], transaction }) : null,
  ]);
  return {
    id: map.id,
    instrumentId: map.instrumentId,
    jobId: map.jobId ?? null,
    jobNumber: job?.number ?? null,
    shopId: map.shopId,
    shopName: shop?.name ?? '',
    unitSystem: map.unitSystem,
    entries: map.entries as unknown as StoredEntry[],
    results: (map.results ?? []) as unknown as KeyResult[],
    createdBy: user?.name ?? '',
    createdAt: map.createdAt,
    updatedAt: map.updatedAt,
  };
}

/** The pad maps a person may read: every shop's for staff who read the registry, their own shops' for auditors. */
function readableMaps(actor: Actor): WhereOptions | null {
  return accessibleWhere(actor.ability, 'read', 'PadMap');
}

async function loadInstrument(actor: Actor, instrumentId: string, transaction?: Transaction) {
  const instrument = await Instrument.findOne({ where: { networkId: actor.networkId, id: instrumentId }, transaction });
  if (!instrument) throw notFound('That instrument');
  return instrument;
}

/** The newest map of an instrument this person may read, or null. */
export async function latestPadMapOf(actor: Actor, instrumentId: string, options: { exceptJobId?: string } = {}) {
  const instrument = await loadInstrument(actor, instrumentId);
  assertCan(actor.ability, 'read', 'Instrument', instrument.get({ plain: true }));
  const access = readableMaps(actor);
  if (!access) return { instrumentId, padMap: null };
  const map = await PadMap.findOne({
    where: {
      [Op.and]: [
        access,
        { networkId: actor.networkId, instrumentId },
        options.exceptJobId ? { [Op.or]: [{ jobId: null }, { jobId: { [Op.ne]: options.exceptJobId } }] } : {},
      ],
    },
    order: [['createdAt', 'DESC']],
  });
  return { instrumentId, padMap: map ? await viewOf(actor.networkId, map) : null };
}

/**
 * Medians per key from earlier maps of the same family, maker and model (maker compared as the
 * registry normalises it, model without case or surrounding spaces).
 */
export async function padMapSuggestions(
  actor: Actor,
  query: { family: InstrumentFamily; maker: string; model?: string | null; excludeInstrumentId?: string },
): Promise<Suggestions & { family: InstrumentFamily; maker: string; model: string | null }> {
  const model = query.model?.trim() ? query.model.trim() : null;
  const base = { family: query.family, maker: query.maker, model };
  const access = readableMaps(actor);
  if (!access) return { ...base, basedOnMaps: 0, keys: {} };
  const maps = await PadMap.findAll({
    where: { [Op.and]: [access, { networkId: actor.networkId }] },
    include: [
      {
        model: Instrument,
        as: 'instrument',
        required: true,
        attributes: ['id'],
        where: {
          [Op.and]: [
            { networkId: actor.networkId, family: query.family, makerNormalized: normalizeMaker(query.maker) },
            model == null ? { model: { [Op.or]: [null, ''] } } : sqlWhere(fn('lower', fn('btrim', col('instrument.model'))), model.toLowerCase()),
            query.excludeInstrumentId ? { id: { [Op.ne]: query.excludeInstrumentId } } : {},
          ],
        },
      },
    ],
    attributes: ['instrumentId', 'createdAt', 'entries', 'results'],
    order: [['createdAt', 'DESC']],
    limit: 1000,
  });
  const earlier: EarlierMap[] = maps.map((m) => ({
    instrumentId: m.instrumentId,
    createdAt: m.createdAt,
    entries: m.entries as unknown as EarlierMap['entries'],
    results: (m.results ?? []) as unknown as EarlierMap['results'],
  }));
  return { ...base, ...suggestFromMaps(earlier, await padCatalogFor(actor.networkId)) };
}

// ---------------------------------------------------------------------------------------------
// The job's pad map screen

async function loadJob(actor: Actor, jobId: string, transaction?: Transaction, lock = false) {
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: jobId }, transaction, ...(lock && transaction ? { lock: transaction.LOCK.UPDATE } : {}) });
  if (!job) throw notFound('That job');
  assertCan(actor.ability, 'read', 'Job', job.get({ plain: true }));
  return job;
}

/** Catalog services for the family; the repad one (its name begins with "Repad") is the default for labor. */
async function serviceChoices(networkId: string, family: InstrumentFamily, transaction?: Transaction) {
  const items = await ServiceCatalogItem.findAll({
    where: { networkId, active: true, [Op.or]: [{ family }, { family: null }] },
    order: [['name', 'ASC']],
    transaction,
  });
  const options = items.map((i) => ({ id: i.id, name: i.name, standardHours: i.standardHours, family: i.family ?? null }));
  const isRepad = (name: string) => /^\s*repad\b/i.test(name);
  const repad = options.find((o) => o.family === family && isRepad(o.name)) ?? options.find((o) => o.family == null && isRepad(o.name)) ?? null;
  return { options, repad };
}

export async function padMapWorkspace(actor: Actor, jobId: string) {
  const job = await loadJob(actor, jobId);
  const instrument = await loadInstrument(actor, job.instrumentId);
  const network = await networkOf(actor);
  const rules = resolvePadRules(network.settings?.padRules);
  const [shop, catalog, services, own, previous, stock, parts] = await Promise.all([
    Shop.findOne({ where: { networkId: actor.networkId, id: job.shopId } }),
    padCatalogFor(actor.networkId),
    serviceChoices(actor.networkId, instrument.family),
    PadMap.findOne({ where: { networkId: actor.networkId, jobId: job.id }, order: [['updatedAt', 'DESC']] }),
    latestPadMapOf(actor, instrument.id, { exceptJobId: job.id }).then((r) => r.padMap),
    padStockAt(actor.networkId, job.shopId, job.id),
    jobStockStatus(actor.networkId, job.id, job.shopId),
  ]);
  const readableOwn = own && actor.ability.can('read', subject('PadMap', own.get({ plain: true })) as never) ? own : null;
  const suggestions = previous || readableOwn
    ? null
    : await padMapSuggestions(actor, { family: instrument.family, maker: instrument.maker, model: instrument.model, excludeInstrumentId: instrument.id });
  const padMap = readableOwn ? await viewOf(actor.networkId, readableOwn) : null;
  return {
    job: { id: job.id, number: job.number, stage: job.stage, shopId: job.shopId, shopName: shop?.name ?? '' },
    instrument: {
      id: instrument.id,
      family: instrument.family,
      familyLabel: INSTRUMENT_FAMILY_LABELS[instrument.family],
      maker: instrument.maker,
      model: instrument.model ?? null,
      serial: instrument.serial,
    },
    rules,
    catalog,
    services: services.options,
    defaultServiceId: services.repad?.id ?? null,
    padMap,
    previous,
    suggestions,
    stock,
    parts,
    summary: padMap ? summaryOf(padMap.results, catalog) : null,
    can: {
      edit: !isEstimateFrozen(job.stage) && actor.ability.can('create', subject('PadMap', { shopId: job.shopId }) as never),
      requestParts: actor.ability.can('request', subject('Stock', { shopId: job.shopId }) as never),
    },
  };
}

function summaryOf(results: KeyResult[], catalog: PadCatalog) {
  const parts = partsListOf(results, catalog);
  return { pads: parts.reduce((sum, p) => sum + p.quantity, 0), lines: parts.length };
}

// ---------------------------------------------------------------------------------------------
// Saving

export async function savePadMap(actor: Actor, jobId: string, input: z.output<typeof savePadMapSchema>) {
  const peek = await loadJob(actor, jobId);
  assertCan(actor.ability, 'create', 'PadMap', { shopId: peek.shopId }, 'Only technicians and managers of the job’s shop can record its pad map.');
  const instrument = await loadInstrument(actor, peek.instrumentId);

  const { entries, errors } = readEntries(input.entries, input.unitSystem);
  const familyKeys = new Set(padKeysFor(instrument.family).map((k) => k.id));
  input.entries.forEach((row, i) => {
    if (!familyKeys.has(row.keyId) && !row.keyName?.trim()) errors[`entries.${i}.keyName`] = 'Name this key.';
  });
  if (Object.keys(errors).length) throw badRequest('Some readings need attention.', errors);

  const saved = await sequelize.transaction(async (transaction) => {
    // one save per job at a time: the second waits and then replaces the first's lines and reservations
    const job = await loadJob(actor, jobId, transaction, true);
    if (job.stage === 'released') throw conflict('This job has been released; open a new job to repad the instrument again.');
    // before anything is written: the map becomes the job's pad lines, which the jobs service freezes at ready
    assertEstimateOpen(job);
    assertCan(actor.ability, 'create', 'PadMap', { shopId: job.shopId }, 'Only technicians and managers of the job’s shop can record its pad map.');

    const network = await networkOf(actor, transaction);
    const rules = resolvePadRules(network.settings?.padRules);
    const catalog = await padCatalogFor(actor.networkId, { transaction });
    const services = await serviceChoices(actor.networkId, instrument.family, transaction);
    let service = services.repad;
    if (input.catalogItemId) {
      service = services.options.find((o) => o.id === input.catalogItemId) ?? null;
      if (!service) throw badRequest('Choose a service from the catalog.', { catalogItemId: 'That service is not offered for this instrument.' });
    }
    const result = computePadMap({ entries, catalog, rules, repadHours: service?.standardHours ?? null });

    const existing = await PadMap.findOne({ where: { networkId: actor.networkId, jobId: job.id }, order: [['updatedAt', 'DESC']], transaction });
    const values = {
      unitSystem: input.unitSystem,
      shopId: job.shopId,
      entries: entries as unknown as Array<Record<string, unknown>>,
      results: result.keys as unknown as Array<Record<string, unknown>>,
    };
    const map = existing
      ? await existing.update({ ...values, createdByUserId: actor.id }, { transaction })
      : await PadMap.create({ networkId: actor.networkId, instrumentId: instrument.id, jobId: job.id, createdByUserId: actor.id, ...values }, { transaction });

    // the job's pad lines are replaced as a whole; labor and other parts on the job stay as they are
    const padPartIds = new Set([...catalog.self_leveling, ...catalog.glued].map((p) => p.partId).filter((id): id is string => !!id));
    const names = new Map(padKeysFor(instrument.family).map((k) => [k.id, k.name]));
    const keyLabel = (id: string) => names.get(id) ?? entries.find((e) => e.keyId === id)?.keyName ?? id;
    const lines = result.parts.filter((p) => p.partId);
    await replacePartLines(
      job,
      padPartIds,
      lines.map((p) => ({ partId: p.partId!, description: `${p.name} (${p.keyIds.map(keyLabel).join(', ')})`, quantity: p.quantity, unitPriceCents: p.unitPriceCents ?? 0 })),
      { userId: actor.id, what: 'pad lines replaced by the pad map' },
      transaction,
    );

    const reservation = await syncJobReservations({
      networkId: actor.networkId,
      jobId: job.id,
      shopId: job.shopId,
      scope: padPartIds,
      wanted: new Map(lines.map((p) => [p.partId!, p.quantity])),
      transaction,
      byUserId: actor.id,
    });

    const shop = await Shop.findOne({ where: { networkId: actor.networkId, id: job.shopId }, attributes: ['name'], transaction });
    const selfLeveling = result.keys.filter((k) => k.padDiameterMm != null && k.padKind === 'self_leveling').length;
    const glued = result.counts.padsChosen - selfLeveling;
    await appendHistory(
      {
        networkId: actor.networkId,
        instrumentId: instrument.id,
        jobId: job.id,
        shopId: job.shopId,
        userId: actor.id,
        kind: 'pad_map_saved',
        summary: `Pad map ${existing ? 'updated' : 'saved'} at ${shop?.name ?? 'the shop'}: ${result.counts.padsChosen} pads (${selfLeveling} self-leveling, ${glued} glued)`,
        data: {
          padMapId: map.id,
          pads: result.counts.padsChosen,
          errors: result.counts.errors,
          warnings: result.counts.warnings,
          labor: result.labor,
          serviceId: service?.id ?? null,
        },
      },
      transaction,
    );
    return { padMapId: map.id, created: !existing, labor: result.labor, reservation };
  });

  return { saved, ...(await padMapWorkspace(actor, jobId)) };
}
