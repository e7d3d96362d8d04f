import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { HistoryEvent, Instrument, Job, Shop } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { assertCan } from '../../lib/access.js';
import { AppError, badRequest, conflict, notFound } from '../../lib/errors.js';
import { JOB_STAGE_LABELS, OPEN_JOB_STAGES, type JobStage } from '../../../shared/domain.js';

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

/** Calendar date ('YYYY-MM-DD') of an instant in a time zone. */
function localDate(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).format(at);
}

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
    await instrument.update({ currentShopId: shop.id, status: 'in_shop' }, t);
  }

  await HistoryEvent.bulkCreate(
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
    t,
  );
  return job;
}
