import { haversineKm } from './haversine.js';
import { nextRun, type RelayRunSchedule } from './next-run.js';
import { atLocal, formatLocal, localDate, localParts, zoneLabel } from './zoned.js';

/**
 * Routing: for a job that needs a skill, rank the shops that have it by when the job would be finished
 * there, and say why. Pure: the server loads the rows, the client can show the same reasons.
 */

export interface RoutingSettings {
  /** Average door-to-door speed of an ad-hoc courier over the great-circle distance, km/h. */
  roadSpeedKmh: number;
  /** Booking, pickup and drop-off time added to an ad-hoc trip where no relay run exists, hours. */
  handlingHours: number;
  /** How long before a relay run leaves the instrument must be packed, hours. */
  packingLeadHours: number;
  /** The bench day at every shop, local hours (a job starts at the start of a bench day). */
  workdayStartHour: number;
  workdayEndHour: number;
}

/**
 * Defaults for a network that has set nothing (network.settings.routing overrides each). None is a
 * published figure: 60 km/h over the great circle (from memory: road distance runs about 1.2–1.4 × the
 * great circle, at highway speeds with stops) and 24 h of handling (booking a courier and two hand-overs)
 * and the 2 h packing lead are invented for the demo; a 09:00–17:00 bench day is common practice.
 */
export const DEFAULT_ROUTING_SETTINGS: RoutingSettings = {
  roadSpeedKmh: 60,
  handlingHours: 24,
  packingLeadHours: 2,
  workdayStartHour: 9,
  workdayEndHour: 17,
};

/** Reads `settings.routing` of a network, keeping only sensible numbers. */
export function routingSettings(networkSettings: Record<string, unknown> | null | undefined): RoutingSettings {
  const raw = (networkSettings?.routing ?? {}) as Record<string, unknown>;
  const out = { ...DEFAULT_ROUTING_SETTINGS };
  for (const key of Object.keys(out) as Array<keyof RoutingSettings>) {
    const value = raw[key];
    if (typeof value === 'number' && Number.isFinite(value) && value >= 0) out[key] = value;
  }
  if (out.roadSpeedKmh <= 0) out.roadSpeedKmh = DEFAULT_ROUTING_SETTINGS.roadSpeedKmh;
  if (!(out.workdayEndHour > out.workdayStartHour) || out.workdayEndHour > 24) {
    out.workdayStartHour = DEFAULT_ROUTING_SETTINGS.workdayStartHour;
    out.workdayEndHour = DEFAULT_ROUTING_SETTINGS.workdayEndHour;
  }
  return out;
}

export interface RoutingOrigin {
  shopId: string;
  name: string;
  timeZone: string;
  latitude: number | null;
  longitude: number | null;
}

export interface RoutingCandidate extends RoutingOrigin {
  /** ISO weekdays the shop is open, Monday = 1. */
  openingDays: number[];
  /** Bench hours a week the shop gives the skill. */
  weeklyBenchHours: number;
  /** Hours of open work already waiting there that need the skill. */
  backlogHours: number;
}

export interface RoutingRequest {
  now: Date;
  origin: RoutingOrigin;
  /** The job's estimated hours; null when it has no estimate yet. */
  jobHours: number | null;
  skillName: string;
  candidates: RoutingCandidate[];
  /** Relay runs of the network; only those leaving the origin are used. */
  runs: RelayRunSchedule[];
  settings?: Partial<RoutingSettings>;
}

export type RoutingReasonKind = 'transport' | 'backlog' | 'job' | 'opening' | 'finish' | 'unavailable';

export interface RoutingReason {
  kind: RoutingReasonKind;
  text: string;
}

export type TransportKind = 'here' | 'relay_run' | 'road' | 'none';

export interface RankedShop {
  rank: number;
  shopId: string;
  shopName: string;
  timeZone: string;
  isOrigin: boolean;
  transport: TransportKind;
  relayRunId: string | null;
  departureAt: string | null;
  arrivalAt: string | null;
  distanceKm: number | null;
  backlogHours: number;
  weeklyBenchHours: number;
  dailyBenchHours: number;
  jobHours: number;
  benchDays: number | null;
  benchStartDate: string | null;
  finishDate: string | null;
  finishAt: string | null;
  /** When the shop would be through the work already waiting for the skill, working from now. */
  backlogClearAt: string | null;
  reasons: RoutingReason[];
}

export interface RoutingResult {
  ranked: RankedShop[];
  /** The soonest-finishing shop other than the origin; null when no other shop can take the job. */
  recommendedShopId: string | null;
  settings: RoutingSettings;
}

const HOUR_MS = 3_600_000;
const WEEKDAY_NAMES = ['Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];

/** 2 → "2", 2.25 → "2.3". */
export function formatHours(hours: number): string {
  return String(Math.round(hours * 10) / 10);
}

/** [1,2,3,4,5] → "Mon–Fri"; [2,4] → "Tue, Thu". */
export function formatWeekdays(days: number[]): string {
  const sorted = [...new Set(days)].filter((d) => d >= 1 && d <= 7).sort((a, b) => a - b);
  if (!sorted.length) return 'no days';
  const contiguous = sorted.every((d, i) => i === 0 || d === sorted[i - 1] + 1);
  if (contiguous && sorted.length >= 3) return `${WEEKDAY_NAMES[sorted[0] - 1]}–${WEEKDAY_NAMES[sorted.at(-1)! - 1]}`;
  return sorted.map((d) => WEEKDAY_NAMES[d - 1]).join(', ');
}

/**
 * The instant `hours` of the skill's bench work are done at a shop, working from `from`. Each opening day gives
 * the skill its daily bench hours, spread evenly over the bench day (workdayStartHour to workdayEndHour, local).
 * With 0 hours it is the first bench moment at or after `from`. null when the shop never works (no opening day).
 */
export function addBenchHours(from: Date, hours: number, c: RoutingCandidate, dailyBenchHours: number, s: RoutingSettings): Date | null {
  if (!(dailyBenchHours > 0) || !c.openingDays.length || !(s.workdayEndHour > s.workdayStartHour)) return null;
  const p = localParts(from, c.timeZone);
  let remaining = Math.max(0, hours);
  // enough calendar days for every bench day the work needs, whichever days of the week the shop opens
  const horizon = 7 * (Math.ceil(remaining / dailyBenchHours) + 2);
  for (let offset = 0; offset <= horizon; offset++) {
    const dayStart = atLocal(p.year, p.month, p.day + offset, s.workdayStartHour, 0, c.timeZone);
    if (!c.openingDays.includes(localParts(dayStart, c.timeZone).isoWeekday)) continue;
    const dayEnd = atLocal(p.year, p.month, p.day + offset, s.workdayEndHour, 0, c.timeZone);
    const begin = Math.max(dayStart.getTime(), from.getTime());
    if (begin >= dayEnd.getTime()) continue;
    const dayMs = dayEnd.getTime() - dayStart.getTime();
    const available = (dailyBenchHours * (dayEnd.getTime() - begin)) / dayMs;
    // a small tolerance so 40 h at 8 h a day ends on the fifth day, not the sixth, after floating-point noise
    if (remaining <= available + 1e-9) return new Date(begin + Math.round((remaining / dailyBenchHours) * dayMs));
    remaining -= available;
  }
  return null;
}

/** Opening days from the day of `start` to the day of `end`, both counted, in the shop's zone. */
function openingDaysBetween(start: Date, end: Date, c: RoutingCandidate): number {
  const p = localParts(start, c.timeZone);
  const last = localDate(end, c.timeZone);
  let count = 0;
  for (let offset = 0; offset < 3660; offset++) {
    const noon = atLocal(p.year, p.month, p.day + offset, 12, 0, c.timeZone);
    if (c.openingDays.includes(localParts(noon, c.timeZone).isoWeekday)) count++;
    if (localDate(noon, c.timeZone) >= last) break;
  }
  return count;
}

interface TripOption {
  transport: 'relay_run' | 'road';
  arrivalAt: Date;
  relayRunId: string | null;
  departureAt: Date | null;
  distanceKm: number | null;
  text: string;
}

export function rankShops(request: RoutingRequest): RoutingResult {
  const settings: RoutingSettings = { ...DEFAULT_ROUTING_SETTINGS, ...request.settings };
  const { now, origin } = request;
  const jobHours = request.jobHours ?? 0;
  const fromOrigin = request.runs.filter((r) => r.fromShopId === origin.shopId && r.active !== false);

  const rows = request.candidates.map((c) => {
    const isOrigin = c.shopId === origin.shopId;
    const reasons: RoutingReason[] = [];
    let transport: TransportKind = 'none';
    let availableAt: Date | null = null;
    let relayRunId: string | null = null;
    let departureAt: Date | null = null;
    let distanceKm: number | null = null;

    const openingDays = c.openingDays.filter((d) => d >= 1 && d <= 7);
    const dailyBenchHours = openingDays.length ? c.weeklyBenchHours / openingDays.length : 0;
    const shop = { ...c, openingDays };
    // The shop works the queue ahead of this job from now on, while the instrument is on its way: the job
    // starts when it has arrived and the waiting work is done, whichever is later.
    const backlogClearAt = dailyBenchHours > 0 ? addBenchHours(now, c.backlogHours, shop, dailyBenchHours, settings) : null;
    const plan = (arrival: Date) => {
      const ready = backlogClearAt && backlogClearAt.getTime() > arrival.getTime() ? backlogClearAt : arrival;
      const start = dailyBenchHours > 0 ? addBenchHours(ready, 0, shop, dailyBenchHours, settings) : null;
      return { start, finish: start ? addBenchHours(start, jobHours, shop, dailyBenchHours, settings) : null };
    };
    const finishMs = (arrival: Date) => plan(arrival).finish?.getTime() ?? Number.POSITIVE_INFINITY;

    if (isOrigin) {
      transport = 'here';
      availableAt = now;
      reasons.push({ kind: 'transport', text: 'Already here: no transfer, no time on the road.' });
    } else {
      // every way there is weighed: a relay run does not win by being a relay run, only by arriving first
      const trips: TripOption[] = [];
      const packedBy = new Date(now.getTime() + settings.packingLeadHours * HOUR_MS);
      const run = nextRun(fromOrigin.filter((r) => r.toShopId === c.shopId), packedBy, origin.timeZone);
      if (run) {
        trips.push({
          transport: 'relay_run',
          arrivalAt: run.arrivalAt,
          relayRunId: run.runId,
          departureAt: run.departureAt,
          distanceKm: null,
          text:
            `Next relay run leaves ${origin.name} ${formatLocal(run.departureAt, origin.timeZone)}, ` +
            `${formatHours(run.transitHours)} h on the road; arrives ${formatLocal(run.arrivalAt, c.timeZone)}.`,
        });
      }
      if (origin.latitude != null && origin.longitude != null && c.latitude != null && c.longitude != null) {
        const km = haversineKm(
          { latitude: origin.latitude, longitude: origin.longitude },
          { latitude: c.latitude, longitude: c.longitude },
        );
        const roadHours = km / settings.roadSpeedKmh;
        const arrivalAt = new Date(now.getTime() + (settings.handlingHours + roadHours) * HOUR_MS);
        trips.push({
          transport: 'road',
          arrivalAt,
          relayRunId: null,
          departureAt: null,
          distanceKm: km,
          text:
            `${run ? 'By road' : `No relay run from ${origin.name}`}: ${Math.round(km).toLocaleString('en-US')} km great-circle at ` +
            `${formatHours(settings.roadSpeedKmh)} km/h is ${formatHours(roadHours)} h, plus ${formatHours(settings.handlingHours)} h handling; ` +
            `arrives about ${formatLocal(arrivalAt, c.timeZone)}.`,
        });
      }
      // The earliest finish wins; when a relay run finishes as soon as a road trip it is kept: it is booked already.
      const better = (a: TripOption, b: TripOption) =>
        finishMs(a.arrivalAt) - finishMs(b.arrivalAt) ||
        (a.transport === b.transport ? 0 : a.transport === 'relay_run' ? -1 : 1) ||
        a.arrivalAt.getTime() - b.arrivalAt.getTime();
      const chosen = trips.reduce<TripOption | null>((best, t) => (!best || better(t, best) < 0 ? t : best), null);
      if (chosen) {
        transport = chosen.transport;
        availableAt = chosen.arrivalAt;
        relayRunId = chosen.relayRunId;
        departureAt = chosen.departureAt;
        distanceKm = chosen.distanceKm;
        reasons.push({ kind: 'transport', text: chosen.text });
        for (const other of trips.filter((t) => t !== chosen)) {
          reasons.push({
            kind: 'transport',
            text: other.transport === 'relay_run'
              ? `The next relay run would arrive ${formatLocal(other.arrivalAt, c.timeZone)}${finishMs(other.arrivalAt) > finishMs(chosen.arrivalAt) ? ' and finish later' : ''}.`
              : `A road trip would arrive about ${formatLocal(other.arrivalAt, c.timeZone)}${finishMs(other.arrivalAt) > finishMs(chosen.arrivalAt) ? ' and finish later' : ', and finish no sooner'}.`,
          });
        }
      } else {
        reasons.push({ kind: 'unavailable', text: `No relay run from ${origin.name}, and no coordinates to estimate a trip.` });
      }
    }

    reasons.push({
      kind: 'backlog',
      text:
        `${formatHours(c.backlogHours)} h of ${request.skillName.toLowerCase()} work already waiting, against ` +
        `${formatHours(c.weeklyBenchHours)} h a week (${formatHours(dailyBenchHours)} h per opening day).`,
    });
    reasons.push({
      kind: 'job',
      text: request.jobHours == null ? 'This job has no estimate yet: counted as 0 h.' : `This job: ${formatHours(jobHours)} h.`,
    });

    let benchDays: number | null = null;
    let benchStart: Date | null = null;
    let finishAt: Date | null = null;
    if (dailyBenchHours <= 0) {
      reasons.push({ kind: 'unavailable', text: 'No bench hours for this skill: the job would not be started.' });
    } else if (availableAt) {
      ({ start: benchStart, finish: finishAt } = plan(availableAt));
      if (benchStart) {
        const afterBacklog = c.backlogHours > 0 && backlogClearAt != null && backlogClearAt.getTime() > availableAt.getTime();
        const when = afterBacklog ? 'once the waiting work is done' : isOrigin ? 'at the next bench hour' : 'once it has arrived';
        reasons.push({
          kind: 'opening',
          text:
            `Open ${formatWeekdays(openingDays)} (${zoneLabel(c.timeZone)})` +
            (c.backlogHours > 0 && backlogClearAt ? `; working from now, the waiting work is done ${formatLocal(backlogClearAt, c.timeZone)}` : '') +
            `: this job can start ${formatLocal(benchStart, c.timeZone)}, ${when}.`,
        });
      }
      if (benchStart && finishAt) {
        benchDays = openingDaysBetween(benchStart, finishAt, shop);
        reasons.push({
          kind: 'finish',
          text: `${formatHours(jobHours)} h of bench work over ${benchDays} bench day${benchDays === 1 ? '' : 's'}: finished by ${formatLocal(finishAt, c.timeZone)}.`,
        });
      }
    }

    return {
      shopId: c.shopId,
      shopName: c.name,
      timeZone: c.timeZone,
      isOrigin,
      transport,
      relayRunId,
      departureAt: departureAt?.toISOString() ?? null,
      arrivalAt: availableAt && !isOrigin ? availableAt.toISOString() : null,
      distanceKm: distanceKm == null ? null : Math.round(distanceKm * 10) / 10,
      backlogHours: c.backlogHours,
      weeklyBenchHours: c.weeklyBenchHours,
      dailyBenchHours: Math.round(dailyBenchHours * 100) / 100,
      jobHours,
      benchDays,
      benchStartDate: benchStart ? localDate(benchStart, c.timeZone) : null,
      finishDate: finishAt ? localDate(finishAt, c.timeZone) : null,
      finishAt: finishAt?.toISOString() ?? null,
      backlogClearAt: backlogClearAt?.toISOString() ?? null,
      reasons,
      _arrival: availableAt?.getTime() ?? Number.POSITIVE_INFINITY,
    };
  });

  rows.sort((a, b) => {
    const fa = a.finishAt ? Date.parse(a.finishAt) : Number.POSITIVE_INFINITY;
    const fb = b.finishAt ? Date.parse(b.finishAt) : Number.POSITIVE_INFINITY;
    if (fa !== fb) return fa - fb;
    // same finishing day: moving nothing beats moving, then the earlier arrival, then the name
    if (a.isOrigin !== b.isOrigin) return a.isOrigin ? -1 : 1;
    if (a._arrival !== b._arrival) return a._arrival - b._arrival;
    return a.shopName.localeCompare(b.shopName);
  });

  const ranked: RankedShop[] = rows.map(({ _arrival, ...row }, i) => ({ ...row, rank: i + 1 }));
  const recommended = ranked.find((r) => !r.isOrigin && r.finishAt);
  return { ranked, recommendedShopId: recommended?.shopId ?? null, settings };
}
