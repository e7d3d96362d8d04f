import type { InstrumentFamily, JobStage, OwnerKind } from '@shared/domain';
import type { CustomerKind, ImportRowResult, InstrumentStatus, MatchKind, TimelineFilter } from '@shared/schemas/registry';

/** Shapes of the registry API's answers (server/modules/registry/service.ts). */

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

export interface ShopRef {
  id: string;
  name: string;
  timeZone: string;
}

export interface CustomerView {
  id: string;
  kind: CustomerKind;
  name: string | null;
  contactVisible: boolean;
  contact: { contactName: string | null; email: string | null; phone: string | null; address: string | null; notes: string | null } | null;
  homeShopId: string | null;
}

export interface InstrumentJob {
  id: string;
  number: number;
  shop: ShopRef | null;
  stage: JobStage;
  complaint: string;
  promisedOn: string | null;
  openedAt: string;
  readyAt: string | null;
  releasedAt: string | null;
  open: boolean;
}

export interface InstrumentDetail {
  instrument: {
    id: string;
    family: InstrumentFamily;
    maker: string;
    model: string | null;
    serial: string;
    serialNormalized: string;
    assetTag: string | null;
    status: InstrumentStatus;
    yearMade: number | null;
    notes: string | null;
    ownerKind: OwnerKind;
    currentShop: ShopRef | null;
    createdAt: string;
  };
  owner: CustomerView | null;
  openJob: InstrumentJob | null;
  jobs: InstrumentJob[];
  otherMakers: InstrumentHit[];
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

export interface SerialCheck {
  serialNormalized: string;
  sameMaker: InstrumentHit | null;
  otherMakers: InstrumentHit[];
}

export interface IntakeResult {
  job: { id: string; number: number; stage: JobStage; shopId: string };
  instrument: { id: string; serial: string; maker: string; assetTag: string | null };
  customerId: string | null;
  warnings: string[];
  replayed: boolean;
}

export interface ImportBatchResult {
  results: ImportRowResult[];
  counts: Record<'created' | 'updated' | 'unchanged' | 'error', number>;
}
