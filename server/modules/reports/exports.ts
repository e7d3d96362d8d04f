import { INSTRUMENT_FAMILY_LABELS, JOB_STAGE_LABELS } from '../../../shared/domain.js';
import { toCsv, type CsvCell } from '../../../shared/reports/csv.js';
import { basisPointsToPercent, centsToDecimal } from '../../../shared/money.js';
import type {
  BenchLoadRow,
  ListAnswer,
  OverdueJob,
  ReportJob,
  ReportShop,
  StageCountRow,
  TransferInFlight,
  TurnaroundWindowReport,
  WeeklyIntakeRow,
} from '../../../shared/reports/schemas.js';
import type { Invoice } from './service.js';
import { PRIVATE_CUSTOMER_LABEL } from '../../../shared/registry.js';

/** The customer cell: a hidden private customer is written as such, never left looking like no customer. */
const customerCell = (c: { customerName: string | null; customerHidden: boolean }) => (c.customerHidden ? PRIVATE_CUSTOMER_LABEL : c.customerName);

/**
 * The CSV files behind the reports page. Column names are snake_case so spreadsheets and accounting
 * imports can map them without guessing; money is given both in integer cents and as a decimal amount.
 */

const shopLookup = (shops: ReportShop[]) => {
  const byId = new Map(shops.map((s) => [s.id, s]));
  return (id: string) => byId.get(id) ?? { code: '', name: id };
};

export function openJobsCsv(shops: ReportShop[], rows: StageCountRow[]): string {
  const shop = shopLookup(shops);
  return toCsv(
    ['shop_code', 'shop', 'stage', 'stage_label', 'open_jobs'],
    [...rows]
      .sort((a, b) => shop(a.shopId).name.localeCompare(shop(b.shopId).name) || a.stage.localeCompare(b.stage))
      .map((r) => [shop(r.shopId).code, shop(r.shopId).name, r.stage, JOB_STAGE_LABELS[r.stage], r.count]),
  );
}

export function overdueCsv(list: ListAnswer<OverdueJob>): string {
  return toCsv(
    ['job_number', 'shop', 'stage', 'family', 'maker', 'model', 'serial', 'customer', 'promised_on', 'days_late', 'assignee'],
    list.items.map((j) => [
      j.number, j.shopName, JOB_STAGE_LABELS[j.stage], INSTRUMENT_FAMILY_LABELS[j.family], j.maker, j.model, j.serial,
      customerCell(j), j.promisedOn, j.daysLate, j.assigneeName,
    ]),
  );
}

export function transfersCsv(list: ListAnswer<TransferInFlight>): string {
  return toCsv(
    ['job_number', 'family', 'serial', 'from_shop', 'to_shop', 'departed_at_utc', 'expected_arrival_at_utc', 'late'],
    list.items.map((t) => [
      t.jobNumber, INSTRUMENT_FAMILY_LABELS[t.family], t.serial, t.fromShopName, t.toShopName, t.departedAt, t.expectedArrivalAt, t.late,
    ]),
  );
}

export function benchLoadCsv(shops: ReportShop[], rows: BenchLoadRow[]): string {
  const shop = shopLookup(shops);
  return toCsv(
    ['shop_code', 'shop', 'skill', 'weekly_bench_hours', 'open_hours', 'open_jobs', 'unestimated_jobs', 'weeks_of_work'],
    rows.map((r) => [
      shop(r.shopId).code, shop(r.shopId).name, r.skillName, r.weeklyBenchHours, r.openHours, r.openJobs, r.unestimatedJobs, r.weeksOfWork,
    ]),
  );
}

export function turnaroundCsv(shops: ReportShop[], windows: TurnaroundWindowReport[]): string {
  const shop = shopLookup(shops);
  const rows: CsvCell[][] = [];
  for (const w of windows) {
    const figures = [
      { group: 'all', name: 'All shops in the report', f: w.overall },
      ...w.byShop.map((f) => ({ group: 'shop', name: shop(f.shopId).name, f })),
      ...w.byFamily.map((f) => ({ group: 'family', name: INSTRUMENT_FAMILY_LABELS[f.family], f })),
    ];
    for (const { group, name, f } of figures) {
      rows.push([w.days, group, name, f.jobs, f.medianBusinessDays, f.p90BusinessDays, f.medianCalendarDays, f.p90CalendarDays]);
    }
  }
  return toCsv(
    ['window_days', 'group', 'name', 'jobs_ready', 'median_business_days', 'p90_business_days', 'median_calendar_days', 'p90_calendar_days'],
    rows,
  );
}

export function weeklyIntakeCsv(shops: ReportShop[], weeks: WeeklyIntakeRow[]): string {
  return toCsv(
    ['week_start', 'total', ...shops.map((s) => `shop_${s.code}`)],
    weeks.map((w) => [w.weekStart, w.total, ...shops.map((s) => w.byShop[s.id] ?? 0)]),
  );
}

export function jobsCsv(list: ListAnswer<ReportJob>): string {
  return toCsv(
    ['job_number', 'shop', 'stage', 'family', 'maker', 'model', 'serial', 'customer', 'skill', 'estimated_hours', 'opened_at_utc', 'ready_at_utc', 'promised_on', 'assignee'],
    list.items.map((j) => [
      j.number, j.shopName, JOB_STAGE_LABELS[j.stage], INSTRUMENT_FAMILY_LABELS[j.family], j.maker, j.model, j.serial, customerCell(j),
      j.skillName, j.estimatedHours, j.openedAt, j.readyAt, j.promisedOn, j.assigneeName,
    ]),
  );
}

/**
 * One row per line item, the invoice's header and totals repeated on each (the shape most accounting
 * imports take); a released job without line items still gets one row, with zero totals.
 */
export function invoicesCsv(invoices: Invoice[]): string {
  const rows: CsvCell[][] = [];
  for (const inv of invoices) {
    const head = [inv.jobNumber, inv.releasedOn, inv.shopCode, inv.shopName, customerCell(inv), inv.instrument, inv.serial];
    const tail = [
      inv.subtotalCents, basisPointsToPercent(inv.taxRateBasisPoints), inv.taxCents, inv.totalCents,
      centsToDecimal(inv.subtotalCents), centsToDecimal(inv.taxCents), centsToDecimal(inv.totalCents),
      inv.poNumber ?? null, inv.taxExemptCertificate ?? null,
    ];
    const lines = inv.lines.length ? inv.lines : [null];
    lines.forEach((l, i) => {
      rows.push([
        ...head,
        l ? i + 1 : null, l?.kind ?? null, l?.description ?? null, l?.quantity ?? null, l?.unitCents ?? null,
        l ? l.totalCents : null, l ? centsToDecimal(l.totalCents) : null,
        ...tail,
      ]);
    });
  }
  return toCsv(
    [
      'job_number', 'released_on', 'shop_code', 'shop', 'customer', 'instrument', 'serial',
      'line_no', 'line_kind', 'description', 'hours_or_quantity', 'unit_price_cents', 'line_total_cents', 'line_total',
      'subtotal_cents', 'tax_rate_percent', 'tax_cents', 'total_cents', 'subtotal', 'tax', 'total',
      'po_number', 'tax_exempt_certificate',
    ],
    rows,
  );
}
