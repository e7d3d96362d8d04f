/**
 * The one way Benchrelay writes a time for people: screens, the manifest PDF, notices and e-mails.
 *
 *   formatDateTime → "Sat 5 Dec 2026, 16:06 PST"   (24-hour clock, the zone's short name)
 *   formatDate     → "Sat 5 Dec 2026"
 *   formatTime     → "16:06 PST"
 *
 * Every time is read in a named IANA zone — the shop's, or the viewer's where a page says so once — and
 * never in the zone of the machine that happens to run the code. Pieces are assembled from
 * `formatToParts`, so the order and punctuation do not depend on a locale's habits.
 */

export type Instant = Date | string | number;

const cache = new Map<string, Intl.DateTimeFormat>();
function formatter(timeZone: string, withTime: boolean): Intl.DateTimeFormat {
  const key = `${timeZone}|${withTime}`;
  let f = cache.get(key);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      weekday: 'short',
      day: 'numeric',
      month: 'short',
      year: 'numeric',
      ...(withTime ? { hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZoneName: 'short' } : {}),
    });
    cache.set(key, f);
  }
  return f;
}

function toDate(value: Instant): Date | null {
  const d = value instanceof Date ? value : new Date(value);
  return Number.isNaN(d.getTime()) ? null : d;
}

function parts(value: Date, timeZone: string, withTime: boolean) {
  const out: Record<string, string> = {};
  for (const p of formatter(timeZone, withTime).formatToParts(value)) out[p.type] = p.value;
  return out;
}

/** "Sat 5 Dec 2026" in the given zone; "—" for nothing. */
export function formatDate(value: Instant | null | undefined, timeZone: string): string {
  const d = value == null ? null : toDate(value);
  if (!d) return '—';
  const p = parts(d, timeZone, false);
  return `${p.weekday} ${p.day} ${p.month} ${p.year}`;
}

/** "Sat 5 Dec 2026, 16:06 PST" in the given zone; "—" for nothing. */
export function formatDateTime(value: Instant | null | undefined, timeZone: string): string {
  const d = value == null ? null : toDate(value);
  if (!d) return '—';
  const p = parts(d, timeZone, true);
  return `${p.weekday} ${p.day} ${p.month} ${p.year}, ${p.hour}:${p.minute} ${p.timeZoneName}`;
}

/** "16:06 PST" in the given zone; "—" for nothing. */
export function formatTime(value: Instant | null | undefined, timeZone: string): string {
  const d = value == null ? null : toDate(value);
  if (!d) return '—';
  const p = parts(d, timeZone, true);
  return `${p.hour}:${p.minute} ${p.timeZoneName}`;
}

/** A calendar date with no time of day ('YYYY-MM-DD', e.g. a promised date) → "Tue 8 Dec 2026". */
export function formatCalendarDate(date: string | null | undefined): string {
  if (!date) return '—';
  const m = /^(\d{4})-(\d{2})-(\d{2})/.exec(date);
  if (!m) return '—';
  return formatDate(new Date(Date.UTC(Number(m[1]), Number(m[2]) - 1, Number(m[3]), 12)), 'UTC');
}

/** The zone of the person's browser or the server, for pages that show times in the viewer's zone. */
export function viewerTimeZone(): string {
  return Intl.DateTimeFormat().resolvedOptions().timeZone || 'UTC';
}

/** "America/Los_Angeles" → "Los Angeles time": said once on a page that shows times in one zone. */
export function zoneName(timeZone: string): string {
  const city = timeZone.split('/').pop() ?? timeZone;
  return `${city.replace(/_/g, ' ')} time`;
}
