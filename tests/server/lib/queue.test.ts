import { afterAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { createQueue, createWorker, queueBackendKind } from '../../../server/lib/queue.js';

/** The real BullMQ PostgreSQL backend on the test database: no fake queue. */
describe('queue on the PostgreSQL backend', () => {
  const closers: Array<() => Promise<unknown>> = [];
  afterAll(async () => {
    for (const close of closers.reverse()) await close();
  });

  it('uses PostgreSQL when REDIS_URL is unset', () => {
    expect(queueBackendKind()).toBe('postgres');
  });

  it('processes a job exactly once, even when the same job id is added twice', async () => {
    const name = `test-once-${randomUUID().slice(0, 8)}`;
    const queue = createQueue(name);
    closers.push(() => queue.close());
    const seen: string[] = [];
    let resolveDone: () => void;
    const done = new Promise<void>((r) => (resolveDone = r));
    const worker = createWorker<{ n: number }>(name, (job) => {
      seen.push(`${job.id}:${job.data.n}`);
      resolveDone();
      return Promise.resolve(job.data.n * 2);
    });
    closers.push(() => worker.close());

    await queue.add('double', { n: 21 }, { jobId: 'step-1' });
    await queue.add('double', { n: 21 }, { jobId: 'step-1' }); // a duplicate step: no second run
    await done;
    // give a wrongly duplicated job time to show up before counting
    await new Promise((r) => setTimeout(r, 500));
    expect(seen).toEqual(['step-1:21']);
    const job = await queue.getJob('step-1');
    expect(await job?.getState()).toBe('completed');
    expect(job?.returnvalue).toBe(42);
  });

  it('retries a failed job with backoff until it succeeds', async () => {
    const name = `test-retry-${randomUUID().slice(0, 8)}`;
    const queue = createQueue(name);
    closers.push(() => queue.close());
    const attempts: number[] = [];
    let resolveDone: () => void;
    const done = new Promise<void>((r) => (resolveDone = r));
    const worker = createWorker(name, (job) => {
      attempts.push(job.attemptsMade);
      if (attempts.length < 3) return Promise.reject(new Error('courier system not answering'));
      resolveDone();
      return Promise.resolve('ok');
    });
    closers.push(() => worker.close());

    await queue.add('flaky', {}, { jobId: 'flaky-1', attempts: 5, backoff: { type: 'fixed', delay: 100 } });
    await done;
    expect(attempts).toEqual([0, 1, 2]);
    await new Promise((r) => setTimeout(r, 200));
    const job = await queue.getJob('flaky-1');
    expect(await job?.getState()).toBe('completed');
    expect(job?.attemptsMade).toBe(3);
  });

  it('gives up after the allowed attempts and keeps the failure', async () => {
    const name = `test-fail-${randomUUID().slice(0, 8)}`;
    const queue = createQueue(name);
    closers.push(() => queue.close());
    let calls = 0;
    const worker = createWorker(name, () => {
      calls++;
      return Promise.reject(new Error('always broken'));
    });
    closers.push(() => worker.close());
    const failed = new Promise<void>((resolve) => worker.on('failed', (job) => job && job.attemptsMade >= 2 && resolve()));
    await queue.add('broken', {}, { jobId: 'broken-1', attempts: 2, backoff: { type: 'fixed', delay: 50 } });
    await failed;
    const job = await queue.getJob('broken-1');
    expect(await job?.getState()).toBe('failed');
    expect(job?.failedReason).toBe('always broken');
    expect(calls).toBe(2);
  });
});
