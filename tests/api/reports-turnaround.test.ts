import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { quantile } from 'simple-statistics';
import { buildApp } from '../../server/app.js';
import { Instrument, Job, ShopClosingDay } from '../../server/lib/models.js';
import { businessDaysBetween } from '../../shared/reports/business-days.js';
import { TURNAROUND_WINDOWS, type DashboardReport, type TurnaroundFigure } from '../../shared/reports/schemas.js';
import type { InstrumentFamily } from '../../shared/domain.js';
import { closeServerResources } from '../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';

/**
 * Turnaround (intake → ready) median and 90th percentile. The server computes them in SQL with
 * percentile_cont; this test computes the same figures independently in JavaScript: business days with
 * shared/reports/business-days.ts (date-fns in the shop's time zone, not the SQL generate_series) and
 * the percentiles with the simple-statistics package from the npm registry, whose `quantile` uses linear
 * interpolation between closest ranks (R type 7) — the definition PostgreSQL documents for percentile_cont.
 */

const DAY = 86_400_000;
const HOUR = 3_600_000;

interface Fixture {
  shopId: string;
  family: InstrumentFamily;
  openedAt: Date;
  readyAt: Date;
}

describe('turnaround: median and 90th percentile per window, shop and family', () => {
  const app = buildApp();
  let ownerCookie: string;
  const shops: Record<string, { id: string; timeZone: string; openingDays: number[]; country: string; closedDays: string[] }> = {};
  const jobs: Fixture[] = [];
  let report: DashboardReport;
  let now: number;

  beforeAll(async () => {
    const net = await makeNetwork();
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    // New York opens Monday–Friday; Tokyo Tuesday–Saturday: the same span is a different count of days
    const ny = await makeShop(net.id, { name: 'Hudson bench', timeZone: 'America/New_York' });
    const tokyo = await makeShop(net.id, { name: 'Sumida bench', timeZone: 'Asia/Tokyo' });
    // both keep the default country US: the sample's 420 days cross U.S. public holidays, which are not business days
    await tokyo.update({ openingDays: [2, 3, 4, 5, 6] });
    // the hand-worked shops are in ZZ (an ISO 3166 user-assigned code, no holiday calendar): weekdays and closing days only
    const hand = await makeShop(net.id, { name: 'Known answers bench', timeZone: 'UTC' });
    await hand.update({ country: 'ZZ' });
    const closing = await makeShop(net.id, { name: 'Stocktake bench', timeZone: 'UTC' });
    await closing.update({ country: 'ZZ' });
    shops.ny = { id: ny.id, timeZone: ny.timeZone, openingDays: [1, 2, 3, 4, 5], country: 'US', closedDays: [] };
    shops.tokyo = { id: tokyo.id, timeZone: tokyo.timeZone, openingDays: [2, 3, 4, 5, 6], country: 'US', closedDays: [] };
    shops.hand = { id: hand.id, timeZone: 'UTC', openingDays: [1, 2, 3, 4, 5], country: 'ZZ', closedDays: [] };
    shops.closing = { id: closing.id, timeZone: 'UTC', openingDays: [1, 2, 3, 4, 5], country: 'ZZ', closedDays: [] };

    now = Date.now();
    // Deterministic spread of jobs: ready between 1 and 420 days ago (never within half a day of a
    // window's edge, so the test's clock and the database's cannot disagree), 3 hours to 30 days on the bench.
    let seed = 20_260_801;
    const rand = () => ((seed = (seed * 48_271) % 2_147_483_647) / 2_147_483_647);
    const families: InstrumentFamily[] = ['flute', 'clarinet', 'trumpet'];
    for (let i = 0; i < 60; i++) {
      let age = 1 + rand() * 419;
      if (TURNAROUND_WINDOWS.some((w) => Math.abs(age - w) < 0.5)) age += 1;
      const readyAt = new Date(now - age * DAY);
      const openedAt = new Date(readyAt.getTime() - (3 * HOUR + rand() * 30 * DAY));
      jobs.push({ shopId: i % 2 ? ny.id : tokyo.id, family: families[i % 3], openedAt, readyAt });
    }
    // Known answers, by hand from the Gregorian weekdays (any published calendar; the dates are found from today's
    // weekday, so no particular year is assumed): UTC, Monday–Friday, ready on a Monday at least two weeks back. Taken in on
    // the Monday before → 5 business days; Tuesday → 4; Thursday → 2; Friday → 1; two Mondays before → 10.
    // Sorted [1, 2, 4, 5, 10]: median 4; p90 at rank 0.9 × 4 = 3.6 → 5 + 0.6 × (10 − 5) = 8.
    const twoWeeksAgo = new Date(now - 14 * DAY);
    const monday = Date.UTC(twoWeeksAgo.getUTCFullYear(), twoWeeksAgo.getUTCMonth(), twoWeeksAgo.getUTCDate() - ((twoWeeksAgo.getUTCDay() + 6) % 7));
    const handReady = new Date(monday + 15 * HOUR);
    for (const daysBefore of [7, 6, 4, 3, 14]) {
      jobs.push({ shopId: hand.id, family: 'oboe', openedAt: new Date(monday - daysBefore * DAY + 9 * HOUR), readyAt: handReady });
    }
    // A closing day, by hand: UTC, Monday–Friday, taken in that same Monday, ready on its Friday → Tue, Wed, Thu, Fri =
    // 4 business days; the owner closed the Wednesday → 3. A second job, the week before, with no closing day → 4.
    const wednesday = new Date(monday + 2 * DAY).toISOString().slice(0, 10);
    await ShopClosingDay.create({ networkId: net.id, shopId: closing.id, date: wednesday, reason: 'Stocktake' });
    shops.closing.closedDays = [wednesday];
    jobs.push({ shopId: closing.id, family: 'bassoon', openedAt: new Date(monday + 9 * HOUR), readyAt: new Date(monday + 4 * DAY + 15 * HOUR) });
    jobs.push({ shopId: closing.id, family: 'bassoon', openedAt: new Date(monday - 7 * DAY + 9 * HOUR), readyAt: new Date(monday - 3 * DAY + 15 * HOUR) });

    let number = 700_000 + Math.floor(Math.random() * 1_000_000);
    for (const j of jobs) {
      const instrument = await Instrument.create({
        networkId: net.id, family: j.family, maker: 'Lindqvale', serial: `TA-${uniq()}`, ownerKind: 'rental_fleet', currentShopId: j.shopId,
      });
      await Job.create({
        networkId: net.id, number: number++, instrumentId: instrument.id, shopId: j.shopId, stage: 'released', complaint: 'Service',
        openedByUserId: owner.id, openedAt: j.openedAt, readyAt: j.readyAt, releasedAt: new Date(j.readyAt.getTime() + HOUR),
      });
    }
    // an open job that is not ready yet is not part of any turnaround
    const open = await Instrument.create({ networkId: net.id, family: 'flute', maker: 'Lindqvale', serial: `TA-${uniq()}`, ownerKind: 'rental_fleet', currentShopId: ny.id });
    await Job.create({ networkId: net.id, number: number++, instrumentId: open.id, shopId: ny.id, stage: 'on_bench', openedByUserId: owner.id, openedAt: new Date(now - 50 * DAY) });

    ownerCookie = await signIn(app, owner.email);
    report = (await request(app).get('/api/reports/dashboard').set('Cookie', ownerCookie).expect(200)).body;
  });
  afterAll(closeServerResources);

  const shopOf = (id: string) => Object.values(shops).find((s) => s.id === id)!;
  function expected(sample: Fixture[]): TurnaroundFigure {
    if (!sample.length) return { jobs: 0, medianBusinessDays: null, p90BusinessDays: null, medianCalendarDays: null, p90CalendarDays: null };
    const business = sample.map((j) => {
      const s = shopOf(j.shopId);
      return businessDaysBetween(j.openedAt, j.readyAt, s.timeZone, s.openingDays, { country: s.country, closedDays: s.closedDays });
    });
    const calendar = sample.map((j) => (j.readyAt.getTime() - j.openedAt.getTime()) / DAY);
    return {
      jobs: sample.length,
      medianBusinessDays: quantile(business, 0.5),
      p90BusinessDays: quantile(business, 0.9),
      medianCalendarDays: quantile(calendar, 0.5),
      p90CalendarDays: quantile(calendar, 0.9),
    };
  }
  /** The API rounds to two decimals. */
  function expectFigure(actual: TurnaroundFigure | undefined, want: TurnaroundFigure, label: string) {
    expect(actual?.jobs, label).toBe(want.jobs);
    for (const key of ['medianBusinessDays', 'p90BusinessDays', 'medianCalendarDays', 'p90CalendarDays'] as const) {
      const a = actual![key];
      const e = want[key];
      if (e == null) expect(a, `${label} ${key}`).toBeNull();
      else expect(Math.abs((a as number) - e), `${label} ${key}: ${a} vs ${e}`).toBeLessThanOrEqual(0.0051);
    }
  }

  it('the hand-worked shop: median 4 and 90th percentile 8 business days', () => {
    const w = report.turnaround.find((t) => t.days === 365)!;
    const hand = w.byShop.find((f) => f.shopId === shops.hand.id)!;
    expect(hand.jobs).toBe(5);
    expect(hand.medianBusinessDays).toBe(4);
    expect(hand.p90BusinessDays).toBe(8);
    expect(w.byFamily.find((f) => f.family === 'oboe')).toMatchObject({ jobs: 5, medianBusinessDays: 4, p90BusinessDays: 8 });
  });

  it('an owner’s closing day is not a business day: 3 and 4 days, by hand, median 3.5', () => {
    const w = report.turnaround.find((t) => t.days === 365)!;
    // sorted [3, 4]: median 3.5; p90 at rank 0.9 × 1 = 0.9 → 3 + 0.9 × (4 − 3) = 3.9
    expect(w.byShop.find((f) => f.shopId === shops.closing.id)).toMatchObject({ jobs: 2, medianBusinessDays: 3.5, p90BusinessDays: 3.9 });
  });

  it.each(TURNAROUND_WINDOWS)('last %i days: overall, per shop and per family match the independent computation', (days) => {
    const w = report.turnaround.find((t) => t.days === days)!;
    const inWindow = jobs.filter((j) => j.readyAt.getTime() > now - days * DAY);
    expect(inWindow.length).toBeGreaterThan(0);
    expectFigure(w.overall, expected(inWindow), `${days}d overall`);
    for (const shop of Object.values(shops)) {
      const sample = inWindow.filter((j) => j.shopId === shop.id);
      const actual = w.byShop.find((f) => f.shopId === shop.id);
      if (!sample.length) expect(actual, `${days}d shop ${shop.timeZone}`).toBeUndefined();
      else expectFigure(actual, expected(sample), `${days}d shop ${shop.timeZone}`);
    }
    for (const family of ['flute', 'clarinet', 'trumpet', 'oboe', 'bassoon'] as InstrumentFamily[]) {
      const sample = inWindow.filter((j) => j.family === family);
      const actual = w.byFamily.find((f) => f.family === family);
      if (!sample.length) expect(actual).toBeUndefined();
      else expectFigure(actual, expected(sample), `${days}d ${family}`);
    }
  });

  it('business days really depend on the shop’s calendar: Tokyo and New York differ on this sample', () => {
    const sample = jobs.filter((j) => j.shopId !== shops.hand.id);
    const asIf = (zone: string, open: number[]) => sample.map((j) => businessDaysBetween(j.openedAt, j.readyAt, zone, open));
    expect(asIf('Asia/Tokyo', [2, 3, 4, 5, 6])).not.toEqual(asIf('America/New_York', [1, 2, 3, 4, 5]));
    // and the U.S. public holidays count: some New York job spans one, so the figures above check the SQL's holidays too
    const ny = jobs.filter((j) => j.shopId === shops.ny.id);
    const withHolidays = ny.map((j) => businessDaysBetween(j.openedAt, j.readyAt, 'America/New_York', [1, 2, 3, 4, 5], { country: 'US' }));
    expect(withHolidays).not.toEqual(ny.map((j) => businessDaysBetween(j.openedAt, j.readyAt, 'America/New_York', [1, 2, 3, 4, 5])));
  });

  it('the list behind a turnaround figure holds exactly the jobs in its sample', async () => {
    const res = await request(app).get(`/api/reports/jobs?shop=${shops.ny.id}&readyWithin=90`).set('Cookie', ownerCookie).expect(200);
    expect(res.body.total).toBe(jobs.filter((j) => j.shopId === shops.ny.id && j.readyAt.getTime() > now - 90 * DAY).length);
    await request(app).get(`/api/reports/jobs?readyWithin=45`).set('Cookie', ownerCookie).expect(400);
  });

  it('the turnaround CSV carries the same figures', async () => {
    const res = await request(app).get('/api/reports/turnaround.csv').set('Cookie', ownerCookie).expect(200);
    const row = res.text.split('\r\n').find((l) => l.startsWith('365,shop,Known answers bench,'));
    expect(row).toBe('365,shop,Known answers bench,5,4,8,' + row!.split(',').slice(6).join(','));
    expect(res.text.split('\r\n')[0]).toBe('window_days,group,name,jobs_ready,median_business_days,p90_business_days,median_calendar_days,p90_calendar_days');
  });
});
