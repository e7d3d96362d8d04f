import { describe, expect, it } from 'vitest';
import { localDate, todayIn } from '../../../../shared/time/shop-calendar.js';
import { localDate as promisedLocalDate } from '../../../../shared/jobs/promised-date.js';
import { localDate as routingLocalDate } from '../../../../shared/routing/zoned.js';

/* Offsets worked by hand from the zones' rules (PST = UTC−8 in December, JST = UTC+9, no DST). */

describe('the shop’s calendar date', () => {
  const instant = new Date('2026-12-05T07:30:00Z');

  it('is the date on the shop’s clock, not the server’s', () => {
    expect(localDate(instant, 'America/Los_Angeles')).toBe('2026-12-04'); // 23:30 on the 4th
    expect(localDate(instant, 'Asia/Tokyo')).toBe('2026-12-05'); // 16:30 on the 5th
    expect(localDate(new Date('2026-12-31T23:59:59Z'), 'Europe/Berlin')).toBe('2027-01-01'); // 00:59 CET
  });

  it('is today at the shop, and the viewer’s zone only when none is given', () => {
    expect(todayIn('America/Los_Angeles', instant)).toBe('2026-12-04');
    expect(todayIn(undefined, instant)).toBe(localDate(instant, Intl.DateTimeFormat().resolvedOptions().timeZone));
  });

  it('has one implementation, used by promises and routing alike', () => {
    expect(promisedLocalDate).toBe(localDate);
    expect(routingLocalDate).toBe(localDate);
  });
});
