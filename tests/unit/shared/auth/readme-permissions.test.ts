import { readFileSync } from 'node:fs';
import path from 'node:path';
import { subject } from '@casl/ability';
import { describe, expect, it } from 'vitest';
import { abilityFor, type Action } from '../../../../shared/auth/ability.js';
import type { Role } from '../../../../shared/domain.js';

/**
 * README's permission table is what people read before they ask for a role; here its Reports rows
 * are read from the file itself and held against the rules, so the two cannot drift apart again.
 */
const README = readFileSync(path.resolve(import.meta.dirname, '../../../../README.md'), 'utf8');
const COLUMNS: Role[] = ['owner', 'regional_manager', 'front_desk', 'technician', 'auditor'];

/** The table row whose first cell starts with `label`, as its five role cells. */
function tableRow(label: string): string[] {
  const lines = README.split('\n').filter((l) => l.startsWith(`| ${label}`));
  expect(lines, `exactly one README table row starting “${label}”`).toHaveLength(1);
  const cells = lines[0].split('|').slice(1, -1).map((c) => c.trim());
  expect(cells, `the row “${label}” has a cell per role`).toHaveLength(1 + COLUMNS.length);
  return cells.slice(1);
}

const HOME = 'shop-home';
const AWAY = 'shop-away';
const report = (shopId: string) => subject('Report', { shopId }) as never;

/** What the rules allow a person with `role` at HOME, in the table's words: all, own or —. */
function inWords(role: Role, action: Action): string {
  const ability = abilityFor({ id: 'u1', memberships: [{ shopId: role === 'owner' ? null : HOME, role }] });
  const home = ability.can(action, report(HOME));
  const away = ability.can(action, report(AWAY));
  if (home && away) return 'all';
  if (home) return 'own';
  if (!away) return '—';
  return 'other shops only';
}

describe('README permission table, Reports rows (shared/auth/ability.ts)', () => {
  it('the dashboard and report screens row says who may read reports', () => {
    expect(tableRow('Reports: dashboard')).toEqual(COLUMNS.map((role) => inWords(role, 'read')));
  });

  it('the CSV downloads row says who may export', () => {
    expect(tableRow('Reports: CSV')).toEqual(COLUMNS.map((role) => inWords(role, 'export')));
  });

  it('front desk and technicians read their shops’ reports; only the front desk exports them', () => {
    expect(inWords('front_desk', 'read')).toBe('own');
    expect(inWords('technician', 'read')).toBe('own');
    expect(inWords('front_desk', 'export')).toBe('own');
    expect(inWords('technician', 'export')).toBe('—');
    expect(inWords('auditor', 'export')).toBe('—');
  });
});
