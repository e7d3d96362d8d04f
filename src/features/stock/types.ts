import type { Hazard } from '@shared/safety/hazards';
/** Bodies of the stock API (server/modules/stock). */

export interface StockSource {
  shopId: string;
  shopName: string;
  free: number;
  distanceKm: number | null;
  relayRun: boolean;
  coversAll: boolean;
}

export interface StockRow {
  partId: string;
  sku: string;
  name: string;
  kind: 'pad' | 'other';
  padKind: 'self_leveling' | 'glued' | null;
  diameterMm: number | null;
  thicknessMm: number | null;
  unitPriceCents: number;
  onHand: number;
  reserved: number;
  reorderPoint: number;
  available: number;
  shortage: number;
  incoming: number;
  belowReorderPoint: boolean;
  source: StockSource | null;
  hazards: Hazard[];
}

export interface PartTransferView {
  id: string;
  state: 'requested' | 'sent' | 'received' | 'cancelled';
  quantity: number;
  part: { partId: string; sku: string; name: string };
  fromShop: { id: string; name: string };
  toShop: { id: string; name: string };
  jobId: string | null;
  jobNumber: number | null;
  relayRun: boolean;
  note: string | null;
  requestedAt: string;
  sentAt: string | null;
  receivedAt: string | null;
}

export interface StockPage {
  shop: { id: string; name: string };
  rows: StockRow[];
  totals: { parts: number; short: number; belowReorderPoint: number };
  transfers: { incoming: PartTransferView[]; outgoing: PartTransferView[] };
  can: { update: boolean; pack: boolean; request: boolean; receive: boolean; setHazards: boolean };
}

export interface StockFilters {
  kind?: 'pad' | 'other';
  attention?: boolean;
  q?: string;
}
