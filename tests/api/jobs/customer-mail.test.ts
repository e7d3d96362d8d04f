import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Customer, OutboxMessage } from '../../../server/lib/models.js';
import { waitForMail } from '../../../server/lib/mail.js';
import { startWorker } from '../../../workers/processors.js';
import { closeServerResources } from '../../helpers/close.js';
import { waitForIdleQueue } from '../../helpers/transfers.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import type { JobStage } from '../../../shared/domain.js';

/** Customer e-mails go through the outbox and the queue to the mail catcher, and are read back from it. */
describe('e-mails to the customer', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let worker: ReturnType<typeof startWorker>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'technician']);
    worker = startWorker(2);
    // earlier files may leave queued work behind; let the worker clear it before timing our own mail
    await waitForIdleQueue();
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  const move = (cookie: string, jobId: string, to: JobStage) =>
    request(app).post(`/api/jobs/${jobId}/stage`).set('Cookie', cookie).send({ to }).expect(200);

  it('sends the estimate when it awaits approval, with lines, tax and total', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake', serial: 'LK-20931' });
    await job.update({ customerId: w.customer.id });
    await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.front_desk).send({ kind: 'labor', catalogItemId: w.catalog.repadAlto.id }).expect(201);
    await request(app)
      .post(`/api/jobs/${job.id}/line-items`)
      .set('Cookie', w.cookies.front_desk)
      .send({ kind: 'part', description: 'Glued pad set, alto', quantity: 1, unitPriceCents: 6450 })
      .expect(201);
    await move(w.cookies.front_desk, job.id, 'assessed');

    const mail = await waitForMail((m) => m.to.includes(w.customer.email!) && m.subject.includes(`job ${job.number}`) && m.subject.includes('awaits your approval'), { timeoutMs: 15_000 });
    expect(mail.to).toEqual([w.customer.email]);
    expect(mail.text).toContain('Hello Tamsin Ordway,');
    expect(mail.text).toContain('serial LK-20931');
    expect(mail.text).toMatch(/Repad — alto saxophone\s+\$540\.00/);
    // $604.50 subtotal, 10 % tax (invented for the test, tests/helpers/factories.ts) $60.45, total $664.95
    expect(mail.text).toMatch(/Subtotal\s+\$604\.50/);
    expect(mail.text).toMatch(/Tax \(10 %\)\s+\$60\.45/);
    expect(mail.text).toMatch(/Total\s+\$664\.95/);
  });

  it('tells the customer when the instrument is ready, through one outbox row that is marked sent', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'quality_check' });
    await job.update({ customerId: w.customer.id, assignedUserId: w.people.technician.id });
    await move(w.cookies.technician, job.id, 'ready');
    const mail = await waitForMail((m) => m.to.includes(w.customer.email!) && m.subject.includes(`ready — job ${job.number}`), { timeoutMs: 15_000 });
    expect(mail.to).toEqual([w.customer.email]);
    expect(mail.text).toContain('ready to collect');

    const sent = await OutboxMessage.findAll({ where: { networkId: w.network.id } });
    const readyRows = sent.filter((r) => r.dedupeKey.startsWith(`job-ready-${job.id}`));
    expect(readyRows).toHaveLength(1);
    await expect.poll(async () => (await OutboxMessage.findOne({ where: { id: readyRows[0].id } }))!.sentAt, { timeout: 10_000 }).not.toBeNull();
  });

  it('writes nothing to the outbox for a customer without an e-mail address or a job without a customer', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake' });
    const walkIn = await Customer.create({ networkId: w.network.id, kind: 'person', name: 'Walk-in player', phone: '+1 303 555 0199', homeShopId: w.shop.id });
    const { job: noEmail } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake' });
    await noEmail.update({ customerId: walkIn.id });
    const before = await OutboxMessage.count({ where: { networkId: w.network.id } });
    await move(w.cookies.front_desk, job.id, 'assessed');
    await move(w.cookies.front_desk, noEmail.id, 'assessed');
    expect(await OutboxMessage.count({ where: { networkId: w.network.id } })).toBe(before);
  });
});
