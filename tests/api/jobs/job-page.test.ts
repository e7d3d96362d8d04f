import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { HistoryEvent, Instrument, Job, Shop } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { signIn } from '../../helpers/sign-in.js';
import type { JobDetail } from '../../../shared/jobs/dto.js';
import type { JobStage } from '../../../shared/domain.js';

describe('the job page API', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner', 'front_desk', 'technician', 'auditor', 'regional_manager']);
  });
  afterAll(closeServerResources);

  const newJob = async (stage: JobStage = 'intake', over: Partial<Job> = {}) => {
    const { job, instrument } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage });
    if (Object.keys(over).length) await job.update(over);
    return { job, instrument };
  };
  const move = (cookie: string, jobId: string, to: JobStage) =>
    request(app).post(`/api/jobs/${jobId}/stage`).set('Cookie', cookie).send({ to });

  it('shows a job with its shop’s rate, tax and calendar, and only the moves the person may make', async () => {
    const { job } = await newJob('approved');
    const tech = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', w.cookies.technician).expect(200);
    const body = tech.body as JobDetail;
    expect(body.job.number).toBe(job.number);
    expect(body.shop).toMatchObject({ laborRateCents: 9000, taxRateBasisPoints: 1000, timeZone: 'America/Denver', openingDays: [1, 2, 3, 4, 5] });
    expect(body.moves.map((m) => m.to).sort()).toEqual(['on_bench', 'waiting_for_parts']);
    const desk = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', w.cookies.front_desk).expect(200);
    expect(desk.body.moves.map((m: { to: string }) => m.to)).toEqual(['waiting_for_parts']);
    const auditor = await request(app).get(`/api/jobs/${job.id}`).set('Cookie', w.cookies.auditor).expect(200);
    expect(auditor.body.moves).toEqual([]);
    expect(auditor.body.can).toMatchObject({ update: false, moveStage: false, addAttachment: false });
  });

  it('walks a job from intake to released, each move in the instrument’s history with who and when', async () => {
    const { job, instrument } = await newJob('intake');
    await move(w.cookies.front_desk, job.id, 'assessed').expect(200);
    // the estimate must be approved before the move to Approved
    const early = await move(w.cookies.front_desk, job.id, 'approved').expect(409);
    expect(early.body.error).toMatchObject({ code: 'move_refused', reason: 'estimate_approved' });
    await request(app)
      .post(`/api/jobs/${job.id}/approval`)
      .set('Cookie', w.cookies.front_desk)
      .send({ approvedByName: 'Tamsin Ordway', method: 'phone' })
      .expect(200);
    // recording the approval moved the job on
    expect((await Job.findOne({ where: { networkId: w.network.id, id: job.id } }))!.stage).toBe('approved');
    const started = await move(w.cookies.technician, job.id, 'on_bench').expect(200);
    // a technician starting unassigned work takes it
    expect(started.body.job.assignee).toEqual({ id: w.people.technician.id, name: w.people.technician.name });
    await move(w.cookies.technician, job.id, 'waiting_for_parts').expect(200);
    const back = await move(w.cookies.technician, job.id, 'on_bench').expect(200);
    expect(back.body.job.stageBeforeHold).toBeNull();
    await move(w.cookies.technician, job.id, 'quality_check').expect(200);
    await move(w.cookies.technician, job.id, 'ready').expect(200);
    // a technician does not hand the instrument over; front desk does
    await move(w.cookies.technician, job.id, 'released').expect(403);
    const released = await move(w.cookies.front_desk, job.id, 'released').expect(200);
    expect(released.body.job.releasedAt).toBeTruthy();
    expect((await Instrument.findOne({ where: { networkId: w.network.id, id: instrument.id } }))!.status).toBe('in_service');

    const events = await HistoryEvent.findAll({
      where: { networkId: w.network.id, instrumentId: instrument.id, kind: 'stage_changed' },
      order: [['occurredAt', 'ASC'], ['createdAt', 'ASC']],
    });
    expect(events.map((e) => [e.data.from, e.data.to])).toEqual([
      ['intake', 'assessed'],
      ['assessed', 'approved'],
      ['approved', 'on_bench'],
      ['on_bench', 'waiting_for_parts'],
      ['waiting_for_parts', 'on_bench'],
      ['on_bench', 'quality_check'],
      ['quality_check', 'ready'],
      ['ready', 'released'],
    ]);
    expect(events.map((e) => e.userId)).toEqual([
      w.people.front_desk.id, w.people.front_desk.id, w.people.technician.id, w.people.technician.id,
      w.people.technician.id, w.people.technician.id, w.people.technician.id, w.people.front_desk.id,
    ]);
    expect(events.every((e) => e.occurredAt instanceof Date && e.shopId === w.shop.id)).toBe(true);
    expect(events[2].summary).toBe(`Job ${job.number}: Approved → On bench`);
  });

  it('refuses moves the machine does not have, moves into transit by a person, and moves by people of other shops', async () => {
    const { job } = await newJob('on_bench');
    expect((await move(w.cookies.owner, job.id, 'released').expect(409)).body.error.reason).toBe('no_such_move');
    expect((await move(w.cookies.owner, job.id, 'in_transit').expect(409)).body.error.reason).toBe('transfer_only');
    await move(w.cookies.auditor, job.id, 'quality_check').expect(403);
    const other = await makeUser(w.network.id, [{ shopId: w.otherShop.id, role: 'technician' }]);
    await move(await signIn(app, other.email), job.id, 'quality_check').expect(403);
    expect((await Job.findOne({ where: { networkId: w.network.id, id: job.id } }))!.stage).toBe('on_bench');
  });

  it('answers 404 for another network’s job, 401 without sign-in, and 400 for a stage that does not exist', async () => {
    const net = await makeNetwork();
    const shop = await makeShop(net.id);
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const { job: foreign } = await makeInstrumentWithJob(net.id, shop.id, owner.id, { stage: 'ready' });
    await request(app).get(`/api/jobs/${foreign.id}`).set('Cookie', w.cookies.owner).expect(404);
    await move(w.cookies.owner, foreign.id, 'released').expect(404);
    await request(app).get(`/api/jobs/not-a-uuid`).set('Cookie', w.cookies.owner).expect(404);
    const { job } = await newJob('intake');
    await request(app).get(`/api/jobs/${job.id}`).expect(401);
    const bad = await move(w.cookies.owner, job.id, 'polished' as JobStage).expect(400);
    expect(bad.body.error.fields.to).toBeTruthy();
  });

  it('builds an estimate from the service catalog at the shop’s rate, with parts and tax in cents', async () => {
    const { job } = await newJob('assessed');
    const add = (body: object) => request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.front_desk).send(body);
    await add({ kind: 'labor', catalogItemId: w.catalog.repadAlto.id }).expect(201);
    await add({ kind: 'labor', catalogItemId: w.catalog.leakTest.id, hours: 1.15 }).expect(201);
    const res = await add({ kind: 'part', description: 'Glued pad 24.5 mm', quantity: 6, unitPriceCents: 215 }).expect(201);
    const body = res.body as JobDetail;
    expect(body.lineItems.map((l) => [l.description, l.totalCents])).toEqual([
      ['Repad — alto saxophone', 54_000], // 6 h × $90.00
      ['Leak test & adjust', 10_350], //     1.15 h × $90.00
      ['Glued pad 24.5 mm', 1290], //       6 × $2.15
    ]);
    // $656.40 × 10 % = $65.64
    expect(body.totals).toMatchObject({ subtotalCents: 65_640, taxCents: 6564, totalCents: 72_204 });
    expect(body.job.estimatedHours).toBe(7.15);
    // the catalog item's skill became the job's required skill
    expect(body.job.requiredSkill).toEqual({ id: w.skill.id, name: 'General woodwind' });
    // the owner tagged the repad with its hazards: the line carries their cautions; the untagged leak test and
    // the free-text pad line carry none
    expect(body.lineItems[0].cautions.map((c) => c.hazard)).toEqual(['adhesive', 'solvent', 'heat_flame', 'springs_sharp', 'pad_removal']);
    expect(body.lineItems[0].cautions.map((c) => c.text).join(' ')).toMatch(/safety data sheet/);
    expect(body.lineItems[1].cautions).toEqual([]);
    expect(body.lineItems[2].cautions).toEqual([]);

    const labor = body.lineItems[1];
    const changed = await request(app)
      .patch(`/api/jobs/${job.id}/line-items/${labor.id}`)
      .set('Cookie', w.cookies.technician)
      .send({ hours: 0.5 })
      .expect(200);
    expect(changed.body.totals.subtotalCents).toBe(54_000 + 4500 + 1290);
    const removed = await request(app).delete(`/api/jobs/${job.id}/line-items/${labor.id}`).set('Cookie', w.cookies.front_desk).expect(200);
    expect(removed.body.lineItems).toHaveLength(2);
    expect(removed.body.job.estimatedHours).toBe(6);
  });

  it('refuses a service for another family, a third decimal, and edits by an auditor or after the work is done', async () => {
    const { job } = await newJob('assessed');
    const wrong = await request(app)
      .post(`/api/jobs/${job.id}/line-items`)
      .set('Cookie', w.cookies.front_desk)
      .send({ kind: 'labor', catalogItemId: w.catalog.repadFlute.id })
      .expect(400);
    expect(wrong.body.error.fields.catalogItemId).toMatch(/flute/);
    const decimals = await request(app)
      .post(`/api/jobs/${job.id}/line-items`)
      .set('Cookie', w.cookies.front_desk)
      .send({ kind: 'part', description: 'Cork', quantity: 1.125, unitPriceCents: 100 })
      .expect(400);
    expect(decimals.body.error.fields.quantity).toMatch(/two decimals/);
    await request(app)
      .post(`/api/jobs/${job.id}/line-items`)
      .set('Cookie', w.cookies.auditor)
      .send({ kind: 'labor', catalogItemId: w.catalog.leakTest.id })
      .expect(403);
    const { job: done } = await newJob('ready');
    await request(app)
      .post(`/api/jobs/${done.id}/line-items`)
      .set('Cookie', w.cookies.front_desk)
      .send({ kind: 'labor', catalogItemId: w.catalog.leakTest.id })
      .expect(409);
  });

  it('records the customer’s approval: who, when and how; only desk or managers, and not before assessment', async () => {
    const { job } = await newJob('on_bench');
    await request(app)
      .post(`/api/jobs/${job.id}/approval`)
      .set('Cookie', w.cookies.technician)
      .send({ approvedByName: 'A. Parent', method: 'in_person' })
      .expect(403);
    const at = '2026-03-02T16:15:00.000Z';
    const res = await request(app)
      .post(`/api/jobs/${job.id}/approval`)
      .set('Cookie', w.cookies.regional_manager)
      .send({ approvedByName: 'A. Parent', method: 'email', approvedAt: at })
      .expect(200);
    expect(res.body.job.estimateApproval).toEqual({ at, byName: 'A. Parent', method: 'email', totalCents: 0, version: 0 });
    expect(res.body.job.stage).toBe('on_bench'); // recording late does not move the job
    const { job: fresh } = await newJob('intake');
    await request(app)
      .post(`/api/jobs/${fresh.id}/approval`)
      .set('Cookie', w.cookies.front_desk)
      .send({ approvedByName: 'Someone', method: 'phone' })
      .expect(409);
    const missing = await request(app).post(`/api/jobs/${fresh.id}/approval`).set('Cookie', w.cookies.front_desk).send({ method: 'fax' }).expect(400);
    expect(Object.keys(missing.body.error.fields).sort()).toEqual(['approvedByName', 'method']);
  });

  it('sets the promise in the shop’s opening days, assigns a technician of the shop, and notes both in the history', async () => {
    const { job, instrument } = await newJob('approved');
    // ZZ is an ISO 3166 user-assigned code with no holiday calendar: weekdays only, whatever today is
    // (public holidays are checked against a published calendar in tests/reference/holidays.test.ts)
    await Shop.update({ country: 'ZZ' }, { where: { networkId: w.network.id, id: w.shop.id } });
    const res = await request(app)
      .patch(`/api/jobs/${job.id}`)
      .set('Cookie', w.cookies.front_desk)
      .send({ promiseInOpeningDays: 5, assignedUserId: w.people.technician.id, conditionNotes: 'Bell rim dented; case latch broken.' })
      .expect(200);
    // Worked by hand, not with the code's own counting: the shop opens Mon–Fri in Denver, and today's date does not
    // count, so 5 opening days later is the same weekday a week on from Mon–Fri (+7 days), the Friday after a
    // Saturday (+6) and the Friday after a Sunday (+5).
    const [y, m, d] = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Denver' }).format(new Date()).split('-').map(Number);
    const today = new Date(Date.UTC(y, m - 1, d));
    const plus = { 0: 5, 6: 6 }[today.getUTCDay()] ?? 7;
    expect(res.body.job.promisedOn).toBe(new Date(today.getTime() + plus * 86_400_000).toISOString().slice(0, 10));
    await Shop.update({ country: 'US' }, { where: { networkId: w.network.id, id: w.shop.id } });
    expect(res.body.job.assignee.id).toBe(w.people.technician.id);
    expect(res.body.job.conditionNotes).toBe('Bell rim dented; case latch broken.');
    const notNow = await request(app)
      .patch(`/api/jobs/${job.id}`)
      .set('Cookie', w.cookies.front_desk)
      .send({ assignedUserId: w.people.front_desk.id })
      .expect(400);
    expect(notNow.body.error.fields.assignedUserId).toMatch(/technician/);
    const note = await HistoryEvent.findOne({ where: { networkId: w.network.id, instrumentId: instrument.id, kind: 'job_updated' } });
    expect(note!.summary).toMatch(/assigned to Tech .*promised for/);
  });

  it('a shop row with an unknown time zone or no opening days gets a clear 409, not a request that never ends', async () => {
    const shop = await makeShop(w.network.id);
    const owner = await makeUser(w.network.id, [{ shopId: shop.id, role: 'front_desk' }]);
    const cookie = await signIn(app, owner.email);
    const { job } = await makeInstrumentWithJob(w.network.id, shop.id, owner.id, { stage: 'approved' });
    // written straight to the row, as a shop saved before the Shops screen checked its time zone could be
    await shop.update({ timeZone: 'Mars/Olympus_Mons' }, { validate: false });
    const res = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', cookie).send({ promiseInOpeningDays: 3 }).timeout(10_000).expect(409);
    expect(res.body.error.message).toMatch(/"Mars\/Olympus_Mons" is not a known time zone/);
    expect(res.body.error.fields.promiseInOpeningDays).toMatch(/Shops screen/);
    await shop.update({ timeZone: 'America/Denver', openingDays: [] }, { validate: false });
    const none = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', cookie).send({ promiseInOpeningDays: 3 }).timeout(10_000).expect(409);
    expect(none.body.error.message).toMatch(/no opening days/);
    expect((await Job.findByPk(job.id))!.promisedOn).toBeNull();
  });

  it('keeps a time log per technician; only the author or a manager removes an entry', async () => {
    const { job } = await newJob('on_bench');
    await request(app).post(`/api/jobs/${job.id}/time-logs`).set('Cookie', w.cookies.technician).send({ minutes: 90, note: 'Disassembly' }).expect(201);
    const res = await request(app).post(`/api/jobs/${job.id}/time-logs`).set('Cookie', w.cookies.front_desk).send({ minutes: 15 }).expect(201);
    const body = res.body as JobDetail;
    expect(body.timeByTechnician.map((t) => [t.user.id, t.minutes])).toEqual([
      [w.people.technician.id, 90],
      [w.people.front_desk.id, 15],
    ]);
    const techEntry = body.timeLogs.find((l) => l.user.id === w.people.technician.id)!;
    await request(app).delete(`/api/jobs/${job.id}/time-logs/${techEntry.id}`).set('Cookie', w.cookies.front_desk).expect(403);
    await request(app).delete(`/api/jobs/${job.id}/time-logs/${techEntry.id}`).set('Cookie', w.cookies.technician).expect(200);
    const future = await request(app).post(`/api/jobs/${job.id}/time-logs`).set('Cookie', w.cookies.technician).send({ minutes: 10, workedOn: '2999-01-01' }).expect(400);
    expect(future.body.error.fields.workedOn).toBeTruthy();
    await request(app).post(`/api/jobs/${job.id}/time-logs`).set('Cookie', w.cookies.auditor).send({ minutes: 10 }).expect(403);
  });
});
