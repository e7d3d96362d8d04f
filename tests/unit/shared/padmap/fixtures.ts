import type { CatalogPad, PadCatalog } from '../../../../shared/padmap/compute.js';

/** A catalog every 0.5 mm from 6 to 58 mm in both kinds, like the demo network's. */
export function halfMillimetreCatalog(thickness = { self_leveling: 3.6, glued: 4 }): PadCatalog {
  const pads = (t: number): CatalogPad[] =>
    Array.from({ length: 105 }, (_, i) => {
      const d = 6 + i * 0.5;
      return { diameterMm: d, thicknessMm: t, partId: `part-${t}-${d}`, sku: `PAD-${d.toFixed(1)}`, name: `Pad ${d.toFixed(1)} mm`, unitPriceCents: 300 };
    });
  return { self_leveling: pads(thickness.self_leveling), glued: pads(thickness.glued) };
}
