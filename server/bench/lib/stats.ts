/** Small helpers shared by the bench scripts: percentiles, concurrency, and the printed lines. */
import { performance } from 'node:perf_hooks';

export function percentile(sorted: number[], p: number): number {
  if (!sorted.length) return NaN;
  const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
  return sorted[i];
}

export interface LoadResult {
  requests: number;
  errors: number;
  seconds: number;
  perSecond: number;
  p50: number;
  p95: number;
  max: number;
}

/**
 * Runs `task` from `connections` loops at once until `total` calls are done; times each call.
 * Used for the raw-SQL side of each comparison (the HTTP side uses autocannon).
 */
export async function runConcurrent(connections: number, total: number, task: (i: number) => Promise<unknown>): Promise<LoadResult> {
  const times: number[] = [];
  let next = 0;
  let errors = 0;
  const started = performance.now();
  await Promise.all(
    Array.from({ length: connections }, async () => {
      while (next < total) {
        const i = next++;
        const t0 = performance.now();
        try {
          await task(i);
        } catch {
          errors++;
        }
        times.push(performance.now() - t0);
      }
    }),
  );
  const seconds = (performance.now() - started) / 1000;
  times.sort((a, b) => a - b);
  return { requests: times.length, errors, seconds, perSecond: times.length / seconds, p50: percentile(times, 50), p95: percentile(times, 95), max: times[times.length - 1] ?? NaN };
}

export const fmt = (n: number, digits = 1) => (Number.isFinite(n) ? n.toFixed(digits) : '–');

/**
 * One figure beside its limit, in one greppable line:
 *   FIGURE <name> = <value> <unit> | limit <op> <limit> <unit> | ratio <value/limit> | ok|MISSED
 */
export function figure(name: string, value: number, unit: string, limit: number, op: '<=' | '>=', note = ''): boolean {
  const ok = op === '<=' ? value <= limit : value >= limit;
  const ratio = limit === 0 ? (value === 0 ? 0 : Infinity) : value / limit;
  console.log(`FIGURE ${name} = ${fmt(value, 2)} ${unit} | limit ${op} ${fmt(limit, 2)} ${unit} | ratio ${fmt(ratio, 2)} | ${ok ? 'ok' : 'MISSED'}${note ? ` | ${note}` : ''}`);
  return ok;
}

/** A measured figure with no limit of its own (the raw side of a comparison, a size). */
export function measured(name: string, value: number, unit: string, note = '') {
  console.log(`MEASURED ${name} = ${fmt(value, 2)} ${unit}${note ? ` | ${note}` : ''}`);
}

export function argValue(name: string, fallback: string): string {
  const argv = process.argv.slice(2);
  const i = argv.indexOf(`--${name}`);
  if (i >= 0 && argv[i + 1] !== undefined) return argv[i + 1];
  const eq = argv.find((a) => a.startsWith(`--${name}=`));
  return eq ? eq.slice(name.length + 3) : fallback;
}
