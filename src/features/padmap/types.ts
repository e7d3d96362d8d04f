import type { KeyResult, LaborEstimate, PadCatalog } from '@shared/padmap/compute';
import type { StoredEntry } from '@shared/padmap/entries';
import type { PadKind, PadRules } from '@shared/padmap/rules';
import type { Suggestions } from '@shared/padmap/suggest';
import type { LengthUnit } from '@shared/padmap/units';

/** Bodies of the pad map API (server/modules/padmaps). */

export interface PadMapView {
  id: string;
  instrumentId: string;
  jobId: string | null;
  jobNumber: number | null;
  shopId: string;
  shopName: string;
  unitSystem: LengthUnit;
  entries: StoredEntry[];
  results: KeyResult[];
  createdBy: string;
  createdAt: string;
  updatedAt: string;
}

export interface PartSource {
  shopId: string;
  shopName: string;
  free: number;
  distanceKm: number | null;
  relayRun: boolean;
  coversAll: boolean;
}

export interface ReservedLine {
  partId: string;
  sku: string;
  name: string;
  padKind: PadKind | null;
  diameterMm: number | null;
  thicknessMm: number | null;
  quantity: number;
  onHand: number;
  reservedAtShop: number;
  shortfall: number;
  uncovered: number;
  requested: Array<{ id: string; fromShopId: string; fromShopName: string; quantity: number; state: string }>;
  source: PartSource | null;
}

export interface PadStock {
  partId: string;
  onHand: number;
  reserved: number;
  reservedForJob: number;
}

export interface ServiceOption {
  id: string;
  name: string;
  standardHours: number;
  family: string | null;
}

export interface PadMapWorkspace {
  job: { id: string; number: number; stage: string; shopId: string; shopName: string };
  instrument: { id: string; family: string; familyLabel: string; maker: string; model: string | null; serial: string };
  rules: PadRules;
  catalog: PadCatalog;
  services: ServiceOption[];
  defaultServiceId: string | null;
  padMap: PadMapView | null;
  previous: PadMapView | null;
  suggestions: (Suggestions & { family: string; maker: string; model: string | null }) | null;
  stock: PadStock[];
  parts: ReservedLine[];
  can: { edit: boolean; requestParts: boolean };
}

export interface SavedPadMap extends PadMapWorkspace {
  saved: { padMapId: string; created: boolean; labor: LaborEstimate | null; reservation: { reserved: number; released: number } };
}
