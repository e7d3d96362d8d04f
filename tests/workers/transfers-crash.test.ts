import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Worker } from 'bullmq';
import { buildApp } from '../../server/app.js';
import { OutboxMessage, Transfer } from '../../server/lib/models.js';
import { listCaughtMail } from '../../server/lib/mail.js';
import { startWorker } from '../../workers/processors.js';
import { closeServerResources } from '../helpers/close.js';
import { signIn } from '../helpers/sign-in.js';
import { spawnWorker } from '../helpers/worker-process.js';
import {
  mailFor,
  makeTransferJob,
  makeTransferNetwork,
  transferEvents,
  waitFor,
  waitForEvent,
  waitForIdleQueue,
  waitForState,
  type TransferNetwork,
} from '../helpers/transfers.js';

/**
 * Crash safety: a worker process is killed right after a step's transaction commits and before any
 * e-mail leaves. The step's job, still claimed by the dead worker, comes back to the queue once its
 * lock runs out; a new worker finishes it. Nothing is lost and nothing happens twice.
 */
describe('a worker killed between the commit and the e-mail', () => {
  const app = buildApp();
  let world: TransferNetwork;
  let worker: Worker | undefined;
  let crashing: ReturnType<typeof spawnWorker> | undefined;
  const cookies: Record<string, string> = {};

  beforeAll(async () => {
    world = await makeTransferNetwork();
    for (const key of ['originDesk', 'manager', 'destinationDesk'] as const) cookies[key] = await signIn(app, world.people[key].email);
    // work left by earlier test files goes first, so the crash below meets this test's step on a quiet queue
    const drain = startWorker(4);
    await waitForIdleQueue();
    await drain.close();
  });

  afterAll(async () => {
    await crashing?.stop();
    await worker?.close();
    await closeServerResources();
  });

  it('leaves exactly one history event per step and one e-mail per person', { timeout: 180_000 }, async () => {
    const { networkId, people } = world;
    const { job, serial } = await makeTransferJob(world);
    const created = await request(app)
      .post('/api/transfers')
      .set('Cookie', cookies.originDesk)
      .send({ jobId: job.id, toShopId: world.destination.id, reason: 'Low-saxophone overhaul.' })
      .expect(201);
    const id: string = created.body.id;
    // queue the approval too, so the recovering worker has a second step waiting behind the stuck one
    await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.manager).send({}).expect(202);

    // a separate worker process that exits right after committing a step of this transfer
    crashing = spawnWorker({
      BENCHRELAY_CRASH_AFTER_COMMIT: 'transfer-step',
      BENCHRELAY_CRASH_TRANSFER_ID: id,
      WORKER_LOCK_MS: '2000',
      WORKER_CONCURRENCY: '1',
    });
    const code = await Promise.race([crashing.exited, new Promise((r) => setTimeout(() => r('timeout'), 60_000))]);
    expect(code, crashing.stderr()).toBe(1);

    // the commit happened: one step recorded, its e-mails written to the outbox, none sent, no manifest yet
    const committed = await transferEvents(networkId, id);
    expect(committed).toHaveLength(1);
    const step = committed[0].idempotencyKey!.split(':')[2];
    const pendingRows = (await OutboxMessage.findAll({ where: { networkId, sentAt: null } })).filter((r) => r.dedupeKey.startsWith(`transfer:${id}:${step}:`));
    expect(pendingRows.length).toBeGreaterThan(0);
    expect(await mailFor(people.destinationDesk.email, job.number)).toHaveLength(0);
    expect((await Transfer.findOne({ where: { networkId, id } }))!.manifestKey).toBeNull();

    // a fresh worker: the dead worker's job returns after its lock expires and is finished, not redone
    worker = startWorker(4, { stalledInterval: 500 });
    await waitForEvent(networkId, id, 'requested', 30_000);
    await waitForEvent(networkId, id, 'approved', 30_000);

    // the rest of the way, on the recovered worker
    await request(app).post(`/api/transfers/${id}/pack`).set('Cookie', cookies.originDesk).send({ liftingAcknowledged: true }).expect(202);
    await waitForState(networkId, id, 'packed');
    // the manifest is made at packing
    await waitFor(async () => (await Transfer.findOne({ where: { networkId, id } }))?.manifestKey, 'the manifest', 30_000);
    await request(app).post(`/api/transfers/${id}/hand-over`).set('Cookie', cookies.originDesk).send({}).expect(202);
    await waitForState(networkId, id, 'in_transit');
    await request(app).post(`/api/transfers/${id}/receive`).set('Cookie', cookies.destinationDesk).send({ serial, method: 'scan' }).expect(202);
    await waitForEvent(networkId, id, 'received');
    await waitFor(async () => (await OutboxMessage.count({ where: { networkId, sentAt: null } })) === 0, 'the outbox to empty', 30_000);

    const events = await transferEvents(networkId, id);
    for (const kind of ['transfer_requested', 'transfer_approved', 'transfer_packed', 'transfer_departed', 'transfer_received']) {
      expect(events.filter((e) => e.kind === kind), kind).toHaveLength(1);
    }
    expect(new Set(events.map((e) => e.idempotencyKey)).size).toBe(events.length);

    // one e-mail per person per step: five steps for the destination's technician, none twice
    const expectations: Array<[string, number]> = [
      [people.destinationTech.email, 5],
      [people.originTech.email, 5],
      [people.manager.email, 4], // the manager approved, and is not told of their own step
      [people.destinationDesk.email, 4], // received it
      [people.owner.email, 1], // heard of the request only
    ];
    await waitFor(async () => (await mailFor(people.destinationTech.email, job.number)).length >= 5, 'all e-mails', 30_000);
    await new Promise((r) => setTimeout(r, 1000)); // room for a wrongly repeated send to show up
    const all = (await listCaughtMail()).filter((m) => m.subject.includes(`(job ${job.number})`));
    const perRecipientAndSubject = new Map<string, number>();
    for (const m of all) for (const to of m.to) perRecipientAndSubject.set(`${to}|${m.subject}`, (perRecipientAndSubject.get(`${to}|${m.subject}`) ?? 0) + 1);
    expect([...perRecipientAndSubject.values()].every((n) => n === 1), JSON.stringify([...perRecipientAndSubject])).toBe(true);
    for (const [email, count] of expectations) expect((await mailFor(email, job.number)).length, email).toBe(count);
  });
});
