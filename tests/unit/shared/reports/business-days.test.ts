import { describe, expect, it } from 'vitest';
import { businessDaysBetween, isOpeningDay, localDateIn } from '../../../../shared/reports/business-days.js';

const MON_FRI = [1, 2, 3, 4, 5];
const TUE_SAT = [2, 3, 4, 5, 6];

/*
 * Weekdays are those of the Gregorian calendar for 2026 and 2027 (any published calendar); the days of the US
 * daylight-saving changes follow 15 U.S.C. § 260a (second Sunday of March, first Sunday of November, 02:00 local);
 * every count of business days below was worked by hand from them.
 */
describe('businessDaysBetween: opening days after the intake date, up to and including the ready date, on the shop’s calendar', () => {
  // 2026-03-07T07:30Z is Friday 23:30 in Seattle (PST) but already Saturday 16:30 in Tokyo;
  // 2026-03-09T17:00Z is Monday 10:00 in Seattle (PDT: clocks went forward on Sunday 8 March)
  // and Tuesday 02:00 in Tokyo. The same two instants are a different stretch of days in each shop.
  const start = new Date('2026-03-07T07:30:00Z');
  const end = new Date('2026-03-09T17:00:00Z');

  it('Seattle, Monday–Friday: Friday night → Monday morning is 1 business day (Sat, Sun closed), across the DST change', () => {
    expect(businessDaysBetween(start, end, 'America/Los_Angeles', MON_FRI)).toBe(1);
  });

  it('Tokyo, Monday–Friday: the same instants run Saturday → Tuesday, so 2 business days (Mon, Tue)', () => {
    expect(businessDaysBetween(start, end, 'Asia/Tokyo', MON_FRI)).toBe(2);
  });

  it('Tokyo, Tuesday–Saturday: Sunday and Monday closed, so 1', () => {
    expect(businessDaysBetween(start, end, 'Asia/Tokyo', TUE_SAT)).toBe(1);
  });

  it('UTC, Monday–Friday: Saturday → Monday is 1', () => {
    expect(businessDaysBetween(start, end, 'UTC', MON_FRI)).toBe(1);
  });

  it('the same local day is 0, and so is an end before the start', () => {
    expect(businessDaysBetween(new Date('2026-03-10T16:00:00Z'), new Date('2026-03-11T06:59:00Z'), 'America/Los_Angeles', MON_FRI)).toBe(0);
    expect(businessDaysBetween(end, start, 'America/Los_Angeles', MON_FRI)).toBe(0);
  });

  it('a shop with no opening days never counts a day', () => {
    expect(businessDaysBetween(start, new Date('2026-04-30T00:00:00Z'), 'UTC', [])).toBe(0);
  });

  it('a whole year: 2026 has 261 weekdays; counting after 1 January (a Thursday) leaves 260', () => {
    expect(businessDaysBetween(new Date('2026-01-01T12:00:00Z'), new Date('2026-12-31T12:00:00Z'), 'UTC', MON_FRI)).toBe(260);
    // Tuesday–Saturday: 2026 has 52 of each weekday plus one extra Thursday; after 1 Jan, 5 × 52 = 260
    expect(businessDaysBetween(new Date('2026-01-01T12:00:00Z'), new Date('2026-12-31T12:00:00Z'), 'UTC', TUE_SAT)).toBe(260);
  });

  it('the whole-week shortcut agrees with walking day by day, for many spans and zones', () => {
    const zones = ['America/Los_Angeles', 'America/Chicago', 'Asia/Tokyo', 'Pacific/Auckland', 'Europe/London'];
    const walk = (a: Date, b: Date, zone: string, open: number[]) => {
      // a deliberately plain re-count: every local date after a's up to b's, weekday from Intl
      const dayOf = (d: Date) => localDateIn(d, zone);
      let n = 0;
      const last = dayOf(b);
      const cursor = new Date(`${dayOf(a)}T12:00:00Z`);
      for (;;) {
        cursor.setUTCDate(cursor.getUTCDate() + 1);
        const date = cursor.toISOString().slice(0, 10);
        if (date > last) break;
        if (open.includes(cursor.getUTCDay() === 0 ? 7 : cursor.getUTCDay())) n++;
      }
      return n;
    };
    let seed = 7;
    const rand = () => ((seed = (seed * 48271) % 2147483647) / 2147483647);
    for (let i = 0; i < 200; i++) {
      const a = new Date(Date.UTC(2025, 0, 1) + rand() * 700 * 86_400_000);
      const b = new Date(a.getTime() + rand() * 90 * 86_400_000);
      const zone = zones[i % zones.length];
      const open = i % 2 ? MON_FRI : TUE_SAT;
      expect(businessDaysBetween(a, b, zone, open), `${a.toISOString()} → ${b.toISOString()} in ${zone}`).toBe(walk(a, b, zone, open));
    }
  });
});

describe('local dates and opening days', () => {
  it('an instant falls on the shop’s own calendar date', () => {
    expect(localDateIn(new Date('2026-03-07T07:30:00Z'), 'America/Los_Angeles')).toBe('2026-03-06');
    expect(localDateIn(new Date('2026-03-07T07:30:00Z'), 'Asia/Tokyo')).toBe('2026-03-07');
  });

  it('Friday night in Seattle is an opening day there while it is already Saturday (closed) in Tokyo', () => {
    const at = new Date('2026-03-07T07:30:00Z');
    expect(isOpeningDay(at, 'America/Los_Angeles', MON_FRI)).toBe(true);
    expect(isOpeningDay(at, 'Asia/Tokyo', MON_FRI)).toBe(false);
  });
});

describe('businessDaysBetween with public holidays and closing days (U.S. OPM federal holidays 2027, opm.gov)', () => {
  // Fri 5 Nov 2027 → Fri 12 Nov 2027 in Los Angeles, across the end of daylight saving time (Sun 7 Nov):
  // Mon 8, Tue 9, Wed 10, (Thu 11 Veterans Day, OPM 2027), Fri 12 → 4 business days, worked by hand
  const start = new Date('2027-11-05T17:00:00Z');
  const end = new Date('2027-11-12T23:00:00Z');
  const MON_FRI = [1, 2, 3, 4, 5];
  it('skips a public holiday of the shop’s country and region', () => {
    expect(businessDaysBetween(start, end, 'America/Los_Angeles', MON_FRI)).toBe(5);
    expect(businessDaysBetween(start, end, 'America/Los_Angeles', MON_FRI, { country: 'US', region: 'WA' })).toBe(4);
  });
  it('skips the owner’s closing days, but not one on a weekday the shop is closed anyway or outside the span', () => {
    // Tue 9 closed → 3; Sat 6 (closed anyway), Fri 5 (the intake date, never counted) and Mon 15 (after) change nothing
    const closedDays = ['2027-11-09', '2027-11-06', '2027-11-05', '2027-11-15'];
    expect(businessDaysBetween(start, end, 'America/Los_Angeles', MON_FRI, { country: 'US', region: 'WA', closedDays })).toBe(3);
  });
  it('a closing day on a public holiday is not taken off twice', () => {
    expect(businessDaysBetween(start, end, 'America/Los_Angeles', MON_FRI, { country: 'US', closedDays: ['2027-11-11'] })).toBe(4);
  });
});
