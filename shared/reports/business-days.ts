import { tz } from '@date-fns/tz';
import { addDays, differenceInCalendarDays, getISODay, startOfDay } from 'date-fns';
import type { IsoWeekday } from '../domain.js';
import { publicHolidays } from '../jobs/promised-date.js';
import { localDateIn } from '../time/calendar-date.js';

/**
 * Business days, as Benchrelay counts them for turnaround: the shop's opening days that come AFTER the
 * local calendar date of `start`, up to and including the local calendar date of `end`, both dates
 * taken in the shop's own time zone. So a job taken in on Monday and ready on Tuesday took 1 business
 * day, ready the same day took 0, and one taken in on a Saturday (shop closed) and ready on Monday took 1.
 * Counting whole local dates (not hours) is what a counter clerk means by "three working days", and it
 * keeps the figure the same whether the bench finished at 9:00 or 17:00.
 *
 * Public holidays of the shop's country and region (the same `date-holidays` "public" days promised dates
 * skip) and the owner's closing days of the shop are not business days either, when `closed` names them.
 *
 * The SQL in server/modules/reports/service.ts counts the same thing (generate_series over local dates,
 * `isodow = any(opening_days)`, less the closed dates it is handed); tests/api/reports-turnaround.test.ts
 * holds the two against each other.
 */
export interface ClosedDates {
  country?: string | null;
  region?: string | null;
  /** The owner's closing days, 'YYYY-MM-DD'. */
  closedDays?: readonly string[] | null;
}

export function businessDaysBetween(start: Date, end: Date, timeZone: string, openingDays: readonly number[], closed?: ClosedDates): number {
  const inZone = tz(timeZone);
  const calendarDays = differenceInCalendarDays(end, start, { in: inZone });
  if (calendarDays <= 0) return 0;
  const open = new Set(openingDays.filter((d) => d >= 1 && d <= 7));
  if (open.size === 0) return 0;
  // whole weeks contain every opening day once; only the remainder needs walking
  const fullWeeks = Math.floor(calendarDays / 7);
  let count = fullWeeks * open.size;
  const first = startOfDay(start, { in: inZone });
  for (let i = fullWeeks * 7 + 1; i <= calendarDays; i++) {
    if (open.has(getISODay(addDays(first, i, { in: inZone }), { in: inZone }))) count++;
  }
  if (!closed) return count;
  // less each closed date after the start's date, up to and including the end's, that was an opening day
  const from = localDateIn(start, timeZone);
  const to = localDateIn(end, timeZone);
  const dates = new Set(closed.closedDays ?? []);
  for (let year = Number(from.slice(0, 4)); year <= Number(to.slice(0, 4)); year++) {
    for (const d of publicHolidays(closed.country, closed.region, year)) dates.add(d);
  }
  for (const d of dates) {
    if (d > from && d <= to && open.has(isoWeekdayOf(d))) count--;
  }
  return count;
}

/** ISO weekday (Monday = 1) of a 'YYYY-MM-DD' calendar date. */
function isoWeekdayOf(date: string): number {
  const [y, m, d] = date.split('-').map(Number);
  return ((new Date(Date.UTC(y, m - 1, d)).getUTCDay() + 6) % 7) + 1;
}

/** Calendar date ('YYYY-MM-DD') of an instant as the shop's wall calendar shows it (kept here for the server's imports). */
export { localDateIn };

/** Whether the shop opens on the local date of this instant. */
export function isOpeningDay(at: Date, timeZone: string, openingDays: readonly IsoWeekday[] | readonly number[]): boolean {
  return (openingDays as readonly number[]).includes(getISODay(at, { in: tz(timeZone) }));
}
