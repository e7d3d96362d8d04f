import { readdirSync, readFileSync, statSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

/*
 * One owner per table: a table is written by one module's service and every other module calls that
 * service. This reads the server's source (modules, seed, workers) and fails when a write to an owned
 * table shows up outside its owner. It is a cheap structural guard, not a parser: it looks for the
 * Sequelize write calls and raw SQL writes that this codebase uses.
 */

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const SCANNED = ['server/modules', 'server/seed', 'workers'];

function sourceFiles(dir: string): string[] {
  const abs = path.join(root, dir);
  return readdirSync(abs).flatMap((name) => {
    const rel = path.posix.join(dir, name);
    if (statSync(path.join(root, rel)).isDirectory()) return sourceFiles(rel);
    return name.endsWith('.ts') ? [rel] : [];
  });
}

const files = SCANNED.flatMap(sourceFiles).map((rel) => ({ rel, text: readFileSync(path.join(root, rel), 'utf8') }));

function writesOf(patterns: RegExp[]) {
  const hits: string[] = [];
  for (const { rel, text } of files) {
    text.split('\n').forEach((line, i) => {
      if (patterns.some((p) => p.test(line))) hits.push(`${rel}:${i + 1}`);
    });
  }
  return hits;
}

const write = (model: string) => new RegExp(`\\b${model}\\.(create|bulkCreate|update|destroy|upsert|increment|decrement)\\(`);
const sqlWrite = (table: string) => new RegExp(`\\b(insert\\s+into|update|delete\\s+from)\\s+${table}\\b`, 'i');

describe('one owner per table', () => {
  it('history events are written only by the registry’s service (appendHistory)', () => {
    const hits = writesOf([write('HistoryEvent'), sqlWrite('history_events')]);
    // the guard sees the owner's own writes, so its patterns are alive
    expect(hits.filter((h) => h.startsWith('server/modules/registry/service.ts')).length).toBeGreaterThan(0);
    expect(hits.filter((h) => !h.startsWith('server/modules/registry/'))).toEqual([]);
  });

  it('instruments are written only by the registry’s service (the demo seed bulk-loads its registry)', () => {
    const hits = writesOf([write('Instrument'), sqlWrite('instruments'), /\binstrument\.update\(/]);
    expect(hits.filter((h) => h.startsWith('server/modules/registry/')).length).toBeGreaterThan(0);
    expect(hits.filter((h) => !h.startsWith('server/modules/registry/') && !h.startsWith('server/seed/demo.ts:'))).toEqual([]);
  });

  it('job lines, job stages and jobs are written only by the jobs service (the demo seed bulk-loads its backdated jobs)', () => {
    const lines = writesOf([write('JobLineItem'), sqlWrite('job_line_items')]);
    const jobs = writesOf([write('Job'), sqlWrite('jobs'), /\.update\(\s*\{[^}]*\bstage\s*:/]);
    expect(lines.filter((h) => h.startsWith('server/modules/jobs/')).length).toBeGreaterThan(0);
    expect(jobs.filter((h) => h.startsWith('server/modules/jobs/')).length).toBeGreaterThan(0);
    const outside = [...lines, ...jobs].filter((h) => !h.startsWith('server/modules/jobs/') && !h.startsWith('server/seed/demo.ts:'));
    expect(outside).toEqual([]);
  });
});
