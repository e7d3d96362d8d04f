import { spawn, type ChildProcess } from 'node:child_process';
import net from 'node:net';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import request from 'supertest';
import { Instrument, Job, Transfer } from '../../server/lib/models.js';
import { appQueue as postgresQueue } from '../../server/lib/queue.js';
import { headObject } from '../../server/lib/storage.js';
import { closeServerResources } from '../helpers/close.js';
import { signIn } from '../helpers/sign-in.js';
import { spawnWorker } from '../helpers/worker-process.js';
import {
  makeTransferJob,
  makeTransferNetwork,
  notificationsFor,
  transferEvents,
  waitFor,
  waitForEvent,
  waitForMailCount,
  waitForState,
  type TransferNetwork,
} from '../helpers/transfers.js';

/**
 * The same lifecycle with REDIS_URL set: BullMQ on Debian's redis-server (started here, on a port of
 * this test slot, with persistence off), the API in a fresh module graph that reads REDIS_URL, and the
 * worker as its own process, as `npm run worker` runs it.
 */
const REDIS_PORT = 6391 + 20 * Number(process.env.TEST_SLOT ?? 0);
const REDIS_URL = `redis://127.0.0.1:${REDIS_PORT}`;

async function waitForPort(port: number, timeoutMs = 10_000) {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const open = await new Promise<boolean>((resolve) => {
      const socket = net.connect(port, '127.0.0.1');
      socket.once('connect', () => (socket.end(), resolve(true)));
      socket.once('error', () => resolve(false));
    });
    if (open) return;
    if (Date.now() > deadline) throw new Error(`nothing listens on ${port}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('transfer lifecycle on the Redis queue backend, worker in its own process', () => {
  let redis: ChildProcess | undefined;
  let worker: ReturnType<typeof spawnWorker> | undefined;
  let fresh: {
    app: import('express').Express;
    queue: typeof import('../../server/lib/queue.js');
    close: typeof import('../helpers/close.js');
  };
  let world: TransferNetwork;
  const cookies: Record<string, string> = {};

  beforeAll(async () => {
    redis = spawn('redis-server', ['--port', String(REDIS_PORT), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no'], { stdio: 'ignore' });
    await waitForPort(REDIS_PORT);

    vi.resetModules();
    process.env.REDIS_URL = REDIS_URL;
    const { buildApp } = await import('../../server/app.js');
    fresh = { app: buildApp(), queue: await import('../../server/lib/queue.js'), close: await import('../helpers/close.js') };

    world = await makeTransferNetwork();
    for (const key of ['originDesk', 'manager', 'destinationDesk'] as const) cookies[key] = await signIn(fresh.app, world.people[key].email);
    worker = spawnWorker({ REDIS_URL });
  });

  afterAll(async () => {
    await worker?.stop();
    await fresh?.close.closeServerResources();
    process.env.REDIS_URL = '';
    if (redis?.pid && redis.exitCode === null) {
      const gone = new Promise((r) => redis!.once('exit', r));
      process.kill(redis.pid, 'SIGTERM');
      await gone;
    }
    await closeServerResources();
  });

  it('runs requested → received with the worker on Redis', { timeout: 120_000 }, async () => {
    expect(fresh.queue.queueBackendKind()).toBe('redis');
    const { networkId, people } = world;
    const { job, instrument, serial } = await makeTransferJob(world, { family: 'baritone_saxophone' });
    const app = fresh.app;

    const created = await request(app)
      .post('/api/transfers')
      .set('Cookie', cookies.originDesk)
      .send({ jobId: job.id, toShopId: world.destination.id, reason: 'Low-saxophone bench.' })
      .expect(201);
    const id: string = created.body.id;
    await waitForEvent(networkId, id, 'requested', 30_000);
    await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.manager).send({}).expect(202);
    await waitForState(networkId, id, 'approved', 30_000);
    await request(app).post(`/api/transfers/${id}/pack`).set('Cookie', cookies.originDesk).send({ liftingAcknowledged: true }).expect(202);
    await waitForState(networkId, id, 'packed', 30_000);
    await request(app).post(`/api/transfers/${id}/hand-over`).set('Cookie', cookies.originDesk).send({}).expect(202);
    const onRoad = await waitForState(networkId, id, 'in_transit', 30_000);
    const check = await waitFor(() => fresh.queue.appQueue().getJob(`transfer:${id}:arrival-check`), 'the arrival check on Redis');
    expect(await check.getState()).toBe('delayed');
    expect(check.timestamp + (check.opts.delay ?? 0)).toBeLessThanOrEqual(onRoad.expectedArrivalAt!.getTime() + 1000);
    await request(app).post(`/api/transfers/${id}/receive`).set('Cookie', cookies.destinationDesk).send({ serial, method: 'scan' }).expect(202);
    await waitForEvent(networkId, id, 'received', 30_000);

    // the steps ran from Redis, not from the PostgreSQL queue
    const done = (await fresh.queue.appQueue().getJob(`transfer:${id}:received`))!;
    await waitFor(async () => (await done.getState()) === 'completed', 'the received step to complete on Redis');
    expect(await postgresQueue().getJob(`transfer:${id}:received`)).toBeUndefined();

    expect(await Job.findOne({ where: { networkId, id: job.id } })).toMatchObject({ shopId: world.destination.id, stage: 'approved' });
    expect(await Instrument.findOne({ where: { networkId, id: instrument.id } })).toMatchObject({ currentShopId: world.destination.id, status: 'in_shop' });
    const events = await transferEvents(networkId, id);
    for (const kind of ['transfer_requested', 'transfer_approved', 'transfer_packed', 'transfer_departed', 'transfer_received']) {
      expect(events.filter((e) => e.kind === kind), kind).toHaveLength(1);
    }
    const t = (await Transfer.findOne({ where: { networkId, id } }))!;
    await waitFor(async () => (await headObject(t.manifestKey ?? 'none')) ?? null, 'the manifest in S3');
    expect(await notificationsFor(networkId, people.destinationTech.id, id)).toHaveLength(5);
    await waitForMailCount(people.destinationTech.email, job.number, 5, 30_000);
  });
});
