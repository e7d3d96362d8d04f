import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';

// This file's own mail catcher on the spare port (not running at first), so stopping mail never
// disturbs other test files; set before the app's modules read SMTP_PORT and MAIL_CATCHER_DIR.
const own = vi.hoisted(() => {
  const slot = Number(process.env.TEST_SLOT ?? 0);
  const port = 2536 + slot * 20; // TEST_PORTS.spareSmtp (tests/helpers/test-env.ts)
  const dir = `.data/test-mail-down${slot ? `-${slot}` : ''}`;
  process.env.SMTP_PORT = String(port);
  process.env.MAIL_CATCHER_DIR = dir;
  return { port, dir };
});

import request from 'supertest';
import { Op } from 'sequelize';
import { buildApp } from '../../server/app.js';
import { Customer, OutboxMessage } from '../../server/lib/models.js';
import { listCaughtMail } from '../../server/lib/mail.js';
import { startWorker } from '../../workers/processors.js';
import { startMailCatcher } from '../../docker-free-dev/mail-catcher.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob, uniq } from '../helpers/factories.js';
import { waitFor } from '../helpers/transfers.js';

const JOBS = 12;

/**
 * The mail server is down while technicians pass jobs as ready (each tells its customer by e-mail).
 * The moves succeed; the e-mails wait in the outbox, tried and unsent; once the mail server is back
 * every one of them leaves, each exactly once, with no restart and nobody pressing anything.
 */
describe('mail server down', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let worker: ReturnType<typeof startWorker>;
  let catcher: { close(): Promise<void> } | undefined;
  const jobs: Array<{ id: string; email: string }> = [];

  beforeAll(async () => {
    fs.rmSync(own.dir, { recursive: true, force: true });
    w = await makeBenchWorld(app, ['technician']);
    for (let i = 0; i < JOBS; i++) {
      const email = `player-${uniq()}@mail-down.test`;
      const customer = await Customer.create({ networkId: w.network.id, kind: 'person', name: `Player ${uniq()}`, email, homeShopId: w.shop.id });
      const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'quality_check' });
      await job.update({ customerId: customer.id });
      jobs.push({ id: job.id, email });
    }
    worker = startWorker(4);
  });

  afterAll(async () => {
    await worker?.close();
    await catcher?.close();
    await closeServerResources();
  });

  const ours = () => OutboxMessage.findAll({ where: { networkId: w.network.id, dedupeKey: { [Op.like]: 'job-ready-%' } } });

  it('keeps every e-mail in the outbox while it is down and sends each once when it is back', { timeout: 120_000 }, async () => {
    for (const job of jobs) {
      await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', w.cookies.technician).send({ to: 'ready' }).expect(200);
    }
    // the worker tries each one and fails: still in the outbox, attempts counted
    await waitFor(async () => (await ours()).filter((r) => r.attempts > 0).length === JOBS, 'every e-mail to be tried', 30_000);
    const waiting = await ours();
    expect(waiting).toHaveLength(JOBS);
    expect(waiting.every((r) => r.sentAt === null)).toBe(true);

    catcher = await startMailCatcher({ port: own.port, directory: path.resolve(own.dir) });
    await waitFor(async () => (await ours()).every((r) => r.sentAt !== null), 'the outbox to empty', 90_000);
    await new Promise((r) => setTimeout(r, 1000)); // room for a wrongly repeated send to show up

    const caught = await listCaughtMail();
    for (const job of jobs) {
      expect(caught.filter((m) => m.to.includes(job.email)), job.email).toHaveLength(1);
    }
  });
});
