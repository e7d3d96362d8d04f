import { formatCalendarDate, formatDateTime } from '../time/format.js';
/** Plain-language numbers for the dashboard and the report tables. */

export function formatDays(days: number | null, unit: 'business' | 'calendar' = 'business'): string {
  if (days == null) return '—';
  const n = Number.isInteger(days) ? String(days) : days.toFixed(1);
  const word = unit === 'business' ? 'business day' : 'day';
  return `${n} ${word}${days === 1 ? '' : 's'}`;
}

export function formatHours(hours: number): string {
  return `${Number.isInteger(hours) ? hours : hours.toFixed(1)} h`;
}

/** A date-only value ('2026-08-31') as people read it, without moving it through a time zone. */
export function formatIsoDate(date: string): string {
  return formatCalendarDate(date);
}

/** An instant on a shop's clock, with the zone's short name so nobody guesses whose clock it is. */
export function formatInstantIn(iso: string, timeZone: string): string {
  return formatDateTime(iso, timeZone);
}

/** Weeks of work as a percentage of one week's bench hours: 1.05 → "105 %". */
export function formatLoad(weeksOfWork: number | null): string {
  return weeksOfWork == null ? 'no bench hours' : `${Math.round(weeksOfWork * 100)} %`;
}
