import type { InstrumentFamily, JobStage, TransferState } from '@shared/domain';
import type { RankedShop, RoutingSettings } from '@shared/routing/rank';

/** Shapes of the transfer API's answers (server/modules/transfers/service.ts). */

export interface ShopBrief {
  id: string;
  name: string;
  code: string;
  city: string | null;
  timeZone: string;
}

export interface PersonBrief {
  id: string;
  name: string;
}

export interface TransferSummary {
  id: string;
  state: TransferState;
  reason: string;
  requestedAt: string;
  departedAt: string | null;
  expectedArrivalAt: string | null;
  receivedAt: string | null;
  overdue: boolean;
  fromShop: ShopBrief;
  toShop: ShopBrief;
  job: { id: string; number: number; stage: JobStage };
  instrument: { id: string; family: InstrumentFamily; maker: string; model: string | null; serial: string };
}

export interface RunBrief {
  id: string;
  weekdays: number[];
  departureTime: string;
  transitHours: number;
  nextDepartureAt: string | null;
  label: string;
}

export interface TransferDetail extends Omit<TransferSummary, 'job' | 'instrument'> {
  decisionNote: string | null;
  approvedAt: string | null;
  packedAt: string | null;
  /** When the origin handed it over; on a relay run `departedAt` is the run's departure, which may be later. */
  handedOverAt: string | null;
  waitingForRun: boolean;
  caseCount: number | null;
  contents: string | null;
  departureCondition: string | null;
  job: { id: string; number: number; stage: JobStage; shopId: string; complaint: string; estimatedHours: number | null };
  instrument: {
    id: string;
    family: InstrumentFamily;
    maker: string;
    model: string | null;
    serial: string;
    assetTag: string | null;
    currentShopId: string;
    status: string;
  };
  heavyCase: boolean;
  requestedBy: PersonBrief | null;
  approvedBy: PersonBrief | null;
  packedBy: PersonBrief | null;
  receivedBy: PersonBrief | null;
  relayRun: RunBrief | null;
  runOptions: RunBrief[];
  manifestAvailable: boolean;
  pendingStep: TransferState | null;
  nextStates: TransferState[];
  history: Array<{ id: string; kind: string; summary: string; occurredAt: string; shopId: string | null; user: PersonBrief | null }>;
}

export interface RequestableJob {
  id: string;
  number: number;
  stage: JobStage;
  complaint: string;
  estimatedHours: number | null;
  requiredSkill: { id: string; code: string; name: string } | null;
  instrument: { family: InstrumentFamily; maker: string; model: string | null; serial: string };
}

export interface Recommendation {
  job: {
    id: string;
    number: number;
    stage: JobStage;
    complaint: string;
    estimatedHours: number | null;
    shop: ShopBrief;
    instrument: { family: InstrumentFamily; maker: string; model: string | null; serial: string; heavyCase: boolean };
    transferable: boolean;
    openTransferId: string | null;
  };
  skill: { id: string; code: string; name: string } | null;
  skills: Array<{ id: string; code: string; name: string }>;
  ranked: RankedShop[];
  recommendedShopId: string | null;
  settings: RoutingSettings;
  /** Ranked shops where nobody may receive a transfer (no front desk or regional manager). */
  withoutReceiver?: string[];
}

export interface StepAccepted {
  id: string;
  state: TransferState;
  queued: { step: TransferState; jobId: string };
}

export type TransferAction = 'approve' | 'reject' | 'cancel' | 'pack' | 'hand-over' | 'receive';
