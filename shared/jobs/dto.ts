import type { InstrumentFamily, JobStage } from '../domain.js';
import type { EstimateTotals } from './estimate.js';
import type { MoveOption } from './stage-machine.js';
import type { EstimateApprovalMethod, IntakeAccessory } from './schemas.js';
import type { Hazard, HazardCaution } from '../safety/hazards.js';

/** The JSON the jobs API answers with; the client reads the same types. Dates are ISO strings. */

export interface PersonRef {
  id: string;
  name: string;
}

export interface JobSummary {
  id: string;
  number: number;
  stage: JobStage;
  stageBeforeHold: JobStage | null;
  shop: { id: string; name: string; timeZone: string };
  /** `heavyCase`: lifting it deserves the caution (a heavy family, or the instrument's own flag). */
  instrument: { id: string; family: InstrumentFamily; maker: string; model: string | null; serial: string; heavyCase: boolean };
  /** null when there is no customer, or for a private customer of another shop (then `customerHidden`) */
  customerName: string | null;
  customerHidden: boolean;
  complaint: string;
  assignee: PersonRef | null;
  requiredSkill: PersonRef | null;
  /** 'YYYY-MM-DD' on the shop's calendar. */
  promisedOn: string | null;
  overdue: boolean;
  estimateApproved: boolean;
  openedAt: string;
  updatedAt: string;
}

export interface BoardResponse {
  shop: { id: string; name: string; timeZone: string };
  jobs: JobSummary[];
  total: number;
  page: number;
  pageSize: number;
  /** Jobs per stage under the other filters (so each stage tab shows what picking it would list). */
  counts: Partial<Record<JobStage, number>>;
  filters: { technicians: PersonRef[]; skills: PersonRef[] };
}

export interface LineItemDto {
  id: string;
  kind: 'labor' | 'part';
  catalogItemId: string | null;
  partId: string | null;
  description: string;
  hours: number | null;
  rateCents: number | null;
  quantity: number | null;
  unitPriceCents: number | null;
  position: number;
  totalCents: number;
  /** The owner's hazard tags of the line's catalog item or part, and their cautions. */
  hazards: Hazard[];
  cautions: HazardCaution[];
}

/** A job on my bench, with the hazards its work carries (lines' tags, and lifting for a heavy case). */
export interface BenchJob extends JobSummary {
  hazards: Hazard[];
}

export interface TimeLogDto {
  id: string;
  user: PersonRef;
  minutes: number;
  workedOn: string;
  note: string | null;
  createdAt: string;
  mine: boolean;
}

export interface HistoryDto {
  id: string;
  kind: string;
  summary: string;
  occurredAt: string;
  userName: string | null;
}

export interface JobDetail {
  job: JobSummary & {
    conditionNotes: string | null;
    estimatedHours: number | null;
    /** The approval (`byName` null where the customer's contact is not shown to this person), with the total and the estimate version approved (null on approvals recorded before versions). */
    estimateApproval: { at: string; byName: string | null; method: EstimateApprovalMethod; totalCents: number | null; version: number | null } | null;
    estimateVersion: number;
    /** A transfer under way (requested to in transit), so the job page can say so and link to it. */
    openTransfer: {
      id: string;
      state: 'requested' | 'approved' | 'packed' | 'in_transit';
      fromShop: { id: string; name: string; timeZone: string };
      toShop: { id: string; name: string; timeZone: string };
      /** On a relay run: the run's departure; else when it left. */
      departedAt: string | null;
      expectedArrivalAt: string | null;
      onRelayRun: boolean;
    } | null;
    /** The total has risen above the approved amount: the job waits for a new approval before more paid work. */
    needsReapproval: boolean;
    readyAt: string | null;
    releasedAt: string | null;
    openedBy: PersonRef | null;
    /** What came in with the instrument (ticked at the counter), and anything else typed. */
    accessories: IntakeAccessory[];
    accessoriesOther: string | null;
    /** Where the customer collects it (the shop that took it in). */
    pickupShop: PersonRef | null;
  };
  /** Every approval and decline, newest first; `name` follows the customer's contact rule. */
  estimateDecisions: Array<{
    id: string;
    decision: 'approved' | 'declined';
    method: EstimateApprovalMethod;
    name: string | null;
    totalCents: number;
    version: number;
    at: string;
  }>;
  /** The customer's private links: how many still open, when the last was made and last opened. */
  customerLink: { live: number; lastIssuedAt: string | null; lastOpenedAt: string | null };
  shop: {
    id: string;
    name: string;
    timeZone: string;
    openingDays: number[];
    /** For the promised date's public holidays (the same rule the server applies). */
    country: string | null;
    region: string | null;
    /** The owner's closing days of the shop, 'YYYY-MM-DD' (the preview skips them as the server does). */
    closedDays: string[];
    laborRateCents: number;
    taxRateBasisPoints: number;
  };
  /** `name` is null for a private customer whose details stay with the shops that serve them */
  customer: {
    id: string;
    name: string | null;
    kind: string;
    email: string | null;
    phone: string | null;
    contactShown: boolean;
    poNumber: string | null;
    taxExemptCertificate: string | null;
    noticesOptOut: boolean;
  } | null;
  lineItems: LineItemDto[];
  /** Everything the job's work can hurt someone with: shown beside the move that starts the work, and lifting at intake and hand-back. */
  safety: { hazards: Hazard[]; heavyCase: boolean; cautions: HazardCaution[] };
  totals: EstimateTotals;
  timeLogs: TimeLogDto[];
  timeByTechnician: Array<{ user: PersonRef; minutes: number }>;
  history: HistoryDto[];
  /** Stage moves this person may make now (blocked ones say why). */
  moves: MoveOption[];
  can: {
    update: boolean;
    moveStage: boolean;
    recordApproval: boolean;
    editEstimate: boolean;
    logTime: boolean;
    addAttachment: boolean;
    /** Send the estimate, make a new customer link, revoke the links: the front desk and managers. */
    customerLink: boolean;
  };
  options: { technicians: PersonRef[]; skills: PersonRef[] };
}

export interface CatalogItemDto {
  id: string;
  name: string;
  family: InstrumentFamily | null;
  standardHours: number;
  skill: PersonRef | null;
  active: boolean;
  hazards: Hazard[];
  cautions: HazardCaution[];
}

export interface AttachmentDto {
  id: string;
  kind: 'photo' | 'document';
  tag: 'before' | 'after' | 'detail' | null;
  caption: string | null;
  contentType: string;
  sizeBytes: number;
  status: 'pending' | 'stored' | 'failed';
  jobId: string | null;
  jobNumber: number | null;
  instrumentId: string;
  uploadedBy: PersonRef | null;
  createdAt: string;
  /** Short-lived presigned GET links (photos only); documents go through the download route. */
  url: string | null;
  thumbnailUrl: string | null;
  canDelete: boolean;
}

export interface UploadTicket {
  attachment: AttachmentDto;
  upload: { url: string; method: 'PUT'; headers: Record<string, string>; expiresAt: string };
}
