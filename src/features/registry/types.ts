import type { InstrumentFamily, JobStage, OwnerKind } from '@shared/domain';
import type { InstrumentStatus } from '@shared/schemas/registry';
import type { CustomerView, InstrumentHit, ShopRef } from '@shared/registry';

export type { CustomerView, ImportBatchResult, InstrumentHit, IntakeResult, ShopRef, TimelineItem } from '@shared/registry';

/** Shapes of the registry API's answers (server/modules/registry/service.ts); the shared ones live in shared/registry.ts. */

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
    /** The desk's own flag; `heavyCase` also counts the heavy families. */
    heavyCaseFlag: boolean;
    heavyCase: boolean;
    canUpdate: boolean;
  };
  owner: CustomerView | null;
  openJob: InstrumentJob | null;
  jobs: InstrumentJob[];
  otherMakers: InstrumentHit[];
  /** In transit: the transfer it travels on (it is at neither shop meanwhile). */
  onRoad?: {
    transferId: string;
    fromShop: ShopRef | null;
    toShop: ShopRef | null;
    departedAt: string | null;
    expectedArrivalAt: string | null;
    onRelayRun: boolean;
  } | null;
}

export interface SerialCheck {
  serialNormalized: string;
  sameMaker: InstrumentHit | null;
  otherMakers: InstrumentHit[];
}

