/**
 * `npm run bench`: every benchmark on the bench data, one after the other (they share two cores), with
 * all figures gathered at the end. Run `npm run bench:data -- --instruments 1000000` first.
 *
 *   npm run bench -- --requests 600    passed on to each script
 */
import { spawnSync } from 'node:child_process';

const passOn = process.argv.slice(2);
const scripts = ['request-overhead.ts', 'api.ts', 'client.ts'];
const lines: string[] = [];
let failed = false;
for (const script of scripts) {
  console.log(`\n== ${script}`);
  const run = spawnSync('npx', ['tsx', `server/bench/${script}`, ...(script === 'client.ts' ? [] : passOn)], {
    encoding: 'utf8', stdio: ['ignore', 'pipe', 'inherit'], maxBuffer: 64 * 1024 * 1024,
  });
  process.stdout.write(run.stdout);
  lines.push(...run.stdout.split('\n').filter((l) => l.startsWith('FIGURE ') || l.startsWith('MEASURED ')));
  if (run.status !== 0) failed = true;
}
console.log(`\n== all figures (${new Date().toISOString()})`);
for (const line of lines) console.log(line);
const missed = lines.filter((l) => l.endsWith('MISSED') || l.includes('| MISSED'));
console.log(`\n${lines.filter((l) => l.startsWith('FIGURE ')).length} figures with a limit, ${missed.length} missed`);
process.exit(failed ? 1 : 0);
