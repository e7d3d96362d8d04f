import { subject } from '@casl/ability';
import { Op, QueryTypes, fn, col, type Transaction, type WhereOptions, type Order } from 'sequelize';
import type { z } from 'zod';
import {
  Customer,
  CustomerLink,
  EstimateDecision,
  HistoryEvent,
  Instrument,
  Job,
  JobLineItem,
  Part,
  ServiceCatalogItem,
  Shop,
  Skill,
  TimeLog,
  Transfer,
  User,
  sequelize,
} from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere, assertCan } from '../../lib/access.js';
import { appendHistory, appendHistoryMany, customerViewById, setInstrumentWhereabouts, visibleCustomerNames } from '../registry/index.js';
import { AppError, badRequest, conflict, forbidden, notFound } from '../../lib/errors.js';
import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS, OPEN_JOB_STAGES, type InstrumentFamily, type JobStage, type Role } from '../../../shared/domain.js';
import {
  estimateTotals,
  laborHours,
  lineTotalCents,
  type EstimateLine,
  type EstimateTotals,
} from '../../../shared/jobs/estimate.js';
import { formatCents } from '../../../shared/money.js';
import { closedDaysOf } from '../networks/index.js';
import { addOpeningDays, formatCalendarDate, isOverdue, localDate, ShopCalendarError } from '../../../shared/jobs/promised-date.js';
import {
  allowedMoves,
  checkMove,
  estimateNeedsReapproval,
  isEstimateFrozen,
  mayRecordApproval,
  rolesAtShop,
  type JobState,
} from '../../../shared/jobs/stage-machine.js';
import { cautionsFor, isHeavyCase, normaliseHazards, type Hazard } from '../../../shared/safety/hazards.js';
import { CUSTOMER_LINK_DAYS_AFTER_RELEASE } from '../../../shared/customers/public-page.js';
import {
  INTAKE_ACCESSORIES,
  INTAKE_ACCESSORY_LABELS,
  type IntakeAccessory,
  ESTIMATE_APPROVAL_METHOD_LABELS,
  type approvalSchema,
  type BoardQuery,
  type catalogItemSchema,
  type catalogItemUpdateSchema,
  type catalogQuerySchema,
  type JobUpdate,
  type LineItemCreate,
  type lineItemUpdateSchema,
  type stageMoveSchema,
  type timeLogSchema,
} from '../../../shared/jobs/schemas.js';
import type {
  BenchJob,
  BoardResponse,
  CatalogItemDto,
  HistoryDto,
  JobDetail,
  JobSummary,
  LineItemDto,
  PersonRef,
  TimeLogDto,
} from '../../../shared/jobs/dto.js';
import { notify, peopleAt } from '../notifications/index.js';
import { queueCustomerNotice, queueEstimateRequest } from './customer-mail.js';

/**
 * Jobs at the bench: the board, the job page, stage moves, the estimate, approvals, time and the
 * service catalog. Every function starts from the session's network; ids from the URL are looked up
 * inside it, so another network's job is simply not found.
 */

const OPEN_EXCEPT_DONE: JobStage[] = ['ready', 'released'];

const iso = (d: Date | string | null | undefined) => (d == null ? null : new Date(d).toISOString());
const person = (u: { id: string; name: string } | null | undefined): PersonRef | null => (u ? { id: u.id, name: u.name } : null);
const asRow = (job: Job) => job.get({ plain: true }) as unknown as Record<string, unknown>;

async function findJob(actor: Actor, jobId: string, options: { transaction?: Transaction; lock?: boolean } = {}) {
  const job = await Job.findOne({
    where: { networkId: actor.networkId, id: jobId },
    transaction: options.transaction,
    lock: options.lock ? options.transaction?.LOCK.UPDATE : undefined,
  });
  if (!job) throw notFound('That job');
  return job;
}

async function findShop(networkId: string, shopId: string, transaction?: Transaction) {
  const shop = await Shop.findOne({ where: { networkId, id: shopId }, transaction });
  if (!shop) throw notFound('That shop');
  return shop;
}

export async function readableJob(actor: Actor, jobId: string, options: { transaction?: Transaction; lock?: boolean } = {}) {
  const job = await findJob(actor, jobId, options);
  // a job the person may not read answers like a missing one, so its existence does not leak
  if (!actor.ability.can('read', subject('Job', asRow(job)))) throw notFound('That job');
  return job;
}

/** A job's customer links stop working 30 days after its release (and whenever revoked). */
export function linkStillOpen(job: Pick<Job, 'releasedAt'>, now = new Date()): boolean {
  return !job.releasedAt || now.getTime() < new Date(job.releasedAt).getTime() + CUSTOMER_LINK_DAYS_AFTER_RELEASE * 86_400_000;
}

export const rolesFor = (actor: Actor, shopId: string): Role[] => rolesAtShop(actor.memberships, shopId);

export async function recordHistory(
  job: Pick<Job, 'networkId' | 'id' | 'instrumentId' | 'shopId'>,
  userId: string | null,
  kind: string,
  summary: string,
  data: Record<string, unknown>,
  transaction?: Transaction,
) {
  return appendHistory({ networkId: job.networkId, instrumentId: job.instrumentId, jobId: job.id, shopId: job.shopId, userId, kind, summary, data }, transaction);
}

/** People who may be assigned work at a shop: its technicians. */
async function techniciansAt(networkId: string, shopId: string, transaction?: Transaction): Promise<PersonRef[]> {
  return sequelize.query<PersonRef>(
    `select u.id, u.name
       from users u
       join memberships m on m.network_id = u.network_id and m.user_id = u.id
      where u.network_id = :networkId and m.shop_id = :shopId and m.role = 'technician' and u.active
      order by u.name`,
    { type: QueryTypes.SELECT, replacements: { networkId, shopId }, transaction },
  );
}

async function networkSkills(networkId: string): Promise<PersonRef[]> {
  const skills = await Skill.findAll({ where: { networkId }, order: [['name', 'ASC']], attributes: ['id', 'name'] });
  return skills.map((s) => ({ id: s.id, name: s.name }));
}

/**
 * Every join names the tenant too: the primary keys are (network_id, id), so a join on the id alone
 * cannot use them and read the whole instruments table for each board (1.2 s at a million instruments).
 */
const summaryIncludes = (networkId: string) => [
  { model: Instrument, as: 'instrument', attributes: ['id', 'family', 'maker', 'model', 'serial', 'heavyCase'], where: { networkId }, required: true },
  { model: User, as: 'assignee', attributes: ['id', 'name'], where: { networkId }, required: false },
  { model: Skill, as: 'requiredSkill', attributes: ['id', 'name'], where: { networkId }, required: false },
  { model: Customer, as: 'customer', attributes: ['id', 'kind', 'name', 'homeShopId'], where: { networkId }, required: false },
  { model: Shop, as: 'shop', attributes: ['id', 'name', 'timeZone'], where: { networkId }, required: true },
];

/** Customer names as the viewer may see them (registry's rule), for a page of jobs. */
const customerNamesFor = (actor: Actor, jobs: Job[]) => visibleCustomerNames(actor, jobs.map((j) => j.customer));

function toSummary(job: Job, names: Map<string, string | null>, now = new Date()): JobSummary {
  const customerName = job.customer ? (names.get(job.customer.id) ?? null) : null;
  const shop = job.shop!;
  const inst = job.instrument!;
  return {
    id: job.id,
    number: job.number,
    stage: job.stage,
    stageBeforeHold: job.stageBeforeHold ?? null,
    shop: { id: shop.id, name: shop.name, timeZone: shop.timeZone },
    instrument: {
      id: inst.id, family: inst.family, maker: inst.maker, model: inst.model ?? null, serial: inst.serial,
      heavyCase: isHeavyCase(inst.family, inst.heavyCase ?? false),
    },
    customerName,
    customerHidden: !!job.customer && customerName === null,
    complaint: job.complaint,
    assignee: person(job.assignee),
    requiredSkill: person(job.requiredSkill),
    promisedOn: job.promisedOn ?? null,
    overdue: isOverdue(job.promisedOn, job.stage, now, shop.timeZone),
    estimateApproved: Boolean(job.estimateApprovedAt),
    openedAt: iso(job.openedAt)!,
    updatedAt: iso(job.updatedAt)!,
  };
}

// ---------------------------------------------------------------------------------------------
// Board and my bench

function boardOrder(sort: BoardQuery['sort'], dir: 'asc' | 'desc' | undefined): Order {
  const d = (fallback: 'ASC' | 'DESC') => (dir ? (dir.toUpperCase() as 'ASC' | 'DESC') : fallback);
  switch (sort) {
    case 'promised':
      return [['promisedOn', `${d('ASC')} NULLS LAST`], ['number', 'ASC']];
    case 'opened':
      return [['openedAt', d('DESC')], ['number', 'DESC']];
    case 'number':
      return [['number', d('ASC')]];
    case 'updated':
      return [['updatedAt', d('DESC')], ['number', 'DESC']];
  }
}

export async function jobBoard(actor: Actor, q: BoardQuery): Promise<BoardResponse> {
  const shop = await findShop(actor.networkId, q.shop);
  if (!actor.ability.can('read', subject('Job', { shopId: shop.id }) as never)) {
    throw forbidden('You do not see this shop’s job board.');
  }
  const readWhere = accessibleWhere(actor.ability, 'read', 'Job') ?? { id: null };
  const now = new Date();
  const today = localDate(now, shop.timeZone);

  const filters: WhereOptions[] = [{ networkId: actor.networkId }, { shopId: shop.id }, readWhere];
  if (q.technician === 'unassigned') filters.push({ assignedUserId: null });
  else if (q.technician) filters.push({ assignedUserId: q.technician });
  if (q.skill) filters.push({ requiredSkillId: q.skill });
  if (q.overdue) filters.push({ promisedOn: { [Op.lt]: today } }, { stage: { [Op.notIn]: OPEN_EXCEPT_DONE } });
  const instrumentInclude = {
    model: Instrument,
    as: 'instrument',
    attributes: [] as string[],
    required: true,
    where: { networkId: actor.networkId, ...(q.family ? { family: q.family } : {}) },
  };

  const stageWhere: WhereOptions =
    q.stage === 'open' ? { stage: { [Op.ne]: 'released' } } : q.stage === 'all' ? {} : { stage: q.stage };

  // the instrument is joined only to filter by family: every job has one (a not-null foreign key)
  const countRows = (await Job.findAll({
    where: { [Op.and]: filters },
    include: q.family ? [instrumentInclude] : [],
    attributes: ['stage', [fn('count', col('Job.id')), 'n']],
    group: ['Job.stage'],
    raw: true,
  })) as unknown as Array<{ stage: JobStage; n: string }>;
  const counts: Partial<Record<JobStage, number>> = {};
  for (const row of countRows) counts[row.stage] = Number(row.n); // COUNT comes back as a string

  const includes = summaryIncludes(actor.networkId).map((inc) =>
    inc.as === 'instrument' || inc.as === 'shop'
      ? { ...inc, required: inc.as === 'instrument' && !!q.family, where: { ...inc.where, ...(inc.as === 'instrument' && q.family ? { family: q.family } : {}) } }
      : inc,
  );
  const { rows, count } = await Job.findAndCountAll({
    where: { [Op.and]: [...filters, stageWhere] },
    include: includes,
    order: boardOrder(q.sort, q.dir),
    limit: q.pageSize,
    offset: (q.page - 1) * q.pageSize,
  });

  const [technicians, skills, names] = await Promise.all([
    techniciansAt(actor.networkId, shop.id), networkSkills(actor.networkId), customerNamesFor(actor, rows),
  ]);
  return {
    shop: { id: shop.id, name: shop.name, timeZone: shop.timeZone },
    jobs: rows.map((j) => toSummary(j, names, now)),
    total: count,
    page: q.page,
    pageSize: q.pageSize,
    counts,
    filters: { technicians, skills },
  };
}

/** A technician's own open work across their shops, soonest promise first (no promise last). */
export async function myBench(actor: Actor, shopId?: string): Promise<{ jobs: BenchJob[] }> {
  const readWhere = accessibleWhere(actor.ability, 'read', 'Job') ?? { id: null };
  const rows = await Job.findAll({
    where: {
      [Op.and]: [
        { networkId: actor.networkId, assignedUserId: actor.id, stage: { [Op.ne]: 'released' } },
        shopId ? { shopId } : {},
        readWhere,
      ],
    },
    include: summaryIncludes(actor.networkId),
    order: [['promisedOn', 'ASC NULLS LAST'], ['number', 'ASC']],
    limit: 200,
  });
  const now = new Date();
  const [names, lines] = await Promise.all([
    customerNamesFor(actor, rows),
    JobLineItem.findAll({
      where: { networkId: actor.networkId, jobId: rows.map((j) => j.id) },
      attributes: ['jobId', 'catalogItemId', 'partId'],
    }),
  ]);
  const tags = await lineHazardsOf(actor.networkId, lines);
  return {
    jobs: rows.map((j) => {
      const summary = toSummary(j, names, now);
      const own = lines.filter((l) => l.jobId === j.id);
      return { ...summary, hazards: jobHazards(own, tags, summary.instrument.heavyCase) };
    }),
  };
}

// ---------------------------------------------------------------------------------------------
// Hazards: the owner's tags on catalog items and parts decide a job's cautions

interface HazardTags {
  catalog: Map<string, Hazard[]>;
  parts: Map<string, Hazard[]>;
}

type TaggedLine = Pick<JobLineItem, 'catalogItemId' | 'partId'>;

/** The owner's tags of the catalog items and parts the lines name. */
async function lineHazardsOf(networkId: string, lines: TaggedLine[], transaction?: Transaction): Promise<HazardTags> {
  const catalogIds = [...new Set(lines.map((l) => l.catalogItemId).filter((id): id is string => !!id))];
  const partIds = [...new Set(lines.map((l) => l.partId).filter((id): id is string => !!id))];
  const [items, parts] = await Promise.all([
    catalogIds.length
      ? ServiceCatalogItem.findAll({ where: { networkId, id: catalogIds }, attributes: ['id', 'hazards'], transaction })
      : [],
    partIds.length ? Part.findAll({ where: { networkId, id: partIds }, attributes: ['id', 'hazards'], transaction }) : [],
  ]);
  return {
    catalog: new Map(items.map((i) => [i.id, i.hazards ?? []])),
    parts: new Map(parts.map((p) => [p.id, p.hazards ?? []])),
  };
}

function hazardsOfLine(line: TaggedLine, tags: HazardTags): Hazard[] {
  return [
    ...(line.catalogItemId ? (tags.catalog.get(line.catalogItemId) ?? []) : []),
    ...(line.partId ? (tags.parts.get(line.partId) ?? []) : []),
  ];
}

/** Every hazard of a job's lines, plus lifting when the instrument travels in a heavy case. */
function jobHazards(lines: TaggedLine[], tags: HazardTags, heavyCase: boolean): Hazard[] {
  return normaliseHazards([...lines.flatMap((l) => hazardsOfLine(l, tags)), ...(heavyCase ? (['heavy_lift'] as const) : [])]);
}

// ---------------------------------------------------------------------------------------------
// The job page

function lineDto(item: JobLineItem, tags: HazardTags): LineItemDto {
  const hazards = normaliseHazards(hazardsOfLine(item, tags));
  return {
    id: item.id,
    kind: item.kind,
    catalogItemId: item.catalogItemId ?? null,
    partId: item.partId ?? null,
    description: item.description,
    hours: item.hours ?? null,
    rateCents: item.rateCents ?? null,
    quantity: item.quantity ?? null,
    unitPriceCents: item.unitPriceCents ?? null,
    position: item.position,
    totalCents: lineTotalCents(toEstimateLine(item)),
    hazards,
    cautions: cautionsFor(hazards),
  };
}

function toEstimateLine(item: Pick<JobLineItem, 'kind' | 'hours' | 'rateCents' | 'quantity' | 'unitPriceCents'>): EstimateLine {
  return item.kind === 'labor'
    ? { kind: 'labor', hours: item.hours ?? 0, rateCents: item.rateCents ?? 0 }
    : { kind: 'part', quantity: item.quantity ?? 0, unitPriceCents: item.unitPriceCents ?? 0 };
}

async function lineItemsOf(job: Job, transaction?: Transaction) {
  return JobLineItem.findAll({
    where: { networkId: job.networkId, jobId: job.id },
    order: [['position', 'ASC'], ['createdAt', 'ASC']],
    transaction,
  });
}

export async function jobDetail(actor: Actor, jobId: string): Promise<JobDetail> {
  const base = await readableJob(actor, jobId);
  const job = (await Job.findOne({
    where: { networkId: actor.networkId, id: base.id },
    include: [...summaryIncludes(actor.networkId), { model: User, as: 'openedBy', attributes: ['id', 'name'], where: { networkId: actor.networkId }, required: false }],
  }))!;
  const shop = await findShop(actor.networkId, job.shopId);
  const [items, logs, history, technicians, skills, customer, openTransfer, closedDays] = await Promise.all([
    lineItemsOf(job),
    TimeLog.findAll({
      where: { networkId: actor.networkId, jobId: job.id },
      include: [{ model: User, as: 'user', attributes: ['id', 'name'] }],
      order: [['workedOn', 'DESC'], ['createdAt', 'DESC']],
    }),
    HistoryEvent.findAll({
      where: { networkId: actor.networkId, jobId: job.id },
      include: [{ model: User, as: 'user', attributes: ['id', 'name'] }],
      order: [['occurredAt', 'DESC']],
      limit: 100,
    }),
    techniciansAt(actor.networkId, job.shopId),
    networkSkills(actor.networkId),
    customerViewById(actor, job.customerId ?? null),
    Transfer.findOne({
      where: { networkId: actor.networkId, jobId: job.id, state: { [Op.in]: ['requested', 'approved', 'packed', 'in_transit'] } },
      include: [
        { association: 'fromShop', attributes: ['id', 'name', 'timeZone'] },
        { association: 'toShop', attributes: ['id', 'name', 'timeZone'] },
      ],
    }) as Promise<(Transfer & { fromShop: Shop; toShop: Shop }) | null>,
    closedDaysOf(actor.networkId, job.shopId),
  ]);
  const [decisions, links, customerRow, pickupShop] = await Promise.all([
    EstimateDecision.findAll({ where: { networkId: actor.networkId, jobId: job.id }, order: [['decidedAt', 'DESC'], ['createdAt', 'DESC']] }),
    CustomerLink.findAll({ where: { networkId: actor.networkId, jobId: job.id }, order: [['createdAt', 'DESC']] }),
    job.customerId ? Customer.findOne({ where: { networkId: actor.networkId, id: job.customerId } }) : null,
    Shop.findOne({ where: { networkId: actor.networkId, id: job.pickupShopId ?? job.shopId }, attributes: ['id', 'name'] }),
  ]);
  const linkOpen = linkStillOpen(job);
  const liveLinks = links.filter((l) => !l.revokedAt && linkOpen);
  const lastOpened = links.map((l) => l.lastOpenedAt).filter((d): d is Date => !!d).sort((a, b) => b.getTime() - a.getTime())[0];

  const tags = await lineHazardsOf(actor.networkId, items);
  const heavyCase = isHeavyCase(job.instrument!.family, job.instrument!.heavyCase ?? false);
  const hazards = jobHazards(items, tags, heavyCase);
  const row = asRow(job);
  const roles = rolesFor(actor, job.shopId);
  const canUpdate = actor.ability.can('update', subject('Job', row));
  const canMove = actor.ability.can('move_stage', subject('Job', row));
  const totals = estimateTotals(items.map(toEstimateLine), shop.taxRateBasisPoints);
  const needsReapproval = estimateNeedsReapproval(job, totals.totalCents);
  const moves = canMove ? allowedMoves(jobState(job, needsReapproval), roles) : [];
  // the registry's rule: contact (and a private person's name) only for the shops that serve the customer
  const contactShown = customer?.contactVisible ?? false;

  const timeLogs: TimeLogDto[] = logs.map((l) => ({
    id: l.id,
    user: person(l.user) ?? { id: l.userId, name: 'Former staff' },
    minutes: l.minutes,
    workedOn: l.workedOn,
    note: l.note ?? null,
    createdAt: iso(l.createdAt)!,
    mine: l.userId === actor.id,
  }));
  const byTech = new Map<string, { user: PersonRef; minutes: number }>();
  for (const l of timeLogs) {
    const entry = byTech.get(l.user.id) ?? { user: l.user, minutes: 0 };
    entry.minutes += l.minutes;
    byTech.set(l.user.id, entry);
  }

  return {
    job: {
      ...toSummary(job, new Map(customer ? [[customer.id, customer.name]] : [])),
      conditionNotes: job.conditionNotes ?? null,
      accessories: (job.accessories ?? []) as IntakeAccessory[],
      accessoriesOther: job.accessoriesOther ?? null,
      estimatedHours: job.estimatedHours ?? null,
      estimateApproval:
        job.estimateApprovedAt && job.estimateApprovedByName && job.estimateApprovalMethod
          ? {
              at: iso(job.estimateApprovedAt)!,
              // who approved is the customer or their contact person: shown where the customer's contact is
              byName: !customer || contactShown ? job.estimateApprovedByName : null,
              method: job.estimateApprovalMethod,
              totalCents: job.approvedTotalCents ?? null,
              version: job.approvedEstimateVersion ?? null,
            }
          : null,
      estimateVersion: job.estimateVersion ?? 0,
      openTransfer: openTransfer
        ? {
            id: openTransfer.id,
            state: openTransfer.state as 'requested' | 'approved' | 'packed' | 'in_transit',
            fromShop: { id: openTransfer.fromShop.id, name: openTransfer.fromShop.name, timeZone: openTransfer.fromShop.timeZone },
            toShop: { id: openTransfer.toShop.id, name: openTransfer.toShop.name, timeZone: openTransfer.toShop.timeZone },
            departedAt: iso(openTransfer.departedAt),
            expectedArrivalAt: iso(openTransfer.expectedArrivalAt),
            onRelayRun: !!openTransfer.relayRunId,
          }
        : null,
      needsReapproval,
      readyAt: iso(job.readyAt),
      releasedAt: iso(job.releasedAt),
      openedBy: person(job.openedBy),
      pickupShop: person(pickupShop),
    },
    estimateDecisions: decisions.map((d) => ({
      id: d.id,
      decision: d.decision,
      method: d.method,
      name: !customer || contactShown ? d.name : null,
      totalCents: d.totalCents,
      version: d.estimateVersion,
      at: iso(d.decidedAt)!,
    })),
    customerLink: { live: liveLinks.length, lastIssuedAt: iso(links[0]?.createdAt), lastOpenedAt: iso(lastOpened) },
    shop: {
      id: shop.id,
      name: shop.name,
      timeZone: shop.timeZone,
      openingDays: shop.openingDays,
      country: shop.country ?? null,
      region: shop.region ?? null,
      closedDays,
      laborRateCents: shop.laborRateCents,
      taxRateBasisPoints: shop.taxRateBasisPoints,
    },
    customer: customer
      ? {
          id: customer.id,
          name: customer.name,
          kind: customer.kind,
          email: customer.contact?.email ?? null,
          phone: customer.contact?.phone ?? null,
          contactShown,
          poNumber: contactShown ? (customerRow?.poNumber ?? null) : null,
          taxExemptCertificate: contactShown ? (customerRow?.taxExemptCertificate ?? null) : null,
          noticesOptOut: customerRow?.noticesOptOut ?? false,
        }
      : null,
    lineItems: items.map((i) => lineDto(i, tags)),
    safety: { hazards, heavyCase, cautions: cautionsFor(hazards) },
    totals,
    timeLogs,
    timeByTechnician: [...byTech.values()].sort((a, b) => b.minutes - a.minutes),
    history: history.map(
      (h): HistoryDto => ({ id: h.id, kind: h.kind, summary: h.summary, occurredAt: iso(h.occurredAt)!, userName: h.user?.name ?? null }),
    ),
    moves,
    can: {
      update: canUpdate,
      moveStage: canMove && moves.length > 0,
      recordApproval: canUpdate && mayRecordApproval(roles) && !['intake', 'released'].includes(job.stage),
      editEstimate: actor.ability.can('edit_estimate', subject('Job', row)) && !isEstimateFrozen(job.stage),
      logTime: canUpdate,
      addAttachment: actor.ability.can('create', subject('Attachment', { shopId: job.shopId }) as never),
      customerLink: canUpdate && mayRecordApproval(roles) && job.stage !== 'released',
    },
    options: { technicians, skills },
  };
}

// ---------------------------------------------------------------------------------------------
// Changes to a job

export async function updateJob(actor: Actor, jobId: string, input: JobUpdate): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await readableJob(actor, jobId, { transaction, lock: true });
    assertCan(actor.ability, 'update', 'Job', asRow(job), 'You cannot change jobs at this shop.');
    if (job.stage === 'released') throw conflict('This job has been released; it can no longer be changed.');
    const shop = await findShop(actor.networkId, job.shopId, transaction);
    const changes: Partial<Job> = {};
    const notes: string[] = [];

    if (input.assignedUserId !== undefined && input.assignedUserId !== job.assignedUserId) {
      if (input.assignedUserId) {
        const techs = await techniciansAt(actor.networkId, job.shopId, transaction);
        const tech = techs.find((t) => t.id === input.assignedUserId);
        if (!tech) throw badRequest('Some fields need attention.', { assignedUserId: 'Choose a technician of this shop.' });
        notes.push(`assigned to ${tech.name}`);
      } else {
        notes.push('unassigned');
      }
      changes.assignedUserId = input.assignedUserId;
    }
    if (input.requiredSkillId !== undefined) {
      if (input.requiredSkillId) {
        const skill = await Skill.findOne({ where: { networkId: actor.networkId, id: input.requiredSkillId }, transaction });
        if (!skill) throw badRequest('Some fields need attention.', { requiredSkillId: 'Choose one of the network’s skills.' });
      }
      changes.requiredSkillId = input.requiredSkillId;
    }
    let promise: string | null | undefined;
    if (input.promiseInOpeningDays !== undefined) {
      try {
        const closedDays = await closedDaysOf(actor.networkId, job.shopId, transaction);
        promise = addOpeningDays(new Date(), input.promiseInOpeningDays, {
          timeZone: shop.timeZone,
          openingDays: shop.openingDays,
          country: shop.country,
          region: shop.region,
          closedDays,
        });
      } catch (err) {
        // a shop row with no opening day or an unknown time zone: say so instead of counting forever
        if (err instanceof ShopCalendarError) throw conflict(err.message, { promiseInOpeningDays: err.message });
        throw err;
      }
    }
    else if (input.promisedOn !== undefined) promise = input.promisedOn;
    if (promise !== undefined && promise !== job.promisedOn) {
      changes.promisedOn = promise;
      notes.push(promise ? `promised for ${formatCalendarDate(promise)}` : 'promise date cleared');
    }
    if (input.complaint !== undefined) changes.complaint = input.complaint;
    if (input.conditionNotes !== undefined) changes.conditionNotes = input.conditionNotes || null;
    if (input.accessories !== undefined) {
      // kept in the list's order, each once
      changes.accessories = INTAKE_ACCESSORIES.filter((a) => input.accessories!.includes(a));
      notes.push(`came with: ${changes.accessories.map((a) => INTAKE_ACCESSORY_LABELS[a as IntakeAccessory].toLowerCase()).join(', ') || 'nothing ticked'}`);
    }
    if (input.accessoriesOther !== undefined) changes.accessoriesOther = input.accessoriesOther || null;

    await job.update(changes, { transaction });
    if (notes.length) {
      await recordHistory(job, actor.id, 'job_updated', `Job ${job.number}: ${notes.join('; ')}`, { ...changes }, transaction);
    }
  });
  return jobDetail(actor, jobId);
}

interface MoveResult {
  job: Job;
  from: JobStage;
}

/**
 * Moves a job through the stage machine inside a transaction the caller owns. People move as
 * 'person' (their roles at the job's shop decide); the transfer steps move as 'transfer'.
 */
export async function applyStageMove(
  job: Job,
  to: JobStage,
  by: { userId: string | null; roles: Role[]; via: 'person' | 'transfer'; note?: string },
  transaction: Transaction,
): Promise<MoveResult> {
  const check = checkMove(jobState(job, by.via === 'person' ? await raisedSinceApproval(job, transaction) : false), to, by.roles, by.via);
  if (!check.ok) {
    if (check.reason === 'not_your_move') throw new AppError(403, 'forbidden', check.message);
    throw new AppError(409, 'move_refused', check.message, undefined, { reason: check.reason });
  }
  const from = job.stage;
  const now = new Date();
  const changes: Partial<Job> = { stage: check.to, stageBeforeHold: check.stageBeforeHold };
  if (check.to === 'ready') changes.readyAt = now;
  if (check.to === 'released') changes.releasedAt = now;
  // a technician who starts unassigned work takes it
  if (check.to === 'on_bench' && !job.assignedUserId && by.userId && by.roles.includes('technician')) {
    changes.assignedUserId = by.userId;
  }
  await job.update(changes, { transaction });
  const label = (s: JobStage) => JOB_STAGE_LABELS[s];
  const event = await recordHistory(
    job,
    by.userId,
    'stage_changed',
    `Job ${job.number}: ${label(from)} → ${label(check.to)}${by.note ? ` — ${by.note}` : ''}`,
    { from, to: check.to, ...(by.note ? { note: by.note } : {}), via: by.via },
    transaction,
  );
  if (check.to === 'released') {
    // the instrument has gone back to its owner
    await setInstrumentWhereabouts({ networkId: job.networkId, id: job.instrumentId }, { status: 'in_service' }, transaction);
  }
  // the estimate goes to the customer as an approval request (with its link and PDF); ready is a notice
  if (check.to === 'assessed') await queueEstimateRequest(job, { key: event.id, userId: by.userId }, transaction);
  if (check.to === 'ready') await queueCustomerNotice(job, { kind: 'ready' }, event.id, transaction);
  if (check.to === 'assessed' || check.to === 'ready') await noticeFrontDesk(job, check.to, event.id, by.userId, transaction);
  return { job, from };
}

/**
 * The front desk of the job's shop hears when an estimate goes out (they follow up with the customer)
 * and when the work is ready (they arrange the collection). The person who made the move is not told.
 */
async function noticeFrontDesk(job: Job, stage: 'assessed' | 'ready', eventId: string, byUserId: string | null, transaction: Transaction) {
  const [desk, shop, instrument] = await Promise.all([
    peopleAt(job.networkId, [job.shopId], ['front_desk'], transaction),
    Shop.findOne({ where: { networkId: job.networkId, id: job.shopId }, attributes: ['name'], transaction }),
    Instrument.findOne({ where: { networkId: job.networkId, id: job.instrumentId }, attributes: ['family', 'maker', 'serial'], transaction }),
  ]);
  const what = instrument ? `${INSTRUMENT_FAMILY_LABELS[instrument.family]} ${instrument.maker}, serial ${instrument.serial}` : 'The instrument';
  const where = shop?.name ?? 'the shop';
  const text =
    stage === 'ready'
      ? { kind: 'job_ready' as const, title: `Job ${job.number} is ready to collect`, body: `${what} passed its final check at ${where}.` }
      : {
          kind: 'estimate_awaiting_approval' as const,
          title: `Estimate for job ${job.number} awaits approval`,
          body: `${what}: the estimate is with the customer; work at ${where} starts once they approve.`,
        };
  await notify(
    {
      networkId: job.networkId,
      kind: text.kind,
      userIds: desk.filter((id) => id !== byUserId),
      title: text.title,
      body: text.body,
      // the job's own shop: someone at several shops lands on it whatever shop they were looking at
      link: `/jobs/${job.id}?shop=${job.shopId}`,
      dedupeKey: `${text.kind}:${job.id}:${eventId}`,
      email: { subject: text.title, text: text.body },
      sendAfterCommit: true,
    },
    transaction,
  );
}

export async function moveJobStage(actor: Actor, jobId: string, input: z.infer<typeof stageMoveSchema>): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await readableJob(actor, jobId, { transaction, lock: true });
    assertCan(actor.ability, 'move_stage', 'Job', asRow(job), 'You cannot move jobs at this shop.');
    await applyStageMove(job, input.to, { userId: actor.id, roles: rolesFor(actor, job.shopId), via: 'person', note: input.note }, transaction);
  });
  return jobDetail(actor, jobId);
}

/** Stage names inside a transfer's sentences ("approved → in transit"). */
const lowerStage = (s: JobStage) => JOB_STAGE_LABELS[s].toLowerCase();

/** What a transfer step tells the jobs service when it moves a job. */
export interface TransferMove {
  transferId: string;
  userId: string | null;
  /** When the step happened (the hand-over, the receipt): the history entry's time. */
  at: Date;
  /** The step's key; the job's history entry carries `<key>:stage`. */
  stepKey: string;
}

/**
 * A transfer's hand-over puts the job on the road. A job waiting for parts (or already on the road)
 * keeps the stage it will resume; any other stage becomes that stage. No customer e-mail or notice:
 * the transfer step sends its own. The caller holds the job's row lock.
 */
export async function sendJobOnTheRoad(job: Job, move: TransferMove & { fromShopId: string }, transaction: Transaction) {
  const fromStage = job.stage;
  const resume = job.stage === 'waiting_for_parts' || job.stage === 'in_transit' ? job.stageBeforeHold : job.stage;
  await job.update({ stage: 'in_transit', stageBeforeHold: resume }, { transaction });
  await appendHistory(
    {
      networkId: job.networkId, instrumentId: job.instrumentId, jobId: job.id, shopId: move.fromShopId, userId: move.userId,
      kind: 'stage_changed', summary: `Job ${job.number}: ${lowerStage(fromStage)} → ${lowerStage('in_transit')}`,
      data: { from: fromStage, to: 'in_transit', transferId: move.transferId }, occurredAt: move.at, idempotencyKey: `${move.stepKey}:stage`,
    },
    transaction,
  );
}

/**
 * A transfer's receipt: the job belongs to the receiving shop from now on, resumes the stage it left
 * in (unassigned: the new shop picks its technician) and its estimate is taxed at the new shop's rate,
 * which leaves an estimate entry when the total changes. The caller holds the job's row lock.
 */
export async function receiveTransferredJob(
  job: Job,
  move: TransferMove & { fromShop: Pick<Shop, 'taxRateBasisPoints'>; toShop: Pick<Shop, 'id' | 'name' | 'taxRateBasisPoints'> },
  transaction: Transaction,
) {
  const resume: JobStage = job.stageBeforeHold ?? (job.stage === 'in_transit' ? 'approved' : job.stage);
  // the estimate is taxed where the work is done: a shop with another rate changes its total
  const estimateBefore = await currentEstimate(job, transaction, move.fromShop.taxRateBasisPoints);
  await job.update({ shopId: move.toShop.id, stage: resume, stageBeforeHold: null, assignedUserId: null }, { transaction });
  await recordEstimateChange(
    job, move.userId, `re-taxed at ${move.toShop.name}'s rate after the transfer`, estimateBefore, transaction,
    await currentEstimate(job, transaction, move.toShop.taxRateBasisPoints),
  );
  await appendHistory(
    {
      networkId: job.networkId, instrumentId: job.instrumentId, jobId: job.id, shopId: move.toShop.id, userId: move.userId,
      kind: 'stage_changed', summary: `Job ${job.number}: ${lowerStage('in_transit')} → ${lowerStage(resume)} at ${move.toShop.name}`,
      data: { from: 'in_transit', to: resume, transferId: move.transferId, shopId: move.toShop.id }, occurredAt: move.at, idempotencyKey: `${move.stepKey}:stage`,
    },
    transaction,
  );
}

// ---------------------------------------------------------------------------------------------
// Customer notices from other steps

/**
 * Tells the customer their instrument went to another shop. The why is said in plain words from the job's
 * required skill; the transfer's own reason is staff writing and stays inside the network.
 */
export async function noticeCustomerOfTransfer(job: Job, toShopName: string, transferId: string, transaction: Transaction) {
  const skill = job.requiredSkillId ? await Skill.findOne({ where: { networkId: job.networkId, id: job.requiredSkillId }, transaction }) : null;
  const why = skill
    ? `the work it needs (${skill.name.toLowerCase()}) is done best by the specialist there.`
    : 'that shop has the bench and the specialist this work needs.';
  return queueCustomerNotice(job, { kind: 'transfer', toShopName, why }, transferId, transaction);
}

/** Days a finished instrument may wait before the customer gets a reminder (once per time it is ready). */
export const PICKUP_REMINDER_DAYS = 7;

/**
 * The daily sweep: a reminder to every customer whose instrument has waited ready and uncollected for
 * PICKUP_REMINDER_DAYS days or more. The outbox key holds the ready time, so each wait reminds once however
 * often the sweep runs.
 */
export async function sendPickupReminders(now = new Date()): Promise<{ reminded: number }> {
  const cutoff = new Date(now.getTime() - PICKUP_REMINDER_DAYS * 86_400_000);
  const jobs = await Job.findAll({
    where: { stage: 'ready', readyAt: { [Op.lte]: cutoff }, customerId: { [Op.ne]: null } },
    order: [['readyAt', 'ASC']],
    limit: 2000,
  });
  let reminded = 0;
  for (const job of jobs) {
    const days = Math.floor((now.getTime() - job.readyAt!.getTime()) / 86_400_000);
    const sent = await sequelize.transaction((transaction) =>
      queueCustomerNotice(job, { kind: 'reminder', days }, `ready-${job.readyAt!.getTime()}`, transaction),
    );
    if (sent) reminded++;
  }
  return { reminded };
}

// ---------------------------------------------------------------------------------------------
// Estimate: line items and approval

async function editableJob(actor: Actor, jobId: string, transaction: Transaction) {
  const job = await readableJob(actor, jobId, { transaction, lock: true });
  assertCan(actor.ability, 'edit_estimate', 'Job', asRow(job), 'You cannot change estimates at this shop.');
  assertEstimateOpen(job);
  return job;
}

/**
 * The one place the estimate's freeze is enforced (the rule itself is `isEstimateFrozen` in
 * shared/jobs/stage-machine.ts): every write of a job's lines goes through this module and calls it.
 */
export function assertEstimateOpen(job: Pick<Job, 'stage'>) {
  if (isEstimateFrozen(job.stage)) throw conflict('The work is finished; the estimate can no longer change.');
}

export interface PartLineInput {
  partId: string;
  description: string;
  quantity: number;
  unitPriceCents: number;
}

/**
 * Replaces the job's part lines whose part is in `scope` (say, every pad of the catalog) by `lines`,
 * appended after the job's other lines; labor and parts outside the scope stay. The caller holds the
 * job's row lock in `transaction` and has checked who may write; the freeze is checked here. Leaves the
 * estimate's history entry (with `what`) when the totals changed.
 */
export async function replacePartLines(
  job: Job,
  scope: ReadonlySet<string>,
  lines: readonly PartLineInput[],
  change: { userId: string | null; what: string },
  transaction: Transaction,
) {
  assertEstimateOpen(job);
  const before = await currentEstimate(job, transaction);
  await JobLineItem.destroy({ where: { networkId: job.networkId, jobId: job.id, kind: 'part', partId: { [Op.in]: [...scope] } }, transaction });
  const last = (await JobLineItem.max<number, JobLineItem>('position', { where: { networkId: job.networkId, jobId: job.id }, transaction })) ?? -1;
  await JobLineItem.bulkCreate(
    lines.map((line, i) => ({
      networkId: job.networkId,
      jobId: job.id,
      kind: 'part' as const,
      partId: line.partId,
      description: line.description,
      quantity: line.quantity,
      unitPriceCents: line.unitPriceCents,
      position: Number(last) + 1 + i,
    })),
    { transaction },
  );
  return recordEstimateChange(job, change.userId, change.what, before, transaction);
}

export function jobState(job: Job, needsReapproval: boolean): JobState {
  return { stage: job.stage, stageBeforeHold: job.stageBeforeHold, estimateApprovedAt: job.estimateApprovedAt, needsReapproval };
}

/** The estimate's totals as they stand, at the job's shop's tax rate (or another rate, for a shop it is going to). */
export async function currentEstimate(job: Job, transaction?: Transaction, taxRateBasisPoints?: number): Promise<EstimateTotals> {
  const items = await lineItemsOf(job, transaction);
  const rate = taxRateBasisPoints ?? (await findShop(job.networkId, job.shopId, transaction)).taxRateBasisPoints;
  return estimateTotals(items.map(toEstimateLine), rate);
}

async function raisedSinceApproval(job: Job, transaction?: Transaction) {
  if (job.approvedTotalCents == null) return false;
  return estimateNeedsReapproval(job, (await currentEstimate(job, transaction)).totalCents);
}

/**
 * Every change of an estimate's lines, tax or total moves its version on and leaves an entry on the
 * instrument's history with the totals before and after; a total above the approved amount says that it
 * needs a new approval. Changes that leave lines, tax and total as they were leave nothing.
 */
export async function recordEstimateChange(
  job: Job,
  userId: string | null,
  what: string,
  before: EstimateTotals,
  transaction: Transaction,
  after?: EstimateTotals,
) {
  const now = after ?? (await currentEstimate(job, transaction));
  const same =
    now.totalCents === before.totalCents &&
    now.taxRateBasisPoints === before.taxRateBasisPoints &&
    now.lineCents.length === before.lineCents.length &&
    now.lineCents.every((c, i) => c === before.lineCents[i]);
  if (same) return null;
  const version = (job.estimateVersion ?? 0) + 1;
  await job.update({ estimateVersion: version }, { transaction });
  const raised = estimateNeedsReapproval(job, now.totalCents);
  // the change that first takes the total above the approved amount asks the customer again (a link, a PDF)
  if (raised && !estimateNeedsReapproval(job, before.totalCents)) {
    await queueEstimateRequest(
      job,
      { key: `v${version}`, userId, raisedFrom: { totalCents: job.approvedTotalCents!, version: job.approvedEstimateVersion ?? 0 } },
      transaction,
    );
  }
  const approvedNote = job.approvedTotalCents != null
    ? raised
      ? `; approved ${formatCents(job.approvedTotalCents)} (v${job.approvedEstimateVersion ?? 0}), now ${formatCents(now.totalCents)}: needs a new approval`
      : `; within the approved ${formatCents(job.approvedTotalCents)}`
    : '';
  return appendHistory(
    {
      networkId: job.networkId, instrumentId: job.instrumentId, jobId: job.id, shopId: job.shopId, userId,
      kind: 'estimate_changed',
      summary: `Job ${job.number}: estimate v${version}, ${what}; total ${formatCents(before.totalCents)} → ${formatCents(now.totalCents)}${approvedNote}`,
      data: {
        version, what,
        before: { subtotalCents: before.subtotalCents, taxRateBasisPoints: before.taxRateBasisPoints, taxCents: before.taxCents, totalCents: before.totalCents, lines: before.lineCents.length },
        after: { subtotalCents: now.subtotalCents, taxRateBasisPoints: now.taxRateBasisPoints, taxCents: now.taxCents, totalCents: now.totalCents, lines: now.lineCents.length },
        approvedTotalCents: job.approvedTotalCents ?? null, approvedVersion: job.approvedEstimateVersion ?? null, needsReapproval: raised,
      },
    },
    transaction,
  );
}

/** Keeps the job's estimated hours (read by routing and bench load) equal to its labor lines. */
async function refreshEstimatedHours(job: Job, transaction: Transaction) {
  const items = await lineItemsOf(job, transaction);
  const hours = laborHours(items.map(toEstimateLine));
  await job.update({ estimatedHours: items.some((i) => i.kind === 'labor') ? hours : null }, { transaction });
}

export async function addLineItem(actor: Actor, jobId: string, input: LineItemCreate): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await editableJob(actor, jobId, transaction);
    const shop = await findShop(actor.networkId, job.shopId, transaction);
    const before = await currentEstimate(job, transaction, shop.taxRateBasisPoints);
    const last = await JobLineItem.max<number | null, JobLineItem>('position', { where: { networkId: actor.networkId, jobId: job.id }, transaction });
    const position = (last ?? -1) + 1;
    if (input.kind === 'labor') {
      const item = await ServiceCatalogItem.findOne({ where: { networkId: actor.networkId, id: input.catalogItemId, active: true }, transaction });
      if (!item) throw badRequest('Some fields need attention.', { catalogItemId: 'Choose an active service from the catalog.' });
      const instrument = await Instrument.findOne({ where: { networkId: actor.networkId, id: job.instrumentId }, transaction });
      if (item.family && instrument && item.family !== instrument.family) {
        throw badRequest('Some fields need attention.', {
          catalogItemId: `That service is for a ${INSTRUMENT_FAMILY_LABELS[item.family as InstrumentFamily].toLowerCase()}.`,
        });
      }
      await JobLineItem.create(
        {
          networkId: actor.networkId,
          jobId: job.id,
          kind: 'labor',
          catalogItemId: item.id,
          description: input.description ?? item.name,
          hours: input.hours ?? item.standardHours,
          // the shop's rate when the line is added: a later rate change does not rewrite an estimate
          rateCents: shop.laborRateCents,
          position,
        },
        { transaction },
      );
      if (!job.requiredSkillId && item.skillId) await job.update({ requiredSkillId: item.skillId }, { transaction });
    } else {
      if (input.partId) {
        const part = await Part.findOne({ where: { networkId: actor.networkId, id: input.partId }, transaction });
        if (!part) throw badRequest('Some fields need attention.', { partId: 'That part is not in the network’s parts list.' });
      }
      await JobLineItem.create(
        {
          networkId: actor.networkId,
          jobId: job.id,
          kind: 'part',
          partId: input.partId ?? null,
          description: input.description,
          quantity: input.quantity,
          unitPriceCents: input.unitPriceCents,
          position,
        },
        { transaction },
      );
    }
    await refreshEstimatedHours(job, transaction);
    await recordEstimateChange(job, actor.id, `line added (${input.kind === 'labor' ? 'labor' : input.description})`, before, transaction);
  });
  return jobDetail(actor, jobId);
}

async function findLineItem(actor: Actor, job: Job, itemId: string, transaction: Transaction) {
  const item = await JobLineItem.findOne({ where: { networkId: actor.networkId, jobId: job.id, id: itemId }, transaction });
  if (!item) throw notFound('That line');
  return item;
}

export async function updateLineItem(
  actor: Actor,
  jobId: string,
  itemId: string,
  input: z.infer<typeof lineItemUpdateSchema>,
): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await editableJob(actor, jobId, transaction);
    const item = await findLineItem(actor, job, itemId, transaction);
    const before = await currentEstimate(job, transaction);
    const changes: Partial<JobLineItem> = {};
    if (input.description !== undefined) changes.description = input.description;
    if (item.kind === 'labor') {
      if (input.quantity !== undefined || input.unitPriceCents !== undefined) {
        throw badRequest('Some fields need attention.', { quantity: 'Labor lines have hours, not quantities.' });
      }
      if (input.hours !== undefined) changes.hours = input.hours;
    } else {
      if (input.hours !== undefined) throw badRequest('Some fields need attention.', { hours: 'Part lines have quantities, not hours.' });
      if (input.quantity !== undefined) changes.quantity = input.quantity;
      if (input.unitPriceCents !== undefined) changes.unitPriceCents = input.unitPriceCents;
    }
    await item.update(changes, { transaction });
    await refreshEstimatedHours(job, transaction);
    await recordEstimateChange(job, actor.id, `line changed (${item.description})`, before, transaction);
  });
  return jobDetail(actor, jobId);
}

export async function removeLineItem(actor: Actor, jobId: string, itemId: string): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await editableJob(actor, jobId, transaction);
    const item = await findLineItem(actor, job, itemId, transaction);
    const before = await currentEstimate(job, transaction);
    await item.destroy({ transaction });
    await refreshEstimatedHours(job, transaction);
    await recordEstimateChange(job, actor.id, `line removed (${item.description})`, before, transaction);
  });
  return jobDetail(actor, jobId);
}

/**
 * Records who approved the estimate, when and how. A job waiting at Assessed moves on to Approved
 * in the same step, because that approval is exactly what the move waits for.
 */
export async function recordApproval(actor: Actor, jobId: string, input: z.infer<typeof approvalSchema>): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await readableJob(actor, jobId, { transaction, lock: true });
    assertCan(actor.ability, 'update', 'Job', asRow(job), 'You cannot change jobs at this shop.');
    const roles = rolesFor(actor, job.shopId);
    if (!mayRecordApproval(roles)) throw forbidden('Front desk or a manager records the customer’s approval.');
    if (job.stage === 'intake') throw conflict('Assess the job and send the estimate before recording an approval.');
    if (job.stage === 'released') throw conflict('This job has been released.');
    const at = input.approvedAt ? new Date(input.approvedAt) : new Date();
    if (at.getTime() > Date.now() + 5 * 60_000) throw badRequest('Some fields need attention.', { approvedAt: 'That is in the future.' });
    // the approval is of this version and this total: a later raise above it needs a new one
    const totals = await currentEstimate(job, transaction);
    const version = job.estimateVersion ?? 0;
    await job.update(
      {
        estimateApprovedAt: at, estimateApprovedByName: input.approvedByName, estimateApprovalMethod: input.method,
        approvedTotalCents: totals.totalCents, approvedEstimateVersion: version,
      },
      { transaction },
    );
    await EstimateDecision.create(
      {
        networkId: job.networkId, jobId: job.id, decision: 'approved', method: input.method, name: input.approvedByName,
        totalCents: totals.totalCents, estimateVersion: version, decidedAt: at, recordedByUserId: actor.id,
      },
      { transaction },
    );
    await recordHistory(
      job,
      actor.id,
      'estimate_approved',
      // the approver's name stays on the job (shown where the customer's contact is); the timeline is read
      // network-wide, so its event says how, not who
      `Job ${job.number}: estimate v${version} approved (${ESTIMATE_APPROVAL_METHOD_LABELS[input.method].toLowerCase()}), ${formatCents(totals.totalCents)}`,
      { method: input.method, approvedAt: at.toISOString(), totalCents: totals.totalCents, version },
      transaction,
    );
    if (job.stage === 'assessed') {
      await applyStageMove(job, 'approved', { userId: actor.id, roles, via: 'person' }, transaction);
    }
  });
  return jobDetail(actor, jobId);
}

// ---------------------------------------------------------------------------------------------
// Time log

export async function logTime(actor: Actor, jobId: string, input: z.infer<typeof timeLogSchema>): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await readableJob(actor, jobId, { transaction });
    assertCan(actor.ability, 'update', 'Job', asRow(job), 'You cannot log time on jobs at this shop.');
    const shop = await findShop(actor.networkId, job.shopId, transaction);
    const today = localDate(new Date(), shop.timeZone);
    const workedOn = input.workedOn ?? today;
    if (workedOn > today) throw badRequest('Some fields need attention.', { workedOn: 'Time can only be logged for today or earlier.' });
    await TimeLog.create(
      { networkId: actor.networkId, jobId: job.id, userId: actor.id, minutes: input.minutes, workedOn, note: input.note || null },
      { transaction },
    );
  });
  return jobDetail(actor, jobId);
}

export async function removeTimeLog(actor: Actor, jobId: string, logId: string): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await readableJob(actor, jobId, { transaction });
    assertCan(actor.ability, 'update', 'Job', asRow(job), 'You cannot change time on jobs at this shop.');
    const log = await TimeLog.findOne({ where: { networkId: actor.networkId, jobId: job.id, id: logId }, transaction });
    if (!log) throw notFound('That time entry');
    const roles = rolesFor(actor, job.shopId);
    if (log.userId !== actor.id && !roles.includes('owner') && !roles.includes('regional_manager')) {
      throw forbidden('Only the person who logged the time, or a manager, can remove it.');
    }
    await log.destroy({ transaction });
  });
  return jobDetail(actor, jobId);
}

// ---------------------------------------------------------------------------------------------
// Service catalog (the owner edits it; the people who write estimates read it)

function catalogDto(item: ServiceCatalogItem): CatalogItemDto {
  return {
    id: item.id,
    name: item.name,
    family: item.family ?? null,
    standardHours: item.standardHours,
    skill: person(item.skill),
    active: item.active,
    hazards: normaliseHazards(item.hazards ?? []),
    cautions: cautionsFor(item.hazards ?? []),
  };
}

export async function listCatalog(
  actor: Actor,
  q: z.infer<typeof catalogQuerySchema>,
): Promise<{ items: CatalogItemDto[]; skills: PersonRef[] }> {
  assertCan(actor.ability, 'read', 'ServiceCatalog', undefined, 'You cannot see the service catalog.');
  const where: WhereOptions[] = [{ networkId: actor.networkId }];
  if (!q.includeInactive) where.push({ active: true });
  // a service for "any family" (null) fits every instrument
  if (q.family) where.push({ [Op.or]: [{ family: q.family }, { family: null }] });
  const items = await ServiceCatalogItem.findAll({
    where: { [Op.and]: where },
    include: [{ model: Skill, as: 'skill', attributes: ['id', 'name'] }],
    order: [['active', 'DESC'], ['name', 'ASC']],
  });
  return { items: items.map(catalogDto), skills: await networkSkills(actor.networkId) };
}

async function checkSkill(networkId: string, skillId: string | null | undefined) {
  if (!skillId) return;
  const skill = await Skill.findOne({ where: { networkId, id: skillId } });
  if (!skill) throw badRequest('Some fields need attention.', { skillId: 'Choose one of the network’s skills.' });
}

async function catalogItemById(networkId: string, id: string) {
  const item = await ServiceCatalogItem.findOne({
    where: { networkId, id },
    include: [{ model: Skill, as: 'skill', attributes: ['id', 'name'] }],
  });
  if (!item) throw notFound('That service');
  return item;
}

export async function createCatalogItem(actor: Actor, input: z.infer<typeof catalogItemSchema>): Promise<CatalogItemDto> {
  assertCan(actor.ability, 'create', 'ServiceCatalog', undefined, 'Only the owner edits the service catalog.');
  await checkSkill(actor.networkId, input.skillId);
  const item = await ServiceCatalogItem.create({
    networkId: actor.networkId, ...input, active: input.active ?? true, hazards: input.hazards ?? [],
  });
  return catalogDto(await catalogItemById(actor.networkId, item.id));
}

export async function updateCatalogItem(actor: Actor, id: string, input: z.infer<typeof catalogItemUpdateSchema>): Promise<CatalogItemDto> {
  const item = await catalogItemById(actor.networkId, id);
  assertCan(actor.ability, 'update', 'ServiceCatalog', undefined, 'Only the owner edits the service catalog.');
  await checkSkill(actor.networkId, input.skillId);
  await item.update(input);
  return catalogDto(await catalogItemById(actor.networkId, id));
}

// ---------------------------------------------------------------------------------------------
// Opening a job (intake)

export interface OpenJobInput {
  instrumentId: string;
  shopId: string;
  customerId?: string | null;
  complaint: string;
  conditionNotes?: string | null;
  /** 'YYYY-MM-DD', a calendar date in the shop's time zone. */
  promisedOn?: string | null;
  /**
   * The client's key for this intake; the intake history event carries it, so the same key never opens
   * a second job (the caller looks it up first with `findJobOpenedBy`).
   */
  requestKey?: string;
}

/** Advisory-lock class for job numbers; the second key is the network, so networks never wait on each other. */
const JOB_NUMBER_LOCK_CLASS = 7301;

export const intakeEventKey = (requestKey: string) => `intake:${requestKey}`;

/** The job an earlier request with this key opened, if any (a retried or double-submitted intake). */
export async function findJobOpenedBy(actor: Actor, requestKey: string, transaction?: Transaction): Promise<Job | null> {
  const event = await HistoryEvent.findOne({
    where: { networkId: actor.networkId, idempotencyKey: intakeEventKey(requestKey) },
    transaction,
  });
  if (!event?.jobId) return null;
  return Job.findOne({ where: { networkId: actor.networkId, id: event.jobId }, transaction });
}

/**
 * Opens a job at a shop for an instrument: the next job number of the network, stage intake, the
 * instrument moved into the shop, and the timeline's `intake` and `job_opened` events.
 *
 * Job numbers are what people say on the phone, so they are dense per network. Two desks opening
 * jobs at once would both read the same max(number); a transaction-scoped advisory lock per network
 * makes them take turns for the few milliseconds between reading and inserting.
 */
export async function openJob(actor: Actor, input: OpenJobInput, transaction?: Transaction): Promise<Job> {
  if (!transaction) return sequelize.transaction((t) => openJob(actor, input, t));
  const t = { transaction };
  const networkId = actor.networkId;

  const shop = await Shop.findOne({ where: { networkId, id: input.shopId }, ...t });
  if (!shop) throw notFound('That shop');
  assertCan(actor.ability, 'create', 'Job', { shopId: shop.id }, `You cannot open jobs at ${shop.name}.`);

  const instrument = await Instrument.findOne({ where: { networkId, id: input.instrumentId }, ...t, lock: transaction.LOCK.UPDATE });
  if (!instrument) throw notFound('That instrument');
  if (instrument.status === 'retired') {
    throw conflict('This instrument is retired from service; it cannot be taken in for work.');
  }

  const complaint = input.complaint.trim();
  if (complaint.length < 3) throw badRequest('Some fields need attention.', { complaint: 'Write what the customer reports.' });
  if (input.promisedOn && input.promisedOn < localDate(new Date(), shop.timeZone)) {
    throw badRequest('Some fields need attention.', { promisedOn: 'The promised date cannot be in the past.' });
  }

  // one visit at a time: the instrument row lock above makes this check and the insert one step
  const open = await Job.findOne({
    where: { networkId, instrumentId: instrument.id, stage: OPEN_JOB_STAGES },
    include: [{ association: 'shop', attributes: ['name'] }],
    ...t,
  });
  if (open) {
    throw new AppError(
      409,
      'open_job_exists',
      `This instrument already has job ${open.number} open at ${open.shop?.name ?? 'another shop'} (${JOB_STAGE_LABELS[open.stage as JobStage].toLowerCase()}).`,
      undefined,
      { jobId: open.id, jobNumber: open.number },
    );
  }

  await sequelize.query('select pg_advisory_xact_lock(:lockClass, hashtext(:networkId))', {
    replacements: { lockClass: JOB_NUMBER_LOCK_CLASS, networkId },
    type: QueryTypes.SELECT,
    ...t,
  });
  const [{ next }] = await sequelize.query<{ next: number }>(
    'select coalesce(max(number), 0)::int + 1 as next from jobs where network_id = :networkId',
    { replacements: { networkId }, type: QueryTypes.SELECT, ...t },
  );

  const now = new Date();
  const job = await Job.create(
    {
      networkId,
      number: next,
      instrumentId: instrument.id,
      shopId: shop.id,
      pickupShopId: shop.id,
      customerId: input.customerId ?? null,
      stage: 'intake',
      complaint,
      conditionNotes: input.conditionNotes?.trim() || null,
      promisedOn: input.promisedOn ?? null,
      openedByUserId: actor.id,
      openedAt: now,
    },
    t,
  );

  if (instrument.currentShopId !== shop.id || instrument.status !== 'in_shop') {
    await setInstrumentWhereabouts(instrument, { currentShopId: shop.id, status: 'in_shop' }, t.transaction);
  }

  await appendHistoryMany(
    [
      {
        networkId, instrumentId: instrument.id, jobId: job.id, shopId: shop.id, userId: actor.id, kind: 'intake',
        summary: `Checked in at ${shop.name}: ${complaint}`,
        data: { complaint, conditionNotes: job.conditionNotes, promisedOn: job.promisedOn },
        occurredAt: now,
        idempotencyKey: input.requestKey ? intakeEventKey(input.requestKey) : `job:${job.id}:intake`,
      },
      {
        networkId, instrumentId: instrument.id, jobId: job.id, shopId: shop.id, userId: actor.id, kind: 'job_opened',
        summary: `Job ${job.number} opened at ${shop.name}`,
        data: { number: job.number, promisedOn: job.promisedOn },
        // a millisecond later, so newest-first lists show the opening above the intake it belongs to
        occurredAt: new Date(now.getTime() + 1),
        idempotencyKey: `job:${job.id}:opened`,
      },
    ],
    t.transaction,
  );
  return job;
}
