import type { IsoWeekday } from '../domain.js';
import { atLocal, localParts } from './zoned.js';

/** A relay run as routing needs it: ISO weekdays and departure time are local to the origin shop. */
export interface RelayRunSchedule {
  id: string;
  fromShopId: string;
  toShopId: string;
  weekdays: IsoWeekday[] | number[];
  /** 'HH:MM' or 'HH:MM:SS', wall-clock time at the origin shop. */
  departureTime: string;
  transitHours: number;
  active?: boolean;
}

export interface NextRun {
  runId: string;
  departureAt: Date;
  arrivalAt: Date;
  transitHours: number;
}

/**
 * The first departure of a run at or after `after`, reading weekdays and departure time in the origin
 * shop's time zone (so a 07:30 run leaves at 07:30 local on both sides of a DST change).
 */
export function nextDeparture(run: RelayRunSchedule, after: Date, originTimeZone: string): Date | null {
  if (run.active === false || run.weekdays.length === 0) return null;
  const [hh, mm] = run.departureTime.split(':').map(Number);
  const today = localParts(after, originTimeZone);
  // eight days: today's run may already have left, and then the same weekday next week is the answer
  for (let offset = 0; offset <= 7; offset++) {
    const isoWeekday = ((today.isoWeekday - 1 + offset) % 7) + 1;
    if (!(run.weekdays as number[]).includes(isoWeekday)) continue;
    const departure = atLocal(today.year, today.month, today.day + offset, hh, mm, originTimeZone);
    if (departure.getTime() >= after.getTime()) return departure;
  }
  return null;
}

/** Among the runs from one shop to another, the one that arrives first when leaving no earlier than `after`. */
export function nextRun(runs: RelayRunSchedule[], after: Date, originTimeZone: string): NextRun | null {
  let best: NextRun | null = null;
  for (const run of runs) {
    const departureAt = nextDeparture(run, after, originTimeZone);
    if (!departureAt) continue;
    const arrivalAt = new Date(departureAt.getTime() + run.transitHours * 3_600_000);
    if (!best || arrivalAt.getTime() < best.arrivalAt.getTime()) {
      best = { runId: run.id, departureAt, arrivalAt, transitHours: run.transitHours };
    }
  }
  return best;
}
