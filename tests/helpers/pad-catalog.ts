import { Part, ServiceCatalogItem, StockLevel } from '../../server/lib/models.js';

/**
 * A network's pad catalog for tests: both kinds every 0.5 mm between two diameters (like the demo's,
 * in a narrower range so each test writes few rows), and a "Repad — alto saxophone" of 6 hours.
 */
export async function makePadCatalog(networkId: string, { from = 8, to = 48 }: { from?: number; to?: number } = {}) {
  const rows = [];
  for (let tenths = from * 10; tenths <= to * 10; tenths += 5) {
    const d = tenths / 10;
    rows.push(
      { networkId, sku: `PAD-G-${d.toFixed(1)}`, name: `Glued pad ${d.toFixed(1)} mm × 4.0 mm`, kind: 'pad' as const, padKind: 'glued' as const, diameterMm: d, thicknessMm: 4, unitPriceCents: 200 + tenths },
      { networkId, sku: `PAD-S-${d.toFixed(1)}`, name: `Self-leveling pad ${d.toFixed(1)} mm × 3.6 mm`, kind: 'pad' as const, padKind: 'self_leveling' as const, diameterMm: d, thicknessMm: 3.6, unitPriceCents: 400 + tenths },
    );
  }
  const parts = await Part.bulkCreate(rows);
  const bySku = new Map(parts.map((p) => [p.sku, p]));
  const repad = await ServiceCatalogItem.create({ networkId, name: 'Repad — alto saxophone', family: 'alto_saxophone', standardHours: 6 });
  await ServiceCatalogItem.create({ networkId, name: 'Leak test & adjust', family: null, standardHours: 1 });
  /** The pad part of a kind and diameter. */
  const pad = (kind: 'glued' | 'self_leveling', d: number) => bySku.get(`PAD-${kind === 'glued' ? 'G' : 'S'}-${d.toFixed(1)}`)!;
  return { parts, pad, repad };
}

export async function setStock(networkId: string, shopId: string, partId: string, onHand: number, reserved = 0) {
  await StockLevel.upsert({ networkId, shopId, partId, onHand, reserved, reorderPoint: 0 });
}

export async function stockOf(networkId: string, shopId: string, partId: string) {
  const level = await StockLevel.findOne({ where: { networkId, shopId, partId } });
  return { onHand: level?.onHand ?? 0, reserved: level?.reserved ?? 0 };
}
