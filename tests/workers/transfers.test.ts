import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import type { Worker } from 'bullmq';
import { buildApp } from '../../server/app.js';
import { Instrument, Job, Notification, OutboxMessage, Transfer } from '../../server/lib/models.js';
import { appQueue } from '../../server/lib/queue.js';
import { headObject } from '../../server/lib/storage.js';
import { applyTransferStep } from '../../server/modules/transfers/service.js';
import { arrivalCheckJobId, stepJobId, type TransferStepData } from '../../server/modules/transfers/queue.js';
import { startWorker } from '../../workers/processors.js';
import { closeServerResources } from '../helpers/close.js';
import { signIn } from '../helpers/sign-in.js';
import {
  mailFor,
  makeTransferJob,
  makeTransferNetwork,
  notificationsFor,
  pdfText,
  transferEvents,
  waitFor,
  waitForEvent,
  waitForMailCount,
  waitForIdleQueue,
  waitForState,
  type TransferNetwork,
} from '../helpers/transfers.js';

/**
 * The whole lifecycle through the real worker on the PostgreSQL queue backend: each step is a queued
 * job, the worker moves the job and instrument, writes history, stores the manifest in S3, and tells
 * both shops in the app and by e-mail (caught by the local mail catcher).
 */
describe('transfer lifecycle through the worker (PostgreSQL queue)', { timeout: 120_000 }, () => {
  const app = buildApp();
  let worker: Worker;
  let world: TransferNetwork;
  const cookies: Record<string, string> = {};

  beforeAll(async () => {
    world = await makeTransferNetwork();
    for (const [key, user] of Object.entries(world.people)) cookies[key] = await signIn(app, user.email);
    worker = startWorker(4);
    await waitForIdleQueue();
  });

  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  it('requested → approved → packed → in transit → received, with history, manifest, notices and e-mail', async () => {
    const { job, instrument, serial } = await makeTransferJob(world);
    const { networkId, people } = world;

    // the recommendation names the destination, with its reasons
    const rec = await request(app).get('/api/transfers/recommendation').query({ jobId: job.id }).set('Cookie', cookies.originDesk).expect(200);
    expect(rec.body.recommendedShopId).toBe(world.destination.id);
    expect(rec.body.ranked[0].reasons.map((r: { text: string }) => r.text).join(' ')).toMatch(/relay run/);

    // requested
    const created = await request(app)
      .post('/api/transfers')
      .set('Cookie', cookies.originDesk)
      .send({ jobId: job.id, toShopId: world.destination.id, reason: 'Needs the low-saxophone bench for a repad.' })
      .expect(201);
    const id: string = created.body.id;
    expect(created.body.queued.jobId).toBe(`transfer:${id}:requested`);
    await waitForEvent(networkId, id, 'requested');
    // the owner hears of a request (they may approve it); the person who asked does not hear of their own step
    expect(await notificationsFor(networkId, people.owner.id, id)).toHaveLength(1);
    expect(await notificationsFor(networkId, people.originDesk.id, id)).toHaveLength(0);

    // approved: front desk may not, the regional manager may
    await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.originDesk).send({}).expect(403);
    const approved = await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.manager).send({ note: 'Portland has hours this week.' }).expect(202);
    expect(approved.body.queued.jobId).toBe(stepJobId(id, 'approved'));
    await waitForState(networkId, id, 'approved');
    await waitForEvent(networkId, id, 'approved');
    // once approved, approving again is refused rather than repeated
    await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.manager).send({}).expect(409);

    // packed: a baritone saxophone needs the lifting caution confirmed
    const refused = await request(app).post(`/api/transfers/${id}/pack`).set('Cookie', cookies.originDesk).send({}).expect(400);
    expect(refused.body.error.fields.liftingAcknowledged).toMatch(/two people or a cart/);
    await request(app).post(`/api/transfers/${id}/pack`).set('Cookie', cookies.originDesk).send({ liftingAcknowledged: true }).expect(202);
    const packed = await waitForState(networkId, id, 'packed');
    expect(packed.relayRunId).toBe(world.run.id);
    expect(packed.packedByUserId).toBe(people.originDesk.id);
    await waitForEvent(networkId, id, 'packed');

    // in transit: the job goes on hold, the instrument is on the road, the arrival check is scheduled
    await request(app).post(`/api/transfers/${id}/hand-over`).set('Cookie', cookies.originDesk).send({}).expect(202);
    const onRoad = await waitForState(networkId, id, 'in_transit');
    await waitForEvent(networkId, id, 'in_transit');
    expect(onRoad.expectedArrivalAt!.getTime() - onRoad.departedAt!.getTime()).toBe(3.5 * 3_600_000);
    expect((await Job.findOne({ where: { networkId, id: job.id } }))!.stage).toBe('in_transit');
    expect((await Job.findOne({ where: { networkId, id: job.id } }))!.stageBeforeHold).toBe('approved');
    expect((await Instrument.findOne({ where: { networkId, id: instrument.id } }))!.status).toBe('in_transit');
    const check = await waitFor(() => appQueue().getJob(arrivalCheckJobId(id)), 'the arrival check job');
    expect(await check.getState()).toBe('delayed');
    expect(check.timestamp + (check.opts.delay ?? 0)).toBeGreaterThanOrEqual(onRoad.expectedArrivalAt!.getTime() - 60_000);
    expect(check.timestamp + (check.opts.delay ?? 0)).toBeLessThanOrEqual(onRoad.expectedArrivalAt!.getTime() + 1000);

    // received: only the destination receives, and only with the right serial
    await request(app).post(`/api/transfers/${id}/receive`).set('Cookie', cookies.originDesk).send({ serial }).expect(403);
    await request(app).post(`/api/transfers/${id}/receive`).set('Cookie', cookies.destinationTech).send({ serial }).expect(403);
    const mismatch = await request(app)
      .post(`/api/transfers/${id}/receive`)
      .set('Cookie', cookies.destinationDesk)
      .send({ serial: 'BX-00000000 7', method: 'scan' })
      .expect(409);
    expect(mismatch.body.error.code).toBe('serial_mismatch');
    expect(mismatch.body.error.fields.serial).toBeTruthy();
    // typed the way people type: lower case, no dash, extra spaces
    await request(app)
      .post(`/api/transfers/${id}/receive`)
      .set('Cookie', cookies.destinationDesk)
      .send({ serial: `  ${serial.toLowerCase().replace('-', ' ')} `, method: 'typed' })
      .expect(202);
    const received = await waitForState(networkId, id, 'received');
    await waitForEvent(networkId, id, 'received');
    expect(received.receivedByUserId).toBe(people.destinationDesk.id);
    const movedJob = (await Job.findOne({ where: { networkId, id: job.id } }))!;
    expect(movedJob).toMatchObject({ shopId: world.destination.id, stage: 'approved', stageBeforeHold: null, assignedUserId: null });
    expect(await Instrument.findOne({ where: { networkId, id: instrument.id } })).toMatchObject({
      currentShopId: world.destination.id,
      status: 'in_shop',
    });

    // history: one event per step, and the job's two stage changes, all keyed to this transfer
    const events = await transferEvents(networkId, id);
    expect(events.map((e) => e.kind).sort()).toEqual(
      ['stage_changed', 'stage_changed', 'transfer_approved', 'transfer_departed', 'transfer_packed', 'transfer_received', 'transfer_requested'],
    );
    for (const kind of ['transfer_requested', 'transfer_approved', 'transfer_packed', 'transfer_departed', 'transfer_received']) {
      expect(events.filter((e) => e.kind === kind), kind).toHaveLength(1);
    }
    expect(events.filter((e) => e.kind === 'stage_changed').map((e) => e.summary)).toEqual([
      `Job ${job.number}: approved → in transit`,
      `Job ${job.number}: in transit → approved at ${world.destination.name}`,
    ]);

    // the manifest is in object storage, and the API hands it out
    const stored = (await Transfer.findOne({ where: { networkId, id } }))!;
    expect(stored.manifestKey).toBe(`networks/${networkId}/transfers/${id}/manifest.pdf`);
    expect(await headObject(stored.manifestKey!)).toMatchObject({ contentType: 'application/pdf' });
    const pdf = await request(app)
      .get(`/api/transfers/${id}/manifest`)
      .set('Cookie', cookies.destinationTech)
      .buffer(true)
      .parse((res, cb) => {
        const chunks: Buffer[] = [];
        res.on('data', (c: Buffer) => chunks.push(c));
        res.on('end', () => cb(null, Buffer.concat(chunks)));
      })
      .expect(200);
    expect(pdf.headers['content-type']).toBe('application/pdf');
    const body = pdf.body as Buffer;
    expect(body.subarray(0, 5).toString()).toBe('%PDF-');
    const text = await pdfText(body);
    for (const words of [serial, 'Baritone saxophone', 'Aldmoor', `${job.number}`, world.origin.name, world.destination.name, 'Packed by', people.originDesk.name, 'Sticky G# key', 'lift it with two people or move it on a cart']) {
      expect(text, words).toContain(words);
    }
    expect(body.includes(Buffer.from('/Subtype /Image'))).toBe(true); // the QR code

    // in-app: the destination's technician heard of every step; the inbox API shows them
    const techNotices = await notificationsFor(networkId, people.destinationTech.id, id);
    expect(techNotices.map((n) => n.title)).toEqual([
      `Transfer requested: Baritone saxophone to ${world.destination.name}`,
      `Transfer approved: Baritone saxophone, ${world.origin.name} → ${world.destination.name}`,
      `Packed for ${world.destination.name}: Baritone saxophone`,
      `Handed over for the relay run to ${world.destination.name}: Baritone saxophone`,
      `Received at ${world.destination.name}: Baritone saxophone`,
    ]);
    const inbox = await request(app).get('/api/notifications').set('Cookie', cookies.destinationTech).expect(200);
    expect(inbox.body.unread).toBeGreaterThanOrEqual(5);
    const first = inbox.body.notifications.find((n: { link: string }) => n.link === `/transfers/${id}`);
    await request(app).post(`/api/notifications/${first.id}/read`).set('Cookie', cookies.destinationTech).expect(200);
    expect((await Notification.findByPk(first.id))?.readAt).toBeTruthy();
    // someone else's notice is not theirs to mark, not even the owner's to mark
    await request(app).post(`/api/notifications/${first.id}/read`).set('Cookie', cookies.originTech).expect(404);
    await request(app).post(`/api/notifications/${first.id}/read`).set('Cookie', cookies.owner).expect(404);

    // e-mail: one message per step to each person at either shop, from the outbox
    const techMail = await waitForMailCount(people.destinationTech.email, job.number, 5);
    // each step's e-mails go out on their own job, so they may arrive in any order
    expect(techMail.map((m) => m.subject.replace(/ \(job \d+\)$/, '')).sort()).toEqual(techNotices.map((n) => n.title).sort());
    for (const m of techMail) expect(m.text).toContain(`/transfers/${id}`);
    await waitForMailCount(people.originTech.email, job.number, 5);
    // the auditor is not staff and gets nothing; the owner only heard of the request
    expect(await mailFor(people.auditor.email, job.number)).toHaveLength(0);
    expect((await waitForMailCount(people.owner.email, job.number, 1)).map((m) => m.subject)).toEqual([
      `Transfer requested: Baritone saxophone to ${world.destination.name} (job ${job.number})`,
    ]);
    // every queued e-mail goes out, and each exactly once
    await waitFor(async () => (await OutboxMessage.count({ where: { networkId, sentAt: null } })) === 0, 'the outbox to empty');
    const sentRows = await OutboxMessage.findAll({ where: { networkId } });
    expect(sentRows.every((r) => r.attempts === 1)).toBe(true);
  });

  it('a duplicated or retried step changes nothing twice', async () => {
    const { job } = await makeTransferJob(world, { family: 'alto_saxophone' });
    const { networkId, people } = world;
    const created = await request(app)
      .post('/api/transfers')
      .set('Cookie', cookies.manager)
      .send({ jobId: job.id, toShopId: world.destination.id, reason: 'Balance the benches.' })
      .expect(201);
    const id: string = created.body.id;
    await waitForEvent(networkId, id, 'requested');
    // two clicks, one job: the same id is added twice
    await request(app).post(`/api/transfers/${id}/approve`).set('Cookie', cookies.manager).send({}).expect(202);
    await appQueue().add('transfer-step', { networkId, transferId: id, to: 'approved', actorUserId: people.manager.id, at: new Date().toISOString() }, { jobId: stepJobId(id, 'approved') });
    await waitForEvent(networkId, id, 'approved');
    await waitForMailCount(people.destinationTech.email, job.number, 2);

    // the step run again by hand, as a worker that retried after the commit would
    const again: TransferStepData = { networkId, transferId: id, to: 'approved', actorUserId: people.manager.id, at: new Date().toISOString() };
    expect(await applyTransferStep(again)).toMatchObject({ status: 'already-applied' });
    // a step the state no longer allows does nothing
    expect(await applyTransferStep({ ...again, to: 'received' })).toMatchObject({ status: 'skipped' });
    await new Promise((r) => setTimeout(r, 1000));

    const events = await transferEvents(networkId, id);
    expect(events.filter((e) => e.kind === 'transfer_approved')).toHaveLength(1);
    expect(await notificationsFor(networkId, people.destinationTech.id, id)).toHaveLength(2);
    expect((await mailFor(people.destinationTech.email, job.number)).filter((m) => m.subject.startsWith('Transfer approved'))).toHaveLength(1);
    expect((await Transfer.findOne({ where: { networkId, id } }))!.state).toBe('approved');
  });

  it('a transfer still on the road at its expected arrival tells the managers it is overdue', async () => {
    const { job, instrument } = await makeTransferJob(world, { family: 'tuba' });
    const { networkId, people } = world;
    const t = await Transfer.create({
      networkId, jobId: job.id, instrumentId: instrument.id, fromShopId: world.origin.id, toShopId: world.destination.id,
      state: 'packed', reason: 'Dent work', requestedByUserId: people.manager.id, approvedByUserId: people.manager.id,
      approvedAt: new Date(), packedByUserId: people.originDesk.id, packedAt: new Date(), relayRunId: world.run.id,
    });
    await request(app).post(`/api/transfers/${t.id}/hand-over`).set('Cookie', cookies.manager).send({}).expect(202);
    await waitForEvent(networkId, t.id, 'in_transit');
    const check = await waitFor(() => appQueue().getJob(arrivalCheckJobId(t.id)), 'the arrival check job');
    expect(await check.getState()).toBe('delayed');

    // the expected arrival passes with the tuba still on the road: bring the check forward
    await Transfer.update({ expectedArrivalAt: new Date(Date.now() - 60_000) }, { where: { networkId, id: t.id } });
    await check.promote();
    await waitForEvent(networkId, t.id, 'overdue');
    const notices = await Notification.findAll({ where: { networkId, kind: 'transfer_overdue', link: `/transfers/${t.id}` } });
    expect(notices.map((n) => n.userId)).toEqual([people.manager.id]);
    const mail = await waitFor(
      async () => (await mailFor(people.manager.email, job.number)).find((m) => m.subject.startsWith('Transfer overdue')),
      'the overdue e-mail',
    );
    expect(mail.text).toMatch(/has not been received/);
    expect((await mailFor(people.originDesk.email, job.number)).some((m) => m.subject.startsWith('Transfer overdue'))).toBe(false);
  });

  it('a manager rejects and a requester cancels, each with a reason; neither moves anything', async () => {
    const { networkId, people } = world;
    const a = await makeTransferJob(world, { family: 'flute' });
    const b = await makeTransferJob(world, { family: 'clarinet' });
    const ask = async (jobId: string) =>
      (await request(app).post('/api/transfers').set('Cookie', cookies.originDesk).send({ jobId, toShopId: world.destination.id, reason: 'Second opinion.' }).expect(201)).body.id as string;
    const rejectId = await ask(a.job.id);
    const cancelId = await ask(b.job.id);

    const noReason = await request(app).post(`/api/transfers/${rejectId}/reject`).set('Cookie', cookies.manager).send({}).expect(400);
    expect(noReason.body.error.fields.reason).toBeTruthy();
    await request(app).post(`/api/transfers/${rejectId}/reject`).set('Cookie', cookies.manager).send({ reason: 'Portland is full this month.' }).expect(202);
    await request(app).post(`/api/transfers/${cancelId}/cancel`).set('Cookie', cookies.originTech).send({ reason: 'Not mine to cancel.' }).expect(403);
    await request(app).post(`/api/transfers/${cancelId}/cancel`).set('Cookie', cookies.originDesk).send({ reason: 'The school wants it back as is.' }).expect(202);

    const rejected = await waitForState(networkId, rejectId, 'rejected');
    expect(rejected).toMatchObject({ decisionNote: 'Portland is full this month.', approvedByUserId: people.manager.id });
    expect((await waitForState(networkId, cancelId, 'cancelled')).decisionNote).toBe('The school wants it back as is.');
    await waitForEvent(networkId, cancelId, 'cancelled');
    expect((await Job.findOne({ where: { networkId, id: a.job.id } }))!.shopId).toBe(world.origin.id);
    // a closed transfer frees the job for a new request
    await request(app).post('/api/transfers').set('Cookie', cookies.originDesk).send({ jobId: a.job.id, toShopId: world.destination.id, reason: 'Try again next month.' }).expect(201);
  });
});
