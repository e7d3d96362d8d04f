import type { Job } from 'bullmq';
import { sendMail } from '../server/lib/mail.js';
import { createWorker, QUEUE_NAME } from '../server/lib/queue.js';
import { logger } from '../server/lib/logger.js';
import { expireUpload, makeThumbnail } from '../server/modules/files/service.js';
import { deliverOutboxMessage } from '../server/modules/notifications/service.js';

/**
 * Each queued job names what it does; the processor calls the same service functions the routes use.
 * A job's id is chosen by whoever adds it, so a repeated add of the same step is a no-op.
 */
export const processors = {
  'send-email': async (job: Job<{ to: string; subject: string; text: string; html?: string }>) => {
    const messageId = await sendMail(job.data);
    return { messageId };
  },
  // job id `thumbnail-<attachmentId>`: a photo gets one thumbnail however often it is confirmed
  'make-thumbnail': async (job: Job<{ networkId: string; attachmentId: string }>) =>
    makeThumbnail(job.data.networkId, job.data.attachmentId),
  // job id `expire-upload-<attachmentId>-<issued>`: delayed; clears an upload nobody confirmed
  'expire-upload': async (job: Job<{ networkId: string; attachmentId: string }>) =>
    expireUpload(job.data.networkId, job.data.attachmentId),
  // job id `outbox-<outboxId>`: one delivery per outbox row
  'deliver-outbox': async (job: Job<{ networkId: string; outboxId: string }>) =>
    deliverOutboxMessage(job.data.networkId, job.data.outboxId),
} satisfies Record<string, (job: Job<never>) => Promise<unknown>>;

export type JobName = keyof typeof processors;

export async function processJob(job: Job): Promise<unknown> {
  const run = processors[job.name as JobName] as ((job: Job) => Promise<unknown>) | undefined;
  if (!run) throw new Error(`No processor for job "${job.name}"`);
  return run(job);
}

export function startWorker(concurrency = 4) {
  const worker = createWorker(QUEUE_NAME, processJob, { concurrency });
  worker.on('failed', (job, err) =>
    logger.warn({ jobId: job?.id, name: job?.name, attempt: job?.attemptsMade, err: err.message }, 'queued job failed'),
  );
  worker.on('error', (err) => logger.error({ err }, 'worker error'));
  return worker;
}
