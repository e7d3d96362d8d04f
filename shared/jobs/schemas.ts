import { z } from 'zod';
import { ALL_JOB_STAGES, INSTRUMENT_FAMILIES } from '../domain.js';
import { hasAtMostTwoDecimals, MAX_HUNDREDTHS_VALUE } from './estimate.js';
import { hazardsSchema } from '../safety/hazards.js';

/**
 * Request shapes for the jobs API, used by the server to parse and by the client to validate forms,
 * so both give the same field errors.
 */

/** How the front desk records an approval it was given; the customer's own, from the link, is `link`. */
export const ESTIMATE_APPROVAL_METHODS = ['in_person', 'phone', 'email'] as const;
export type EstimateApprovalMethod = (typeof ESTIMATE_APPROVAL_METHODS)[number] | 'link';
export const ESTIMATE_APPROVAL_METHOD_LABELS: Record<EstimateApprovalMethod, string> = {
  link: 'Customer link',
  in_person: 'In person',
  phone: 'Phone',
  email: 'E-mail',
};

/** What may come in with an instrument, ticked at the counter; anything else is typed. */
export const INTAKE_ACCESSORIES = ['case', 'mouthpiece', 'ligature', 'neck', 'strap', 'reeds', 'swab'] as const;
export type IntakeAccessory = (typeof INTAKE_ACCESSORIES)[number];
export const INTAKE_ACCESSORY_LABELS: Record<IntakeAccessory, string> = {
  case: 'Case',
  mouthpiece: 'Mouthpiece',
  ligature: 'Ligature',
  neck: 'Neck',
  strap: 'Strap',
  reeds: 'Reeds',
  swab: 'Swab',
};

export const BOARD_SORTS = ['promised', 'opened', 'number', 'updated'] as const;
export type BoardSort = (typeof BOARD_SORTS)[number];
export const BOARD_SORT_LABELS: Record<BoardSort, string> = {
  promised: 'Promise date',
  opened: 'Date opened',
  number: 'Job number',
  updated: 'Last change',
};
/** `open`: every stage but released (the default); `all`: released too. */
export const BOARD_STAGE_FILTERS = ['open', 'all', ...ALL_JOB_STAGES] as const;
export const BOARD_PAGE_SIZES = [10, 25, 50, 100] as const;

const calendarDate = z.iso.date({ message: 'Use a date like 2026-03-09.' });
const hundredths = (what: string, max = MAX_HUNDREDTHS_VALUE) =>
  z
    .number({ message: `Enter a number for ${what.toLowerCase()}.` })
    .min(0, `${what} cannot be negative.`)
    .max(max, `${what} is too large.`)
    .refine(hasAtMostTwoDecimals, `${what} takes at most two decimals.`);
const cents = (what: string) =>
  z.number({ message: `Enter a number for ${what.toLowerCase()}.` }).int(`${what} is a whole number of cents.`).min(0, `${what} cannot be negative.`).max(100_000_000);
const boolParam = z
  .enum(['true', 'false', '1', '0'])
  .transform((v) => v === 'true' || v === '1')
  .optional();

export const boardQuerySchema = z.object({
  shop: z.uuid({ message: 'Choose a shop.' }),
  stage: z.enum(BOARD_STAGE_FILTERS).default('open'),
  /** a technician's user id, or `unassigned` */
  technician: z.union([z.uuid(), z.literal('unassigned')]).optional(),
  skill: z.uuid().optional(),
  family: z.enum(INSTRUMENT_FAMILIES).optional(),
  overdue: boolParam,
  sort: z.enum(BOARD_SORTS).default('promised'),
  dir: z.enum(['asc', 'desc']).optional(),
  page: z.coerce.number().int().min(1).max(10_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(25),
});
export type BoardQuery = z.infer<typeof boardQuerySchema>;

export const myBenchQuerySchema = z.object({ shop: z.uuid().optional() });

export const jobUpdateSchema = z
  .object({
    assignedUserId: z.uuid().nullable(),
    requiredSkillId: z.uuid().nullable(),
    promisedOn: calendarDate.nullable(),
    /** Sets the promise this many opening days after today, on the shop's calendar. */
    promiseInOpeningDays: z.number().int().min(0).max(366),
    complaint: z.string().trim().max(4000),
    conditionNotes: z.string().trim().max(4000).nullable(),
    accessories: z.array(z.enum(INTAKE_ACCESSORIES, { message: 'Choose from the list; type anything else below.' })).max(INTAKE_ACCESSORIES.length),
    accessoriesOther: z.string().trim().max(500, 'At most 500 characters.').nullable(),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' })
  .refine((v) => !(v.promisedOn !== undefined && v.promiseInOpeningDays !== undefined), {
    message: 'Give a promise date or a number of opening days, not both.',
    path: ['promiseInOpeningDays'],
  });
export type JobUpdate = z.infer<typeof jobUpdateSchema>;

export const stageMoveSchema = z.object({
  to: z.enum(ALL_JOB_STAGES, { message: 'Choose a stage.' }),
  note: z.string().trim().max(1000).optional(),
});

export const laborLineSchema = z.object({
  kind: z.literal('labor'),
  catalogItemId: z.uuid({ message: 'Choose a service from the catalog.' }),
  /** Defaults to the catalog's standard hours. */
  hours: hundredths('Hours', 9999.99).optional(),
  description: z.string().trim().min(1).max(300).optional(),
});
export const partLineSchema = z.object({
  kind: z.literal('part'),
  partId: z.uuid().optional(),
  description: z.string().trim().min(1, 'Say what the part is.').max(300),
  quantity: hundredths('Quantity').refine((q) => Math.round(q * 100) > 0, 'Quantity must be more than zero.'),
  unitPriceCents: cents('Unit price'),
});
export const lineItemCreateSchema = z.discriminatedUnion('kind', [laborLineSchema, partLineSchema]);
export type LineItemCreate = z.infer<typeof lineItemCreateSchema>;

export const lineItemUpdateSchema = z
  .object({
    description: z.string().trim().min(1).max(300),
    hours: hundredths('Hours', 9999.99),
    quantity: hundredths('Quantity').refine((q) => Math.round(q * 100) > 0, 'Quantity must be more than zero.'),
    unitPriceCents: cents('Unit price'),
  })
  .partial()
  .refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });

export const approvalSchema = z.object({
  approvedByName: z.string().trim().min(1, 'Who approved it?').max(200),
  method: z.enum(ESTIMATE_APPROVAL_METHODS, { message: 'How was it approved?' }),
  /** When the customer approved; defaults to now. */
  approvedAt: z.iso.datetime({ offset: true }).optional(),
});

export const timeLogSchema = z.object({
  minutes: z
    .number({ message: 'Enter a number of minutes.' })
    .int('Whole minutes, please.')
    .min(1, 'At least one minute.')
    .max(24 * 60, 'At most a day per entry.'),
  /** The shop's calendar date; defaults to today there. */
  workedOn: calendarDate.optional(),
  note: z.string().trim().max(500).optional(),
});

export const catalogItemSchema = z.object({
  name: z.string().trim().min(1, 'Name the service.').max(200),
  family: z.enum(INSTRUMENT_FAMILIES).nullable(),
  standardHours: hundredths('Standard hours', 9999.99),
  skillId: z.uuid().nullable(),
  active: z.boolean().optional(),
  hazards: hazardsSchema.optional(),
});
export const catalogItemUpdateSchema = catalogItemSchema.partial().refine((v) => Object.keys(v).length > 0, { message: 'Nothing to change.' });
export const catalogQuerySchema = z.object({
  family: z.enum(INSTRUMENT_FAMILIES).optional(),
  includeInactive: boolParam,
});
