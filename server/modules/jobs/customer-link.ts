import { Op, type Transaction } from 'sequelize';
import type { Actor } from '../../lib/auth.js';
import { AppError, conflict, forbidden } from '../../lib/errors.js';
import { assertCan } from '../../lib/access.js';
import { Attachment, Customer, CustomerLink, EstimateDecision, Instrument, Job, JobLineItem, Shop, Transfer, sequelize } from '../../lib/models.js';
import { INSTRUMENT_FAMILY_LABELS } from '../../../shared/domain.js';
import { lineTotalCents } from '../../../shared/jobs/estimate.js';
import { formatCents } from '../../../shared/money.js';
import { formatCalendarDate } from '../../../shared/jobs/promised-date.js';
import { estimateNeedsReapproval, mayRecordApproval } from '../../../shared/jobs/stage-machine.js';
import { INTAKE_ACCESSORY_LABELS, type EstimateApprovalMethod, type IntakeAccessory } from '../../../shared/jobs/schemas.js';
import { config } from '../../config.js';
import { renderClaimTicket } from './claim-ticket.js';
import { formatDateTime } from '../../../shared/time/format.js';
import { formatWeekdays } from '../../../shared/routing/rank.js';
import {
  CUSTOMER_LINK_TOKEN,
  serialEnding,
  stageInPlainWords,
  type CustomerDecisionInput,
  type JobCustomerUpdate,
  type PublicJobView,
  type PublicShop,
} from '../../../shared/customers/public-page.js';
import { hashCustomerToken, issueLinkToken, queueEstimateRequest, shopAddress } from './customer-mail.js';
import { applyStageMove, currentEstimate, jobDetail, linkStillOpen, readableJob, recordHistory, rolesFor } from './service.js';
import type { JobDetail } from '../../../shared/jobs/dto.js';
import { customerViewById } from '../registry/index.js';

/**
 * The customer's side of a job: the front desk makes, sends and revokes private links; the customer opens
 * the job's public page with one and approves or declines the estimate. A link reaches exactly one job and
 * only what `publicJobView` puts in its answer.
 */

// ---------------------------------------------------------------------------------------------
// The front desk

async function deskJob(actor: Actor, jobId: string, transaction: Transaction) {
  const job = await readableJob(actor, jobId, { transaction, lock: true });
  assertCan(actor.ability, 'update', 'Job', job.get({ plain: true }), 'You cannot change jobs at this shop.');
  if (!mayRecordApproval(rolesFor(actor, job.shopId))) throw forbidden('The front desk or a manager deals with the customer’s link.');
  if (job.stage === 'released') throw conflict('This job has been released.');
  return job;
}

/** A new private link, shown once to the person who made it (to copy into a text message, say). */
export async function issueCustomerLink(actor: Actor, jobId: string): Promise<{ url: string }> {
  return sequelize.transaction(async (transaction) => {
    const job = await deskJob(actor, jobId, transaction);
    const { url } = await issueLinkToken(job, actor.id, transaction);
    await recordHistory(job, actor.id, 'customer_link_issued', `Job ${job.number}: a new customer link was made`, {}, transaction);
    return { url };
  });
}

/** Ends every live link of the job: a forwarded or lost e-mail opens nothing from now on. */
export async function revokeCustomerLinks(actor: Actor, jobId: string): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await deskJob(actor, jobId, transaction);
    const [count] = await CustomerLink.update(
      { revokedAt: new Date(), revokedByUserId: actor.id },
      { where: { networkId: job.networkId, jobId: job.id, revokedAt: null }, transaction },
    );
    if (count) {
      await recordHistory(job, actor.id, 'customer_link_revoked', `Job ${job.number}: customer links revoked (${count})`, { count }, transaction);
    }
  });
  return jobDetail(actor, jobId);
}

/** E-mails the estimate (PDF and a fresh link) to the customer again, or for the first time after assessment. */
export async function sendEstimate(actor: Actor, jobId: string): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await deskJob(actor, jobId, transaction);
    if (job.stage === 'intake') throw conflict('Assess the job and write the estimate before sending it.');
    if (!job.customerId) throw conflict('This job has no customer to send the estimate to.');
    const customer = await Customer.findOne({ where: { networkId: job.networkId, id: job.customerId }, transaction });
    if (!customer?.email) throw conflict('The customer has no e-mail address; give them the estimate by phone or in person.');
    const raised = job.approvedTotalCents != null && estimateNeedsReapproval(job, (await currentEstimate(job, transaction)).totalCents);
    const event = await recordHistory(job, actor.id, 'estimate_sent', `Job ${job.number}: estimate v${job.estimateVersion ?? 0} sent to the customer`, {
      version: job.estimateVersion ?? 0,
    }, transaction);
    await queueEstimateRequest(
      job,
      {
        key: event.id,
        userId: actor.id,
        raisedFrom: raised ? { totalCents: job.approvedTotalCents!, version: job.approvedEstimateVersion ?? 0 } : null,
      },
      transaction,
    );
  });
  return jobDetail(actor, jobId);
}

/**
 * The job's customer's purchase order, tax-exempt certificate and notice choice, set by the desk of a
 * shop that serves the customer (the registry's contact rule): others do not see the customer's details.
 */
export async function updateJobCustomer(actor: Actor, jobId: string, input: JobCustomerUpdate): Promise<JobDetail> {
  await sequelize.transaction(async (transaction) => {
    const job = await deskJob(actor, jobId, transaction);
    if (!job.customerId) throw conflict('This job has no customer.');
    const view = await customerViewById(actor, job.customerId, transaction);
    if (!view?.contactVisible) throw forbidden('The customer’s details stay with the shops that serve them.');
    const changes: Partial<Customer> = {};
    if (input.poNumber !== undefined) changes.poNumber = input.poNumber || null;
    if (input.taxExemptCertificate !== undefined) changes.taxExemptCertificate = input.taxExemptCertificate || null;
    if (input.noticesOptOut !== undefined) changes.noticesOptOut = input.noticesOptOut;
    await Customer.update(changes, { where: { networkId: job.networkId, id: job.customerId }, transaction });
  });
  return jobDetail(actor, jobId);
}

/**
 * The claim ticket the counter prints at intake (desk and bench people who may change the job). The
 * customer's name is printed only for those who may see it (the registry's rule).
 */
export async function claimTicketPdf(actor: Actor, jobId: string): Promise<{ number: number; pdf: Buffer }> {
  const job = await readableJob(actor, jobId);
  assertCan(actor.ability, 'update', 'Job', job.get({ plain: true }), 'You cannot print tickets for jobs at this shop.');
  const where = { networkId: job.networkId };
  const [shop, instrument, customer, photoCount] = await Promise.all([
    Shop.findOne({ where: { ...where, id: job.shopId } }),
    Instrument.findOne({ where: { ...where, id: job.instrumentId } }),
    customerViewById(actor, job.customerId ?? null),
    Attachment.count({ where: { ...where, jobId: job.id, kind: 'photo', status: 'stored' } }),
  ]);
  const pdf = await renderClaimTicket({
    jobNumber: job.number,
    url: `${config.appOrigin}/jobs/${job.id}?shop=${job.shopId}`,
    shop: { name: shop!.name, address: shopAddress(shop!), phone: shop!.phone ?? null, timeZone: shop!.timeZone },
    openedAt: job.openedAt,
    promisedOn: job.promisedOn ?? null,
    instrument: {
      family: INSTRUMENT_FAMILY_LABELS[instrument!.family],
      maker: instrument!.maker,
      model: instrument!.model ?? null,
      serial: instrument!.serial,
    },
    customerName: customer?.name ?? null,
    complaint: job.complaint,
    conditionNotes: job.conditionNotes ?? null,
    accessories: [
      ...(job.accessories ?? []).map((a) => INTAKE_ACCESSORY_LABELS[a as IntakeAccessory] ?? a),
      ...(job.accessoriesOther ? [job.accessoriesOther] : []),
    ],
    photoCount,
    printedAt: new Date(),
  });
  return { number: job.number, pdf };
}

// ---------------------------------------------------------------------------------------------
// The customer (no account: the token is the key)

/** One answer for a token that is malformed, unknown, revoked or past its time: nothing to tell them apart. */
const linkNotFound = () => new AppError(404, 'not_found', 'This link does not open anything. Ask the shop for a new one.');

async function jobByToken(token: string, transaction?: Transaction, lock = false) {
  if (!CUSTOMER_LINK_TOKEN.test(token)) throw linkNotFound();
  const link = await CustomerLink.findOne({ where: { tokenHash: hashCustomerToken(token), revokedAt: null }, transaction });
  if (!link) throw linkNotFound();
  const job = await Job.findOne({
    where: { networkId: link.networkId, id: link.jobId },
    transaction,
    lock: lock && transaction ? transaction.LOCK.UPDATE : undefined,
  });
  if (!job || !linkStillOpen(job)) throw linkNotFound();
  return { link, job };
}

function publicShop(shop: Shop): PublicShop {
  return {
    name: shop.name,
    address: shopAddress(shop),
    phone: shop.phone ?? null,
    email: shop.email ?? null,
    openDays: formatWeekdays(shop.openingDays ?? []),
  };
}

/** How an approval came, in the customer's words ("Approved …, on this page"). */
const HOW_FOR_CUSTOMER: Record<EstimateApprovalMethod, string> = {
  link: 'on this page',
  phone: 'by phone',
  in_person: 'in person',
  email: 'by e-mail',
};

const DECIDABLE = ['assessed', 'approved', 'on_bench', 'quality_check', 'waiting_for_parts', 'in_transit'];

async function buildView(job: Job, transaction?: Transaction): Promise<PublicJobView> {
  const where = { networkId: job.networkId };
  const [shop, pickup, instrument, customer, totals, latestDecision, transfer] = await Promise.all([
    Shop.findOne({ where: { ...where, id: job.shopId }, transaction }),
    Shop.findOne({ where: { ...where, id: job.pickupShopId ?? job.shopId }, transaction }),
    Instrument.findOne({ where: { ...where, id: job.instrumentId }, transaction }),
    job.customerId ? Customer.findOne({ where: { ...where, id: job.customerId }, transaction }) : null,
    currentEstimate(job, transaction),
    EstimateDecision.findOne({ where: { ...where, jobId: job.id }, order: [['decidedAt', 'DESC'], ['createdAt', 'DESC']], transaction }),
    job.stage === 'in_transit'
      ? (Transfer.findOne({
          where: { ...where, jobId: job.id, state: { [Op.in]: ['approved', 'packed', 'in_transit'] } },
          include: [{ association: 'toShop', attributes: ['name'] }],
          transaction,
        }) as Promise<(Transfer & { toShop?: Shop }) | null>)
      : null,
  ]);
  const items = await JobLineItem.findAll({
    where: { ...where, jobId: job.id },
    order: [['position', 'ASC'], ['createdAt', 'ASC']],
    transaction,
  });
  const here = shop!;
  const version = job.estimateVersion ?? 0;
  const showEstimate = job.stage !== 'intake' && items.length > 0;
  const raised = job.approvedTotalCents != null && estimateNeedsReapproval(job, totals.totalCents);
  const declinedLatest = latestDecision?.decision === 'declined' && latestDecision.estimateVersion === version;
  let status: PublicJobView['approval']['status'];
  if (!showEstimate) status = 'not_ready';
  else if (job.stage === 'released' || job.stage === 'ready') status = job.approvedTotalCents != null ? 'approved' : 'closed';
  else if (raised) status = declinedLatest ? 'declined' : 'needs_reapproval';
  else if (job.approvedTotalCents != null) status = 'approved';
  else if (declinedLatest) status = 'declined';
  else status = 'awaiting';

  return {
    job: {
      number: job.number,
      stage: job.stage,
      stageText: stageInPlainWords(job.stage, transfer?.toShop?.name ?? null),
      promisedOn: job.promisedOn ? formatCalendarDate(job.promisedOn) : null,
    },
    instrument: {
      family: INSTRUMENT_FAMILY_LABELS[instrument!.family],
      maker: instrument!.maker,
      model: instrument!.model ?? null,
      serialEnding: serialEnding(instrument!.serial),
    },
    shopNow: publicShop(here),
    pickupShop: publicShop(pickup ?? here),
    estimate: showEstimate
      ? {
          version,
          lines: items.map((i) => ({
            description: i.description,
            totalCents: lineTotalCents(
              i.kind === 'labor'
                ? { kind: 'labor', hours: i.hours ?? 0, rateCents: i.rateCents ?? 0 }
                : { kind: 'part', quantity: i.quantity ?? 0, unitPriceCents: i.unitPriceCents ?? 0 },
            ),
          })),
          subtotalCents: totals.subtotalCents,
          taxRateBasisPoints: totals.taxRateBasisPoints,
          taxCents: totals.taxCents,
          totalCents: totals.totalCents,
          poNumber: customer?.poNumber ?? null,
          taxExemptCertificate: customer?.taxExemptCertificate ?? null,
        }
      : null,
    approval: {
      status,
      approved:
        job.approvedTotalCents != null && job.estimateApprovedAt && job.estimateApprovalMethod
          ? {
              totalCents: job.approvedTotalCents,
              version: job.approvedEstimateVersion ?? 0,
              at: formatDateTime(job.estimateApprovedAt, here.timeZone),
              method: HOW_FOR_CUSTOMER[job.estimateApprovalMethod as EstimateApprovalMethod],
            }
          : null,
      declinedAt: declinedLatest ? formatDateTime(latestDecision.decidedAt, here.timeZone) : null,
      canDecide: (status === 'awaiting' || status === 'needs_reapproval' || status === 'declined') && DECIDABLE.includes(job.stage),
    },
  };
}

/** The job's public page. Opening it notes when the link was last used (the front desk sees it). */
export async function publicJobView(token: string): Promise<PublicJobView> {
  const { link, job } = await jobByToken(token);
  await CustomerLink.update({ lastOpenedAt: new Date() }, { where: { networkId: link.networkId, id: link.id } });
  return buildView(job);
}

/**
 * The customer approves or declines the estimate as they read it (`estimateVersion`): the decision
 * records the typed name, the amount in cents, the version, the time and `link` as the way. An approval
 * at Assessed moves the job on to Approved, as the desk's record of an approval does.
 */
export async function recordCustomerDecision(token: string, input: CustomerDecisionInput): Promise<PublicJobView> {
  return sequelize.transaction(async (transaction) => {
    const { link, job } = await jobByToken(token, transaction, true);
    const before = await buildView(job, transaction);
    if (!before.approval.canDecide || !before.estimate) {
      throw conflict(
        before.approval.status === 'approved'
          ? 'This estimate is already approved.'
          : 'There is no estimate waiting for your answer. Call the shop if something is not right.',
      );
    }
    if (input.estimateVersion !== before.estimate.version) {
      throw new AppError(409, 'estimate_changed', 'The estimate changed while you were reading it. Read it again before you answer.');
    }
    const totalCents = before.estimate.totalCents;
    const now = new Date();
    await EstimateDecision.create(
      {
        networkId: job.networkId, jobId: job.id, decision: input.decision, method: 'link', name: input.name,
        totalCents, estimateVersion: before.estimate.version, decidedAt: now, recordedByUserId: null, linkId: link.id,
      },
      { transaction },
    );
    if (input.decision === 'approved') {
      await job.update(
        {
          estimateApprovedAt: now, estimateApprovedByName: input.name, estimateApprovalMethod: 'link',
          approvedTotalCents: totalCents, approvedEstimateVersion: before.estimate.version,
        },
        { transaction },
      );
      // like the desk's record: the timeline says how and how much, the name stays with the job
      await recordHistory(
        job, null, 'estimate_approved',
        `Job ${job.number}: estimate v${before.estimate.version} approved (customer link), ${formatCents(totalCents)}`,
        { method: 'link', approvedAt: now.toISOString(), totalCents, version: before.estimate.version },
        transaction,
      );
      if (job.stage === 'assessed') {
        // the customer's own approval does what the front desk's record of it does
        await applyStageMove(job, 'approved', { userId: null, roles: ['front_desk'], via: 'person', note: 'approved by the customer' }, transaction);
      }
    } else {
      await recordHistory(
        job, null, 'estimate_declined',
        `Job ${job.number}: estimate v${before.estimate.version} declined (customer link), ${formatCents(totalCents)}`,
        { method: 'link', declinedAt: now.toISOString(), totalCents, version: before.estimate.version },
        transaction,
      );
    }
    return buildView(job, transaction);
  });
}
