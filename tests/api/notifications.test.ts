import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { sequelize } from '../../server/lib/db.js';
import { listCaughtMail, waitForMail } from '../../server/lib/mail.js';
import { Notification, NotificationPreference, OutboxMessage } from '../../server/lib/models.js';
import { notify } from '../../server/modules/notifications/service.js';
import { startWorker } from '../../workers/processors.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';
import { waitForIdleQueue } from '../helpers/transfers.js';
import { NOTIFICATION_EMAIL_DEFAULTS, NOTIFICATION_KINDS, type JobStage } from '../../shared/domain.js';

/**
 * The inbox and the e-mail choices over HTTP, on the real database, queue and mail catcher: unread
 * counts follow reads, "mark all read" stops at what the person saw, and a notice goes out by e-mail
 * only to those who chose it for that kind.
 */
describe('notifications inbox and e-mail choices', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let secondDesk: Awaited<ReturnType<typeof makeUser>>;
  let secondDeskCookie: string;
  let worker: ReturnType<typeof startWorker>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['front_desk', 'technician', 'regional_manager']);
    secondDesk = await makeUser(w.network.id, [{ shopId: w.shop.id, role: 'front_desk' }], { name: `Second desk ${uniq()}` });
    secondDeskCookie = await signIn(app, secondDesk.email);
    worker = startWorker(2);
    await waitForIdleQueue();
  });
  afterAll(async () => {
    await worker?.close();
    await closeServerResources();
  });

  const get = (cookie: string, path: string) => request(app).get(path).set('Cookie', cookie);
  const post = (cookie: string, path: string, body: unknown = {}) => request(app).post(path).set('Cookie', cookie).send(body as object);
  const unread = async (cookie: string) => (await get(cookie, '/api/notifications/unread-count').expect(200)).body.unread as number;

  async function noticeFor(networkId: string, userId: string, title: string, minutesAgo: number) {
    await notify({ networkId, kind: 'transfer_incoming', userIds: [userId], title, body: 'A test notice.', link: '/transfers', dedupeKey: `test:${uniq()}` });
    // place it in time, so "mark all read up to" has something to stop at
    await sequelize.query(`update notifications set created_at = now() - make_interval(mins => :minutes) where network_id = :networkId and title = :title`, {
      replacements: { minutes: minutesAgo, networkId, title },
    });
  }

  it('counts unread notices, marks one or all read, and never touches anyone else’s', async () => {
    const tag = uniq();
    await noticeFor(w.network.id, w.people.front_desk.id, `Oldest ${tag}`, 30);
    await noticeFor(w.network.id, w.people.front_desk.id, `Middle ${tag}`, 20);
    await noticeFor(w.network.id, w.people.front_desk.id, `Newest ${tag}`, 10);
    await noticeFor(w.network.id, w.people.technician.id, `Technician’s ${tag}`, 10);
    const elsewhere = await makeNetwork();
    const stranger = await makeUser(elsewhere.id, [{ shopId: (await makeShop(elsewhere.id)).id, role: 'front_desk' }]);
    await noticeFor(elsewhere.id, stranger.id, `Stranger’s ${tag}`, 10);

    const desk = w.cookies.front_desk;
    expect(await unread(desk)).toBe(3);
    const list = (await get(desk, '/api/notifications').expect(200)).body;
    expect(list.unread).toBe(3);
    expect(list.notifications.map((n: { title: string }) => n.title)).toEqual([`Newest ${tag}`, `Middle ${tag}`, `Oldest ${tag}`]);

    // one read: the count drops by one, and reading it again changes nothing
    const middle = list.notifications[1];
    const first = await post(desk, `/api/notifications/${middle.id}/read`).expect(200);
    expect(first.body.readAt).not.toBeNull();
    await post(desk, `/api/notifications/${middle.id}/read`).expect(200);
    expect(await unread(desk)).toBe(2);
    const onlyUnread = (await get(desk, '/api/notifications?unread=true').expect(200)).body;
    expect(onlyUnread.notifications.map((n: { title: string }) => n.title)).toEqual([`Newest ${tag}`, `Oldest ${tag}`]);

    // someone else's notice, in this network or another, is not found and stays unread
    const technicians = (await get(w.cookies.technician, '/api/notifications').expect(200)).body;
    await post(desk, `/api/notifications/${technicians.notifications[0].id}/read`).expect(404);
    const strangers = await Notification.findOne({ where: { networkId: elsewhere.id, userId: stranger.id } });
    await post(desk, `/api/notifications/${strangers!.id}/read`).expect(404);
    expect(await unread(w.cookies.technician)).toBe(1);
    expect((await Notification.findByPk(strangers!.id))?.readAt ?? null).toBeNull();

    // bad input: a clear 400, nothing marked
    const badId = await post(desk, '/api/notifications/not-a-notice/read').expect(400);
    expect(badId.body.error.fields).toHaveProperty('id');
    const badDate = await post(desk, '/api/notifications/read-all', { upTo: 'last tuesday-ish' }).expect(400);
    expect(badDate.body.error.fields).toHaveProperty('upTo');
    expect(await unread(desk)).toBe(2);

    // "all read" up to what the screen showed: a notice that came in later stays unread
    const seenUpTo = new Date(Date.now() - 15 * 60_000).toISOString();
    const marked = (await post(desk, '/api/notifications/read-all', { upTo: seenUpTo }).expect(200)).body;
    expect(marked).toEqual({ marked: 1, unread: 1 });
    expect((await get(desk, '/api/notifications?unread=true').expect(200)).body.notifications.map((n: { title: string }) => n.title)).toEqual([`Newest ${tag}`]);
    expect((await post(desk, '/api/notifications/read-all').expect(200)).body).toEqual({ marked: 1, unread: 0 });
    expect(await unread(desk)).toBe(0);

    // the others' counts did not move
    expect(await unread(w.cookies.technician)).toBe(1);
    expect(await Notification.count({ where: { networkId: elsewhere.id, readAt: null } })).toBe(1);
  });

  it('shows each kind with its default, refuses bad choices without saving any, and keeps choices per person', async () => {
    const start = (await get(secondDeskCookie, '/api/notification-preferences').expect(200)).body;
    expect(start.email).toBe(secondDesk.email);
    expect(start.preferences.map((p: { kind: string }) => p.kind)).toEqual([...NOTIFICATION_KINDS]);
    for (const p of start.preferences) {
      expect(p).toEqual({ kind: p.kind, email: NOTIFICATION_EMAIL_DEFAULTS[p.kind as keyof typeof NOTIFICATION_EMAIL_DEFAULTS], chosen: false, defaultEmail: p.email });
    }

    const put = (cookie: string, body: unknown) => request(app).put('/api/notification-preferences').set('Cookie', cookie).send(body as object);
    const unknownKind = await put(secondDeskCookie, { preferences: [{ kind: 'job_ready', email: true }, { kind: 'tea_break', email: true }] }).expect(400);
    expect(unknownKind.body.error.fields).toHaveProperty('preferences.1.kind');
    await put(secondDeskCookie, { preferences: [{ kind: 'job_ready', email: true }, { kind: 'job_ready', email: false }] }).expect(400);
    await put(secondDeskCookie, { preferences: [{ kind: 'job_ready', email: 'yes' }] }).expect(400);
    await put(secondDeskCookie, { preferences: [] }).expect(400);
    await put(secondDeskCookie, { preferences: [{ kind: 'job_ready', email: true }], userId: w.people.front_desk.id }).expect(400);
    expect(await NotificationPreference.count({ where: { networkId: w.network.id, userId: secondDesk.id } })).toBe(0);

    const saved = (await put(secondDeskCookie, { preferences: [{ kind: 'transfer_incoming', email: false }] }).expect(200)).body;
    expect(saved.preferences.find((p: { kind: string }) => p.kind === 'transfer_incoming')).toMatchObject({ email: false, chosen: true });
    // saving again overwrites rather than adding a row
    await put(secondDeskCookie, { preferences: [{ kind: 'transfer_incoming', email: true }] }).expect(200);
    expect(await NotificationPreference.findAll({ where: { networkId: w.network.id, userId: secondDesk.id } })).toMatchObject([{ kind: 'transfer_incoming', email: true }]);
    // nobody else's choices changed
    expect(await NotificationPreference.count({ where: { networkId: w.network.id, userId: w.people.front_desk.id } })).toBe(0);
  });

  it('sends "job ready" by e-mail only to the front desk person who chose it; both see it in the inbox', async () => {
    const put = (cookie: string, email: boolean) =>
      request(app).put('/api/notification-preferences').set('Cookie', cookie).send({ preferences: [{ kind: 'job_ready', email }] }).expect(200);
    const move = (jobId: string, to: JobStage) => request(app).post(`/api/jobs/${jobId}/stage`).set('Cookie', w.cookies.technician).send({ to }).expect(200);
    const mailTo = async (address: string, subject: string) => (await listCaughtMail()).filter((m) => m.to.includes(address) && m.subject === subject);

    await put(w.cookies.front_desk, true); // the first desk chooses e-mail; the second keeps the default (inbox only)
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'quality_check', serial: `RD-${uniq()}` });
    await job.update({ assignedUserId: w.people.technician.id });
    const before = { first: await unread(w.cookies.front_desk), second: await unread(secondDeskCookie), tech: await unread(w.cookies.technician) };
    await move(job.id, 'ready');

    const subject = `Job ${job.number} is ready to collect`;
    const mail = await waitForMail((m) => m.subject === subject, { timeoutMs: 20_000 });
    expect(mail.to).toEqual([w.people.front_desk.email]);
    expect(mail.text).toContain(`/jobs/${job.id}`);
    await waitForIdleQueue();
    expect(await mailTo(secondDesk.email, subject)).toHaveLength(0);

    // the inbox: both desks, with a link to the job; not the technician who made the move
    expect(await unread(w.cookies.front_desk)).toBe(before.first + 1);
    expect(await unread(secondDeskCookie)).toBe(before.second + 1);
    expect(await unread(w.cookies.technician)).toBe(before.tech);
    const inbox = (await get(secondDeskCookie, '/api/notifications').expect(200)).body;
    expect(inbox.notifications[0]).toMatchObject({ kind: 'job_ready', title: subject, link: `/jobs/${job.id}?shop=${w.shop.id}`, readAt: null });

    // the choices swap: now only the second desk gets the e-mail
    await put(w.cookies.front_desk, false);
    await put(secondDeskCookie, true);
    const { job: next } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'quality_check' });
    await next.update({ assignedUserId: w.people.technician.id });
    await move(next.id, 'ready');
    const nextSubject = `Job ${next.number} is ready to collect`;
    expect((await waitForMail((m) => m.subject === nextSubject, { timeoutMs: 20_000 })).to).toEqual([secondDesk.email]);
    await waitForIdleQueue();
    expect(await mailTo(w.people.front_desk.email, nextSubject)).toHaveLength(0);
    expect(await OutboxMessage.count({ where: { networkId: w.network.id, sentAt: null } })).toBe(0);
  });

  it('tells the other front desk person when an estimate awaits approval, and nobody by e-mail by default', async () => {
    await request(app).put('/api/notification-preferences').set('Cookie', secondDeskCookie).send({ preferences: [{ kind: 'job_ready', email: false }] }).expect(200);
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage: 'intake' });
    await request(app).post(`/api/jobs/${job.id}/stage`).set('Cookie', w.cookies.front_desk).send({ to: 'assessed' }).expect(200);
    const notices = await Notification.findAll({ where: { networkId: w.network.id, kind: 'estimate_awaiting_approval', link: `/jobs/${job.id}?shop=${w.shop.id}` } });
    expect(notices.map((n) => n.userId)).toEqual([secondDesk.id]);
    expect(notices[0].title).toBe(`Estimate for job ${job.number} awaits approval`);
    // estimate_awaiting_approval is inbox-only until chosen
    expect(await OutboxMessage.count({ where: { networkId: w.network.id, dedupeKey: { [Op.like]: `estimate_awaiting_approval:${job.id}:%` } } })).toBe(0);
  });
});
