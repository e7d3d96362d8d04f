import type { InstrumentFamily, JobStage } from './domain.js';
import type { CustomerKind, ImportRowOutcome, ImportRowResult, InstrumentStatus, MatchKind, TimelineFilter } from './schemas/registry.js';
import type { HazardCaution } from './safety/hazards.js';

/** Shapes of the registry API's answers: built by server/modules/registry/service.ts, read by the client. */

export interface ShopRef {
  id: string;
  name: string;
  timeZone: string;
}

export interface InstrumentHit {
  id: string;
  family: InstrumentFamily;
  maker: string;
  model: string | null;
  serial: string;
  serialNormalized: string;
  assetTag: string | null;
  status: InstrumentStatus;
  currentShop: { id: string; name: string };
  openJob: { id: string; number: number; stage: JobStage; shopId: string; shopName: string } | null;
  match: MatchKind | null;
  score: number;
}

/**
 * How a customer whose name the viewer may not see is written in files, PDFs and e-mails (JSON answers carry
 * `null` and the screens write this).
 */
export const PRIVATE_CUSTOMER_LABEL = 'Private customer';

export interface CustomerView {
  id: string;
  kind: CustomerKind;
  /** null for a private person whose details this viewer may not see */
  name: string | null;
  contactVisible: boolean;
  contact: { contactName: string | null; email: string | null; phone: string | null; address: string | null; notes: string | null } | null;
  homeShopId: string | null;
}

export interface TimelineItem {
  id: string;
  source: 'history' | 'attachment' | 'pad_map';
  kind: string;
  filter: TimelineFilter;
  at: string;
  summary: string;
  shop: ShopRef | null;
  person: string | null;
  job: { id: string; number: number } | null;
  data: Record<string, unknown>;
}

export interface IntakeResult {
  job: { id: string; number: number; stage: JobStage; shopId: string };
  /** `heavyCase`: its family or its own flag makes lifting it deserve the caution. */
  instrument: { id: string; serial: string; maker: string; assetTag: string | null; heavyCase: boolean };
  customerId: string | null;
  warnings: string[];
  /** Shown on the intake confirmation: the lifting caution for a heavy case, before anyone carries it to the shelf. */
  cautions: HazardCaution[];
  /** true when this request key had already opened the job (a retry): nothing new was written */
  replayed: boolean;
}

export interface ImportBatchResult {
  results: ImportRowResult[];
  counts: Record<ImportRowOutcome, number>;
  /** true for a preview: nothing was written */
  dryRun: boolean;
}
