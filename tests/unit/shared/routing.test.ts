import { describe, expect, it } from 'vitest';
import { nextDeparture, nextRun } from '../../../shared/routing/next-run.js';
import { formatWeekdays, rankShops, routingSettings, type RoutingCandidate } from '../../../shared/routing/rank.js';
import { haversineKm } from '../../../shared/routing/haversine.js';

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

  it('ranks by finishing date: the relay run and the backlog against bench hours, with the reasons', () => {
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [CHI, PDX] });
    expect(ranked.map((r) => r.shopId)).toEqual(['pdx', 'chi']);
    expect(recommendedShopId).toBe('pdx');

    const pdx = ranked[0];
    // run Tue 07:30 + 3.5 h → Tue 11:00; Tuesday's bench day had begun, so work starts Wednesday;
    // (20 h backlog + 18 h) / (40 h / 5 opening days) = 4.75 → 5 bench days: Wed, Thu, Fri, Sat, Tue (closed Sun, Mon)
    expect(pdx).toMatchObject({
      rank: 1, transport: 'relay_run', relayRunId: 'sea-pdx', departureAt: '2024-06-11T14:30:00.000Z',
      arrivalAt: '2024-06-11T18:00:00.000Z', dailyBenchHours: 8, benchDays: 5, benchStartDate: '2024-06-12', finishDate: '2024-06-18',
    });
    const texts = pdx.reasons.map((r) => r.text).join('\n');
    expect(texts).toMatch(/Next relay run leaves Seattle Tue 11 Jun 2024, 07:30 PDT, 3\.5 h on the road; arrives Tue 11 Jun 2024, 11:00 PDT/);
    expect(texts).toMatch(/20 h of low saxophones work already waiting, against 40 h a week \(8 h per opening day\)/);
    expect(texts).toMatch(/This job: 18 h/);
    expect(texts).toMatch(/Open Tue–Sat \(Los Angeles time\): the bench can start Wed 12 Jun 2024/);
    expect(texts).toMatch(/5 bench days .* finished by Tue 18 Jun 2024/);

    // no run Seattle → Chicago: great-circle distance at 60 km/h plus 24 h handling
    const chi = ranked[1];
    const km = haversineKm(SEA, { latitude: CHI.latitude!, longitude: CHI.longitude! });
    expect(km).toBeGreaterThan(2700);
    expect(km).toBeLessThan(2850);
    const arrival = NOW.getTime() + (24 + km / 60) * 3_600_000;
    expect(chi.transport).toBe('road');
    expect(chi.distanceKm).toBeCloseTo(km, 0);
    expect(Date.parse(chi.arrivalAt!)).toBeCloseTo(arrival, -3);
    // arrives Thu 13 Jun mid-morning Chicago time → starts Fri; 18 h at 4 h a day = 5 days → Thu 20 Jun
    expect(chi).toMatchObject({ benchStartDate: '2024-06-14', benchDays: 5, finishDate: '2024-06-20' });
    expect(chi.reasons[0].text).toContain(`No relay run from Seattle: ${Math.round(km).toLocaleString('en-US')} km great-circle at 60 km/h`);
    expect(chi.reasons[0].text).toContain('plus 24 h handling');
  });

  it('a long backlog at the nearer shop sends the job further away', () => {
    const busyPortland = { ...PDX, backlogHours: 60 };
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [busyPortland, CHI] });
    // (60 + 18) / 8 = 9.75 → 10 bench days from Wed 12 Jun at Tue–Sat → Tue 25 Jun, after Chicago's Thu 20 Jun
    expect(ranked.map((r) => [r.shopId, r.finishDate])).toEqual([['chi', '2024-06-20'], ['pdx', '2024-06-25']]);
    expect(recommendedShopId).toBe('chi');
  });

  it('counts the origin as "keep it here" and never recommends it as a destination', () => {
    const seattleBench = { ...SEA, openingDays: [1, 2, 3, 4, 5], weeklyBenchHours: 80, backlogHours: 0 };
    const { ranked, recommendedShopId } = rankShops({ ...base, candidates: [PDX, seattleBench, CHI] });
    expect(ranked[0]).toMatchObject({ shopId: 'sea', isOrigin: true, transport: 'here', arrivalAt: null, benchStartDate: '2024-06-11', finishDate: '2024-06-12' });
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
    expect(ranked[0].benchDays).toBe(3); // 20 h / 8 h a day
  });

  it('uses the network’s configured road speed and handling time', () => {
    const settings = routingSettings({ routing: { roadSpeedKmh: 90, handlingHours: 6, bogus: 'x' } });
    expect(settings).toMatchObject({ roadSpeedKmh: 90, handlingHours: 6, packingLeadHours: 2 });
    const { ranked } = rankShops({ ...base, candidates: [CHI], settings });
    const km = haversineKm(SEA, { latitude: CHI.latitude!, longitude: CHI.longitude! });
    expect(Date.parse(ranked[0].arrivalAt!)).toBeCloseTo(NOW.getTime() + (6 + km / 90) * 3_600_000, -3);
    expect(routingSettings({ routing: { roadSpeedKmh: 0 } }).roadSpeedKmh).toBe(60);
  });

  it('names opening days plainly', () => {
    expect(formatWeekdays([1, 2, 3, 4, 5])).toBe('Mon–Fri');
    expect(formatWeekdays([2, 4])).toBe('Tue, Thu');
  });
});
