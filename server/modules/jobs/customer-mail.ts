import { createHash, randomBytes } from 'node:crypto';
import type { Transaction } from 'sequelize';
import { config } from '../../config.js';
import { Customer, CustomerLink, Instrument, Job, JobLineItem, OutboxMessage, Shop } from '../../lib/models.js';
import { queueEmail } from '../notifications/index.js';
import { INSTRUMENT_FAMILY_LABELS } from '../../../shared/domain.js';
import { estimateTotals, formatBasisPoints, lineTotalCents, type EstimateLine } from '../../../shared/jobs/estimate.js';
import { formatCents } from '../../../shared/money.js';
import { formatWeekdays } from '../../../shared/routing/rank.js';
import { renderEstimatePdf } from './estimate-pdf.js';
import { APPROVAL_MEANING } from '../../../shared/customers/public-page.js';

/**
 * E-mails to a job's customer, all through the outbox: the estimate with its approval link and PDF (an
 * approval request always goes out), and the notices a customer may turn off (sent to another shop, ready
 * to collect, a reminder when it waits uncollected). Also the private link itself: 32 random bytes in
 * base64url, of which only the SHA-256 is stored.
 */

export const hashCustomerToken = (token: string) => createHash('sha256').update(token, 'utf8').digest();
export const customerLinkUrl = (token: string) => `${config.appOrigin}/c/${token}`;

/** A new live link for the job; the token exists only in the answer (and the e-mail that carries it). */
export async function issueLinkToken(job: Pick<Job, 'networkId' | 'id'>, userId: string | null, transaction: Transaction) {
  const token = randomBytes(32).toString('base64url');
  const link = await CustomerLink.create(
    { networkId: job.networkId, jobId: job.id, tokenHash: hashCustomerToken(token), createdByUserId: userId },
    { transaction },
  );
  return { token, url: customerLinkUrl(token), linkId: link.id };
}

const toLine = (i: JobLineItem): EstimateLine =>
  i.kind === 'labor'
    ? { kind: 'labor', hours: i.hours ?? 0, rateCents: i.rateCents ?? 0 }
    : { kind: 'part', quantity: i.quantity ?? 0, unitPriceCents: i.unitPriceCents ?? 0 };

export const shopAddress = (s: Pick<Shop, 'addressLine' | 'city' | 'region' | 'postalCode'>) =>
  [s.addressLine, [s.city, s.region].filter(Boolean).join(', '), s.postalCode].filter(Boolean).join(', ') || null;

/** A message already written for this key: a repeated step or sweep makes no second link or e-mail. */
const alreadyQueued = async (networkId: string, dedupeKey: string, transaction: Transaction) =>
  !!(await OutboxMessage.findOne({ where: { networkId, dedupeKey }, attributes: ['id'], transaction }));

async function mailContext(job: Job, transaction: Transaction) {
  if (!job.customerId) return null;
  const [customer, shop, pickup, instrument, items] = await Promise.all([
    Customer.findOne({ where: { networkId: job.networkId, id: job.customerId }, transaction }),
    Shop.findOne({ where: { networkId: job.networkId, id: job.shopId }, transaction }),
    Shop.findOne({ where: { networkId: job.networkId, id: job.pickupShopId ?? job.shopId }, transaction }),
    Instrument.findOne({ where: { networkId: job.networkId, id: job.instrumentId }, transaction }),
    JobLineItem.findAll({ where: { networkId: job.networkId, jobId: job.id }, order: [['position', 'ASC'], ['createdAt', 'ASC']], transaction }),
  ]);
  if (!customer?.email || !shop || !instrument) return null;
  const family = INSTRUMENT_FAMILY_LABELS[instrument.family].toLowerCase();
  return {
    customer,
    shop,
    pickup: pickup ?? shop,
    instrument,
    items,
    family,
    what: `${family} (${instrument.maker}, serial ${instrument.serial})`,
    greeting: `Hello ${customer.contactName?.split(',')[0] || customer.name},`,
    reach: (s: Shop) => [s.phone, s.email].filter(Boolean).join(' or '),
  };
}

/**
 * The estimate as an approval request: the lines, tax and total in the text, the same as a PDF, and a
 * fresh private link to approve or decline. `raisedFrom` says the total rose above an earlier approval.
 * Not subject to the customer's notice opt-out: the work waits for this answer.
 */
export async function queueEstimateRequest(
  job: Job,
  options: { key: string; userId: string | null; raisedFrom?: { totalCents: number; version: number } | null },
  transaction: Transaction,
): Promise<{ queued: boolean; url?: string }> {
  const dedupeKey = `job-estimate-${job.id}-${options.key}`;
  if (await alreadyQueued(job.networkId, dedupeKey, transaction)) return { queued: false };
  const c = await mailContext(job, transaction);
  if (!c) return { queued: false };
  const totals = estimateTotals(c.items.map(toLine), c.shop.taxRateBasisPoints);
  const { url } = await issueLinkToken(job, options.userId, transaction);
  const version = job.estimateVersion ?? 0;
  const lines = c.items.map((i) => `  ${i.description.padEnd(44)} ${formatCents(lineTotalCents(toLine(i))).padStart(12)}`);
  const reach = c.reach(c.shop);
  const pdf = await renderEstimatePdf({
    shop: { name: c.shop.name, address: shopAddress(c.shop), phone: c.shop.phone ?? null, email: c.shop.email ?? null, timeZone: c.shop.timeZone },
    jobNumber: job.number,
    version,
    instrument: `${INSTRUMENT_FAMILY_LABELS[c.instrument.family]}, ${c.instrument.maker}${c.instrument.model ? ` ${c.instrument.model}` : ''}`,
    customerName: c.customer.kind === 'person' ? null : c.customer.name,
    poNumber: c.customer.poNumber ?? null,
    taxExemptCertificate: c.customer.taxExemptCertificate ?? null,
    lines: c.items.map((i) => ({ description: i.description, totalCents: lineTotalCents(toLine(i)) })),
    subtotalCents: totals.subtotalCents,
    taxRateBasisPoints: totals.taxRateBasisPoints,
    taxCents: totals.taxCents,
    totalCents: totals.totalCents,
    previouslyApproved: options.raisedFrom ?? null,
    url,
    generatedAt: new Date(),
  });
  const raised = options.raisedFrom;
  const subject = raised
    ? `Estimate for job ${job.number} has risen and awaits your approval again — ${c.shop.name}`
    : `Estimate for job ${job.number} awaits your approval — ${c.shop.name}`;
  const text = [
    c.greeting,
    '',
    raised
      ? `The work on your ${c.what} needs more than you approved. You approved ${formatCents(raised.totalCents)} (version ${raised.version}); the estimate for job ${job.number} is now ${formatCents(totals.totalCents)} (version ${version}):`
      : `We have looked at your ${c.what}. Here is our estimate for job ${job.number}:`,
    '',
    ...lines,
    '',
    `  ${'Subtotal'.padEnd(44)} ${formatCents(totals.subtotalCents).padStart(12)}`,
    `  ${`Tax (${formatBasisPoints(totals.taxRateBasisPoints)})`.padEnd(44)} ${formatCents(totals.taxCents).padStart(12)}`,
    `  ${'Total'.padEnd(44)} ${formatCents(totals.totalCents).padStart(12)}`,
    ...(c.customer.poNumber ? ['', `Purchase order: ${c.customer.poNumber}`] : []),
    ...(c.customer.taxExemptCertificate ? [`Tax-exempt certificate: ${c.customer.taxExemptCertificate}`] : []),
    '',
    `Approve or decline here (your private link; no account needed): ${url}`,
    '',
    APPROVAL_MEANING,
    '',
    raised ? 'Work above the amount you approved waits for your answer.' : 'Work starts once you approve.',
    reach ? `You can also contact us at ${reach}.` : '',
    '',
    c.shop.name,
  ].join('\n');
  await queueEmail(
    {
      networkId: job.networkId,
      dedupeKey,
      to: c.customer.email!,
      subject,
      text,
      attachments: [{ filename: `estimate-job-${job.number}-v${version}.pdf`, contentType: 'application/pdf', contentBase64: pdf.toString('base64') }],
    },
    transaction,
  );
  return { queued: true, url };
}

export type CustomerNotice =
  | { kind: 'ready' }
  | { kind: 'reminder'; days: number }
  | { kind: 'transfer'; toShopName: string; why: string };

/** A notice the customer may turn off; each carries a fresh link to the job's page. */
export async function queueCustomerNotice(job: Job, notice: CustomerNotice, key: string, transaction: Transaction): Promise<boolean> {
  const dedupeKey = `job-${notice.kind}-${job.id}-${key}`;
  if (await alreadyQueued(job.networkId, dedupeKey, transaction)) return false;
  const c = await mailContext(job, transaction);
  if (!c || c.customer.noticesOptOut) return false;
  const { url } = await issueLinkToken(job, null, transaction);
  const pickup = c.pickup;
  const pickupLine = `${pickup.name}${shopAddress(pickup) ? `, ${shopAddress(pickup)}` : ''}`;
  const hours = `Open ${formatWeekdays(pickup.openingDays ?? [])}${c.reach(pickup) ? `; ${c.reach(pickup)}` : ''}.`;
  let subject: string;
  let body: string[];
  switch (notice.kind) {
    case 'ready':
      subject = `Your ${c.family} is ready — job ${job.number}, ${pickup.name}`;
      body =
        job.shopId === pickup.id
          ? [`Your ${c.what} has passed its final check and is ready to collect at ${pickupLine}.`, hours]
          : [
              `The work on your ${c.what} is done and has passed its final check at our ${c.shop.name} shop.`,
              `It comes back to ${pickupLine} for you to collect; we tell you when it is there. ${hours}`,
            ];
      break;
    case 'reminder':
      subject = `Reminder: your ${c.family} is waiting for you — job ${job.number}, ${pickup.name}`;
      body = [`Your ${c.what} has been ready to collect for ${notice.days} days at ${pickupLine}.`, hours];
      break;
    case 'transfer':
      subject = `Your ${c.family} is going to our ${notice.toShopName} shop — job ${job.number}`;
      body = [
        `Your ${c.what} is on its way to our ${notice.toShopName} shop: ${notice.why}`,
        `You still collect it at ${pickupLine}. ${hours}`,
      ];
      break;
  }
  const text = [
    c.greeting,
    '',
    ...body,
    '',
    `Follow your job here (your private link): ${url}`,
    '',
    c.shop.name,
    '',
    `You get this because ${c.shop.name} has your instrument. To stop these notices, tell the shop; estimates that need your approval still come.`,
  ].join('\n');
  await queueEmail({ networkId: job.networkId, dedupeKey, to: c.customer.email!, subject, text }, transaction);
  return true;
}
