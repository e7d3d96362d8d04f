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
 * Defaults for a network that has set nothing (network.settings.routing overrides each). These are
 * working assumptions, not published figures: 60 km/h allows for the detour of real roads over the
 * great circle and for stops; a day of handling covers booking a courier and the two hand-overs.
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

/** The start of the first bench day, at or after `availableAt`, on a day the shop opens. */
function firstBenchDay(availableAt: Date, c: RoutingCandidate, s: RoutingSettings) {
  const p = localParts(availableAt, c.timeZone);
  for (let offset = 0; offset <= 14; offset++) {
    const start = atLocal(p.year, p.month, p.day + offset, s.workdayStartHour, 0, c.timeZone);
    const weekday = localParts(start, c.timeZone).isoWeekday;
    if (c.openingDays.includes(weekday) && start.getTime() >= availableAt.getTime()) return start;
  }
  return null;
}

/** The n-th opening day counting `start` as the first; returns the end of that bench day. */
function nthBenchDayEnd(start: Date, n: number, c: RoutingCandidate, s: RoutingSettings) {
  const p = localParts(start, c.timeZone);
  let counted = 0;
  for (let offset = 0; offset < 7 * (n + 2); offset++) {
    const dayStart = atLocal(p.year, p.month, p.day + offset, s.workdayStartHour, 0, c.timeZone);
    if (!c.openingDays.includes(localParts(dayStart, c.timeZone).isoWeekday)) continue;
    counted++;
    if (counted === n) return atLocal(p.year, p.month, p.day + offset, s.workdayEndHour, 0, c.timeZone);
  }
  return null;
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

    if (isOrigin) {
      transport = 'here';
      availableAt = now;
      reasons.push({ kind: 'transport', text: 'Already here: no transfer, no time on the road.' });
    } else {
      const packedBy = new Date(now.getTime() + settings.packingLeadHours * HOUR_MS);
      const run = nextRun(fromOrigin.filter((r) => r.toShopId === c.shopId), packedBy, origin.timeZone);
      if (run) {
        transport = 'relay_run';
        availableAt = run.arrivalAt;
        relayRunId = run.runId;
        departureAt = run.departureAt;
        reasons.push({
          kind: 'transport',
          text:
            `Next relay run leaves ${origin.name} ${formatLocal(run.departureAt, origin.timeZone)}, ` +
            `${formatHours(run.transitHours)} h on the road; arrives ${formatLocal(run.arrivalAt, c.timeZone)}.`,
        });
      } else if (origin.latitude != null && origin.longitude != null && c.latitude != null && c.longitude != null) {
        transport = 'road';
        distanceKm = haversineKm(
          { latitude: origin.latitude, longitude: origin.longitude },
          { latitude: c.latitude, longitude: c.longitude },
        );
        const roadHours = distanceKm / settings.roadSpeedKmh;
        availableAt = new Date(now.getTime() + (settings.handlingHours + roadHours) * HOUR_MS);
        reasons.push({
          kind: 'transport',
          text:
            `No relay run from ${origin.name}: ${Math.round(distanceKm).toLocaleString('en-US')} km great-circle at ` +
            `${formatHours(settings.roadSpeedKmh)} km/h is ${formatHours(roadHours)} h, plus ${formatHours(settings.handlingHours)} h handling; ` +
            `arrives about ${formatLocal(availableAt, c.timeZone)}.`,
        });
      } else {
        reasons.push({ kind: 'unavailable', text: `No relay run from ${origin.name}, and no coordinates to estimate a trip.` });
      }
    }

    const openingDays = c.openingDays.filter((d) => d >= 1 && d <= 7);
    const dailyBenchHours = openingDays.length ? c.weeklyBenchHours / openingDays.length : 0;
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
      // a small tolerance so 40 h at 8 h a day is 5 days, not 6 after floating-point noise
      benchDays = Math.max(1, Math.ceil((c.backlogHours + jobHours) / dailyBenchHours - 1e-9));
      benchStart = firstBenchDay(availableAt, { ...c, openingDays }, settings);
      finishAt = benchStart ? nthBenchDayEnd(benchStart, benchDays, { ...c, openingDays }, settings) : null;
      if (benchStart) {
        reasons.push({
          kind: 'opening',
          text: `Open ${formatWeekdays(openingDays)} (${zoneLabel(c.timeZone)}): the bench can start ${formatLocal(benchStart, c.timeZone, false)}.`,
        });
      }
      if (finishAt) {
        reasons.push({
          kind: 'finish',
          text: `${benchDays} bench day${benchDays === 1 ? '' : 's'} for the waiting work and this job: finished by ${formatLocal(finishAt, c.timeZone, false)}.`,
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
