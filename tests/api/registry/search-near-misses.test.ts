import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../../server/lib/db.js';
import { abilityFor } from '../../../shared/auth/ability.js';
import { searchInstruments } from '../../../server/modules/registry/service.js';
import type { Actor } from '../../../server/lib/auth.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';

/**
 * Recall of near misses over generated cases: a registry of 3,000 instruments with 8-character serials, and
 * for each edit kind (swap of neighbours, substitution, deletion, insertion) 150 typed serials made from a
 * registry serial by one such edit, with a fixed-seed generator so every run checks the same cases. The
 * instrument must be among the answers and, among the near misses, at the top distance (one edit).
 */
const SIZE = 3000;
const CASES = 150;
const ALPHABET = 'ABCDEFGHJKLMNPQRSTUVWXYZ0123456789';

/** mulberry32, a small public-domain PRNG: the same sequence on every run. */
function prng(seed: number) {
  return () => {
    seed = (seed + 0x6d2b79f5) | 0;
    let t = Math.imul(seed ^ (seed >>> 15), 1 | seed);
    t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t;
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe('serial search finds every single-edit near miss', () => {
  let actor: Actor;
  let serials: string[];
  const random = prng(20261205);
  const pick = (n: number) => Math.floor(random() * n);
  const char = () => ALPHABET[pick(ALPHABET.length)];

  beforeAll(async () => {
    const net = await makeNetwork();
    const shop = await makeShop(net.id);
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const set = new Set<string>();
    while (set.size < SIZE) set.add(Array.from({ length: 8 }, (_, i) => (i < 2 ? 'ABCDEFGH'[pick(8)] : String(pick(10)))).join(''));
    set.delete('AB104323');
    set.add('AB104233');
    serials = [...set];
    await sequelize.query(
      `insert into instruments (network_id, family, maker, maker_normalized, serial, serial_normalized, owner_kind, current_shop_id, status)
       select :networkId, 'alto_saxophone', 'Aldmoor', 'aldmoor', case s when 'AB104233' then 'AB-104 233' else s end, s, 'rental_fleet', :shopId, 'in_service'
         from unnest(array[:serials]) s`,
      { replacements: { networkId: net.id, shopId: shop.id, serials }, type: QueryTypes.INSERT },
    );
    const memberships = [{ shopId: null, role: 'owner' as const }];
    actor = { id: owner.id, networkId: net.id, email: owner.email, name: owner.name, memberships, ability: abilityFor({ id: owner.id, memberships }) };
  });
  afterAll(closeServerResources);

  const edits = {
    swap: (s: string) => {
      let i = pick(s.length - 1);
      while (s[i] === s[i + 1]) i = (i + 1) % (s.length - 1);
      return s.slice(0, i) + s[i + 1] + s[i] + s.slice(i + 2);
    },
    substitution: (s: string) => {
      const i = pick(s.length);
      let c = char();
      while (c === s[i]) c = char();
      return s.slice(0, i) + c + s.slice(i + 1);
    },
    deletion: (s: string) => {
      const i = pick(s.length);
      return s.slice(0, i) + s.slice(i + 1);
    },
    insertion: (s: string) => {
      const i = pick(s.length + 1);
      return s.slice(0, i) + char() + s.slice(i);
    },
  };

  it('the issue’s example: AB104323 finds AB-104 233 (neighbours swapped), first among the near misses', async () => {
    const hits = await searchInstruments(actor, { q: 'AB104323', limit: 20 });
    expect(hits.find((h) => h.match === 'similar')).toMatchObject({ serial: 'AB-104 233', serialNormalized: 'AB104233' });
  });

  for (const [kind, edit] of Object.entries(edits)) {
    it(`${kind}: all ${CASES} generated cases found, one-edit matches ranked first among near misses`, async () => {
      let found = 0;
      const missed: string[] = [];
      for (let n = 0; n < CASES; n++) {
        const target = serials[pick(serials.length)];
        const typed = edit(target);
        if (serials.includes(typed)) { found++; continue; } // the edit landed on another registry serial: an exact hit, fair
        const hits = await searchInstruments(actor, { q: typed, limit: 20 });
        const at = hits.findIndex((h) => h.serialNormalized === target);
        const firstSimilar = hits.findIndex((h) => h.match === 'similar');
        // ahead of it only literal matches (prefix, contains) and other serials also one edit away
        if (at >= 0 && hits.slice(firstSimilar, at).every((h) => osaOne(h.serialNormalized, typed))) found++;
        else missed.push(`${typed} → ${target}`);
      }
      expect(missed).toEqual([]);
      expect(found).toBe(CASES);
    });
  }
});

/** One edit apart, checked by the definition (not with the code's distance function). */
function osaOne(a: string, b: string): boolean {
  if (a === b) return false;
  if (a.length === b.length) {
    const diff = [...a].map((c, i) => (c === b[i] ? -1 : i)).filter((i) => i >= 0);
    if (diff.length === 1) return true;
    return diff.length === 2 && diff[1] === diff[0] + 1 && a[diff[0]] === b[diff[1]] && a[diff[1]] === b[diff[0]];
  }
  const [short, long] = a.length < b.length ? [a, b] : [b, a];
  if (long.length - short.length !== 1) return false;
  for (let i = 0; i < long.length; i++) if (long.slice(0, i) + long.slice(i + 1) === short) return true;
  return false;
}
