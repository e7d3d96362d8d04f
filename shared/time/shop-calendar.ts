import { format } from 'date-fns';
import { TZDate } from '@date-fns/tz';

/**
 * A shop's calendar dates: the one home for "what day is it at the shop". A calendar date is a
 * 'YYYY-MM-DD' string read in the shop's IANA time zone, never the server's or the viewer's.
 * Opening days and closing days build on it in shared/jobs/promised-date.ts (promises) and
 * shared/reports/business-days.ts (turnaround counts).
 */

/** The calendar date ('YYYY-MM-DD') of an instant in a time zone. */
export function localDate(instant: Date, timeZone: string): string {
  return format(new TZDate(instant, timeZone), 'yyyy-MM-dd');
}

/** Today's date at the shop; without a zone, the viewer's own. */
export function todayIn(timeZone: string | undefined, now: Date = new Date()): string {
  return localDate(now, timeZone ?? Intl.DateTimeFormat().resolvedOptions().timeZone);
}
