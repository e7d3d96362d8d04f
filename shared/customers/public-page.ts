import { z } from 'zod';
import type { JobStage } from '../domain.js';

/**
 * The customer's page of a job, reached by a private link without an account: what it shows, and the
 * approval or decline the customer sends from it. Shared by the server (which builds exactly this and
 * nothing more) and the page.
 */

/** Said on the page, in the e-mail and on the PDF, so the customer knows what their answer does. */
export const APPROVAL_MEANING =
  'Approving this estimate asks the shop to do the work listed for the total shown. If the work turns out to need more, ' +
  'the shop asks you again before the total goes above the amount you approved. Declining stops the work: you collect ' +
  'the instrument as it is. Either way, you can call the shop.';

/** A link lives until revoked, or until this many days after the job's release. */
export const CUSTOMER_LINK_DAYS_AFTER_RELEASE = 30;

/** 32 random bytes in base64url: 43 characters, no padding. */
export const CUSTOMER_LINK_TOKEN = /^[A-Za-z0-9_-]{43}$/;

export const customerDecisionSchema = z.object({
  decision: z.enum(['approved', 'declined'], { message: 'Approve or decline.' }),
  name: z
    .string({ message: 'Type your name.' })
    .trim()
    .min(2, 'Type your full name.')
    .max(200, 'At most 200 characters.'),
  /** The version the customer read: a change since then asks them to read it again. */
  estimateVersion: z.number().int().min(0),
});
export type CustomerDecisionInput = z.infer<typeof customerDecisionSchema>;

/** The stage in the words a customer uses. */
export function stageInPlainWords(stage: JobStage, travellingTo?: string | null): string {
  switch (stage) {
    case 'intake':
      return 'We have your instrument and will look it over soon.';
    case 'assessed':
      return 'We have looked it over. The estimate below waits for your answer before any work starts.';
    case 'approved':
      return 'The estimate is approved. Your instrument is waiting for a free bench.';
    case 'on_bench':
      return 'A technician is working on your instrument.';
    case 'quality_check':
      return 'The work is done and we are checking it: a leak test and a play test.';
    case 'ready':
      return 'Your instrument is ready to collect.';
    case 'released':
      return 'You have collected your instrument. Thank you.';
    case 'waiting_for_parts':
      return 'We are waiting for parts to arrive; work goes on as soon as they are here.';
    case 'in_transit':
      return travellingTo
        ? `Your instrument is on its way to our ${travellingTo} shop, where the right specialist will work on it.`
        : 'Your instrument is on its way to another of our shops, where the right specialist will work on it.';
  }
}

export interface PublicShop {
  name: string;
  address: string | null;
  phone: string | null;
  email: string | null;
  /** e.g. "Tue–Sat" */
  openDays: string;
}

export interface PublicEstimateLine {
  description: string;
  totalCents: number;
}

export type PublicApprovalStatus = 'not_ready' | 'awaiting' | 'approved' | 'declined' | 'needs_reapproval' | 'closed';

export interface PublicJobView {
  job: {
    number: number;
    stage: JobStage;
    stageText: string;
    /** formatted with the shared date format, in the shop's time zone; null when no date is promised */
    promisedOn: string | null;
  };
  instrument: {
    family: string;
    maker: string;
    model: string | null;
    /** only the end of the serial: enough for the customer to recognise it, not enough to use it */
    serialEnding: string;
  };
  /** where the instrument is now */
  shopNow: PublicShop;
  /** where it will be collected */
  pickupShop: PublicShop;
  estimate: {
    version: number;
    lines: PublicEstimateLine[];
    subtotalCents: number;
    taxRateBasisPoints: number;
    taxCents: number;
    totalCents: number;
    poNumber: string | null;
    taxExemptCertificate: string | null;
  } | null;
  approval: {
    status: PublicApprovalStatus;
    /** the last approval, when there is one: amount and version, when, and how in words ("on this page", "by phone") */
    approved: { totalCents: number; version: number; at: string; method: string } | null;
    declinedAt: string | null;
    /** true while the customer may approve or decline the estimate as it stands */
    canDecide: boolean;
  };
}

/** The last characters of a serial: four, or two of a short one, so the whole serial never shows. */
export function serialEnding(serial: string): string {
  const s = serial.trim();
  const n = s.length >= 8 ? 4 : Math.min(2, Math.max(0, s.length - 2));
  return n > 0 ? `…${s.slice(-n)}` : '…';
}

/** What the front desk sets on the job's customer: schools' and fleets' paperwork, and the notice choice. */
export const jobCustomerUpdateSchema = z
  .object({
    poNumber: z.string().trim().max(100, 'At most 100 characters.').nullable(),
    taxExemptCertificate: z.string().trim().max(100, 'At most 100 characters.').nullable(),
    /** true: no notices by e-mail (approval requests still go out) */
    noticesOptOut: z.boolean(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });
export type JobCustomerUpdate = z.infer<typeof jobCustomerUpdateSchema>;
