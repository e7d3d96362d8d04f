import { afterEach, describe, expect, it } from 'vitest';
import {
  addOpeningDays,
  formatCalendarDate,
  isOpeningDay,
  isOverdue,
  localDate,
  openingDaysUntil,
  ShopCalendarError,
} from '../../../../shared/jobs/promised-date.js';

/**
 * Worked examples, one per shop time zone of the demo network. Weekdays and daylight-saving dates
 * checked against the 2025/2026 calendar: in the United States daylight saving time ends on the
 * first Sunday of November (2 Nov 2025) and starts on the second Sunday of March (8 Mar 2026),
 * both at 02:00 local time (Energy Policy Act of 2005, 15 U.S.C. § 260a).
 */
const MON_FRI = [1, 2, 3, 4, 5];
const TUE_SAT = [2, 3, 4, 5, 6];
const seattle = { timeZone: 'America/Los_Angeles', openingDays: MON_FRI };
const portland = { timeZone: 'America/Los_Angeles', openingDays: TUE_SAT };
const denver = { timeZone: 'America/Denver', openingDays: TUE_SAT };
const chicago = { timeZone: 'America/Chicago', openingDays: MON_FRI };

const originalTz = process.env.TZ;
afterEach(() => {
  process.env.TZ = originalTz;
});

describe('America/Los_Angeles (Seattle Mon–Fri, Portland Tue–Sat), week DST ends (Sun 2 Nov 2025)', () => {
  it('Fri 31 Oct 16:00 PDT + 3 opening days → Wed 5 Nov (the weekend and the clock change skipped)', () => {
    expect(addOpeningDays(new Date('2025-10-31T23:00:00Z'), 3, seattle)).toBe('2025-11-05');
  });

  it('counts from the shop’s local date, not UTC: Thu 30 Oct 22:30 PDT is Fri 05:30 UTC', () => {
    const lateThursday = new Date('2025-10-31T05:30:00Z');
    expect(localDate(lateThursday, seattle.timeZone)).toBe('2025-10-30');
    // local Thursday + 1 → Friday; counting from the UTC date (Friday) would wrongly give Monday
    expect(addOpeningDays(lateThursday, 1, seattle)).toBe('2025-10-31');
  });

  it('Portland opens Tue–Sat: Sat 1 Nov + 1 → Tue 4 Nov; a job taken in on a closed Monday + 1 → Tue', () => {
    expect(addOpeningDays(new Date('2025-11-01T18:00:00Z'), 1, portland)).toBe('2025-11-04');
    expect(addOpeningDays(new Date('2025-11-03T18:00:00Z'), 1, portland)).toBe('2025-11-04');
  });
});

describe('America/Denver (Denver Tue–Sat), week DST starts (Sun 8 Mar 2026)', () => {
  it('Sat 7 Mar 17:00 MST (already Sunday in UTC) + 2 → Wed 11 Mar; + 5 → Sat 14 Mar', () => {
    const saturdayEvening = new Date('2026-03-08T00:00:00Z');
    expect(localDate(saturdayEvening, denver.timeZone)).toBe('2026-03-07');
    expect(addOpeningDays(saturdayEvening, 2, denver)).toBe('2026-03-11');
    expect(addOpeningDays(saturdayEvening, 5, denver)).toBe('2026-03-14');
  });

  it('zero days on a closed day is the next opening day; on an opening day it is that day', () => {
    expect(addOpeningDays(new Date('2026-03-09T16:00:00Z'), 0, denver)).toBe('2026-03-10'); // Mon closed → Tue
    expect(addOpeningDays(new Date('2026-03-10T16:00:00Z'), 0, denver)).toBe('2026-03-10');
  });
});

describe('America/Chicago (Chicago Mon–Fri), across the DST start', () => {
  it('Fri 6 Mar 18:00 CST (Saturday in UTC) + 1 → Mon 9 Mar', () => {
    expect(addOpeningDays(new Date('2026-03-07T00:00:00Z'), 1, chicago)).toBe('2026-03-09');
  });

  it('Wed 4 Mar noon + 10 opening days → Wed 18 Mar (two weekends skipped, no day lost to the clock change)', () => {
    expect(addOpeningDays(new Date('2026-03-04T18:00:00Z'), 10, chicago)).toBe('2026-03-18');
  });

  it('accepts a calendar date already on the shop’s calendar', () => {
    expect(addOpeningDays('2026-03-06', 1, chicago)).toBe('2026-03-09');
  });
});

describe('independent of the server’s own time zone', () => {
  it('gives the same answers when the process runs in Asia/Tokyo or Pacific/Kiritimati', () => {
    for (const zone of ['Asia/Tokyo', 'Pacific/Kiritimati', 'UTC']) {
      process.env.TZ = zone;
      expect(addOpeningDays(new Date('2025-10-31T23:00:00Z'), 3, seattle), zone).toBe('2025-11-05');
      expect(addOpeningDays(new Date('2026-03-08T00:00:00Z'), 2, denver), zone).toBe('2026-03-11');
      expect(localDate(new Date('2025-10-31T05:30:00Z'), seattle.timeZone), zone).toBe('2025-10-30');
    }
  });
});

describe('helpers', () => {
  it('knows opening days', () => {
    expect(isOpeningDay('2026-03-07', denver)).toBe(true); // Saturday
    expect(isOpeningDay('2026-03-07', chicago)).toBe(false);
  });

  it('counts opening days left until a promise', () => {
    expect(openingDaysUntil(new Date('2025-10-31T23:00:00Z'), '2025-11-05', seattle)).toBe(3);
    expect(openingDaysUntil(new Date('2025-10-31T23:00:00Z'), '2025-10-31', seattle)).toBe(0);
  });

  it('a promise is overdue once the shop’s date has passed it, unless the work is ready or released', () => {
    const justAfterMidnightInChicago = new Date('2026-03-10T05:30:00Z'); // 00:30 CDT on Tue 10 Mar
    expect(isOverdue('2026-03-09', 'on_bench', justAfterMidnightInChicago, chicago.timeZone)).toBe(true);
    // still Monday evening in Seattle
    expect(isOverdue('2026-03-09', 'on_bench', justAfterMidnightInChicago, seattle.timeZone)).toBe(false);
    expect(isOverdue('2026-03-09', 'ready', justAfterMidnightInChicago, chicago.timeZone)).toBe(false);
    expect(isOverdue(null, 'on_bench', justAfterMidnightInChicago, chicago.timeZone)).toBe(false);
  });

  it('refuses an unknown time zone or no opening days with a clear error instead of counting forever', () => {
    const mars = { timeZone: 'Mars/Olympus_Mons', openingDays: MON_FRI };
    expect(() => addOpeningDays(new Date('2026-03-02T12:00:00Z'), 3, mars)).toThrow(ShopCalendarError);
    expect(() => addOpeningDays('2026-03-02', 0, mars)).toThrow(/"Mars\/Olympus_Mons" is not a known time zone/);
    expect(() => openingDaysUntil(new Date('2026-03-02T12:00:00Z'), '2026-03-09', mars)).toThrow(ShopCalendarError);
    expect(() => addOpeningDays('2026-03-02', 2, { timeZone: 'America/Chicago', openingDays: [] })).toThrow(/no opening days/);
    expect(() => addOpeningDays('2026-03-02', 2, { timeZone: 'America/Chicago', openingDays: [0, 8] })).toThrow(ShopCalendarError);
  });

  it('refuses a calendar without opening days and silly counts', () => {
    expect(() => addOpeningDays(new Date(), 1, { timeZone: 'America/Chicago', openingDays: [] })).toThrow(RangeError);
    expect(() => addOpeningDays(new Date(), -1, chicago)).toThrow(RangeError);
    expect(() => addOpeningDays(new Date(), 1.5, chicago)).toThrow(RangeError);
  });

  it('formats a calendar date without shifting it', () => {
    process.env.TZ = 'Pacific/Kiritimati';
    expect(formatCalendarDate('2026-03-09')).toBe('Mon 9 Mar 2026');
  });
});
