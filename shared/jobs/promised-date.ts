import { addDays, format, getISODay, parseISO, startOfDay } from 'date-fns';
import { TZDate } from '@date-fns/tz';
import Holidays from 'date-holidays';
import type { IsoWeekday } from '../domain.js';
import { isTimeZone } from '../schemas/shops.js';
import { localDate } from '../time/shop-calendar.js';
import { formatCalendarDate } from '../time/calendar-date.js';

/**
 * Promised dates are counted in the shop's opening days, on the shop's own calendar.
 *
 * The rule: take the calendar date of `from` in the shop's time zone (a job opened at 23:30 in Denver
 * on a Friday was opened on Friday, whatever UTC says); that day itself does not count; count forward
 * over the days the shop opens (ISO weekdays, Monday = 1) and promise the N-th. Zero days means "today
 * if the shop is open today, else its next opening day". Closed days — weekends, a shop's day off —
 * are skipped, and so are the public holidays of the shop's country and region (the `date-holidays`
 * package's "public" days, substitute days included: a shop closes on the day the holiday is observed) and
 * the closing days the owner adds for the shop.
 *
 * Counting happens on local calendar days (a TZDate at local midnight), so a daylight-saving change in
 * the week neither adds nor loses a day.
 */

export interface ShopCalendar {
  /** IANA time zone, e.g. America/Denver. */
  timeZone: string;
  /** ISO weekdays the shop opens. */
  openingDays: readonly IsoWeekday[] | readonly number[];
  /** ISO 3166-1 alpha-2 country, e.g. US; its public holidays are closing days. None: no public holidays. */
  country?: string | null;
  /** State or province code within the country, e.g. WA; adds the region's own public holidays. */
  region?: string | null;
  /** Further closing days the owner set for this shop, 'YYYY-MM-DD'. */
  closedDays?: readonly string[] | null;
}

const holidayCache = new Map<string, Set<string>>();

/** The public holidays of a country (and region) in a year, as 'YYYY-MM-DD' dates of that country's calendar. */
export function publicHolidays(country: string | null | undefined, region: string | null | undefined, year: number): Set<string> {
  if (!country) return new Set();
  const key = `${country}/${region ?? ''}/${year}`;
  let dates = holidayCache.get(key);
  if (!dates) {
    const hd = new Holidays();
    const c = country.toUpperCase();
    const r = region?.toUpperCase() ?? '';
    // an unknown region falls back to the country's holidays; an unknown country has none
    const known = c in (hd.getCountries() ?? {});
    if (known) {
      if (r && r in (hd.getStates(c) ?? {})) hd.init(c, r);
      else hd.init(c);
    }
    dates = new Set(known ? hd.getHolidays(year).filter((h) => h.type === 'public').map((h) => h.date.slice(0, 10)) : []);
    holidayCache.set(key, dates);
  }
  return dates;
}

/** A public holiday as the owner sees it beside the shop's closing days. */
export interface PublicHoliday {
  date: string;
  name: string;
}

/**
 * The public holidays of a country (and region) from `fromDate` for `days` days, oldest first: the same
 * "public" days (substitute days included) that promised dates skip, with their names.
 */
export function upcomingPublicHolidays(country: string | null | undefined, region: string | null | undefined, fromDate: string, days = 365): PublicHoliday[] {
  if (!country) return [];
  const hd = new Holidays();
  const c = country.toUpperCase();
  const r = region?.toUpperCase() ?? '';
  if (!(c in (hd.getCountries() ?? {}))) return [];
  if (r && r in (hd.getStates(c) ?? {})) hd.init(c, r);
  else hd.init(c);
  const start = parseISO(fromDate);
  const end = format(addDays(start, days), 'yyyy-MM-dd');
  const out: PublicHoliday[] = [];
  for (let year = start.getFullYear(); year <= Number(end.slice(0, 4)); year++) {
    for (const h of hd.getHolidays(year)) {
      const date = h.date.slice(0, 10);
      if (h.type === 'public' && date >= fromDate && date < end) out.push({ date, name: h.name });
    }
  }
  return out.sort((a, b) => a.date.localeCompare(b.date));
}

/** A shop's open-or-closed test for local calendar days. */
function openTest(shop: ShopCalendar): (day: Date) => boolean {
  const open = new Set<number>(shop.openingDays as readonly number[]);
  const closed = new Set(shop.closedDays ?? []);
  return (day: Date) => {
    if (!open.has(getISODay(day))) return false;
    const date = format(day, 'yyyy-MM-dd');
    return !closed.has(date) && !publicHolidays(shop.country, shop.region, Number(date.slice(0, 4))).has(date);
  };
}

/** Holidays and closing days are finite; this many days with no open day means the calendar is broken. */
const MAX_CLOSED_RUN = 400;

/**
 * Refuses a calendar the counting could never finish on: no opening day at all, or a time zone the runtime
 * does not know (every date in it is Invalid Date, which matches no weekday, so the count would never end).
 * The shop schema refuses both on the Shops screen; this catches rows written before it did.
 */
export class ShopCalendarError extends RangeError {
  override name = 'ShopCalendarError';
}

export function assertCalendar(shop: ShopCalendar) {
  if (!shop.openingDays.length || shop.openingDays.some((d) => !Number.isInteger(d) || d < 1 || d > 7)) {
    throw new ShopCalendarError('The shop has no opening days set (ISO weekdays 1–7): set them on the Shops screen before promising a date.');
  }
  if (typeof shop.timeZone !== 'string' || !isTimeZone(shop.timeZone)) {
    throw new ShopCalendarError(`The shop's time zone "${String(shop.timeZone)}" is not a known time zone: set one such as America/Denver on the Shops screen.`);
  }
}

// the shop's calendar date lives in shared/time/shop-calendar.ts; re-exported for this module's callers
export { localDate };

/** Local midnight of a 'YYYY-MM-DD' date in a time zone. */
function localMidnight(date: string, timeZone: string): TZDate {
  const [y, m, d] = date.split('-').map(Number);
  return new TZDate(y, m - 1, d, timeZone);
}

export function isOpeningDay(date: string, shop: ShopCalendar): boolean {
  assertCalendar(shop);
  return openTest(shop)(localMidnight(date, shop.timeZone));
}

/**
 * The promised date N opening days after `from` (an instant, or a 'YYYY-MM-DD' date already on the
 * shop's calendar), as 'YYYY-MM-DD' in the shop's time zone.
 */
export function addOpeningDays(from: Date | string, openingDays: number, shop: ShopCalendar): string {
  assertCalendar(shop);
  if (!Number.isInteger(openingDays) || openingDays < 0 || openingDays > 366) {
    throw new RangeError(`Opening days must be a whole number from 0 to 366, got ${openingDays}`);
  }
  const isOpen = openTest(shop);
  let day: TZDate =
    typeof from === 'string' ? localMidnight(from, shop.timeZone) : startOfDay(new TZDate(from, shop.timeZone));
  let closedRun = 0;
  const step = () => {
    day = addDays(day, 1);
    if (++closedRun > MAX_CLOSED_RUN) throw new ShopCalendarError(`The shop is closed every day for more than ${MAX_CLOSED_RUN} days: check its closing days.`);
  };
  if (openingDays === 0) {
    while (!isOpen(day)) step();
    return format(day, 'yyyy-MM-dd');
  }
  let counted = 0;
  while (counted < openingDays) {
    step();
    if (isOpen(day)) {
      counted++;
      closedRun = 0;
    }
  }
  return format(day, 'yyyy-MM-dd');
}

/**
 * Opening days from `from`'s local date up to `promisedOn` (the count `addOpeningDays` would need);
 * 0 when the promise is today or earlier. Used to show "3 opening days left".
 */
export function openingDaysUntil(from: Date, promisedOn: string, shop: ShopCalendar): number {
  assertCalendar(shop);
  const isOpen = openTest(shop);
  let day = startOfDay(new TZDate(from, shop.timeZone));
  const end = localMidnight(promisedOn, shop.timeZone);
  let counted = 0;
  while (day.getTime() < end.getTime()) {
    day = addDays(day, 1);
    if (isOpen(day)) counted++;
  }
  return counted;
}

/**
 * A promise is overdue once the shop's local date has passed it and the work is not finished
 * (ready or released jobs kept their promise or are waiting on the customer).
 */
export function isOverdue(promisedOn: string | null | undefined, stage: string, now: Date, timeZone: string): boolean {
  if (!promisedOn || stage === 'ready' || stage === 'released') return false;
  return localDate(now, timeZone) > promisedOn;
}

/** "Tue 14 Oct 2025" for a 'YYYY-MM-DD' date (shared/time/calendar-date.ts, kept here for existing imports). */
export { formatCalendarDate };
