/** What bench:data leaves for the benchmarks: .data/bench/<database>.json. */
import fs from 'node:fs';
import path from 'node:path';
import { BENCH_DATABASE } from './env.js';

export const FIXTURES_PATH = path.resolve(`.data/bench/${BENCH_DATABASE}.json`);

export interface BenchFixtures {
  database: string;
  instruments: number;
  createdAt: string;
  generationSeconds: number;
  counts: Record<string, number>;
  network: { id: string; slug: string; shops: number };
  busiestShop: { id: string; openJobs: number };
  historyInstrument: { id: string; events: number };
  people: Record<'owner' | 'regional_manager' | 'front_desk' | 'technician' | 'auditor', { id: string; cookie: string }>;
}

export function readFixtures(): BenchFixtures {
  if (!fs.existsSync(FIXTURES_PATH)) {
    throw new Error(`no bench data yet: run \`npm run bench:data -- --instruments 2000\` (or 1000000) first (${FIXTURES_PATH})`);
  }
  return JSON.parse(fs.readFileSync(FIXTURES_PATH, 'utf8')) as BenchFixtures;
}
