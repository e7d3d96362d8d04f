import { subject as asSubject } from '@casl/ability';
import { Op, QueryTypes, type Transaction, type WhereOptions } from 'sequelize';
import { config } from '../../config.js';
import { sequelize } from '../../lib/db.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { AppError, badRequest, conflict, forbidden, notFound } from '../../lib/errors.js';
import type { Actor } from '../../lib/auth.js';
import { getObjectBuffer, putObject } from '../../lib/storage.js';
import {
  HistoryEvent,
  Instrument,
  Job,
  Network,
  RelayRun,
  Shop,
  ShopSkill,
  Skill,
  Transfer,
  User,
} from '../../lib/models.js';
import {
  INSTRUMENT_FAMILY_LABELS,
  JOB_STAGE_LABELS,
  type JobStage,
  type TransferState,
} from '../../../shared/domain.js';
import { normalizeSerial } from '../../../shared/serial.js';
import { haversineKm } from '../../../shared/routing/haversine.js';
import { nextDeparture, nextRun } from '../../../shared/routing/next-run.js';
import { rankShops, routingSettings, formatHours } from '../../../shared/routing/rank.js';
import { zoneLabel } from '../../../shared/routing/zoned.js';
import { formatDateTime } from '../../../shared/time/format.js';
import {
  OPEN_TRANSFER_STATES,
  TRANSFER_STATE_LABELS,
  TRANSFER_TRANSITIONS,
  canMove,
  type CreateTransferInput,
  type TransferView,
} from '../../../shared/transfers.js';
import { notify, peopleAt } from '../notifications/index.js';
import { isHeavyCase, LIFTING_CAUTION } from '../../../shared/safety/hazards.js';
import { noticeCustomerOfTransfer, receiveTransferredJob, sendJobOnTheRoad } from '../jobs/index.js';
import { appendHistory, setInstrumentWhereabouts } from '../registry/index.js';
import { renderManifest } from './manifest.js';
import {
  enqueueOutbox,
  enqueueTransferStep,
  pendingStep,
  scheduleArrivalCheck,
  type ArrivalCheckData,
  type TransferStepData,
} from './queue.js';

/**
 * Transfers between shops. The API checks who may do what and whether the step makes sense now, then
 * queues the step; the worker carries it out (`applyTransferStep`) in one transaction and afterwards
 * writes the manifest and sends the e-mails from the outbox.
 */

const HOUR_MS = 3_600_000;
/** Stages a job can leave its shop from: not finished, not already on the road. */
const TRANSFERABLE_STAGES: JobStage[] = ['intake', 'assessed', 'approved', 'on_bench', 'quality_check', 'waiting_for_parts'];
/** Open work that counts against a shop's bench hours. */
const BACKLOG_STAGES: JobStage[] = [...TRANSFERABLE_STAGES, 'in_transit'];
const STAFF_ROLES = ['regional_manager', 'front_desk', 'technician'] as const;

export const stepKey = (transferId: string, to: TransferState | 'overdue') => `transfer:${transferId}:${to}`;
export const manifestKeyFor = (networkId: string, transferId: string) => `networks/${networkId}/transfers/${transferId}/manifest.pdf`;

const plain = (t: Transfer) => t.get({ plain: true }) as unknown as Record<string, unknown>;
const stageLabel = (s: JobStage) => JOB_STAGE_LABELS[s].toLowerCase();

// ---------------------------------------------------------------------------------------------
// Loading

const bundleInclude = [
  { association: 'job', required: false },
  { association: 'instrument', required: false },
  { association: 'fromShop', required: false },
  { association: 'toShop', required: false },
  { association: 'relayRun', required: false },
  { association: 'requestedBy', required: false, attributes: ['id', 'name'] },
  { association: 'approvedBy', required: false, attributes: ['id', 'name'] },
  { association: 'packedBy', required: false, attributes: ['id', 'name'] },
  { association: 'receivedBy', required: false, attributes: ['id', 'name'] },
];

type Bundle = Transfer & {
  job: Job;
  instrument: Instrument;
  fromShop: Shop;
  toShop: Shop;
  relayRun: RelayRun | null;
  requestedBy: User | null;
  approvedBy: User | null;
  packedBy: User | null;
  receivedBy: User | null;
};

async function loadBundle(networkId: string, id: string, transaction?: Transaction): Promise<Bundle | null> {
  const row = await Transfer.findOne({ where: { networkId, id }, include: bundleInclude, transaction });
  return row as Bundle | null;
}

/** A transfer the person may read; anything else is "not found", so ids of other shops do not leak. */
async function loadReadable(actor: Actor, id: string): Promise<Bundle> {
  const row = await loadBundle(actor.networkId, id);
  if (!row || !actor.ability.can('read', asSubject('Transfer', plain(row)))) throw notFound('That transfer');
  return row;
}

const address = (s: Shop) => [s.addressLine, s.city, s.region].filter(Boolean).join(', ');
const shopBrief = (s: Shop) => ({ id: s.id, name: s.name, code: s.code, city: s.city, timeZone: s.timeZone });
const person = (u: User | null | undefined) => (u ? { id: u.id, name: u.name } : null);
const instrumentLine = (i: Instrument) =>
  `${INSTRUMENT_FAMILY_LABELS[i.family]} ${[i.maker, i.model].filter(Boolean).join(' ')}, serial ${i.serial}`;

// ---------------------------------------------------------------------------------------------
// Reading

export async function listTransfers(actor: Actor, query: { view: TransferView; shopId?: string; status: 'open' | 'closed' | 'any' }) {
  const readWhere = accessibleWhere(actor.ability, 'read', 'Transfer');
  if (!readWhere) return { transfers: [] };
  const conditions: WhereOptions[] = [readWhere];
  if (query.view === 'incoming' || query.view === 'outgoing') {
    if (!query.shopId) throw badRequest('Choose a shop.', { shopId: 'Choose a shop.' });
    conditions.push(query.view === 'incoming' ? { toShopId: query.shopId } : { fromShopId: query.shopId });
  } else if (query.shopId) {
    conditions.push({ [Op.or]: [{ fromShopId: query.shopId }, { toShopId: query.shopId }] });
  }
  if (query.view === 'approvals') {
    const approveWhere = accessibleWhere(actor.ability, 'approve', 'Transfer');
    if (!approveWhere) return { transfers: [] };
    conditions.push(approveWhere, { state: 'requested' });
  }
  if (query.status === 'open') conditions.push({ state: { [Op.in]: OPEN_TRANSFER_STATES } });
  if (query.status === 'closed') conditions.push({ state: { [Op.notIn]: OPEN_TRANSFER_STATES } });

  const rows = (await Transfer.findAll({
    where: { networkId: actor.networkId, [Op.and]: conditions },
    include: bundleInclude.slice(0, 4),
    order: [['requestedAt', 'DESC']],
    limit: 200,
  })) as Bundle[];
  const now = Date.now();
  return {
    transfers: rows.map((t) => ({
      id: t.id,
      state: t.state,
      reason: t.reason,
      requestedAt: t.requestedAt,
      departedAt: t.departedAt,
      expectedArrivalAt: t.expectedArrivalAt,
      receivedAt: t.receivedAt,
      overdue: t.state === 'in_transit' && !!t.expectedArrivalAt && t.expectedArrivalAt.getTime() < now,
      fromShop: shopBrief(t.fromShop),
      toShop: shopBrief(t.toShop),
      job: { id: t.job.id, number: t.job.number, stage: t.job.stage },
      instrument: {
        id: t.instrument.id,
        family: t.instrument.family,
        maker: t.instrument.maker,
        model: t.instrument.model,
        serial: t.instrument.serial,
      },
    })),
  };
}

export async function getTransfer(actor: Actor, id: string) {
  const t = await loadReadable(actor, id);
  const [runs, history, pending] = await Promise.all([
    RelayRun.findAll({ where: { networkId: actor.networkId, fromShopId: t.fromShopId, toShopId: t.toShopId, active: true } }),
    // every transfer event names its transfer in `data`, including those written before the worker kept keys
    HistoryEvent.findAll({
      where: { networkId: actor.networkId, instrumentId: t.instrumentId, data: { transferId: t.id } },
      include: [{ association: 'user', required: false, attributes: ['id', 'name'] }],
      order: [['occurredAt', 'ASC'], ['createdAt', 'ASC']],
    }),
    pendingStep(t.id, t.state === 'requested' ? ['requested', ...TRANSFER_TRANSITIONS.requested] : TRANSFER_TRANSITIONS[t.state as TransferState]),
  ]);
  const now = new Date();
  return {
    id: t.id,
    state: t.state,
    reason: t.reason,
    decisionNote: t.decisionNote,
    requestedAt: t.requestedAt,
    approvedAt: t.approvedAt,
    packedAt: t.packedAt,
    handedOverAt: t.handedOverAt,
    departedAt: t.departedAt,
    expectedArrivalAt: t.expectedArrivalAt,
    receivedAt: t.receivedAt,
    /** On the road but the relay run has not left yet: handed over, waiting at the origin for the run. */
    waitingForRun: t.state === 'in_transit' && !!t.relayRunId && !!t.departedAt && t.departedAt.getTime() > now.getTime(),
    caseCount: t.caseCount,
    contents: t.contents,
    departureCondition: t.departureCondition,
    overdue: t.state === 'in_transit' && !!t.expectedArrivalAt && t.expectedArrivalAt.getTime() < now.getTime(),
    fromShop: shopBrief(t.fromShop),
    toShop: shopBrief(t.toShop),
    job: {
      id: t.job.id,
      number: t.job.number,
      stage: t.job.stage,
      shopId: t.job.shopId,
      complaint: t.job.complaint,
      estimatedHours: t.job.estimatedHours,
    },
    instrument: {
      id: t.instrument.id,
      family: t.instrument.family,
      maker: t.instrument.maker,
      model: t.instrument.model,
      serial: t.instrument.serial,
      assetTag: t.instrument.assetTag,
      currentShopId: t.instrument.currentShopId,
      status: t.instrument.status,
    },
    heavyCase: isHeavyCase(t.instrument.family, t.instrument.heavyCase ?? false),
    requestedBy: person(t.requestedBy),
    approvedBy: person(t.approvedBy),
    packedBy: person(t.packedBy),
    receivedBy: person(t.receivedBy),
    relayRun: t.relayRun ? runBrief(t.relayRun, t.fromShop, now) : null,
    runOptions: runs.map((r) => runBrief(r, t.fromShop, now)).sort((a, b) => (a.nextDepartureAt ?? '').localeCompare(b.nextDepartureAt ?? '')),
    manifestAvailable: !!t.manifestKey && MANIFEST_STATES.includes(t.state),
    pendingStep: pending,
    nextStates: TRANSFER_TRANSITIONS[t.state as TransferState],
    history: history.map((h) => ({
      id: h.id,
      kind: h.kind,
      summary: h.summary,
      occurredAt: h.occurredAt,
      shopId: h.shopId,
      user: person((h as HistoryEvent & { user?: User }).user),
    })),
  };
}

function runBrief(r: RelayRun, from: Shop, now: Date) {
  const next = nextDeparture(r, now, from.timeZone);
  return {
    id: r.id,
    weekdays: r.weekdays,
    departureTime: r.departureTime.slice(0, 5),
    transitHours: r.transitHours,
    nextDepartureAt: next?.toISOString() ?? null,
    label: `${formatWeekdaysShort(r.weekdays)} ${r.departureTime.slice(0, 5)} (${zoneLabel(from.timeZone)}), ${formatHours(r.transitHours)} h`,
  };
}

const DAY_NAMES = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
const formatWeekdaysShort = (days: number[]) => [...days].sort().map((d) => DAY_NAMES[d - 1]).join(', ');

/** A manifest exists from the pack step on; a cancelled or rejected transfer offers none. */
const MANIFEST_STATES: TransferState[] = ['packed', 'in_transit', 'received'];

/** Reads the stored manifest; it never makes one (the worker does, at the pack step). */
export async function manifestFile(actor: Actor, id: string) {
  const t = await loadReadable(actor, id);
  if (t.state === 'cancelled' || t.state === 'rejected') {
    throw new AppError(409, 'no_manifest', `This transfer was ${t.state}; it has no manifest.`);
  }
  if (!MANIFEST_STATES.includes(t.state)) {
    throw new AppError(409, 'manifest_not_ready', 'The manifest is made when the instrument is packed; it is not packed yet.');
  }
  if (!t.manifestKey) {
    throw new AppError(409, 'manifest_being_made', 'The manifest is being made; try again in a moment.');
  }
  const body = await getObjectBuffer(t.manifestKey);
  return { body, filename: `transfer-job-${t.job.number}-manifest.pdf` };
}

// ---------------------------------------------------------------------------------------------
// Choosing where to send a job

async function loadJob(actor: Actor, jobId: string) {
  const job = await Job.findOne({ where: { networkId: actor.networkId, id: jobId }, include: [{ association: 'instrument' }] });
  if (!job) throw notFound('That job');
  return job as Job & { instrument: Instrument };
}

/** Open jobs at a shop that could be sent elsewhere: not finished, not on the road, no transfer under way. */
export async function listRequestableJobs(actor: Actor, shopId: string) {
  const shop = await Shop.findOne({ where: { networkId: actor.networkId, id: shopId } });
  if (!shop) throw notFound('That shop');
  assertCan(actor.ability, 'request', 'Transfer', { fromShopId: shopId }, 'You cannot send transfers from this shop.');
  const jobs = (await Job.findAll({
    where: {
      networkId: actor.networkId,
      shopId,
      stage: { [Op.in]: TRANSFERABLE_STAGES },
      id: {
        [Op.notIn]: sequelize.literal(
          `(select job_id from transfers where network_id = ${sequelize.escape(actor.networkId)} and state in (${OPEN_TRANSFER_STATES.map((s) => `'${s}'`).join(', ')}))`,
        ),
      },
    },
    include: [{ association: 'instrument' }, { association: 'requiredSkill', required: false }],
    order: [['number', 'ASC']],
  })) as Array<Job & { instrument: Instrument; requiredSkill?: Skill }>;
  return {
    jobs: jobs.map((j) => ({
      id: j.id,
      number: j.number,
      stage: j.stage,
      complaint: j.complaint,
      estimatedHours: j.estimatedHours,
      requiredSkill: j.requiredSkill ? { id: j.requiredSkill.id, code: j.requiredSkill.code, name: j.requiredSkill.name } : null,
      instrument: { family: j.instrument.family, maker: j.instrument.maker, model: j.instrument.model, serial: j.instrument.serial },
    })),
  };
}

/** Hours of open work needing a skill, per shop, net of time already logged; incoming jobs count at their destination. */
async function backlogBySkill(networkId: string, skillId: string, excludeJobId: string) {
  const rows = await sequelize.query<{ shop_id: string; hours: string }>(
    `select coalesce(t.to_shop_id, j.shop_id) as shop_id,
            sum(greatest(coalesce(j.estimated_hours, 0) - coalesce(tl.minutes, 0) / 60.0, 0)) as hours
       from jobs j
       left join (select job_id, sum(minutes) as minutes from time_logs where network_id = :networkId group by job_id) tl
              on tl.job_id = j.id
       left join transfers t
              on t.network_id = j.network_id and t.job_id = j.id and t.state in ('approved', 'packed', 'in_transit')
      where j.network_id = :networkId and j.required_skill_id = :skillId and j.id <> :excludeJobId
        and j.stage in (:stages)
      group by 1`,
    { type: QueryTypes.SELECT, replacements: { networkId, skillId, excludeJobId, stages: BACKLOG_STAGES } },
  );
  return new Map(rows.map((r) => [r.shop_id, Number(r.hours)]));
}

/** The shops that have the job's skill, ranked by when the job would be finished there, with reasons. */
export async function recommendDestinations(actor: Actor, input: { jobId: string; skillId?: string }, now = new Date()) {
  const job = await loadJob(actor, input.jobId);
  assertCan(actor.ability, 'request', 'Transfer', { fromShopId: job.shopId }, 'You cannot send transfers from this job’s shop.');
  const skills = await Skill.findAll({ where: { networkId: actor.networkId }, order: [['name', 'ASC']] });
  const skillId = input.skillId ?? job.requiredSkillId;
  const skill = skills.find((s) => s.id === skillId);
  if (input.skillId && !skill) throw badRequest('Choose one of the network’s skills.', { skillId: 'Choose one of the network’s skills.' });

  const [network, origin, openTransfer] = await Promise.all([
    Network.findByPk(actor.networkId),
    Shop.findOne({ where: { networkId: actor.networkId, id: job.shopId } }),
    Transfer.findOne({ where: { networkId: actor.networkId, jobId: job.id, state: { [Op.in]: OPEN_TRANSFER_STATES } } }),
  ]);
  if (!origin) throw notFound('That job’s shop');
  const jobBrief = {
    id: job.id,
    number: job.number,
    stage: job.stage,
    complaint: job.complaint,
    estimatedHours: job.estimatedHours,
    shop: shopBrief(origin),
    instrument: {
      family: job.instrument.family,
      maker: job.instrument.maker,
      model: job.instrument.model,
      serial: job.instrument.serial,
      heavyCase: isHeavyCase(job.instrument.family, job.instrument.heavyCase ?? false),
    },
    transferable: TRANSFERABLE_STAGES.includes(job.stage) && !openTransfer,
    openTransferId: openTransfer?.id ?? null,
  };
  const skillList = skills.map((s) => ({ id: s.id, code: s.code, name: s.name }));
  const settings = routingSettings(network?.settings);
  // no skill on the job yet: the screen asks for one before it can rank anything
  if (!skill) return { job: jobBrief, skill: null, skills: skillList, ranked: [], recommendedShopId: null, settings };

  const [shopSkills, runs, backlog] = await Promise.all([
    ShopSkill.findAll({ where: { networkId: actor.networkId, skillId: skill.id }, include: [{ association: 'shop' }] }),
    RelayRun.findAll({ where: { networkId: actor.networkId, fromShopId: job.shopId, active: true } }),
    backlogBySkill(actor.networkId, skill.id, job.id),
  ]);

  const candidates = (shopSkills as Array<ShopSkill & { shop: Shop }>)
    .filter((ss) => ss.shop?.active)
    .map((ss) => ({
      shopId: ss.shop.id,
      name: ss.shop.name,
      timeZone: ss.shop.timeZone,
      latitude: ss.shop.latitude,
      longitude: ss.shop.longitude,
      openingDays: ss.shop.openingDays,
      weeklyBenchHours: ss.weeklyBenchHours,
      backlogHours: Math.round((backlog.get(ss.shop.id) ?? 0) * 10) / 10,
    }));
  const result = rankShops({
    now,
    origin: { shopId: origin.id, name: origin.name, timeZone: origin.timeZone, latitude: origin.latitude, longitude: origin.longitude },
    jobHours: job.estimatedHours,
    skillName: skill.name,
    candidates,
    runs: runs.map((r) => ({ ...r.get({ plain: true }), transitHours: r.transitHours })),
    settings,
  });
  const withoutReceiver = await shopsWithoutReceiver(actor.networkId, candidates.map((c) => c.shopId));
  return { job: jobBrief, skill: { id: skill.id, code: skill.code, name: skill.name }, skills: skillList, ...result, withoutReceiver };
}

/**
 * Receiving is the destination's front desk's or regional manager's work (the rules keep it so). Shops
 * among `shopIds` where nobody holds either role: a request to them is warned about, since only the
 * owner could then confirm receipt.
 */
async function shopsWithoutReceiver(networkId: string, shopIds: string[]) {
  const out: string[] = [];
  for (const shopId of shopIds) {
    if (!(await peopleAt(networkId, [shopId], ['front_desk', 'regional_manager'])).length) out.push(shopId);
  }
  return out;
}

export const noReceiverWarning = (shopName: string) =>
  `Nobody at ${shopName} may receive transfers (no front desk or regional manager there): only the owner could confirm receipt. Give someone there that role before the instrument arrives.`;

// ---------------------------------------------------------------------------------------------
// Asking for a step (API side)

export async function requestTransfer(actor: Actor, input: CreateTransferInput) {
  const job = await loadJob(actor, input.jobId);
  assertCan(actor.ability, 'request', 'Transfer', { fromShopId: job.shopId }, 'You cannot send transfers from this job’s shop.');
  if (!TRANSFERABLE_STAGES.includes(job.stage)) {
    throw conflict(`A job that is ${stageLabel(job.stage)} cannot be transferred.`);
  }
  if (input.toShopId === job.shopId) throw badRequest('The job is already at that shop.', { toShopId: 'Choose another shop.' });
  const destination = await Shop.findOne({ where: { networkId: actor.networkId, id: input.toShopId, active: true } });
  if (!destination) throw badRequest('Choose the destination shop.', { toShopId: 'Choose the destination shop.' });

  let transfer: Transfer;
  try {
    transfer = await Transfer.create({
      networkId: actor.networkId,
      jobId: job.id,
      instrumentId: job.instrumentId,
      fromShopId: job.shopId,
      toShopId: destination.id,
      reason: input.reason,
      requestedByUserId: actor.id,
    });
  } catch (err) {
    if ((err as Error).name === 'SequelizeUniqueConstraintError') {
      throw conflict('This job already has a transfer under way.');
    }
    throw err;
  }
  const jobId = await enqueueTransferStep({
    networkId: actor.networkId,
    transferId: transfer.id,
    to: 'requested',
    actorUserId: actor.id,
    at: transfer.requestedAt.toISOString(),
  });
  const warnings = (await shopsWithoutReceiver(actor.networkId, [destination.id])).length ? [noReceiverWarning(destination.name)] : [];
  return { id: transfer.id, state: transfer.state, queued: { step: 'requested' as const, jobId }, warnings };
}

async function loadForStep(actor: Actor, id: string) {
  const t = await loadBundle(actor.networkId, id);
  if (!t) throw notFound('That transfer');
  return t;
}

function requireMove(t: Transfer, to: TransferState) {
  if (!canMove(t.state, to)) {
    throw conflict(`This transfer is ${TRANSFER_STATE_LABELS[t.state as TransferState].toLowerCase()}; it cannot be ${TRANSFER_STATE_LABELS[to].toLowerCase()} now.`);
  }
}

async function queueStep(actor: Actor, t: Transfer, to: TransferState, extra: Partial<TransferStepData> = {}) {
  const jobId = await enqueueTransferStep({
    networkId: actor.networkId,
    transferId: t.id,
    to,
    actorUserId: actor.id,
    at: new Date().toISOString(),
    ...extra,
  });
  return { id: t.id, state: t.state, queued: { step: to, jobId } };
}

/** Visible rows first (404 for the unseen), then the permission for the step itself (403). */
function readableOr404(actor: Actor, t: Transfer) {
  if (!actor.ability.can('read', asSubject('Transfer', plain(t)))) throw notFound('That transfer');
}

export async function approveTransfer(actor: Actor, id: string, input: { note?: string }) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  assertCan(actor.ability, 'approve', 'Transfer', plain(t), 'Only a manager over one of the two shops, or the owner, approves transfers.');
  requireMove(t, 'approved');
  return queueStep(actor, t, 'approved', { note: input.note?.trim() || null });
}

export async function rejectTransfer(actor: Actor, id: string, input: { reason: string }) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  assertCan(actor.ability, 'approve', 'Transfer', plain(t), 'Only a manager over one of the two shops, or the owner, decides on transfers.');
  requireMove(t, 'rejected');
  return queueStep(actor, t, 'rejected', { reason: input.reason });
}

export async function cancelTransfer(actor: Actor, id: string, input: { reason: string }) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  const managerOrOwner = actor.ability.can('update', asSubject('Transfer', plain(t)));
  const ownRequest =
    t.requestedByUserId === actor.id && actor.ability.can('request', asSubject('Transfer', { fromShopId: t.fromShopId }) as never);
  if (!managerOrOwner && !ownRequest) throw forbidden('Only the person who asked, a manager of the two shops or the owner can cancel.');
  requireMove(t, 'cancelled');
  return queueStep(actor, t, 'cancelled', { reason: input.reason });
}

async function runForRoute(networkId: string, t: Transfer, relayRunId: string | null | undefined, now: Date) {
  if (relayRunId === null) return null;
  if (relayRunId) {
    const run = await RelayRun.findOne({ where: { networkId, id: relayRunId, fromShopId: t.fromShopId, toShopId: t.toShopId, active: true } });
    if (!run) throw badRequest('That relay run does not go between these two shops.', { relayRunId: 'Choose a relay run between these shops.' });
    return run.id;
  }
  // not chosen: the run that gets there first, if the two shops have one
  const runs = await RelayRun.findAll({ where: { networkId, fromShopId: t.fromShopId, toShopId: t.toShopId, active: true } });
  const from = await Shop.findOne({ where: { networkId, id: t.fromShopId } });
  return nextRun(runs, now, from!.timeZone)?.runId ?? null;
}

export async function packTransfer(
  actor: Actor,
  id: string,
  input: { relayRunId?: string | null; liftingAcknowledged?: boolean; caseCount?: number; contents?: string | null; departureCondition?: string | null },
) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  // packing happens at the origin: the permission must come from there
  assertCan(actor.ability, 'pack', 'Transfer', { fromShopId: t.fromShopId }, 'Packing is done by the shop the instrument leaves.');
  requireMove(t, 'packed');
  if (isHeavyCase(t.instrument.family, t.instrument.heavyCase ?? false) && !input.liftingAcknowledged) {
    throw badRequest('Confirm the lifting caution before packing a heavy case.', {
      liftingAcknowledged: 'Confirm you have read the lifting caution: two people or a cart.',
    });
  }
  const relayRunId = await runForRoute(actor.networkId, t, input.relayRunId, new Date());
  return queueStep(actor, t, 'packed', {
    relayRunId,
    caseCount: input.caseCount ?? 1,
    contents: input.contents ?? null,
    departureCondition: input.departureCondition ?? null,
  });
}

export async function handOverTransfer(actor: Actor, id: string, input: { relayRunId?: string | null }) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  assertCan(actor.ability, 'pack', 'Transfer', { fromShopId: t.fromShopId }, 'The hand-over is done by the shop the instrument leaves.');
  requireMove(t, 'in_transit');
  if (!TRANSFERABLE_STAGES.includes(t.job.stage)) throw conflict(`The job is ${stageLabel(t.job.stage)}; it cannot travel now.`);
  const relayRunId = input.relayRunId === undefined ? (t.relayRunId ?? (await runForRoute(actor.networkId, t, undefined, new Date()))) : await runForRoute(actor.networkId, t, input.relayRunId, new Date());
  return queueStep(actor, t, 'in_transit', { relayRunId });
}

export async function receiveTransfer(actor: Actor, id: string, input: { serial: string; method: 'scan' | 'typed' }) {
  const t = await loadForStep(actor, id);
  readableOr404(actor, t);
  // receiving happens at the destination: the permission must come from there
  assertCan(actor.ability, 'receive', 'Transfer', { toShopId: t.toShopId }, 'Only the shop the instrument goes to can receive it.');
  requireMove(t, 'received');
  if (normalizeSerial(input.serial) !== t.instrument.serialNormalized) {
    throw new AppError(409, 'serial_mismatch', 'That serial does not match the instrument on this transfer. Check the engraving before receiving it.', {
      serial: 'This is not the serial of the instrument on this transfer.',
    });
  }
  return queueStep(actor, t, 'received', { receiveMethod: input.method });
}

// ---------------------------------------------------------------------------------------------
// Carrying out a step (worker side)

export type StepOutcome =
  | { status: 'applied' | 'already-applied'; transferId: string; to: TransferState }
  | { status: 'skipped'; transferId: string; to: TransferState; reason: string };

/**
 * When a handed-over instrument leaves and when it is expected. On a relay run it waits for the run:
 * it leaves at the run's next departure on or after the hand-over (weekdays and time read in the
 * origin shop's zone) and is expected at that departure + the run's hours. An ad-hoc courier leaves at
 * once, and takes the routing rule's hours. A run that no longer has a departure counts as ad hoc.
 */
export function departureFor(run: RelayRun | null, handedOverAt: Date, from: Shop, to: Shop, network: Network | null) {
  const departure = run ? nextDeparture(run, handedOverAt, from.timeZone) : null;
  if (run && departure) {
    return { departedAt: departure, expectedArrivalAt: new Date(departure.getTime() + run.transitHours * HOUR_MS) };
  }
  const hours = adHocHours(from, to, routingSettings(network?.settings));
  return { departedAt: handedOverAt, expectedArrivalAt: new Date(handedOverAt.getTime() + hours * HOUR_MS) };
}

/** How long an ad-hoc trip takes where no relay run exists (the routing rule). */
function adHocHours(from: Shop, to: Shop, settings: ReturnType<typeof routingSettings>) {
  if (from.latitude == null || from.longitude == null || to.latitude == null || to.longitude == null) return settings.handlingHours;
  const km = haversineKm({ latitude: from.latitude, longitude: from.longitude }, { latitude: to.latitude, longitude: to.longitude });
  return settings.handlingHours + km / settings.roadSpeedKmh;
}

interface StepText {
  title: string;
  body: string;
  summary: string;
}

function describeStep(t: Bundle, to: TransferState, data: TransferStepData, actorName: string): StepText {
  const route = `${t.fromShop.name} → ${t.toShop.name}`;
  const what = instrumentLine(t.instrument);
  const job = `Job ${t.job.number}`;
  const family = INSTRUMENT_FAMILY_LABELS[t.instrument.family];
  switch (to) {
    case 'requested':
      return {
        title: `Transfer requested: ${family} to ${t.toShop.name}`,
        body: `${actorName} asks to send ${job} (${what}) from ${t.fromShop.name} to ${t.toShop.name}. Reason: ${t.reason} It waits for a manager's approval.`,
        summary: `Transfer requested: ${route}. ${t.reason}`,
      };
    case 'approved':
      return {
        title: `Transfer approved: ${family}, ${route}`,
        body: `${actorName} approved sending ${job} (${what}) from ${t.fromShop.name} to ${t.toShop.name}.${data.note ? ` Note: ${data.note}` : ''} ${t.fromShop.name} packs it for the next relay run.`,
        summary: `Transfer approved: ${route}${data.note ? `. ${data.note}` : ''}`,
      };
    case 'rejected':
      return {
        title: `Transfer rejected: ${family}, ${route}`,
        body: `${actorName} rejected sending ${job} (${what}) to ${t.toShop.name}. Reason: ${data.reason}`,
        summary: `Transfer rejected: ${route}. ${data.reason}`,
      };
    case 'cancelled':
      return {
        title: `Transfer cancelled: ${family}, ${route}`,
        body: `${actorName} cancelled sending ${job} (${what}) to ${t.toShop.name}. Reason: ${data.reason}`,
        summary: `Transfer cancelled: ${route}. ${data.reason}`,
      };
    case 'packed':
      return {
        title: `Packed for ${t.toShop.name}: ${family}`,
        body: `${actorName} packed ${job} (${what}) at ${t.fromShop.name} for ${t.toShop.name}. The manifest is attached to the transfer.`,
        summary: `Packed for the relay run: ${route}`,
      };
    case 'in_transit': {
      const eta = t.expectedArrivalAt ? ` Expected at ${t.toShop.name} ${formatDateTime(t.expectedArrivalAt, t.toShop.timeZone)}.` : '';
      if (t.relayRunId && t.departedAt) {
        const leaves = formatDateTime(t.departedAt, t.fromShop.timeZone);
        return {
          title: `Handed over for the relay run to ${t.toShop.name}: ${family}`,
          body: `${actorName} handed over ${job} (${what}) at ${t.fromShop.name} for the relay run to ${t.toShop.name}. The run leaves ${leaves}.${eta}`,
          summary: `Handed over for the relay run of ${leaves}: ${route}.${eta}`,
        };
      }
      return {
        title: `On the road to ${t.toShop.name}: ${family}`,
        body: `${job} (${what}) left ${t.fromShop.name} with a courier.${eta}`,
        summary: `Left on the courier trip: ${route}.${eta}`,
      };
    }
    case 'received':
      return {
        title: `Received at ${t.toShop.name}: ${family}`,
        body: `${actorName} received ${job} (${what}) at ${t.toShop.name} and confirmed the serial by ${data.receiveMethod === 'scan' ? 'scan' : 'typing it'}.`,
        summary: `Received: ${route}; serial confirmed by ${data.receiveMethod === 'scan' ? 'scan' : 'typing'}.`,
      };
  }
}

/** Steps after which someone at either shop lifts the case: packing, handing over, carrying it in. */
const LIFTING_STATES: TransferState[] = ['approved', 'packed', 'in_transit', 'received'];

const HISTORY_KIND: Record<TransferState, string> = {
  requested: 'transfer_requested',
  approved: 'transfer_approved',
  rejected: 'transfer_rejected',
  cancelled: 'transfer_cancelled',
  packed: 'transfer_packed',
  in_transit: 'transfer_departed',
  received: 'transfer_received',
};

/**
 * One step of a transfer, as the worker runs it. The database part is one transaction: the transfer
 * row (locked), the job and instrument, the history events, the in-app notices and the outbox e-mails.
 * The step's history event carries the key `transfer:<id>:<state>`: finding it means the step was
 * already committed, so a retried or duplicated job changes nothing and only finishes the work after
 * the commit (manifest, e-mail, arrival check), which is itself safe to repeat.
 */
export async function applyTransferStep(data: TransferStepData, hooks: { afterCommit?: () => void } = {}): Promise<StepOutcome> {
  const { networkId, transferId, to } = data;
  const at = new Date(data.at);
  const key = stepKey(transferId, to);

  const outcome = await sequelize.transaction(async (transaction): Promise<StepOutcome> => {
    // the lock serialises two steps of one transfer racing on two workers
    const locked = await Transfer.findOne({ where: { networkId, id: transferId }, lock: transaction.LOCK.UPDATE, transaction });
    if (!locked) return { status: 'skipped', transferId, to, reason: 'no such transfer' };
    const done = await HistoryEvent.findOne({ where: { networkId, idempotencyKey: key }, transaction });
    if (done) return { status: 'already-applied', transferId, to };
    // the request is always worth recording, even when a quick approval overtook it in the queue
    const valid = to === 'requested' || canMove(locked.state, to);
    if (!valid) return { status: 'skipped', transferId, to, reason: `the transfer is ${locked.state}` };

    const t = (await loadBundle(networkId, transferId, transaction))!;
    const actor = await User.findOne({ where: { networkId, id: data.actorUserId }, transaction });
    const actorName = actor?.name ?? 'Someone';
    const job = t.job;
    const instrument = t.instrument;
    // the job moves through the jobs service, after the step's own history entry (the timeline reads step, then stage)
    let moveJob: (() => Promise<void>) | null = null;

    switch (to) {
      case 'requested':
        break;
      case 'approved':
        await t.update({ state: 'approved', approvedByUserId: data.actorUserId, approvedAt: at, decisionNote: data.note ?? null }, { transaction });
        break;
      case 'rejected':
        await t.update({ state: 'rejected', approvedByUserId: data.actorUserId, decisionNote: data.reason ?? null }, { transaction });
        break;
      case 'cancelled':
        await t.update({ state: 'cancelled', decisionNote: data.reason ?? null }, { transaction });
        break;
      case 'packed':
        await t.update(
          {
            state: 'packed', packedByUserId: data.actorUserId, packedAt: at, relayRunId: data.relayRunId ?? null,
            caseCount: data.caseCount ?? 1, contents: data.contents ?? null, departureCondition: data.departureCondition ?? null,
          },
          { transaction },
        );
        break;
      case 'in_transit': {
        if (job.stage === 'released') return { status: 'skipped', transferId, to, reason: 'the job was released' };
        const relayRunId = data.relayRunId === undefined ? t.relayRunId : data.relayRunId;
        const run = relayRunId ? await RelayRun.findOne({ where: { networkId, id: relayRunId }, transaction }) : null;
        const network = await Network.findByPk(networkId, { transaction });
        const { departedAt, expectedArrivalAt } = departureFor(run, at, t.fromShop, t.toShop, network);
        await t.update({ state: 'in_transit', handedOverAt: at, departedAt, relayRunId: run?.id ?? null, expectedArrivalAt }, { transaction });
        await setInstrumentWhereabouts(instrument, { status: 'in_transit' }, transaction);
        // the customer hears where it went and where they still collect it (unless they turned notices off)
        await noticeCustomerOfTransfer(job, t.toShop.name, transferId, transaction);
        moveJob = () => sendJobOnTheRoad(job, { transferId, userId: data.actorUserId, at, stepKey: key, fromShopId: t.fromShopId }, transaction);
        break;
      }
      case 'received': {
        await t.update({ state: 'received', receivedByUserId: data.actorUserId, receivedAt: at }, { transaction });
        await setInstrumentWhereabouts(instrument, { currentShopId: t.toShopId, status: 'in_shop' }, transaction);
        moveJob = () =>
          receiveTransferredJob(job, { transferId, userId: data.actorUserId, at, stepKey: key, fromShop: t.fromShop, toShop: t.toShop }, transaction);
        break;
      }
    }

    const text = describeStep(t, to, data, actorName);
    // the people who will lift a heavy case read the lifting caution in the notice and the e-mail itself
    const liftingNote = isHeavyCase(t.instrument.family, t.instrument.heavyCase ?? false) && LIFTING_STATES.includes(to) ? `\n\n${LIFTING_CAUTION}` : '';
    await appendHistory(
      {
        networkId, instrumentId: instrument.id, jobId: job.id, shopId: to === 'received' ? t.toShopId : t.fromShopId,
        userId: data.actorUserId, kind: HISTORY_KIND[to], summary: text.summary,
        data: {
          transferId, from: t.fromShopId, to: t.toShopId, state: to,
          ...(data.note ? { note: data.note } : {}), ...(data.reason ? { reason: data.reason } : {}),
          ...(t.relayRunId ? { relayRunId: t.relayRunId } : {}), ...(data.receiveMethod ? { serialConfirmedBy: data.receiveMethod } : {}),
        },
        occurredAt: at, idempotencyKey: key,
      },
      transaction,
    );
    if (moveJob) await moveJob();

    // both shops hear of every step; the owners also hear of a request (they may approve it) and of its
    // cancellation (so a request they were weighing does not stay on their mind)
    const staff = await peopleAt(networkId, [t.fromShopId, t.toShopId], [...STAFF_ROLES], transaction);
    const owners = to === 'requested' || to === 'cancelled' ? await peopleAt(networkId, null, ['owner'], transaction) : [];
    const recipients = [...new Set([...staff, ...owners])].filter((id) => id !== data.actorUserId);
    await notify(
      {
        networkId, kind: 'transfer_incoming', userIds: recipients, title: text.title, body: text.body + liftingNote,
        link: `/transfers/${transferId}`, dedupeKey: key,
        email: { subject: `${text.title} (job ${job.number})`, text: text.body + liftingNote },
      },
      transaction,
    );
    return { status: 'applied', transferId, to };
  });

  if (outcome.status === 'skipped') return outcome;
  hooks.afterCommit?.();
  await finishStep(networkId, transferId, to);
  return outcome;
}

/** The part after the commit; each piece may run again after a crash without harm. */
async function finishStep(networkId: string, transferId: string, to: TransferState) {
  // the manifest is made at the pack step, and made again when the hand-over fixes the run's date
  if (to === 'packed' || to === 'in_transit') await writeManifest(networkId, transferId);
  await enqueueOutbox(transferId, to, `${stepKey(transferId, to)}:email:`);
  if (to === 'in_transit') {
    const t = await Transfer.findOne({ where: { networkId, id: transferId } });
    if (t?.state === 'in_transit' && t.expectedArrivalAt) await scheduleArrivalCheck({ networkId, transferId }, t.expectedArrivalAt);
  }
}

/** Renders the manifest from the rows as they are now and stores it; the same key each time. */
export async function writeManifest(networkId: string, transferId: string) {
  const t = await loadBundle(networkId, transferId);
  if (!t) return null;
  const run = t.relayRun;
  const body = await renderManifest({
    transferId: t.id,
    url: `${config.appOrigin}/transfers/${t.id}`,
    state: t.state,
    serial: t.instrument.serial,
    family: t.instrument.family,
    maker: t.instrument.maker,
    model: t.instrument.model,
    assetTag: t.instrument.assetTag,
    jobNumber: t.job.number,
    complaint: t.job.complaint,
    from: { name: t.fromShop.name, address: address(t.fromShop), timeZone: t.fromShop.timeZone },
    to: { name: t.toShop.name, address: address(t.toShop), timeZone: t.toShop.timeZone },
    run: run ? { weekdays: run.weekdays, departureTime: run.departureTime, transitHours: run.transitHours } : null,
    reason: t.reason,
    requestedBy: t.requestedBy?.name ?? '—',
    approvedBy: t.approvedBy?.name ?? null,
    packedBy: t.packedBy?.name ?? null,
    packedAt: t.packedAt,
    handedOverAt: t.handedOverAt,
    departedAt: t.departedAt,
    expectedArrivalAt: t.expectedArrivalAt,
    nextRunDepartureAt: run && !t.departedAt ? nextDeparture(run, t.packedAt ?? new Date(), t.fromShop.timeZone) : null,
    caseCount: t.caseCount ?? 1,
    contents: t.contents,
    departureCondition: t.departureCondition,
    heavyCase: isHeavyCase(t.instrument.family, t.instrument.heavyCase ?? false),
    generatedAt: new Date(),
  });
  const key = manifestKeyFor(networkId, transferId);
  await putObject(key, body, 'application/pdf');
  if (t.manifestKey !== key) await Transfer.update({ manifestKey: key }, { where: { networkId, id: transferId } });
  return key;
}

/**
 * Arrival checks for every transfer on the road, added again at worker start: transfers that went on the
 * road before the queue knew them (loaded data, a queue that was emptied) still get theirs. The fixed job
 * id makes this a no-op for those already scheduled.
 */
export async function scheduleOpenArrivalChecks() {
  const onRoad = await Transfer.findAll({ where: { state: 'in_transit', expectedArrivalAt: { [Op.ne]: null } }, limit: 10_000 });
  for (const t of onRoad) await scheduleArrivalCheck({ networkId: t.networkId, transferId: t.id }, t.expectedArrivalAt!);
  return onRoad.length;
}

/**
 * The delayed job at the expected arrival: a transfer still on the road is overdue, and the managers of
 * both shops (or the owners, where a shop has none) are told once.
 */
export async function checkTransferArrival(data: ArrivalCheckData, now = new Date()) {
  const { networkId, transferId } = data;
  const key = stepKey(transferId, 'overdue');
  const outcome = await sequelize.transaction(async (transaction) => {
    const t = await loadBundle(networkId, transferId, transaction);
    if (!t || t.state !== 'in_transit') return 'arrived' as const;
    if (t.expectedArrivalAt && t.expectedArrivalAt.getTime() > now.getTime() + 1000) return 'not-due' as const;
    const done = await HistoryEvent.findOne({ where: { networkId, idempotencyKey: key }, transaction });
    if (done) return 'already-noticed' as const;
    const managers = await peopleAt(networkId, [t.fromShopId, t.toShopId], ['regional_manager'], transaction);
    const recipients = managers.length ? managers : await peopleAt(networkId, null, ['owner'], transaction);
    const eta = t.expectedArrivalAt ? formatDateTime(t.expectedArrivalAt, t.toShop.timeZone) : 'the expected time';
    const family = INSTRUMENT_FAMILY_LABELS[t.instrument.family];
    const summary = `Overdue: not received at ${t.toShop.name} by ${eta}.`;
    await appendHistory(
      {
        networkId, instrumentId: t.instrumentId, jobId: t.jobId, shopId: t.toShopId, userId: null,
        kind: 'transfer_overdue', summary, data: { transferId, expectedArrivalAt: t.expectedArrivalAt }, occurredAt: now, idempotencyKey: key,
      },
      transaction,
    );
    const body = `${family} on job ${t.job.number} (${instrumentLine(t.instrument)}) left ${t.fromShop.name} for ${t.toShop.name} and was expected by ${eta}. It has not been received. Check with the courier and with ${t.toShop.name}.`;
    await notify(
      {
        networkId, kind: 'transfer_overdue', userIds: recipients, title: `Transfer overdue: ${family} to ${t.toShop.name}`, body,
        link: `/transfers/${transferId}`, dedupeKey: key,
        email: { subject: `Transfer overdue: ${family} to ${t.toShop.name} (job ${t.job.number})`, text: body },
      },
      transaction,
    );
    return 'overdue' as const;
  });
  if (outcome === 'overdue' || outcome === 'already-noticed') await enqueueOutbox(transferId, 'overdue', `${key}:email:`);
  return { status: outcome };
}
