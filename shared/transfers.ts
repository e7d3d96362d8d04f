import { z } from 'zod';
import type { TransferState } from './domain.js';

/** Transfers: the state machine, the words for it, and the request bodies both sides validate with. */

export const TRANSFER_STATE_LABELS: Record<TransferState, string> = {
  requested: 'Requested',
  approved: 'Approved',
  packed: 'Packed',
  in_transit: 'In transit',
  received: 'Received',
  rejected: 'Rejected',
  cancelled: 'Cancelled',
};

/** Where each state may go next. `requested` is where every transfer starts. */
export const TRANSFER_TRANSITIONS: Record<TransferState, TransferState[]> = {
  requested: ['approved', 'rejected', 'cancelled'],
  approved: ['packed', 'cancelled'],
  packed: ['in_transit', 'cancelled'],
  // on the road nobody can call it back: it is received, and then can be sent again
  in_transit: ['received'],
  received: [],
  rejected: [],
  cancelled: [],
};

export const OPEN_TRANSFER_STATES: TransferState[] = ['requested', 'approved', 'packed', 'in_transit'];

export function canMove(from: TransferState, to: TransferState): boolean {
  return TRANSFER_TRANSITIONS[from].includes(to);
}

const uuid = z.string().uuid('Choose a valid record.');
const text = (min: number, max: number, label: string) =>
  z.string().trim().min(min, `${label} must be at least ${min} characters.`).max(max, `${label} is too long.`);

export const createTransferSchema = z.object({
  jobId: uuid,
  toShopId: z.string({ error: 'Choose the destination shop.' }).uuid('Choose the destination shop.'),
  reason: text(3, 1000, 'The reason'),
});
export type CreateTransferInput = z.infer<typeof createTransferSchema>;

export const approveTransferSchema = z.object({ note: z.string().trim().max(1000, 'The note is too long.').optional() });
export const reasonSchema = z.object({ reason: text(3, 1000, 'The reason') });

export const PACK_TEXT_MAX = 1000;
const packText = (label: string) =>
  z
    .string({ error: `${label} must be text.` })
    .trim()
    .max(PACK_TEXT_MAX, `${label} is too long (at most ${PACK_TEXT_MAX} characters).`)
    .optional()
    .transform((v) => (v ? v : null));

export const packTransferSchema = z.object({
  /** null: no relay run between the two shops, an ad-hoc courier takes it. */
  relayRunId: uuid.nullable().optional(),
  /** Required for heavy cases: the person packing has read the lifting caution. */
  liftingAcknowledged: z.boolean().optional(),
  /** What travels, printed on the manifest: the instrument's case(s), and what goes with it. */
  caseCount: z
    .number({ error: 'Enter a number of cases.' })
    .int('Enter a whole number of cases.')
    .min(1, 'At least one case travels.')
    .max(20, 'At most 20 cases on one transfer.')
    .default(1),
  contents: packText('Contents and accessories'),
  departureCondition: packText('Condition on departure'),
});

export const handOverSchema = z.object({ relayRunId: uuid.nullable().optional() });

export const RECEIVE_METHODS = ['scan', 'typed'] as const;
export const receiveTransferSchema = z.object({
  serial: z.string().trim().min(1, 'Scan or type the serial number on the instrument.').max(100, 'That serial is too long.'),
  method: z.enum(RECEIVE_METHODS).default('typed'),
});

export const TRANSFER_VIEWS = ['incoming', 'outgoing', 'approvals', 'all'] as const;
export type TransferView = (typeof TRANSFER_VIEWS)[number];
export const listTransfersQuery = z.object({
  view: z.enum(TRANSFER_VIEWS).default('all'),
  shopId: uuid.optional(),
  /** `open` = not yet received, rejected or cancelled. */
  status: z.enum(['open', 'closed', 'any']).default('any'),
});

export const recommendationQuery = z.object({
  jobId: uuid,
  skillId: uuid.optional(),
});

export const requestableJobsQuery = z.object({ shopId: uuid });
