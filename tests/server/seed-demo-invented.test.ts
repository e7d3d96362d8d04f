import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../server/lib/db.js';
import { loadDemoNetwork } from '../../server/seed/demo.js';
import { closeServerResources } from '../helpers/close.js';

/*
 * The demo must not borrow reality beyond the cities: no model numbering that a real instrument could carry, no
 * real postal code, no city's real tax rate. The test keeps patterns (numbering styles), not brand names.
 */
const MODEL_PATTERNS_TO_AVOID: Array<[RegExp, string]> = [
  [/^[A-Z]{1,4}[- ]?\d/i, 'letters then digits, the numbering of student instruments (AS-300, TS 450, YX23)'],
  [/\d/, 'any digit: most real model names are numbers, so an invented one has none'],
  [/\b(mark|mk)\b/i, 'a "Mark" generation'],
  [/\b(model|series)\b/i, 'a "Model"/"Series" name'],
  [/\b[IVX]{2,4}\b/, 'a roman-numeral generation'],
  [/\b(pro|custom|reference|artist|standard)\b/i, 'a catalogue tier word that real lines use as a suffix'],
];
const MAKER_PATTERNS_TO_AVOID: Array<[RegExp, string]> = [
  [/\d/, 'a number in the name'],
  [/\b(inc|ltd|llc|gmbh|corp|co|company|s\.?a)\b\.?/i, 'a company form, which reads as a registered business'],
  [/^[A-Z]{2,5}$/, 'an all-capitals initialism'],
  [/\b(music|musical|instruments?)\b/i, 'the generic "Music"/"Instruments" ending most real makers use'],
];
/*
 * The five cities' combined sales-tax rates as remembered for 2024–2025, in basis points (from memory, not
 * checked against the tax authorities; here only so the demo stays clear of them).
 */
const REAL_TAX_RATES: Record<string, number[]> = {
  Seattle: [1010, 1025, 1035],
  Portland: [],
  Sacramento: [875, 925],
  Denver: [881, 915],
  Chicago: [1025],
};

describe('demo data nobody can mistake for real', () => {
  let networkId: string;
  const q = <T extends object>(sql: string) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements: { networkId } });

  beforeAll(async () => {
    networkId = (await loadDemoNetwork()).networkId;
  });
  afterAll(closeServerResources);

  it('no model code or maker follows a real numbering or naming style', async () => {
    const rows = await q<{ maker: string; model: string | null }>('select distinct maker, model from instruments where network_id = :networkId');
    expect(rows.length).toBeGreaterThan(10);
    for (const { maker, model } of rows) {
      for (const [pattern, why] of MODEL_PATTERNS_TO_AVOID) expect(model ?? '', `model "${model}": ${why}`).not.toMatch(pattern);
      for (const [pattern, why] of MAKER_PATTERNS_TO_AVOID) expect(maker, `maker "${maker}": ${why}`).not.toMatch(pattern);
    }
  });

  it('postal codes sit in the unused 000xx range, phones in 555-0100–0199, tax rates away from the cities’ own', async () => {
    const shops = await q<{ city: string; postal_code: string; phone: string; tax_rate_basis_points: number }>(
      'select city, postal_code, phone, tax_rate_basis_points from shops where network_id = :networkId',
    );
    expect(shops.length).toBeGreaterThanOrEqual(4);
    for (const shop of shops) {
      // US ZIP codes in use start at 005 (from memory); a five-digit code above that could be a real place
      expect(shop.postal_code, shop.city).toMatch(/^000\d\d$/);
      // 555-0100 to 555-0199: the range the North American numbering plan keeps for fiction
      expect(shop.phone, shop.city).toMatch(/555 01\d\d$/);
      expect(REAL_TAX_RATES[shop.city] ?? [], `${shop.city} uses a real tax rate`).not.toContain(shop.tax_rate_basis_points);
    }
  });

  it('the demo catalog and parts carry their hazard tags, and the heavy brass dent jobs are on heavy families', async () => {
    const items = await q<{ name: string; hazards: string[] }>('select name, hazards from service_catalog where network_id = :networkId');
    const tags = (prefix: string) => items.find((i) => i.name.startsWith(prefix))?.hazards;
    expect(tags('Cork & felt')).toEqual(expect.arrayContaining(['adhesive', 'heat_flame']));
    expect(tags('Adjust and seal')).toEqual(expect.arrayContaining(['adhesive', 'heat_flame', 'springs_sharp']));
    expect(tags('Dent removal — large brass')).toEqual(expect.arrayContaining(['solder_lead', 'abrasive_rotary']));
    expect(tags('Repad — alto saxophone')).toEqual(expect.arrayContaining(['pad_removal', 'adhesive', 'heat_flame', 'solvent']));
    const [cement] = await q<{ hazards: string[] }>(`select hazards from parts where network_id = :networkId and sku = 'PAD-CEMENT-STICK'`);
    expect(cement.hazards).toEqual(['adhesive', 'heat_flame']);
    const dents = await q<{ family: string }>(
      `select i.family from jobs j join instruments i on i.network_id = j.network_id and i.id = j.instrument_id
         join job_line_items l on l.network_id = j.network_id and l.job_id = j.id
         join service_catalog c on c.network_id = l.network_id and c.id = l.catalog_item_id
        where j.network_id = :networkId and c.name = 'Dent removal — large brass' and j.stage <> 'released'`,
    );
    expect(dents.map((d) => d.family).sort()).toEqual(expect.arrayContaining(['euphonium', 'tuba']));
  });
});
