import type { Job } from 'bullmq';
import { describe, expect, it } from 'vitest';
import { processJob, processors } from '../../workers/processors.js';

/*
 * The queue's job names: one processor per name of `JobPayloads` (server/lib/queue-jobs.ts; the
 * compiler checks payload types on both sides), and a name nobody registered is refused loudly.
 */
describe('queue processors', () => {
  it('registers exactly the jobs the app enqueues, without the old unused send-email', () => {
    expect(Object.keys(processors).sort()).toEqual([
      'customer-pickup-reminders',
      'deliver-outbox',
      'expire-upload',
      'make-thumbnail',
      'send-outbox',
      'transfer-arrival-check',
      'transfer-step',
    ]);
  });

  it('fails a job whose name has no processor, inherited object keys included', async () => {
    await expect(processJob({ name: 'send-email', data: {} } as Job)).rejects.toThrow('No processor for job "send-email"');
    await expect(processJob({ name: 'toString', data: {} } as Job)).rejects.toThrow('No processor for job "toString"');
  });
});
