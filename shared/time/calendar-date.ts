import { tz } from '@date-fns/tz';
import { format, parseISO } from 'date-fns';

/**
 * Calendar dates ('YYYY-MM-DD') without the holiday calendars: screens that only show or compare dates
 * import these, so the public-holiday tables (shared/jobs/promised-date.ts) load only with the pages
 * that count opening days.
 */

/** The local calendar date of an instant in a time zone, as 'YYYY-MM-DD'. */
export function localDateIn(at: Date, timeZone: string): string {
  return format(at, 'yyyy-MM-dd', { in: tz(timeZone) });
}

/** 'YYYY-MM-DD' → "Sat 5 Dec 2026". */
export function formatCalendarDate(date: string): string {
  return format(parseISO(date), 'EEE d MMM yyyy');
}
