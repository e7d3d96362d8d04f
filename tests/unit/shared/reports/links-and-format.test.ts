import { describe, expect, it } from 'vitest';
import { csvLinks, reportLinks } from '../../../../shared/reports/links.js';
import { formatDays, formatHours, formatInstantIn, formatIsoDate, formatLoad } from '../../../../shared/reports/format.js';

describe('links behind the figures', () => {
  it('client lists carry the report’s shop as `scope`, leaving the app’s own `shop` alone', () => {
    expect(reportLinks.overdue()).toBe('/reports/overdue');
    expect(reportLinks.overdue('s-1')).toBe('/reports/overdue?scope=s-1');
    expect(reportLinks.jobs({ shop: 's-1', stage: 'on_bench' })).toBe('/reports/jobs?scope=s-1&stage=on_bench');
    expect(reportLinks.jobs({ readyWithin: 90, family: 'flute' })).toBe('/reports/jobs?readyWithin=90&family=flute');
    expect(reportLinks.job('a b')).toBe('/jobs/a%20b');
  });

  it('CSV links go to the API with `shop`', () => {
    expect(csvLinks.report('bench-load')).toBe('/api/reports/bench-load.csv');
    expect(csvLinks.report('overdue', 's-1')).toBe('/api/reports/overdue.csv?shop=s-1');
    expect(csvLinks.jobs({ shop: 's-1', week: '2026-08-17' })).toBe('/api/reports/jobs.csv?shop=s-1&week=2026-08-17');
    expect(csvLinks.invoices('2026-08-01', '2026-08-31')).toBe('/api/reports/invoices.csv?from=2026-08-01&to=2026-08-31');
  });
});

describe('plain-language figures', () => {
  it('days, hours and load', () => {
    expect(formatDays(1)).toBe('1 business day');
    expect(formatDays(4.25)).toBe('4.3 business days');
    expect(formatDays(2, 'calendar')).toBe('2 days');
    expect(formatDays(null)).toBe('—');
    expect(formatHours(12)).toBe('12 h');
    expect(formatHours(10.5)).toBe('10.5 h');
    expect(formatLoad(1.05)).toBe('105 %');
    expect(formatLoad(null)).toBe('no bench hours');
  });

  it('a date-only value is not moved by any time zone; an instant is shown on the shop’s clock', () => {
    expect(formatIsoDate('2026-03-01')).toBe('Sun 1 Mar 2026');
    // 07:30 UTC on 7 March 2026 is 23:30 the evening before in Los Angeles (PST, UTC−8; DST begins 8 March: second Sunday of March, 15 U.S.C. § 260a)
    expect(formatInstantIn('2026-03-07T07:30:00Z', 'America/Los_Angeles')).toBe('Fri 6 Mar 2026, 23:30 PST');
    expect(formatInstantIn('2026-03-07T07:30:00Z', 'Asia/Tokyo')).toBe('Sat 7 Mar 2026, 16:30 GMT+9');
  });
});
