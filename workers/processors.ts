import type { Job } from 'bullmq';
import { appQueue, createWorker, QUEUE_NAME } from '../server/lib/queue.js';
import { logger } from '../server/lib/logger.js';
import { applyTransferStep, checkTransferArrival, scheduleOpenArrivalChecks } from '../server/modules/transfers/service.js';
import { deliverOutbox, deliverOutboxMessage } from '../server/modules/notifications/service.js';
import type { JobName, JobPayloads, Processors } from '../server/lib/queue-jobs.js';
import { expireUpload, makeThumbnail } from '../server/modules/files/service.js';
import { sendPickupReminders } from '../server/modules/jobs/service.js';

/**
 * Tests only: `BENCHRELAY_CRASH_AFTER_COMMIT=<job name>` ends the process right after that job's
 * transaction commits, before anything is sent — the crash the outbox exists for. With
 * `BENCHRELAY_CRASH_TRANSFER_ID` set, only that transfer's step crashes.
 */
function crashAfterCommitIfAsked(jobName: string, transferId?: string) {
  if (process.env.NODE_ENV !== 'test' || process.env.BENCHRELAY_CRASH_AFTER_COMMIT !== jobName) return;
  const only = process.env.BENCHRELAY_CRASH_TRANSFER_ID;
  if (only && only !== transferId) return;
  process.exit(1);
}

/**
 * Each queued job names what it does; the processor calls the same service functions the routes use.
 * Names and payload types come from `JobPayloads` (server/lib/queue-jobs.ts), the map producers use
 * too. A job's id is chosen by whoever adds it, so a repeated add of the same step is a no-op.
 */
export const processors: Processors = {
  'transfer-step': async (job) =>
    applyTransferStep(job.data, { afterCommit: () => crashAfterCommitIfAsked('transfer-step', job.data.transferId) }),
  'transfer-arrival-check': async (job) => checkTransferArrival(job.data),
  'send-outbox': async (job) => deliverOutbox({ dedupePrefix: job.data?.dedupePrefix }),
  // job id `thumbnail-<attachmentId>`: a photo gets one thumbnail however often it is confirmed. Its
  // decode runs one at a time per process under the pixel limit (server/lib/images.ts), whatever the
  // worker's concurrency: other jobs keep flowing while a photo is shrunk.
  'make-thumbnail': async (job) => makeThumbnail(job.data.networkId, job.data.attachmentId),
  // job id `expire-upload-<attachmentId>-<issued>`: delayed; clears an upload nobody confirmed
  'expire-upload': async (job) => expireUpload(job.data.networkId, job.data.attachmentId),
  // once a day (scheduler below): reminders for instruments ready and uncollected for 7 days
  'customer-pickup-reminders': async () => sendPickupReminders(),
  // job id `outbox-<outboxId>`: one delivery per outbox row
  'deliver-outbox': async (job) => deliverOutboxMessage(job.data.networkId, job.data.outboxId),
};

export type { JobName };

export async function processJob(job: Job): Promise<unknown> {
  // the name comes from the queue's row, so it is checked here; the payload then has its name's type
  const run = Object.hasOwn(processors, job.name) ? (processors[job.name as JobName] as (job: Job) => Promise<unknown>) : undefined;
  if (!run) throw new Error(`No processor for job "${job.name}"`);
  return run(job);
}

export interface WorkerTuning {
  /** How long a job stays claimed without a heartbeat; a crashed worker's job returns after this. */
  lockDuration?: number;
  /** How often stalled jobs (claimed by a worker that died) are looked for. */
  stalledInterval?: number;
}

export function startWorker(concurrency = 4, tuning: WorkerTuning = {}) {
  const worker = createWorker(QUEUE_NAME, processJob, {
    concurrency,
    ...(tuning.lockDuration ? { lockDuration: tuning.lockDuration } : {}),
    ...(tuning.stalledInterval ? { stalledInterval: tuning.stalledInterval } : {}),
  });
  worker.on('failed', (job, err) =>
    logger.warn({ jobId: job?.id, name: job?.name, attempt: job?.attemptsMade, err: err.message }, 'queued job failed'),
  );
  worker.on('error', (err) => logger.error({ err }, 'worker error'));
  return worker;
}

/**
 * Work a worker sets up when it starts. E-mails left pending (their send job gave up while the mail
 * server was down) go out with the next sweep, every ten minutes; sending is per row and marks the row,
 * so a sweep never repeats a message. Every transfer on the road gets its arrival check. Once a day,
 * customers whose instrument waits ready and uncollected for 7 days get a reminder.
 */
export async function scheduleStartupWork() {
  await appQueue().upsertJobScheduler('outbox-sweep', { every: 10 * 60_000 }, { name: 'send-outbox' satisfies JobName, data: {} satisfies JobPayloads['send-outbox'] });
  // 16:00 UTC is morning across the Americas: the reminder arrives when a shop's day starts. Each wait
  // reminds once (the outbox key holds the ready time), so a sweep that runs twice sends nothing twice.
  await appQueue().upsertJobScheduler('pickup-reminders', { pattern: '0 16 * * *' }, { name: 'customer-pickup-reminders' satisfies JobName, data: {} satisfies JobPayloads['customer-pickup-reminders'] });
  await scheduleOpenArrivalChecks();
}
