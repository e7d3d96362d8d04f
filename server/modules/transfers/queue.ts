import type { JobsOptions } from 'bullmq';
import { appQueue } from '../../lib/queue.js';
import type { TransferState } from '../../../shared/domain.js';
import { enqueue, type ArrivalCheckData, type JobName, type JobPayloads, type TransferStepData } from '../../lib/queue-jobs.js';

/**
 * Queue names and ids of the transfer jobs. Every id is deterministic, so adding the same step twice
 * (a double click, a retried request, a recovering worker) is one job, and the step itself is
 * idempotent on top of that.
 */

export const TRANSFER_STEP_JOB = 'transfer-step' satisfies JobName;
export const TRANSFER_ARRIVAL_CHECK_JOB = 'transfer-arrival-check' satisfies JobName;
export const SEND_OUTBOX_JOB = 'send-outbox' satisfies JobName;

export type { ArrivalCheckData, SendOutboxData, TransferStepData } from '../../lib/queue-jobs.js';

// BullMQ accepts a colon in a custom id only as exactly three parts, hence these shapes.
export const stepJobId = (transferId: string, to: TransferState) => `transfer:${transferId}:${to}`;
export const arrivalCheckJobId = (transferId: string) => `transfer:${transferId}:arrival-check`;
export const outboxJobId = (transferId: string, event: string) => `outbox:${transferId}:${event}`;

const KEEP_FINISHED = {
  // finished ids stay a month so a late duplicate still finds its twin and is ignored
  removeOnComplete: { age: 30 * 24 * 3600 },
  removeOnFail: { age: 90 * 24 * 3600 },
} satisfies JobsOptions;

const RETRY = { attempts: 8, backoff: { type: 'exponential', delay: 1000 } } satisfies JobsOptions;

/** Adds a job under a fixed id; a job that already failed for good under that id is retried instead. */
async function addOnce<K extends JobName>(name: K, data: JobPayloads[K], jobId: string, opts: JobsOptions = {}) {
  const existing = await appQueue().getJob(jobId);
  if (existing && (await existing.getState()) === 'failed') {
    await existing.retry();
    return jobId;
  }
  await enqueue(name, data, { ...RETRY, ...KEEP_FINISHED, ...opts, jobId });
  return jobId;
}

export function enqueueTransferStep(data: TransferStepData) {
  return addOnce(TRANSFER_STEP_JOB, data, stepJobId(data.transferId, data.to));
}

export function enqueueOutbox(transferId: string, event: string, dedupePrefix: string) {
  return addOnce(SEND_OUTBOX_JOB, { dedupePrefix }, outboxJobId(transferId, event));
}

export function scheduleArrivalCheck(data: ArrivalCheckData, expectedArrivalAt: Date) {
  const delay = Math.max(0, expectedArrivalAt.getTime() - Date.now());
  return addOnce(TRANSFER_ARRIVAL_CHECK_JOB, data, arrivalCheckJobId(data.transferId), { delay });
}

/** The step of this transfer that is queued or running, if any (the screen shows it as under way). */
export async function pendingStep(transferId: string, candidates: TransferState[]): Promise<TransferState | null> {
  const queue = appQueue();
  for (const to of candidates) {
    const job = await queue.getJob(stepJobId(transferId, to));
    if (!job) continue;
    const state = await job.getState();
    if (state === 'waiting' || state === 'active' || state === 'delayed' || state === 'prioritized') return to;
  }
  return null;
}
