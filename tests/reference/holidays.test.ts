import { describe, expect, it } from 'vitest';
import { addOpeningDays, openingDaysUntil, publicHolidays, upcomingPublicHolidays } from '../../shared/jobs/promised-date.js';

/**
 * Promised dates against a published holiday calendar: the U.S. Office of Personnel Management's federal
 * holidays for 2027 (opm.gov, "Federal Holidays", 2027 table; dates as written there, from memory):
 * New Year's Day Fri 1 Jan, Birthday of Martin Luther King, Jr. Mon 18 Jan, Washington's Birthday Mon 15 Feb,
 * Memorial Day Mon 31 May, Juneteenth Fri 18 Jun (observed; 19 Jun is a Saturday), Independence Day Mon 5 Jul
 * (observed; 4 Jul is a Sunday), Labor Day Mon 6 Sep, Columbus Day Mon 11 Oct, Veterans Day Thu 11 Nov,
 * Thanksgiving Day Thu 25 Nov, Christmas Day Fri 24 Dec (observed; 25 Dec is a Saturday).
 * Daylight saving time ends on Sunday 7 November 2027 at 02:00 in the United States (15 U.S.C. § 260a:
 * the first Sunday of November).
 */
const OPM_2027 = [
  '2027-01-01', '2027-01-18', '2027-02-15', '2027-05-31', '2027-06-18', '2027-07-05',
  '2027-09-06', '2027-10-11', '2027-11-11', '2027-11-25', '2027-12-24',
];
const seattle = { timeZone: 'America/Los_Angeles', openingDays: [1, 2, 3, 4, 5], country: 'US', region: 'WA' };

describe('public holidays in promised dates (U.S. OPM federal holidays 2027)', () => {
  it('the shop’s calendar closes on every weekday OPM lists for 2027', () => {
    const holidays = publicHolidays('US', 'WA', 2027);
    for (const date of OPM_2027) expect(holidays.has(date), date).toBe(true);
  });

  it('across the end of daylight saving time: Fri 5 Nov 2027 + 5 opening days skips Veterans Day → Mon 15 Nov', () => {
    // Mon 8, Tue 9, Wed 10, (Thu 11 Veterans Day), Fri 12, Mon 15; the clocks go back on Sun 7 Nov
    const friday = new Date('2027-11-05T23:00:00Z'); // 16:00 PDT
    expect(addOpeningDays(friday, 5, seattle)).toBe('2027-11-15');
    expect(addOpeningDays(friday, 5, { ...seattle, country: null })).toBe('2027-11-12'); // no country: no holidays
    expect(openingDaysUntil(friday, '2027-11-15', seattle)).toBe(5);
  });

  it('Thanksgiving, Independence Day and the observed Christmas and New Year are skipped', () => {
    expect(addOpeningDays('2027-11-23', 2, seattle)).toBe('2027-11-26'); // Wed 24, (Thu 25), Fri 26
    expect(addOpeningDays('2027-07-02', 1, seattle)).toBe('2027-07-06'); // (Mon 5 Jul observed) → Tue 6
    expect(addOpeningDays('2027-12-23', 1, seattle)).toBe('2027-12-27'); // (Fri 24 Dec observed) → Mon 27
    // New Year's Day 2028 is a Saturday, observed Fri 31 Dec 2027 (5 U.S.C. 6103(b)): → Mon 3 Jan 2028
    expect(addOpeningDays('2027-12-30', 1, seattle)).toBe('2028-01-03');
    expect(addOpeningDays('2027-11-11', 0, seattle)).toBe('2027-11-12'); // a promise "today" on a holiday is the next open day
  });

  it('closing days the owner adds are skipped too', () => {
    const friday = new Date('2027-11-05T23:00:00Z');
    expect(addOpeningDays(friday, 5, { ...seattle, closedDays: ['2027-11-12'] })).toBe('2027-11-16');
  });

  it('the shop screen’s coming 12 months list the same OPM days, named, and nothing outside the window', () => {
    // from 1 Jan 2027 for 365 days: 2027's eleven OPM days plus New Year's Day 2028 observed on Fri 31 Dec 2027
    const list = upcomingPublicHolidays('US', 'WA', '2027-01-01', 365);
    const dates = list.map((h) => h.date);
    for (const date of [...OPM_2027, '2027-12-31']) expect(dates, date).toContain(date);
    expect(dates.every((d) => d >= '2027-01-01' && d < '2028-01-01')).toBe(true);
    expect(list.find((h) => h.date === '2027-11-25')?.name).toMatch(/Thanksgiving/);
    expect([...dates].sort()).toEqual(dates);
    // from mid-November, for 60 days: Thanksgiving, Christmas (observed Fri 24 Dec and the Saturday itself), New
    // Year (observed Fri 31 Dec and Sat 1 Jan 2028 itself); MLK Day 2028 (third Monday of January: Mon 17 Jan 2028,
    // 5 U.S.C. 6103(a)) is outside the 60 days (they end before 14 Jan 2028)
    const late = upcomingPublicHolidays('US', null, '2027-11-15', 60).map((h) => h.date);
    expect(late).toEqual(['2027-11-25', '2027-12-24', '2027-12-25', '2027-12-31', '2028-01-01']);
    expect(upcomingPublicHolidays('ZZ', null, '2027-01-01')).toEqual([]);
  });
});
