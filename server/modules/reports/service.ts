import { subject as asSubject } from '@casl/ability';
import { Op, QueryTypes } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { Shop } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { forbidden, notFound } from '../../lib/errors.js';
import type { JobStage, InstrumentFamily } from '../../../shared/domain.js';
import {
  REPORT_LIST_LIMIT,
  TURNAROUND_WINDOWS,
  WEEKLY_INTAKE_WEEKS,
  type BenchLoadRow,
  type DashboardReport,
  type InvoiceQuery,
  type JobListQuery,
  type ListAnswer,
  type OverdueJob,
  type ReportJob,
  type ReportShop,
  type StageCountRow,
  type TransferInFlight,
  type TurnaroundFigure,
  type TurnaroundWindowReport,
  type WeeklyIntakeRow,
} from '../../../shared/reports/schemas.js';
import { publicHolidays } from '../../../shared/jobs/promised-date.js';
import { invoiceTotals, type InvoiceLineInput } from '../../../shared/reports/money.js';
import type { CustomerKind } from '../../../shared/schemas/registry.js';
import { visibleCustomerNames } from '../registry/index.js';

/**
 * The network at a glance. Every figure is one SQL aggregate over the shops the person may see
 * (the whole network for the owner, their shops for everyone else); rows are only read for the lists
 * behind the figures and for the CSV exports.
 *
 * Time: "today" is the shop's own calendar date (`now() at time zone shops.time_zone`), so a promise
 * for Tuesday is overdue in Chicago an hour or two before it is in Seattle.
 */

/** Stages whose estimated hours still wait for a bench at the shop. Ready and released work is done;
 *  a job in transit is on the road and joins the destination's load when it is received. */
export const BENCH_STAGES: JobStage[] = ['intake', 'assessed', 'approved', 'on_bench', 'quality_check', 'waiting_for_parts'];
/** A promise is kept once the job is ready for pickup. */
const PROMISE_KEPT_STAGES: JobStage[] = ['ready', 'released'];

type Scope = { networkId: string; shops: ReportShop[]; shopIds: string[]; asOf: string };

function toReportShop(s: Shop): ReportShop {
  return { id: s.id, name: s.name, code: s.code, timeZone: s.timeZone, openingDays: [...(s.openingDays ?? [])] };
}

/**
 * The shops a report covers. With `shopId`, that one shop (404 when it is not the network's, 403 when
 * the person may not see its figures); without it, every shop the rules allow for `action`.
 */
export async function reportScope(actor: Actor, shopId: string | undefined, action: 'read' | 'export' = 'read', asOf = new Date()): Promise<Scope> {
  const shops = await Shop.findAll({ where: { networkId: actor.networkId }, order: [['name', 'ASC']] });
  const allowed = (s: Shop) => actor.ability.can(action, asSubject('Report', { shopId: s.id }) as never);
  let chosen: Shop[];
  if (shopId) {
    const shop = shops.find((s) => s.id === shopId);
    if (!shop) throw notFound('That shop');
    if (!allowed(shop)) throw forbidden(action === 'export' ? 'You may not export this shop’s figures.' : 'You may not see this shop’s figures.');
    chosen = [shop];
  } else {
    chosen = shops.filter(allowed);
    if (!chosen.length) throw forbidden(action === 'export' ? 'You have no shop whose figures you may export.' : 'You have no shop whose figures you may see.');
  }
  const reportShops = chosen.map(toReportShop);
  return { networkId: actor.networkId, shops: reportShops, shopIds: reportShops.map((s) => s.id), asOf: asOf.toISOString() };
}

const select = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
  sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

/** NUMERIC, percentile_cont and COUNT come back from pg as strings (or null). */
const num = (v: unknown): number => Number(v ?? 0);
const numOrNull = (v: unknown): number | null => (v == null ? null : Number(v));
/** Two decimals are plenty for days and hours, and keep the JSON readable. */
const round2 = (v: number | null) => (v == null ? null : Math.round(v * 100) / 100);
const iso = (v: unknown): string | null => (v == null ? null : new Date(v as string).toISOString());

/** The job's customer as a list query selects it, for the registry's name rule (`visibleCustomerNames`). */
const CUSTOMER_COLUMNS = 'c.id as customer_id, c.kind as customer_kind, c.name as customer_name, c.home_shop_id as customer_home_shop_id';

const customerNamesOf = (actor: Actor, rows: Array<Record<string, unknown>>) =>
  visibleCustomerNames(
    actor,
    rows.map((r) =>
      r.customer_id
        ? { id: r.customer_id as string, kind: r.customer_kind as CustomerKind, name: r.customer_name as string, homeShopId: (r.customer_home_shop_id as string) ?? null }
        : null,
    ),
  );

/** A private customer of a shop the viewer does not serve: no name, and `customerHidden` says one is there. */
function customerOf(r: Record<string, unknown>, names: Map<string, string | null>): { customerName: string | null; customerHidden: boolean } {
  if (!r.customer_id) return { customerName: null, customerHidden: false };
  const name = names.get(r.customer_id as string) ?? null;
  return { customerName: name, customerHidden: name === null };
}

// ---------------------------------------------------------------------------------------------
// figures

export async function openJobsByStage(scope: Scope): Promise<StageCountRow[]> {
  const rows = await select<{ shop_id: string; stage: JobStage; n: string }>(
    `select shop_id, stage, count(*) as n
       from jobs
      where network_id = :networkId and shop_id in (:shopIds) and stage <> 'released'
      group by shop_id, stage`,
    scope,
  );
  return rows.map((r) => ({ shopId: r.shop_id, stage: r.stage, count: num(r.n) }));
}

const overdueWhere = `
  j.network_id = :networkId and j.shop_id in (:shopIds)
  and j.stage not in (:keptStages)
  and j.promised_on < (cast(:asOf as timestamptz) at time zone s.time_zone)::date`;

export async function overdueCounts(scope: Scope) {
  const rows = await select<{ shop_id: string; n: string }>(
    `select j.shop_id, count(*) as n
       from jobs j
       join shops s on s.network_id = j.network_id and s.id = j.shop_id
      where ${overdueWhere}
      group by j.shop_id`,
    { ...scope, keptStages: PROMISE_KEPT_STAGES },
  );
  const byShop = rows.map((r) => ({ shopId: r.shop_id, count: num(r.n) }));
  return { total: byShop.reduce((a, b) => a + b.count, 0), byShop };
}

export async function overdueJobs(actor: Actor, scope: Scope, limit: number | null): Promise<{ total: number; items: OverdueJob[] }> {
  const rows = await select<Record<string, unknown>>(
    `select j.id, j.number, j.shop_id, s.name as shop_name, j.stage, i.family, i.maker, i.model, i.serial,
            ${CUSTOMER_COLUMNS}, to_char(j.promised_on, 'YYYY-MM-DD') as promised_on,
            ((cast(:asOf as timestamptz) at time zone s.time_zone)::date - j.promised_on) as days_late,
            u.name as assignee_name, count(*) over () as total
       from jobs j
       join shops s on s.network_id = j.network_id and s.id = j.shop_id
       join instruments i on i.network_id = j.network_id and i.id = j.instrument_id
       left join customers c on c.network_id = j.network_id and c.id = j.customer_id
       left join users u on u.network_id = j.network_id and u.id = j.assigned_user_id
      where ${overdueWhere}
      order by days_late desc, j.number
      ${limit == null ? '' : 'limit :limit'}`,
    { ...scope, keptStages: PROMISE_KEPT_STAGES, limit },
  );
  const names = await customerNamesOf(actor, rows);
  return {
    total: rows.length ? num(rows[0].total) : 0,
    items: rows.map((r) => ({
      id: r.id as string, number: num(r.number), shopId: r.shop_id as string, shopName: r.shop_name as string,
      stage: r.stage as JobStage, family: r.family as InstrumentFamily, maker: r.maker as string, model: (r.model as string) ?? null,
      serial: r.serial as string, ...customerOf(r, names), promisedOn: r.promised_on as string,
      daysLate: num(r.days_late), assigneeName: (r.assignee_name as string) ?? null,
    })),
  };
}

/** Transfers on the road (departed, not yet received) from or to the shops in scope. */
export async function transfersInFlight(scope: Scope, limit: number | null): Promise<{ total: number; late: number; items: TransferInFlight[] }> {
  const rows = await select<Record<string, unknown>>(
    `select t.id, t.job_id, j.number, i.family, i.serial,
            t.from_shop_id, fs.name as from_name, t.to_shop_id, ts.name as to_name, ts.time_zone as to_time_zone,
            t.departed_at, t.expected_arrival_at,
            coalesce(t.expected_arrival_at < cast(:asOf as timestamptz), false) as late,
            count(*) over () as total,
            count(*) filter (where t.expected_arrival_at < cast(:asOf as timestamptz)) over () as late_total
       from transfers t
       join jobs j on j.network_id = t.network_id and j.id = t.job_id
       join instruments i on i.network_id = t.network_id and i.id = t.instrument_id
       join shops fs on fs.network_id = t.network_id and fs.id = t.from_shop_id
       join shops ts on ts.network_id = t.network_id and ts.id = t.to_shop_id
      where t.network_id = :networkId and t.state = 'in_transit'
        and (t.from_shop_id in (:shopIds) or t.to_shop_id in (:shopIds))
      order by t.expected_arrival_at nulls last, j.number
      ${limit == null ? '' : 'limit :limit'}`,
    { ...scope, limit },
  );
  return {
    total: rows.length ? num(rows[0].total) : 0,
    late: rows.length ? num(rows[0].late_total) : 0,
    items: rows.map((r) => ({
      id: r.id as string, jobId: r.job_id as string, jobNumber: num(r.number), family: r.family as InstrumentFamily,
      serial: r.serial as string, fromShopId: r.from_shop_id as string, fromShopName: r.from_name as string,
      toShopId: r.to_shop_id as string, toShopName: r.to_name as string, toShopTimeZone: r.to_time_zone as string, departedAt: iso(r.departed_at),
      expectedArrivalAt: iso(r.expected_arrival_at), late: Boolean(r.late),
    })),
  };
}

/**
 * Estimated hours of open work per skill against the shop's weekly bench hours for it. A full join,
 * so work that needs a skill the shop has no hours for still shows (with 0 weekly hours).
 */
export async function benchLoad(scope: Scope): Promise<BenchLoadRow[]> {
  const rows = await select<Record<string, unknown>>(
    `with open_work as (
       select j.shop_id, j.required_skill_id as skill_id,
              coalesce(sum(j.estimated_hours), 0) as open_hours,
              count(*) as open_jobs,
              count(*) filter (where j.estimated_hours is null) as unestimated
         from jobs j
        where j.network_id = :networkId and j.shop_id in (:shopIds)
          and j.required_skill_id is not null and j.stage in (:benchStages)
        group by j.shop_id, j.required_skill_id
     ), capacity as (
       select shop_id, skill_id, weekly_bench_hours
         from shop_skills
        where network_id = :networkId and shop_id in (:shopIds)
     )
     select coalesce(c.shop_id, w.shop_id) as shop_id, coalesce(c.skill_id, w.skill_id) as skill_id, sk.name as skill_name,
            coalesce(c.weekly_bench_hours, 0) as weekly, coalesce(w.open_hours, 0) as open_hours,
            coalesce(w.open_jobs, 0) as open_jobs, coalesce(w.unestimated, 0) as unestimated
       from capacity c
       full join open_work w on w.shop_id = c.shop_id and w.skill_id = c.skill_id
       join skills sk on sk.network_id = :networkId and sk.id = coalesce(c.skill_id, w.skill_id)`,
    { ...scope, benchStages: BENCH_STAGES },
  );
  const shopOrder = (id: unknown) => scope.shopIds.indexOf(id as string);
  rows.sort((a, b) => shopOrder(a.shop_id) - shopOrder(b.shop_id) || String(a.skill_name).localeCompare(String(b.skill_name)));
  return rows.map((r) => {
    const weekly = num(r.weekly);
    const open = num(r.open_hours);
    return {
      shopId: r.shop_id as string, skillId: r.skill_id as string, skillName: r.skill_name as string,
      weeklyBenchHours: weekly, openHours: open, openJobs: num(r.open_jobs), unestimatedJobs: num(r.unestimated),
      weeksOfWork: weekly > 0 ? round2(open / weekly) : null,
    };
  });
}

/**
 * The public holidays (shared/jobs/promised-date.ts `publicHolidays`) of each report shop's country and region,
 * for every year from the earliest intake of a job in the turnaround sample to the report's date.
 */
async function publicHolidaysInReport(scope: Scope, maxDays: number): Promise<Array<{ shop_id: string; day: string }>> {
  const [first] = await select<{ first: string | null }>(
    `select min(j.opened_at) as first
       from jobs j
      where j.network_id = :networkId and j.shop_id in (:shopIds) and j.ready_at is not null
        and j.ready_at > cast(:asOf as timestamptz) - make_interval(days => :maxDays)
        and j.ready_at <= cast(:asOf as timestamptz)`,
    { ...scope, maxDays },
  );
  if (!first?.first) return [];
  // a day either side: the shop's local year may differ from UTC's at the turn of the year
  const fromYear = new Date(new Date(first.first).getTime() - 86_400_000).getUTCFullYear();
  const toYear = new Date(new Date(scope.asOf).getTime() + 86_400_000).getUTCFullYear();
  const shops = await Shop.findAll({ where: { networkId: scope.networkId, id: { [Op.in]: scope.shopIds } }, attributes: ['id', 'country', 'region'] });
  const out: Array<{ shop_id: string; day: string }> = [];
  for (const shop of shops) {
    for (let year = fromYear; year <= toYear; year++) {
      for (const day of publicHolidays(shop.country, shop.region, year)) out.push({ shop_id: shop.id, day });
    }
  }
  return out;
}

/**
 * Turnaround from intake (opened_at) to Ready (ready_at) of the jobs that reached Ready in the last
 * 30, 90 and 365 days: median and 90th percentile with PostgreSQL's `percentile_cont` (linear
 * interpolation between the closest ranks), overall, per shop and per family, in one grouped query.
 *
 * Two measures: business days (the headline: opening days of the job's shop, counted on its own
 * calendar as shared/reports/business-days.ts defines them) and calendar days (elapsed time / 24 h).
 */
export async function turnaround(scope: Scope): Promise<TurnaroundWindowReport[]> {
  const maxDays = Math.max(...TURNAROUND_WINDOWS);
  const holidays = await publicHolidaysInReport(scope, maxDays);
  const rows = await select<Record<string, unknown>>(
    // closed: the public holidays of each shop's country and region (computed with date-holidays, handed in as
    // JSON) and the owner's closing days; neither is a business day
    `with closed as (
       select h.shop_id, h.day
         from jsonb_to_recordset(cast(:holidays as jsonb)) as h(shop_id uuid, day date)
       union
       select c.shop_id, c.date
         from shop_closing_days c
        where c.network_id = :networkId and c.shop_id in (:shopIds)
     ), done as (
       select j.shop_id, i.family, j.ready_at,
              extract(epoch from (j.ready_at - j.opened_at)) / 86400.0 as calendar_days,
              (select count(*)
                 from generate_series(((j.opened_at at time zone s.time_zone)::date + 1)::timestamp,
                                      ((j.ready_at at time zone s.time_zone)::date)::timestamp,
                                      interval '1 day') as d(day)
                where extract(isodow from d.day)::int = any(s.opening_days::int[])
                  and not exists (select 1 from closed x where x.shop_id = j.shop_id and x.day = d.day::date)) as business_days
         from jobs j
         join shops s on s.network_id = j.network_id and s.id = j.shop_id
         join instruments i on i.network_id = j.network_id and i.id = j.instrument_id
        where j.network_id = :networkId and j.shop_id in (:shopIds) and j.ready_at is not null
          and j.ready_at > cast(:asOf as timestamptz) - make_interval(days => :maxDays)
          and j.ready_at <= cast(:asOf as timestamptz)
     ), windowed as (
       select w.days, d.*
         from done d
         join unnest(array[:windows]::int[]) as w(days)
           on d.ready_at > cast(:asOf as timestamptz) - make_interval(days => w.days)
     )
     select days, shop_id, family, grouping(shop_id) as all_shops, grouping(family) as all_families,
            count(*) as jobs,
            percentile_cont(0.5) within group (order by business_days) as median_bd,
            percentile_cont(0.9) within group (order by business_days) as p90_bd,
            percentile_cont(0.5) within group (order by calendar_days) as median_cd,
            percentile_cont(0.9) within group (order by calendar_days) as p90_cd
       from windowed
      group by grouping sets ((days), (days, shop_id), (days, family))`,
    { ...scope, windows: [...TURNAROUND_WINDOWS], maxDays, holidays: JSON.stringify(holidays) },
  );
  const figure = (r: Record<string, unknown>): TurnaroundFigure => ({
    jobs: num(r.jobs),
    medianBusinessDays: round2(numOrNull(r.median_bd)),
    p90BusinessDays: round2(numOrNull(r.p90_bd)),
    medianCalendarDays: round2(numOrNull(r.median_cd)),
    p90CalendarDays: round2(numOrNull(r.p90_cd)),
  });
  const empty: TurnaroundFigure = { jobs: 0, medianBusinessDays: null, p90BusinessDays: null, medianCalendarDays: null, p90CalendarDays: null };
  return TURNAROUND_WINDOWS.map((days) => {
    const mine = rows.filter((r) => num(r.days) === days);
    const overallRow = mine.find((r) => num(r.all_shops) === 1 && num(r.all_families) === 1);
    return {
      days,
      overall: overallRow ? figure(overallRow) : empty,
      byShop: mine
        .filter((r) => num(r.all_shops) === 0)
        .map((r) => ({ shopId: r.shop_id as string, ...figure(r) }))
        .sort((a, b) => scope.shopIds.indexOf(a.shopId) - scope.shopIds.indexOf(b.shopId)),
      byFamily: mine
        .filter((r) => num(r.all_families) === 0)
        .map((r) => ({ family: r.family as InstrumentFamily, ...figure(r) }))
        .sort((a, b) => b.jobs - a.jobs || a.family.localeCompare(b.family)),
    };
  });
}

/**
 * Jobs taken in per week for the last 52 weeks (Monday-based weeks of each shop's own calendar), with
 * every week present so a quiet week shows as zero: the late-summer school-rental rush stands out.
 */
export async function weeklyIntake(scope: Scope): Promise<WeeklyIntakeRow[]> {
  const rows = await select<{ week_start: string; shop_id: string | null; n: string | null }>(
    // weeks are the shops' own local weeks, as the jobs are counted: the latest local week of any shop in the
    // report ends the series (a shop east of UTC may already be in next week while UTC is not)
    `with bounds as (
       select coalesce(max(date_trunc('week', cast(:asOf as timestamptz) at time zone s.time_zone)),
                       date_trunc('week', cast(:asOf as timestamptz) at time zone 'UTC')) as last_week
         from shops s
        where s.network_id = :networkId and s.id in (:shopIds)
     ), weeks as (
       select generate_series(b.last_week - make_interval(weeks => :weeks - 1), b.last_week, interval '1 week')::date as week_start
         from bounds b
     ), intake as (
       select date_trunc('week', j.opened_at at time zone s.time_zone)::date as week_start, j.shop_id, count(*) as n
         from jobs j
         join shops s on s.network_id = j.network_id and s.id = j.shop_id
        where j.network_id = :networkId and j.shop_id in (:shopIds)
          and j.opened_at >= cast(:asOf as timestamptz) - make_interval(weeks => :weeks + 1)
        group by 1, 2
     )
     select to_char(w.week_start, 'YYYY-MM-DD') as week_start, i.shop_id, i.n
       from weeks w
       left join intake i on i.week_start = w.week_start
      order by w.week_start`,
    { ...scope, weeks: WEEKLY_INTAKE_WEEKS },
  );
  const byWeek = new Map<string, WeeklyIntakeRow>();
  for (const r of rows) {
    const row = byWeek.get(r.week_start) ?? { weekStart: r.week_start, total: 0, byShop: {} };
    if (r.shop_id) {
      row.byShop[r.shop_id] = num(r.n);
      row.total += num(r.n);
    }
    byWeek.set(r.week_start, row);
  }
  return [...byWeek.values()];
}

export async function dashboard(actor: Actor, shopId?: string): Promise<DashboardReport> {
  const scope = await reportScope(actor, shopId);
  const [openJobs, overdue, oldest, transfers, load, turn, weekly] = await Promise.all([
    openJobsByStage(scope),
    overdueCounts(scope),
    overdueJobs(actor, scope, 5),
    transfersInFlight(scope, 50),
    benchLoad(scope),
    turnaround(scope),
    weeklyIntake(scope),
  ]);
  return {
    generatedAt: scope.asOf,
    shops: scope.shops,
    openJobsByStage: openJobs,
    overdue: { ...overdue, oldest: oldest.items },
    transfersInFlight: transfers,
    benchLoad: load,
    turnaround: turn,
    weeklyIntake: weekly,
  };
}

// ---------------------------------------------------------------------------------------------
// lists behind the figures

type ReportAction = 'read' | 'export';

export async function overdueList(
  actor: Actor, shopId: string | undefined, limit: number | null = REPORT_LIST_LIMIT, action: ReportAction = 'read',
): Promise<ListAnswer<OverdueJob>> {
  const scope = await reportScope(actor, shopId, action);
  return { shops: scope.shops, ...(await overdueJobs(actor, scope, limit)) };
}

export async function transferList(
  actor: Actor, shopId: string | undefined, limit: number | null = REPORT_LIST_LIMIT, action: ReportAction = 'read',
): Promise<ListAnswer<TransferInFlight> & { late: number }> {
  const scope = await reportScope(actor, shopId, action);
  return { shops: scope.shops, ...(await transfersInFlight(scope, limit)) };
}

export async function jobList(
  actor: Actor, query: JobListQuery, limit: number | null = REPORT_LIST_LIMIT, action: ReportAction = 'read',
): Promise<ListAnswer<ReportJob>> {
  const scope = await reportScope(actor, query.shop, action);
  const where: string[] = ['j.network_id = :networkId', 'j.shop_id in (:shopIds)'];
  const stage = query.stage ?? (query.skill ? 'bench' : undefined);
  if (stage === 'open') where.push(`j.stage <> 'released'`);
  else if (stage === 'bench') where.push('j.stage in (:benchStages)');
  else if (stage) where.push('j.stage = :stage');
  if (query.skill) where.push('j.required_skill_id = :skill');
  if (query.family) where.push('i.family = :family');
  if (query.readyWithin) {
    where.push('j.ready_at is not null and j.ready_at <= cast(:asOf as timestamptz)');
    where.push('j.ready_at > cast(:asOf as timestamptz) - make_interval(days => :readyWithin)');
  }
  if (query.week) where.push(`date_trunc('week', j.opened_at at time zone s.time_zone)::date = cast(:week as date)`);
  const rows = await select<Record<string, unknown>>(
    `select j.id, j.number, j.shop_id, s.name as shop_name, j.stage, i.family, i.maker, i.model, i.serial,
            ${CUSTOMER_COLUMNS}, sk.name as skill_name, j.estimated_hours, j.opened_at, j.ready_at,
            to_char(j.promised_on, 'YYYY-MM-DD') as promised_on, u.name as assignee_name, count(*) over () as total
       from jobs j
       join shops s on s.network_id = j.network_id and s.id = j.shop_id
       join instruments i on i.network_id = j.network_id and i.id = j.instrument_id
       left join customers c on c.network_id = j.network_id and c.id = j.customer_id
       left join skills sk on sk.network_id = j.network_id and sk.id = j.required_skill_id
       left join users u on u.network_id = j.network_id and u.id = j.assigned_user_id
      where ${where.join(' and ')}
      order by j.opened_at desc, j.number desc
      ${limit == null ? '' : 'limit :limit'}`,
    {
      ...scope, benchStages: BENCH_STAGES, stage: stage ?? null, skill: query.skill ?? null, family: query.family ?? null,
      readyWithin: query.readyWithin ?? null, week: query.week ?? null, limit,
    },
  );
  const names = await customerNamesOf(actor, rows);
  return {
    shops: scope.shops,
    total: rows.length ? num(rows[0].total) : 0,
    items: rows.map((r) => ({
      id: r.id as string, number: num(r.number), shopId: r.shop_id as string, shopName: r.shop_name as string,
      stage: r.stage as JobStage, family: r.family as InstrumentFamily, maker: r.maker as string, model: (r.model as string) ?? null,
      serial: r.serial as string, ...customerOf(r, names), skillName: (r.skill_name as string) ?? null,
      estimatedHours: numOrNull(r.estimated_hours), openedAt: iso(r.opened_at)!, readyAt: iso(r.ready_at),
      promisedOn: (r.promised_on as string) ?? null, assigneeName: (r.assignee_name as string) ?? null,
    })),
  };
}

// ---------------------------------------------------------------------------------------------
// invoices

export interface InvoiceLine {
  kind: 'labor' | 'part';
  description: string;
  /** hours for labor, quantity for parts */
  quantity: number;
  unitCents: number;
  totalCents: number;
}

export interface Invoice {
  jobId: string;
  jobNumber: number;
  releasedOn: string;
  shopCode: string;
  shopName: string;
  customerName: string | null;
  customerHidden: boolean;
  instrument: string;
  serial: string;
  taxRateBasisPoints: number;
  /** a school's or fleet's paperwork, when the customer's name is shown */
  poNumber?: string | null;
  taxExemptCertificate?: string | null;
  lines: InvoiceLine[];
  subtotalCents: number;
  taxCents: number;
  totalCents: number;
}

/**
 * Released jobs whose release date (on the shop's calendar) falls in [from, to], with their line
 * items and totals. Tax uses the shop's current tax rate (shops.tax_rate_basis_points).
 */
export async function invoices(actor: Actor, query: InvoiceQuery): Promise<{ shops: ReportShop[]; invoices: Invoice[] }> {
  const scope = await reportScope(actor, query.shop, 'export');
  const rows = await select<Record<string, unknown>>(
    `select j.id, j.number, s.code as shop_code, s.name as shop_name, s.tax_rate_basis_points,
            to_char(j.released_at at time zone s.time_zone, 'YYYY-MM-DD') as released_on,
            ${CUSTOMER_COLUMNS}, c.po_number, c.tax_exempt_certificate, i.family, i.maker, i.model, i.serial,
            li.id as line_id, li.kind, li.description, li.hours, li.rate_cents, li.quantity, li.unit_price_cents
       from jobs j
       join shops s on s.network_id = j.network_id and s.id = j.shop_id
       join instruments i on i.network_id = j.network_id and i.id = j.instrument_id
       left join customers c on c.network_id = j.network_id and c.id = j.customer_id
       left join job_line_items li on li.network_id = j.network_id and li.job_id = j.id
      where j.network_id = :networkId and j.shop_id in (:shopIds) and j.released_at is not null
        and (j.released_at at time zone s.time_zone)::date between cast(:from as date) and cast(:to as date)
      order by released_on, j.number, li.position, li.created_at, li.id`,
    { ...scope, from: query.from, to: query.to },
  );
  const byJob = new Map<string, { head: Record<string, unknown>; lines: Record<string, unknown>[] }>();
  for (const r of rows) {
    const entry = byJob.get(r.id as string) ?? { head: r, lines: [] };
    if (r.line_id) entry.lines.push(r);
    byJob.set(r.id as string, entry);
  }
  const names = await customerNamesOf(actor, [...byJob.values()].map((e) => e.head));
  const familyLabel = (f: string) => f.replace(/_/g, ' ');
  return {
    shops: scope.shops,
    invoices: [...byJob.values()].map(({ head, lines }) => {
      const inputs: InvoiceLineInput[] = lines.map((l) => ({
        kind: l.kind as 'labor' | 'part',
        hours: l.hours as string | null, rateCents: numOrNull(l.rate_cents),
        quantity: l.quantity as string | null, unitPriceCents: numOrNull(l.unit_price_cents),
      }));
      const taxRate = num(head.tax_rate_basis_points);
      const totals = invoiceTotals(inputs, taxRate);
      const customer = customerOf(head, names);
      const paperwork = !customer.customerHidden;
      return {
        jobId: head.id as string, jobNumber: num(head.number), releasedOn: head.released_on as string,
        shopCode: head.shop_code as string, shopName: head.shop_name as string, ...customer,
        poNumber: paperwork ? ((head.po_number as string | null) ?? null) : null,
        taxExemptCertificate: paperwork ? ((head.tax_exempt_certificate as string | null) ?? null) : null,
        instrument: [familyLabel(head.family as string), head.maker, head.model].filter(Boolean).join(' · '),
        serial: head.serial as string, taxRateBasisPoints: taxRate,
        lines: lines.map((l, i) => ({
          kind: l.kind as 'labor' | 'part', description: l.description as string,
          quantity: l.kind === 'labor' ? num(l.hours) : num(l.quantity),
          unitCents: l.kind === 'labor' ? num(l.rate_cents) : num(l.unit_price_cents),
          totalCents: totals.lineTotalsCents[i],
        })),
        subtotalCents: totals.subtotalCents, taxCents: totals.taxCents, totalCents: totals.totalCents,
      };
    }),
  };
}
