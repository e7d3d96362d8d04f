/** HTTP load with autocannon, timed per response so p95 is exact (autocannon itself reports p90 and p97.5). */
import autocannon from 'autocannon';
import { percentile, type LoadResult } from './stats.js';

export async function httpLoad(opts: { url: string; connections: number; amount: number; cookie?: string; paths: string[] }): Promise<LoadResult> {
  const times: number[] = [];
  let errors = 0;
  let i = 0;
  // without a callback autocannon returns its tracker, an event emitter that is also a promise of the result
  const instance = autocannon({
    url: opts.url,
    connections: opts.connections,
    amount: opts.amount,
    timeout: 30,
    headers: opts.cookie ? { cookie: opts.cookie } : {},
    requests: [
      {
        method: 'GET',
        setupRequest: (req) => ({ ...req, path: opts.paths[i++ % opts.paths.length] }),
      },
    ],
  }) as unknown as Promise<autocannon.Result> & { on(event: 'response', fn: (client: unknown, status: number, bytes: number, ms: number) => void): void };
  instance.on('response', (_client: unknown, status: number, _bytes: number, ms: number) => {
    times.push(ms);
    if (status >= 400) errors++;
  });
  const result = await instance;
  errors += result.errors + result.timeouts;
  times.sort((a, b) => a - b);
  const seconds = result.duration;
  return {
    requests: times.length, errors, seconds, perSecond: times.length / seconds,
    p50: percentile(times, 50), p95: percentile(times, 95), max: times[times.length - 1] ?? NaN,
  };
}
