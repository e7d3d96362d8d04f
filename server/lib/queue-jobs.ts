import type { Job, JobsOptions } from 'bullmq';
import type { TransferState } from '../../shared/domain.js';
import { appQueue } from './queue.js';

/**
 * Every job the app queues, by name, with the payload it carries. Producers add jobs with `enqueue`
 * and workers/processors.ts registers one processor per name against `Processors`, so a payload that
 * changes on one side and not the other does not compile, and a name without a processor (or a
 * processor nobody can enqueue) is a type error too.
 */
export interface JobPayloads {
  /** One step of a transfer (server/modules/transfers/service.ts `applyTransferStep`); id `transfer:<id>:<state>`. */
  'transfer-step': TransferStepData;
  /** Delayed to the expected arrival: a transfer still on the road is overdue; id `transfer:<id>:arrival-check`. */
  'transfer-arrival-check': ArrivalCheckData;
  /** Sends pending outbox rows (all of them, or those whose dedupe key starts with the prefix); also the ten-minute sweep. */
  'send-outbox': SendOutboxData;
  /** One outbox row; id `outbox-<outboxId>`. */
  'deliver-outbox': { networkId: string; outboxId: string };
  /** A photo's small copy; id `thumbnail-<attachmentId>`. */
  'make-thumbnail': AttachmentRef;
  /** Delayed: clears an upload nobody confirmed; id `expire-upload-<attachmentId>-<issued>`. */
  'expire-upload': AttachmentRef;
  /** Daily scheduler `pickup-reminders`: reminds customers whose instrument has waited ready for 7 days. */
  'customer-pickup-reminders': Record<string, never>;
}

export type JobName = keyof JobPayloads;

/** One processor per job name, each receiving its own payload type. */
export type Processors = { [K in JobName]: (job: Job<JobPayloads[K]>) => Promise<unknown> };

/** Every job carries an id chosen by its producer, so adding the same work twice is one job. */
export type EnqueueOptions = JobsOptions & { jobId: string };

/** Adds a job to the app's queue, typed by its name. */
export function enqueue<K extends JobName>(name: K, data: JobPayloads[K], opts: EnqueueOptions) {
  return appQueue().add(name, data, opts);
}

/** The one step that leads into a state: `requested` records the request, the rest are transitions. */
export interface TransferStepData {
  networkId: string;
  transferId: string;
  to: TransferState;
  actorUserId: string;
  /** When the person asked (ISO); the step records this time, whenever the worker gets to it. */
  at: string;
  note?: string | null;
  reason?: string | null;
  relayRunId?: string | null;
  receiveMethod?: 'scan' | 'typed';
  /** Pack step: what travels, for the manifest. */
  caseCount?: number;
  contents?: string | null;
  departureCondition?: string | null;
}

export interface ArrivalCheckData {
  networkId: string;
  transferId: string;
}

export interface SendOutboxData {
  /** Only rows whose dedupe key starts with this; none: every pending row. */
  dedupePrefix?: string;
}

export interface AttachmentRef {
  networkId: string;
  attachmentId: string;
}
