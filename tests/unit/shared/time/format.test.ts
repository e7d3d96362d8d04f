import { describe, expect, it } from 'vitest';
import { formatCalendarDate, formatDate, formatDateTime, formatTime, zoneName } from '../../../../shared/time/format.js';

// Expectations are written by hand: 2026-12-06T00:06:00Z is Saturday 5 December 2026, 16:06 in
// Los Angeles (PST is UTC−8 in December), Sunday 01:06 in Berlin (CET, UTC+1) and 00:06 in UTC.
describe('one way to write a time', () => {
  it('writes date and time in the shop’s zone with a 24-hour clock and the zone’s name', () => {
    expect(formatDateTime('2026-12-06T00:06:00Z', 'America/Los_Angeles')).toBe('Sat 5 Dec 2026, 16:06 PST');
    expect(formatDateTime(new Date('2026-12-06T00:06:00Z'), 'UTC')).toBe('Sun 6 Dec 2026, 00:06 UTC');
    expect(formatDateTime('2026-12-06T00:06:00Z', 'Europe/Berlin')).toBe('Sun 6 Dec 2026, 01:06 GMT+1');
  });

  // daylight time runs from the second Sunday of March to the first Sunday of November (15 U.S.C. § 260a)
  it('uses daylight time when the date falls in it (July in Los Angeles is UTC−7)', () => {
    expect(formatDateTime('2026-07-04T19:30:00Z', 'America/Los_Angeles')).toBe('Sat 4 Jul 2026, 12:30 PDT');
  });

  it('writes the date alone the same way', () => {
    expect(formatDate('2026-12-06T00:06:00Z', 'America/Los_Angeles')).toBe('Sat 5 Dec 2026');
    expect(formatDate('2026-12-06T00:06:00Z', 'UTC')).toBe('Sun 6 Dec 2026');
    expect(formatTime('2026-12-08T18:30:00Z', 'America/Los_Angeles')).toBe('10:30 PST');
  });

  it('reads a calendar date as that day wherever the code runs', () => {
    expect(formatCalendarDate('2026-12-08')).toBe('Tue 8 Dec 2026');
    expect(formatCalendarDate('2027-01-01')).toBe('Fri 1 Jan 2027');
  });

  it('says a dash for nothing or for a value that is not a time', () => {
    expect(formatDateTime(null, 'UTC')).toBe('—');
    expect(formatDate('not a date', 'UTC')).toBe('—');
    expect(formatCalendarDate(undefined)).toBe('—');
  });

  it('names a zone in words', () => {
    expect(zoneName('America/Los_Angeles')).toBe('Los Angeles time');
  });
});
