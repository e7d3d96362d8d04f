import { describe, expect, it } from 'vitest';
import { nextDeparture, nextRun } from '../../../shared/routing/next-run.js';
import { formatWeekdays, rankShops, routingSettings, type RoutingCandidate } from '../../../shared/routing/rank.js';

/** A small fixture network: Seattle sends a baritone saxophone overhaul (18 h) that needs low-sax work. */
const SEA = { shopId: 'sea', name: 'Seattle', timeZone: 'America/Los_Angeles', latitude: 47.6062, longitude: -122.3321 };
const PDX: RoutingCandidate = {
  shopId: 'pdx', name: 'Portland', timeZone: 'America/Los_Angeles', latitude: 45.5152, longitude: -122.6784,
  openingDays: [2, 3, 4, 5, 6], weeklyBenchHours: 40, backlogHours: 20,
};
const CHI: RoutingCandidate = {
  shopId: 'chi', name: 'Chicago', timeZone: 'America/Chicago', latitude: 41.8781, longitude: -87.6298,
  openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 20, backlogHours: 0,
};
const SAC: RoutingCandidate = {
  shopId: 'sac', name: 'Sacramento', timeZone: 'America/Los_Angeles', latitude: 38.5816, longitude: -121.4944,
  openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 0, backlogHours: 0,
};
const RUNS = [
  { id: 'sea-pdx', fromShopId: 'sea', toShopId: 'pdx', weekdays: [2, 4], departureTime: '07:30:00', transitHours: 3.5 },
  { id: 'pdx-sea', fromShopId: 'pdx', toShopId: 'sea', weekdays: [3, 5], departureTime: '08:00:00', transitHours: 3.5 },
];
// Monday 10 June 2024, 10:00 in Seattle (PDT, UTC−7)
const NOW = new Date('2024-06-10T17:00:00Z');

describe('next relay run', () => {
  const run = RUNS[0];

  it('leaves on the next listed weekday at the departure time in the origin shop’s zone', () => {
    expect(nextDeparture(run, NOW, SEA.timeZone)?.toISOString()).toBe('2024-06-11T14:30:00.000Z'); // Tue 07:30 PDT
  });

  it('skips a run that has already left today and wraps to next week', () => {
    const thursdayNoon = new Date('2024-06-13T19:00:00Z'); // Thu 12:00 PDT, after Thursday's 07:30
    expect(nextDeparture(run, thursdayNoon, SEA.timeZone)?.toISOString()).toBe('2024-06-18T14:30:00.000Z');
  });

  it('keeps 07:30 local across the change to daylight saving time', () => {
    const sundayBefore = new Date('2024-03-10T06:00:00Z'); // Sat 22:00 PST, the night the clocks go forward
    const sunday = { ...run, weekdays: [7, 1] };
    // Sunday 10 March 07:30 is already PDT (UTC−7), not PST
    expect(nextDeparture(sunday, sundayBefore, SEA.timeZone)?.toISOString()).toBe('2024-03-10T14:30:00.000Z');
  });

  it('takes the run that arrives first when two shops have several', () => {
    const slowSoon = { ...run, id: 'slow', weekdays: [2], transitHours: 60 }; // Tue 07:30 → Thu 19:30
    const fastLater = { ...run, id: 'fast', weekdays: [4], transitHours: 3 }; // Thu 07:30 → Thu 10:30
    expect(nextRun([slowSoon, fastLater], NOW, SEA.timeZone)?.runId).toBe('fast');
  });

  it('ignores an inactive run', () => {
    expect(nextDeparture({ ...run, active: false }, NOW, SEA.timeZone)).toBeNull();
  });
});

describe('rankShops', () => {
  const base = { now: NOW, origin: SEA, jobHours: 18, skillName: 'Low saxophones', runs: RUNS };
  /*
   * Every shop here works 09:00–17:00 local (the default bench day) and gives the skill its daily hours spread
   * evenly over it, so at 8 h a day one bench hour is one hour of the clock, and at 4 h a day it is two.
   */

  it('ranks by the real finish: the backlog is worked from now while the instrument travels, with the reasons', () => {
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [CHI, PDX] });
    expect(ranked.map((r) => r.shopId)).toEqual(['pdx', 'chi']);
    expect(recommendedShopId).toBe('pdx');

    const pdx = ranked[0];
    // Portland, open Tue–Sat, 40 h / 5 days = 8 h a day; now is Mon 10:00 (closed).
    // Backlog 20 h from now: Tue 8 h, Wed 8 h, Thu 09:00–13:00 4 h → done Thu 13 Jun 13:00.
    // The run arrives Tue 11:00, before that, so the job starts Thu 13:00:
    // 18 h = Thu 13:00–17:00 4 h, Fri 8 h, Sat 09:00–15:00 6 h → Sat 15 Jun 15:00 PDT (22:00 UTC), 3 bench days.
    expect(pdx).toMatchObject({
      rank: 1, transport: 'relay_run', relayRunId: 'sea-pdx', departureAt: '2024-06-11T14:30:00.000Z',
      arrivalAt: '2024-06-11T18:00:00.000Z', dailyBenchHours: 8, backlogClearAt: '2024-06-13T20:00:00.000Z',
      benchStartDate: '2024-06-13', benchDays: 3, finishDate: '2024-06-15', finishAt: '2024-06-15T22:00:00.000Z',
    });
    const texts = pdx.reasons.map((r) => r.text).join('\n');
    expect(texts).toMatch(/Next relay run leaves Seattle Tue 11 Jun 2024, 07:30 PDT, 3\.5 h on the road; arrives Tue 11 Jun 2024, 11:00 PDT/);
    expect(texts).toMatch(/20 h of low saxophones work already waiting, against 40 h a week \(8 h per opening day\)/);
    expect(texts).toMatch(/This job: 18 h/);
    expect(texts).toMatch(/Open Tue–Sat \(Los Angeles time\); working from now, the waiting work is done Thu 13 Jun 2024, 13:00 PDT: this job can start Thu 13 Jun 2024, 13:00 PDT, once the waiting work is done/);
    expect(texts).toMatch(/18 h of bench work over 3 bench days: finished by Sat 15 Jun 2024, 15:00 PDT/);
    // Portland is about 235 km from Seattle (great circle, from memory): 24 h + ~3.9 h by road arrives Tue ≈ 14:00,
    // after the run and long before the waiting work is done, so it would finish no sooner: the booked run is kept.
    expect(texts).toMatch(/A road trip would arrive about Tue 11 Jun 2024, 1[34]:\d\d PDT, and finish no sooner\./);

    // No run Seattle → Chicago. Seattle–Chicago is about 2,790 km great circle (from memory; 2,700–2,850 km below):
    // at 60 km/h that is 45–47.5 h, plus 24 h handling → 69–71.5 h after Mon 10:00 PDT = Thu 13 Jun 09:00–11:30 CDT.
    const chi = ranked[1];
    expect(chi.transport).toBe('road');
    expect(chi.distanceKm).toBeGreaterThan(2700);
    expect(chi.distanceKm).toBeLessThan(2850);
    expect(Date.parse(chi.arrivalAt!)).toBeGreaterThanOrEqual(Date.parse('2024-06-13T14:00:00Z'));
    expect(Date.parse(chi.arrivalAt!)).toBeLessThanOrEqual(Date.parse('2024-06-13T16:30:00Z'));
    // Chicago: no backlog, 20 h / 5 = 4 h a day (a bench hour = 2 clock hours). From a Thu 09:00–11:30 start:
    // Thu gives 2.75–4 h, Fri 4, Mon 4, Tue 4 → 14.75–16 h; the last 2–3.25 h end Wed 19 Jun 13:00–15:30.
    expect(chi).toMatchObject({ benchStartDate: '2024-06-13', benchDays: 5, finishDate: '2024-06-19' });
    expect(chi.reasons[0].text).toMatch(/^No relay run from Seattle: 2,(7\d\d|8[0-4]\d) km great-circle at 60 km\/h/);
    expect(chi.reasons[0].text).toContain('plus 24 h handling');
  });

  it('three shops worked by hand: a faster road trip beats a slow relay run, and the origin works its own queue', () => {
    const seattleBench: RoutingCandidate = { ...SEA, openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 40, backlogHours: 30 };
    // Tacoma is about 40 km from Seattle (from memory); its only relay run leaves Friday.
    const TAC: RoutingCandidate = {
      shopId: 'tac', name: 'Tacoma', timeZone: 'America/Los_Angeles', latitude: 47.2529, longitude: -122.4443,
      openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 40, backlogHours: 10,
    };
    const runs = [...RUNS, { id: 'sea-tac', fromShopId: 'sea', toShopId: 'tac', weekdays: [5], departureTime: '07:30:00', transitHours: 1 }];
    const { ranked, recommendedShopId } = rankShops({ ...base, runs, candidates: [PDX, seattleBench, TAC] });
    /*
     * Now: Mon 10 Jun 10:00 PDT. All three give the skill 8 h a day, 09:00–17:00.
     * Tacoma: backlog 10 h from now = Mon 10:00–17:00 7 h + Tue 09:00–12:00 3 h → Tue 12:00.
     *   By road: 24 h handling + ~0.7 h → arrives Tue ≈ 10:40, before the backlog is done: starts Tue 12:00.
     *   18 h = Tue 12–17 5 h, Wed 8 h, Thu 09–14 5 h → Thu 13 Jun 14:00 PDT (21:00 UTC).
     *   The Friday run (arrives Fri 08:30) would start Fri 09:00 and finish Tue 18 Jun 11:00: later, so road it is.
     * Portland: as in the first test, Sat 15 Jun 15:00 PDT (22:00 UTC).
     * Seattle (keep it here): backlog 30 h = Mon 7 h, Tue 8 h, Wed 8 h, Thu 09–16 7 h → Thu 16:00;
     *   18 h = Thu 1 h, Fri 8 h, Mon 8 h, Tue 09–10 1 h → Tue 18 Jun 10:00 PDT (17:00 UTC).
     */
    expect(ranked.map((r) => [r.shopId, r.transport, r.finishAt])).toEqual([
      ['tac', 'road', '2024-06-13T21:00:00.000Z'],
      ['pdx', 'relay_run', '2024-06-15T22:00:00.000Z'],
      ['sea', 'here', '2024-06-18T17:00:00.000Z'],
    ]);
    expect(recommendedShopId).toBe('tac');
    const tac = ranked[0];
    expect(Date.parse(tac.arrivalAt!)).toBeGreaterThan(Date.parse('2024-06-11T17:30:00Z')); // Tue 10:30 PDT
    expect(Date.parse(tac.arrivalAt!)).toBeLessThan(Date.parse('2024-06-11T18:00:00Z')); // Tue 11:00 PDT
    expect(tac.reasons.map((r) => r.text)).toContain('The next relay run would arrive Fri 14 Jun 2024, 08:30 PDT and finish later.');
    expect(tac.backlogClearAt).toBe('2024-06-11T19:00:00.000Z'); // Tue 12:00 PDT
    expect(ranked[2]).toMatchObject({ isOrigin: true, arrivalAt: null, backlogClearAt: '2024-06-13T23:00:00.000Z' });
  });

  it('a long backlog at the nearer shop sends the job further away', () => {
    const busyPortland = { ...PDX, backlogHours: 60 };
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [busyPortland, CHI] });
    // Portland (Tue–Sat, 8 h a day): 60 h from Mon 10:00 = Tue 11, Wed 12, Thu 13, Fri 14, Sat 15, Tue 18, Wed 19 (56 h)
    // and Thu 20 09:00–13:00; the 18 h job = Thu 13–17 4 h, Fri 21 8 h, Sat 22 09–15 6 h → Sat 22 Jun 15:00 PDT,
    // after Chicago's Wed 19 Jun (first test).
    expect(ranked.map((r) => [r.shopId, r.finishDate])).toEqual([['chi', '2024-06-19'], ['pdx', '2024-06-22']]);
    expect(ranked[1].finishAt).toBe('2024-06-22T22:00:00.000Z');
    expect(recommendedShopId).toBe('chi');
  });

  it('counts the origin as "keep it here" and never recommends it as a destination', () => {
    const seattleBench = { ...SEA, openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 80, backlogHours: 0 };
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [PDX, seattleBench, CHI] });
    // 80 h / 5 = 16 h a day, 2 bench hours per clock hour: from Mon 10:00, 14 h by 17:00, the last 4 h Tue 09:00–11:00
    expect(ranked[0]).toMatchObject({
      shopId: 'sea', isOrigin: true, transport: 'here', arrivalAt: null, benchStartDate: '2024-06-10', finishDate: '2024-06-11',
      finishAt: '2024-06-11T18:00:00.000Z',
    });
    expect(ranked[0].reasons[0].text).toMatch(/Already here/);
    expect(recommendedShopId).toBe('pdx');
  });

  it('puts a shop without bench hours for the skill last, saying why', () => {
    const { ranked } = rankShops({ ...base, candidates: [SAC, PDX] });
    expect(ranked.map((r) => r.shopId)).toEqual(['pdx', 'sac']);
    expect(ranked[1]).toMatchObject({ finishAt: null, benchDays: null });
    expect(ranked[1].reasons.some((r) => r.kind === 'unavailable' && /No bench hours/.test(r.text))).toBe(true);
  });

  it('a job with no estimate counts as 0 h and says so', () => {
    const { ranked } = rankShops({ ...base, jobHours: null, candidates: [PDX] });
    expect(ranked[0].reasons.find((r) => r.kind === 'job')?.text).toBe('This job has no estimate yet: counted as 0 h.');
    // 20 h waiting, done Thu 13:00 (first test); a 0 h job finishes as it starts
    expect(ranked[0]).toMatchObject({ benchDays: 1, finishAt: '2024-06-13T20:00:00.000Z' });
  });

  it('uses the network’s configured road speed and handling time', () => {
    const settings = routingSettings({ routing: { roadSpeedKmh: 90, handlingHours: 6, bogus: 'x' } });
    expect(settings).toMatchObject({ roadSpeedKmh: 90, handlingHours: 6, packingLeadHours: 2 });
    const { ranked } = rankShops({ ...base, candidates: [CHI], settings });
    // 2,700–2,850 km at 90 km/h = 30–31.7 h, plus 6 h: 36–37.7 h after Mon 17:00 UTC
    expect(Date.parse(ranked[0].arrivalAt!)).toBeGreaterThanOrEqual(Date.parse('2024-06-12T05:00:00Z'));
    expect(Date.parse(ranked[0].arrivalAt!)).toBeLessThanOrEqual(Date.parse('2024-06-12T06:40:00Z'));
    expect(routingSettings({ routing: { roadSpeedKmh: 0 } }).roadSpeedKmh).toBe(60);
    expect(routingSettings({ routing: { workdayStartHour: 17, workdayEndHour: 9 } })).toMatchObject({ workdayStartHour: 9, workdayEndHour: 17 });
  });

  it('names opening days plainly', () => {
    expect(formatWeekdays([1, 2, 3, 4, 5])).toBe('Mon–Fri');
    expect(formatWeekdays([2, 4])).toBe('Tue, Thu');
  });
});
