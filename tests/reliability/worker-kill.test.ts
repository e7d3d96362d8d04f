import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { Op } from 'sequelize';
import { buildApp } from '../../server/app.js';
import { HistoryEvent, Job, Notification, OutboxMessage, Transfer } from '../../server/lib/models.js';
import { listCaughtMail } from '../../server/lib/mail.js';
import { headObject } from '../../server/lib/storage.js';
import { startWorker } from '../../workers/processors.js';
import { closeServerResources } from '../helpers/close.js';
import { signIn } from '../helpers/sign-in.js';
import { spawnWorker } from '../helpers/worker-process.js';
import { makeTransferJob, makeTransferNetwork, waitFor, waitForIdleQueue, type TransferNetwork } from '../helpers/transfers.js';

/**
 * Many transfers move through every step (requested, approved, packed, in transit, received) while
 * the worker process is killed with SIGKILL at random moments and started again. Afterwards every
 * transfer is received and its job and history agree, no history event is missing or doubled, every
 * notice and e-mail exists exactly once (e-mails counted at the mail catcher), and every manifest is
 * in storage. TRANSFERS sets how many (60 here; `npm run faults:worker-kill` runs 1,000); KILL_SEED
 * picks other moments.
 */
const TRANSFERS = Number(process.env.TRANSFERS ?? 60);
const SEED = Number(process.env.KILL_SEED ?? 16);
const STEPS = ['requested', 'approved', 'packed', 'in_transit', 'received'] as const;
const EVENT_KINDS = ['transfer_requested', 'transfer_approved', 'transfer_packed', 'transfer_departed', 'transfer_received'];

/** A small seeded generator (mulberry32), so a failing run can be repeated with its seed. */
function random(seed: number) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

describe(`the worker killed at random while ${TRANSFERS} transfers move through every step`, () => {
  const app = buildApp();
  let world: TransferNetwork;
  const cookies: Record<string, string> = {};
  const transfers: Array<{ id: string; jobId: string; jobNumber: number; serial: string }> = [];
  let current: ReturnType<typeof spawnWorker> | undefined;
  let finisher: ReturnType<typeof startWorker> | undefined;

  beforeAll(async () => {
    world = await makeTransferNetwork();
    for (const key of ['originDesk', 'manager', 'destinationDesk'] as const) cookies[key] = await signIn(app, world.people[key].email);
    // work left by earlier test files goes first
    const drain = startWorker(4);
    await waitForIdleQueue();
    await drain.close();
  }, 180_000);

  afterAll(async () => {
    await current?.stop();
    await finisher?.close();
    await closeServerResources();
  });

  it('loses nothing and does nothing twice', { timeout: Math.max(600_000, TRANSFERS * 2_000) }, async () => {
    const { networkId } = world;
    const next = random(SEED);

    // the killer: a worker process lives a random 6–14 s (starting tsx takes a few seconds on a busy machine), then SIGKILL, then a new one
    let kills = 0;
    let killing = true;
    const killer = (async () => {
      while (killing) {
        current = spawnWorker({ WORKER_LOCK_MS: '2000', WORKER_STALLED_INTERVAL_MS: '500', WORKER_CONCURRENCY: '8' });
        const life = 6000 + next() * 8000;
        await Promise.race([current.exited, new Promise((r) => setTimeout(r, life))]);
        if (current.running()) kills++;
        current.kill(); // the whole group, even if tsx itself already ended
        await current.exited;
      }
    })();

    // the people: request every transfer, then take each one's next step as soon as the worker has applied the last
    for (let i = 0; i < TRANSFERS; i++) {
      const { job, serial } = await makeTransferJob(world);
      const res = await request(app).post('/api/transfers').set('Cookie', cookies.originDesk).send({ jobId: job.id, toShopId: world.destination.id, reason: 'Low-saxophone overhaul.' });
      expect(res.status, res.text).toBe(201);
      transfers.push({ id: res.body.id, jobId: job.id, jobNumber: job.number, serial });
    }
    const asked = new Map<string, string>(); // transfer → the state whose next step was asked for
    const stepFor = (t: (typeof transfers)[number], state: string) => {
      const base = `/api/transfers/${t.id}`;
      if (state === 'requested') return request(app).post(`${base}/approve`).set('Cookie', cookies.manager).send({});
      if (state === 'approved') return request(app).post(`${base}/pack`).set('Cookie', cookies.originDesk).send({ liftingAcknowledged: true });
      if (state === 'packed') return request(app).post(`${base}/hand-over`).set('Cookie', cookies.originDesk).send({});
      return request(app).post(`${base}/receive`).set('Cookie', cookies.destinationDesk).send({ serial: t.serial, method: 'scan' });
    };
    const deadline = Date.now() + Math.max(480_000, TRANSFERS * 1_500);
    for (;;) {
      const rows = await Transfer.findAll({ where: { networkId, id: transfers.map((t) => t.id) }, attributes: ['id', 'state'] });
      const states = new Map(rows.map((r) => [r.id, r.state as string]));
      if ([...states.values()].every((s) => s === 'received')) break;
      expect(Date.now(), `transfers still moving: ${JSON.stringify([...states.values()].reduce((m, s) => ({ ...m, [s]: (m[s] ?? 0) + 1 }), {} as Record<string, number>))}`).toBeLessThan(deadline);
      const due = transfers.filter((t) => states.get(t.id) !== 'received' && asked.get(t.id) !== states.get(t.id));
      for (let i = 0; i < due.length; i += 8) {
        await Promise.all(
          due.slice(i, i + 8).map(async (t) => {
            const state = states.get(t.id)!;
            const res = await stepFor(t, state);
            expect(res.status, `${state} → next of ${t.id}: ${res.text}`).toBe(202);
            asked.set(t.id, state);
          }),
        );
      }
      await new Promise((r) => setTimeout(r, 300));
    }
    killing = false;
    await killer;
    expect(kills, 'the worker was killed along the way').toBeGreaterThan(2);

    // one last worker finishes what the dead ones left: e-mails, manifests, after-commit work
    finisher = startWorker(8, { stalledInterval: 500 });
    await waitFor(async () => (await OutboxMessage.count({ where: { networkId, sentAt: null } })) === 0, 'the outbox to empty', 240_000);
    await waitFor(
      async () => (await Transfer.count({ where: { networkId, id: transfers.map((t) => t.id), manifestKey: { [Op.ne]: null } } })) === TRANSFERS,
      'every manifest',
      120_000,
    );
    await waitForIdleQueue(240_000);

    // every transfer in one consistent state, its history whole and single
    const byTransfer = new Map<string, HistoryEvent[]>();
    for (const e of await HistoryEvent.findAll({ where: { networkId, idempotencyKey: { [Op.like]: 'transfer:%' } } })) {
      const id = e.idempotencyKey!.split(':')[1];
      byTransfer.set(id, [...(byTransfer.get(id) ?? []), e]);
    }
    for (const t of transfers) {
      const row = (await Transfer.findOne({ where: { networkId, id: t.id } }))!;
      expect(row.state).toBe('received');
      const job = (await Job.findOne({ where: { networkId, id: t.jobId } }))!;
      expect(job.stage, `job of ${t.id}`).not.toBe('in_transit');
      expect(job.shopId, `job of ${t.id} is at the destination`).toBe(world.destination.id);
      const events = byTransfer.get(t.id) ?? [];
      // one event per step, plus the job's two stage moves (on the road at hand-over, back on arrival)
      expect(events.map((e) => e.kind).sort(), `history of ${t.id}`).toEqual([...EVENT_KINDS, 'stage_changed', 'stage_changed'].sort());
      expect(new Set(events.map((e) => e.idempotencyKey)).size).toBe(STEPS.length + 2);
      expect(row.manifestKey, `manifest of ${t.id}`).toBeTruthy();
      expect((await headObject(row.manifestKey!))?.size ?? 0, `manifest of ${t.id} in storage`).toBeGreaterThan(0);
    }

    // notices: the same set for every transfer (same people, same steps), none twice
    const notices = await Notification.findAll({ where: { networkId, link: { [Op.like]: '/transfers/%' } } });
    const perTransfer = new Map<string, number>();
    const seen = new Set<string>();
    for (const n of notices) {
      const key = `${n.userId}|${n.dedupeKey}`;
      expect(seen.has(key), `notice ${key} twice`).toBe(false);
      seen.add(key);
      perTransfer.set(n.link!, (perTransfer.get(n.link!) ?? 0) + 1);
    }
    const counts = transfers.map((t) => perTransfer.get(`/transfers/${t.id}`) ?? 0);
    expect(counts[0]).toBeGreaterThan(0);
    expect(new Set(counts), 'every transfer told the same people').toEqual(new Set([counts[0]]));

    // e-mails at the mail catcher: each person told of each step once
    await new Promise((r) => setTimeout(r, 1000)); // room for a wrongly repeated send to show up
    // job numbers count per network, so other tests' networks have a job of the same number: only mail to this network's people counts
    const ours = new Set(Object.values(world.people).map((p) => p.email));
    const mail = (await listCaughtMail()).filter((m) => m.to.some((to) => ours.has(to)));
    // what the app meant to send: the outbox rows to this network's people, every one marked sent
    const ourIds = new Set(Object.values(world.people).map((p) => p.id));
    const outbox = (await OutboxMessage.findAll({ where: { networkId } })).filter((o) => typeof o.payload.userId === 'string' && ourIds.has(o.payload.userId));
    expect(outbox.filter((o) => o.sentAt === null).map((o) => o.dedupeKey), 'e-mails never sent').toEqual([]);
    // SMTP is the one hand-off that cannot be made exactly-once: a kill after the mail server accepted a
    // message and before its outbox row is marked sent re-sends that message (with the same Message-ID,
    // so a mail client shows it once). Lost e-mail is never allowed; a repeat only within that window,
    // at most one per job in flight at each kill (README, Reliability).
    const perTransferMail: number[] = [];
    let repeats = 0;
    for (const t of transfers) {
      const about = mail.filter((m) => m.subject.includes(`(job ${t.jobNumber})`));
      const keys = about.flatMap((m) => m.to.map((to) => `${to}|${m.subject}`));
      repeats += keys.length - new Set(keys).size;
      const meant = outbox.filter((o) => String(o.payload.subject).includes(`(job ${t.jobNumber})`)).length;
      expect(new Set(keys).size, `e-mails about job ${t.jobNumber}: caught vs outbox`).toBe(meant);
      perTransferMail.push(new Set(keys).size);
    }
    expect(repeats, 'e-mails repeated after a kill').toBeLessThanOrEqual(kills * 8);
    // every transfer told the same people of the same steps, so each has the same number of e-mails
    expect(perTransferMail[0]).toBeGreaterThan(0);
    expect(new Set(perTransferMail), 'the same e-mails for every transfer').toEqual(new Set([perTransferMail[0]]));
    console.log(`${TRANSFERS} transfers received through ${kills} worker kills; ${notices.length} notices, ${perTransferMail[0] * TRANSFERS} e-mails, none lost, ${repeats} repeated at a kill`);
  });
});
