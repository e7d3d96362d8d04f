import { z } from 'zod';
import { ALL_JOB_STAGES, INSTRUMENT_FAMILIES, type InstrumentFamily, type JobStage } from '../domain.js';

/**
 * Query strings and answers of /api/reports/*, shared by the server (parsing) and the client (types
 * and links). `shop` narrows a report to one shop; without it a report covers every shop whose figures
 * the person may read (the whole network for the owner).
 */

export const TURNAROUND_WINDOWS = [30, 90, 365] as const;
export type TurnaroundWindow = (typeof TURNAROUND_WINDOWS)[number];
export const WEEKLY_INTAKE_WEEKS = 52;
/** The most rows a list report answers with; the total is always given, the CSV has every row. */
export const REPORT_LIST_LIMIT = 200;

const isoDate = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2026-08-31.')
  // a real calendar date: 2026-02-30 is refused here rather than by the database
  .refine((v) => !Number.isNaN(Date.parse(`${v}T00:00:00Z`)) && new Date(`${v}T00:00:00Z`).toISOString().startsWith(v), 'That date does not exist.');
const optionalUuid = z.preprocess((v) => (v === '' ? undefined : v), z.uuid('Not a shop of this network.').optional());

export const reportScopeQuerySchema = z.object({ shop: optionalUuid });
export type ReportScopeQuery = z.infer<typeof reportScopeQuerySchema>;

/**
 * The list behind a figure: open jobs at a stage, of a skill, of a family, finished in a window, taken in one week.
 * `stage=open` is every stage but released; `stage=bench` the stages whose hours count as bench load.
 */
export const jobListQuerySchema = reportScopeQuerySchema.extend({
  stage: z.preprocess((v) => (v === '' ? undefined : v), z.enum([...ALL_JOB_STAGES, 'open', 'bench'] as [string, ...string[]]).optional()),
  skill: optionalUuid,
  family: z.preprocess((v) => (v === '' ? undefined : v), z.enum(INSTRUMENT_FAMILIES).optional()),
  /** jobs that reached Ready in the last N days (the turnaround sample) */
  readyWithin: z.preprocess((v) => (v === '' || v == null ? undefined : Number(v)), z.union([z.literal(30), z.literal(90), z.literal(365)]).optional()),
  /** jobs taken in during the week starting on this Monday (shop's local date) */
  week: z.preprocess((v) => (v === '' ? undefined : v), isoDate.optional()),
});
export type JobListQuery = z.infer<typeof jobListQuerySchema>;

export const invoiceQuerySchema = reportScopeQuerySchema
  .extend({ from: isoDate, to: isoDate })
  .refine((q) => q.from <= q.to, { message: 'The end date must not be before the start date.', path: ['to'] })
  .refine((q) => Date.parse(q.to) - Date.parse(q.from) <= 366 * 86_400_000, { message: 'Export at most one year at a time.', path: ['to'] });
export type InvoiceQuery = z.infer<typeof invoiceQuerySchema>;

// ---- answers ----

export interface ReportShop {
  id: string;
  name: string;
  code: string;
  timeZone: string;
  openingDays: number[];
}

export interface StageCountRow {
  shopId: string;
  stage: JobStage;
  count: number;
}

export interface OverdueJob {
  id: string;
  number: number;
  shopId: string;
  shopName: string;
  stage: JobStage;
  family: InstrumentFamily;
  maker: string;
  model: string | null;
  serial: string;
  /** null when there is no customer, or for a private customer of a shop the viewer does not serve (`customerHidden`) */
  customerName: string | null;
  customerHidden: boolean;
  promisedOn: string;
  /** calendar days since the promised date, counted on the shop's calendar */
  daysLate: number;
  assigneeName: string | null;
}

export interface TransferInFlight {
  id: string;
  jobId: string;
  jobNumber: number;
  family: InstrumentFamily;
  serial: string;
  fromShopId: string;
  fromShopName: string;
  toShopId: string;
  toShopName: string;
  /** arrival is shown on the destination's clock */
  toShopTimeZone: string;
  departedAt: string | null;
  expectedArrivalAt: string | null;
  /** expected arrival has passed and nobody has received it */
  late: boolean;
}

export interface BenchLoadRow {
  shopId: string;
  skillId: string;
  skillName: string;
  /** shop_skills.weekly_bench_hours; 0 when open jobs need a skill the shop has no hours for */
  weeklyBenchHours: number;
  /** sum of estimated hours of open jobs (not yet ready) that require the skill */
  openHours: number;
  openJobs: number;
  /** open jobs without an estimate yet (intake): their hours are not in openHours */
  unestimatedJobs: number;
  /** openHours / weeklyBenchHours: weeks of work waiting; null when the shop has no hours for it */
  weeksOfWork: number | null;
}

export interface TurnaroundFigure {
  /** jobs that reached Ready in the window */
  jobs: number;
  medianBusinessDays: number | null;
  p90BusinessDays: number | null;
  medianCalendarDays: number | null;
  p90CalendarDays: number | null;
}

export interface TurnaroundWindowReport {
  days: TurnaroundWindow;
  overall: TurnaroundFigure;
  byShop: Array<TurnaroundFigure & { shopId: string }>;
  byFamily: Array<TurnaroundFigure & { family: InstrumentFamily }>;
}

export interface WeeklyIntakeRow {
  /** Monday of the week, shop-local calendar */
  weekStart: string;
  total: number;
  byShop: Record<string, number>;
}

export interface DashboardReport {
  generatedAt: string;
  shops: ReportShop[];
  openJobsByStage: StageCountRow[];
  overdue: { total: number; byShop: Array<{ shopId: string; count: number }>; oldest: OverdueJob[] };
  transfersInFlight: { total: number; late: number; items: TransferInFlight[] };
  benchLoad: BenchLoadRow[];
  turnaround: TurnaroundWindowReport[];
  weeklyIntake: WeeklyIntakeRow[];
}

export interface ReportJob {
  id: string;
  number: number;
  shopId: string;
  shopName: string;
  stage: JobStage;
  family: InstrumentFamily;
  maker: string;
  model: string | null;
  serial: string;
  /** null when there is no customer, or for a private customer of a shop the viewer does not serve (`customerHidden`) */
  customerName: string | null;
  customerHidden: boolean;
  skillName: string | null;
  estimatedHours: number | null;
  openedAt: string;
  readyAt: string | null;
  promisedOn: string | null;
  assigneeName: string | null;
}

export interface ListAnswer<T> {
  shops: ReportShop[];
  total: number;
  items: T[];
}
