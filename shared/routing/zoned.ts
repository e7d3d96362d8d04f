import { TZDate } from '@date-fns/tz';
import { formatDate, formatDateTime } from '../time/format.js';
import { localDate } from '../time/shop-calendar.js';
import type { IsoWeekday } from '../domain.js';

/** Wall-clock reading of an instant in a shop's time zone. Months are 1–12; weekdays ISO (Monday = 1). */
export interface LocalParts {
  year: number;
  month: number;
  day: number;
  isoWeekday: IsoWeekday;
  hour: number;
  minute: number;
}

export function localParts(instant: Date, timeZone: string): LocalParts {
  const z = new TZDate(instant.getTime(), timeZone);
  const weekday = z.getDay();
  return {
    year: z.getFullYear(),
    month: z.getMonth() + 1,
    day: z.getDate(),
    isoWeekday: (weekday === 0 ? 7 : weekday) as IsoWeekday,
    hour: z.getHours(),
    minute: z.getMinutes(),
  };
}

/**
 * The instant at a wall-clock time in a time zone. `day` may run past the month's end (day 32 is the
 * 1st of the next month), which keeps "n days later" arithmetic free of month lengths and DST jumps.
 */
export function atLocal(year: number, month: number, day: number, hour: number, minute: number, timeZone: string): Date {
  return new Date(new TZDate(year, month - 1, day, hour, minute, 0, 0, timeZone).getTime());
}

// 'YYYY-MM-DD' of an instant in a time zone: shared/time/shop-calendar.ts, re-exported for routing's callers
export { localDate };

/** "Tue 11 Jun 2024, 07:30 PDT" (or the date alone) in the shop's zone: the one format of shared/time/format.ts. */
export function formatLocal(instant: Date, timeZone: string, withTime = true): string {
  return withTime ? formatDateTime(instant, timeZone) : formatDate(instant, timeZone);
}

/** "America/Los_Angeles" → "Los Angeles time". */
export function zoneLabel(timeZone: string): string {
  const city = timeZone.split('/').pop() ?? timeZone;
  return `${city.replace(/_/g, ' ')} time`;
}
