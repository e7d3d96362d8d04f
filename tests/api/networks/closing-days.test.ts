import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { AuditLog, Shop, ShopClosingDay } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';

/** Closing days the owner sets per shop: who may read and change them, and what they do to promised dates. */
describe('a shop’s closing days', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner', 'front_desk', 'technician', 'auditor', 'regional_manager']);
  });
  afterAll(closeServerResources);

  const daysOf = async (shopId: string) =>
    (await ShopClosingDay.findAll({ where: { networkId: w.network.id, shopId }, order: [['date', 'ASC']] })).map((d) => ({ date: d.date, reason: d.reason }));

  it('the owner adds one (a past day too), everyone at the shop reads them, the owner removes one; each change is logged', async () => {
    const path = `/api/shops/${w.shop.id}/closing-days`;
    const added = await request(app).post(path).set('Cookie', w.cookies.owner).send({ date: '2027-08-16', reason: ' Stocktake ' });
    expect(added.status, JSON.stringify(added.body)).toBe(201);
    expect(added.body.closingDays).toEqual([{ date: '2027-08-16', reason: 'Stocktake' }]);
    await request(app).post(path).set('Cookie', w.cookies.owner).send({ date: '2026-01-02', reason: 'Bench move' }).expect(201);

    for (const role of ['front_desk', 'technician', 'auditor', 'regional_manager'] as const) {
      const read = await request(app).get(path).set('Cookie', w.cookies[role]).expect(200);
      expect(read.body.closingDays).toEqual([{ date: '2026-01-02', reason: 'Bench move' }, { date: '2027-08-16', reason: 'Stocktake' }]);
    }

    const logs = await AuditLog.findAll({ where: { networkId: w.network.id, entity: 'Shop', entityId: w.shop.id, action: 'shop.closing_day_added' } });
    const log = logs.find((l) => (l.after as { date?: string } | null)?.date === '2027-08-16');
    expect(log).toMatchObject({ actorUserId: w.people.owner.id, before: null, after: { date: '2027-08-16', reason: 'Stocktake' } });

    const removed = await request(app).delete(`${path}/2026-01-02`).set('Cookie', w.cookies.owner).expect(200);
    expect(removed.body.closingDays).toEqual([{ date: '2027-08-16', reason: 'Stocktake' }]);
    expect(await daysOf(w.shop.id)).toEqual([{ date: '2027-08-16', reason: 'Stocktake' }]);
    const gone = await AuditLog.findOne({ where: { networkId: w.network.id, entityId: w.shop.id, action: 'shop.closing_day_removed' } });
    expect(gone).toMatchObject({ actorUserId: w.people.owner.id, before: { date: '2026-01-02', reason: 'Bench move' }, after: null });

    const again = await request(app).delete(`${path}/2026-01-02`).set('Cookie', w.cookies.owner).expect(404);
    expect(again.body.error.code).toBe('not_found');
  });

  it('refuses a day already closed (409), a day that is not on the calendar and a missing reason (400 on the field), changing nothing', async () => {
    const path = `/api/shops/${w.shop.id}/closing-days`;
    const before = await daysOf(w.shop.id);
    const dup = await request(app).post(path).set('Cookie', w.cookies.owner).send({ date: '2027-08-16', reason: 'Again' }).expect(409);
    expect(dup.body.error.fields.date).toMatch(/Already/);
    for (const date of ['2027-02-29', '2026-13-01', '2027-04-31', '16/08/2027', '']) {
      const bad = await request(app).post(path).set('Cookie', w.cookies.owner).send({ date, reason: 'Stocktake' }).expect(400);
      expect(bad.body.error.fields.date, date).toMatch(/real calendar day|Choose the day/);
    }
    const noReason = await request(app).post(path).set('Cookie', w.cookies.owner).send({ date: '2027-08-17', reason: '  ' }).expect(400);
    expect(Object.keys(noReason.body.error.fields)).toEqual(['reason']);
    const badPath = await request(app).delete(`${path}/2027-02-30`).set('Cookie', w.cookies.owner).expect(400);
    expect(badPath.body.error.fields.date).toMatch(/real calendar day/);
    expect(await daysOf(w.shop.id)).toEqual(before);
  });

  it('refuses everyone but the owner (403) and changes nothing', async () => {
    const path = `/api/shops/${w.shop.id}/closing-days`;
    const before = await daysOf(w.shop.id);
    for (const role of ['front_desk', 'technician', 'auditor', 'regional_manager'] as const) {
      const add = await request(app).post(path).set('Cookie', w.cookies[role]).send({ date: '2027-09-01', reason: 'Not mine to close' }).expect(403);
      expect(add.body.error.code).toBe('forbidden');
      await request(app).delete(`${path}/2027-08-16`).set('Cookie', w.cookies[role]).expect(403);
    }
    expect(await daysOf(w.shop.id)).toEqual(before);
    expect(await AuditLog.count({ where: { networkId: w.network.id, action: 'shop.closing_day_added' } })).toBe(2);
  });

  it('another network’s shop is not found, for reading and for changing, and keeps its days', async () => {
    const other = await makeNetwork();
    const foreign = await makeShop(other.id);
    await ShopClosingDay.create({ networkId: other.id, shopId: foreign.id, date: '2027-08-20', reason: 'Their own day' });
    const path = `/api/shops/${foreign.id}/closing-days`;
    const read = await request(app).get(path).set('Cookie', w.cookies.owner).expect(404);
    expect(read.text).not.toContain('Their own day');
    await request(app).post(path).set('Cookie', w.cookies.owner).send({ date: '2027-08-21', reason: 'Intruding' }).expect(404);
    await request(app).delete(`${path}/2027-08-20`).set('Cookie', w.cookies.owner).expect(404);
    const kept = await ShopClosingDay.findAll({ where: { networkId: other.id, shopId: foreign.id } });
    expect(kept.map((d) => d.date)).toEqual(['2027-08-20']);
  });

  it('a promise in opening days steps over a closing day, and the job page carries the closing days for its preview', async () => {
    // a shop of its own (Mon–Fri, Denver) so the other tests' days do not matter; ZZ is an ISO 3166 user-assigned
    // code with no holiday calendar, so only weekdays and the closing day count whatever today is
    const shop = await makeShop(w.network.id, { timeZone: 'America/Denver' });
    await Shop.update({ country: 'ZZ' }, { where: { networkId: w.network.id, id: shop.id } });
    const { job } = await makeInstrumentWithJob(w.network.id, shop.id, w.people.owner.id, { stage: 'approved' });

    // Worked by hand: today's date in Denver does not count; the next weekday is +3 days from a Friday, +2 from a
    // Saturday, +1 otherwise. Closing that day pushes a 1-opening-day promise to the weekday after it (+3 days if
    // the closed day is a Friday, else +1).
    const [y, m, d] = new Intl.DateTimeFormat('en-CA', { timeZone: 'America/Denver' }).format(new Date()).split('-').map(Number);
    const today = new Date(Date.UTC(y, m - 1, d));
    const day = (from: Date, n: number) => new Date(from.getTime() + n * 86_400_000);
    const firstOpen = day(today, { 5: 3, 6: 2 }[today.getUTCDay()] ?? 1);
    const secondOpen = day(firstOpen, firstOpen.getUTCDay() === 5 ? 3 : 1);
    const iso = (t: Date) => t.toISOString().slice(0, 10);

    const plain = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', w.cookies.owner).send({ promiseInOpeningDays: 1 }).expect(200);
    expect(plain.body.job.promisedOn).toBe(iso(firstOpen));

    await request(app).post(`/api/shops/${shop.id}/closing-days`).set('Cookie', w.cookies.owner).send({ date: iso(firstOpen), reason: 'Stocktake' }).expect(201);
    const moved = await request(app).patch(`/api/jobs/${job.id}`).set('Cookie', w.cookies.owner).send({ promiseInOpeningDays: 1 }).expect(200);
    expect(moved.body.job.promisedOn).toBe(iso(secondOpen));
    expect(moved.body.shop.closedDays).toEqual([iso(firstOpen)]);
  });
});
