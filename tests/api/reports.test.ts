import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { Customer, Instrument, Job, JobLineItem, ShopSkill, Skill, Transfer } from '../../server/lib/models.js';
import { localDateIn } from '../../shared/reports/business-days.js';
import type { JobStage } from '../../shared/domain.js';
import type { DashboardReport } from '../../shared/reports/schemas.js';
import { closeServerResources } from '../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../helpers/factories.js';
import { signIn } from '../helpers/sign-in.js';

/**
 * A small network with known answers: three shops in three time zones, people in every role, open
 * jobs at every stage, promises kept and broken, transfers on the road and two released jobs to bill.
 */

const DAY = 86_400_000;
/** The shop's calendar date `days` from today (negative: in the past). */
function shopDate(days: number, timeZone: string): string {
  const today = localDateIn(new Date(), timeZone);
  return new Date(Date.parse(`${today}T12:00:00Z`) + days * DAY).toISOString().slice(0, 10);
}

describe('reports API: figures, scope per role, CSV and invoices', () => {
  const app = buildApp();
  const cookies: Record<string, string> = {};
  const ids: Record<string, string> = {};
  let jobSeq = 50_000 + Math.floor(Math.random() * 1_000_000);

  beforeAll(async () => {
    const net = await makeNetwork();
    const networkId = net.id;
    const A = await makeShop(networkId, { name: 'Alder bench', timeZone: 'America/Los_Angeles' });
    const B = await makeShop(networkId, { name: 'Birch bench', timeZone: 'America/Chicago' });
    const C = await makeShop(networkId, { name: 'Cedar bench', timeZone: 'America/Denver' });
    await B.update({ openingDays: [2, 3, 4, 5, 6] });
    Object.assign(ids, { A: A.id, B: B.id, C: C.id });

    const owner = await makeUser(networkId, [{ shopId: null, role: 'owner' }]);
    const manager = await makeUser(networkId, [{ shopId: A.id, role: 'regional_manager' }, { shopId: B.id, role: 'regional_manager' }]);
    const desk = await makeUser(networkId, [{ shopId: A.id, role: 'front_desk' }]);
    const tech = await makeUser(networkId, [{ shopId: B.id, role: 'technician' }], { name: 'Tamsin Reedley' });
    const auditor = await makeUser(networkId, [{ shopId: C.id, role: 'auditor' }]);

    const woodwind = await Skill.create({ networkId, code: `woodwind_${uniq().replace(/-/g, '')}`, name: 'General woodwind' });
    const brass = await Skill.create({ networkId, code: `brass_${uniq().replace(/-/g, '')}`, name: 'Brass dent work' });
    Object.assign(ids, { woodwind: woodwind.id, brass: brass.id });
    await ShopSkill.bulkCreate([
      { networkId, shopId: A.id, skillId: woodwind.id, weeklyBenchHours: 40 },
      { networkId, shopId: A.id, skillId: brass.id, weeklyBenchHours: 10 },
      { networkId, shopId: B.id, skillId: woodwind.id, weeklyBenchHours: 20 },
    ]);
    const school = await Customer.create({ networkId, kind: 'school', name: 'Quillfeather "North" School, Band Dept', homeShopId: A.id });
    const trickster = await Customer.create({ networkId, kind: 'person', name: '=HYPERLINK("http://example.test","pay")', homeShopId: B.id });

    const job = async (
      key: string,
      shop: { id: string; timeZone: string },
      stage: JobStage,
      over: Partial<{ skill: string; hours: number; promisedInDays: number; openedAt: Date; readyAt: Date; releasedAt: Date; customerId: string; assignee: string }> = {},
    ) => {
      const instrument = await Instrument.create({
        networkId, family: key.startsWith('b') ? 'trumpet' : 'alto_saxophone', maker: 'Fernleigh', model: 'F-2', serial: `RP-${uniq()}`,
        ownerKind: over.customerId ? 'school' : 'rental_fleet', ownerCustomerId: over.customerId ?? null, currentShopId: shop.id,
      });
      const created = await Job.create({
        networkId, number: jobSeq++, instrumentId: instrument.id, shopId: shop.id, stage, customerId: over.customerId ?? null,
        complaint: 'Leaks', openedByUserId: owner.id, requiredSkillId: over.skill ?? null, estimatedHours: over.hours ?? null,
        promisedOn: over.promisedInDays == null ? null : shopDate(over.promisedInDays, shop.timeZone),
        assignedUserId: over.assignee ?? null,
        ...(over.openedAt ? { openedAt: over.openedAt } : {}),
        ...(over.readyAt ? { readyAt: over.readyAt } : {}),
        ...(stage === 'released' ? { releasedAt: over.releasedAt ?? new Date() } : {}),
        ...(stage === 'waiting_for_parts' || stage === 'in_transit' ? { stageBeforeHold: 'approved' as const } : {}),
      });
      ids[key] = created.id;
      ids[`${key}#`] = String(created.number);
      ids[`${key}@`] = instrument.id;
      return created;
    };

    // Alder (Seattle time, Mon–Fri, 10 % tax invented for the test)
    await job('a1', A, 'intake', { skill: woodwind.id, promisedInDays: -1, customerId: school.id });
    await job('a2', A, 'on_bench', { skill: woodwind.id, hours: 12, promisedInDays: -3 });
    await job('a3', A, 'ready', { skill: woodwind.id, hours: 5, promisedInDays: -2, readyAt: new Date() });
    await job('a4', A, 'released', { promisedInDays: -10, openedAt: new Date(Date.now() - 100 * DAY) });
    await job('a5', A, 'approved', { skill: brass.id, hours: 4.5, promisedInDays: 0 });
    await job('a6', A, 'waiting_for_parts', { skill: brass.id, hours: 6 });
    await job('a7', A, 'in_transit', { skill: woodwind.id, hours: 3, promisedInDays: -4 });
    // Birch (Chicago time, Tue–Sat): needs brass work it has no bench hours for
    await job('b8', B, 'on_bench', { skill: woodwind.id, hours: 7.5, promisedInDays: -1, customerId: trickster.id, assignee: tech.id });
    await job('b9', B, 'quality_check', { skill: brass.id, hours: 2 });
    // Cedar (Denver time): one job taken in more than a year ago, still open
    await job('c10', C, 'intake', { openedAt: new Date(Date.now() - 400 * DAY) });

    await Transfer.create({
      networkId, jobId: ids.a7, instrumentId: ids['a7@'], fromShopId: A.id, toShopId: C.id, state: 'in_transit', reason: 'Needs Cedar’s bench',
      requestedByUserId: manager.id, departedAt: new Date(Date.now() - 2 * DAY), expectedArrivalAt: new Date(Date.now() - 3_600_000),
    });
    await Transfer.create({
      networkId, jobId: ids.b9, instrumentId: ids['b9@'], fromShopId: B.id, toShopId: A.id, state: 'in_transit', reason: 'Brass bench at Alder',
      requestedByUserId: manager.id, departedAt: new Date(), expectedArrivalAt: new Date(Date.now() + DAY),
    });

    // two released jobs to bill; Alder's left at 21:30 on 1 March in Seattle, already 2 March in UTC
    const billed = await job('inv1', A, 'released', {
      customerId: school.id, openedAt: new Date('2026-02-20T17:00:00Z'), releasedAt: new Date('2026-03-02T05:30:00Z'),
    });
    await JobLineItem.bulkCreate([
      { networkId, jobId: billed.id, kind: 'labor', description: 'Repad — alto saxophone', hours: 1.25, rateCents: 9250, position: 0 },
      { networkId, jobId: billed.id, kind: 'part', description: 'Glued pad 10.0 mm', quantity: 0.5, unitPriceCents: 125, position: 1 },
      { networkId, jobId: billed.id, kind: 'part', description: 'Pad cement stick', quantity: 1, unitPriceCents: 719, position: 2 },
    ]);
    await job('binv2', B, 'released', { customerId: trickster.id, openedAt: new Date('2026-02-25T17:00:00Z'), releasedAt: new Date('2026-03-01T12:00:00Z') });

    // another network's shop: its id must never answer
    const other = await makeNetwork();
    ids.otherShop = (await makeShop(other.id, { name: 'Elsewhere bench' })).id;

    for (const [role, user] of Object.entries({ owner, manager, desk, tech, auditor })) cookies[role] = await signIn(app, user.email);
  });
  afterAll(closeServerResources);

  const dashboard = async (who: string, query = '') =>
    (await request(app).get(`/api/reports/dashboard${query}`).set('Cookie', cookies[who]).expect(200)).body as DashboardReport;

  it('the owner’s dashboard: open jobs by stage, overdue promises on each shop’s calendar, transfers, bench load', async () => {
    const d = await dashboard('owner');
    expect(d.shops.map((s) => s.name)).toEqual(['Alder bench', 'Birch bench', 'Cedar bench']);
    const stages = (shop: string) => Object.fromEntries(d.openJobsByStage.filter((r) => r.shopId === shop).map((r) => [r.stage, r.count]));
    expect(stages(ids.A)).toEqual({ intake: 1, on_bench: 1, ready: 1, approved: 1, waiting_for_parts: 1, in_transit: 1 });
    expect(stages(ids.B)).toEqual({ on_bench: 1, quality_check: 1 });
    expect(stages(ids.C)).toEqual({ intake: 1 });

    // a1 (1 day late), a2 (3), a7 (4, on the road) at Alder; b8 at Birch. a3 is ready (kept), a5 is due today.
    expect(d.overdue.total).toBe(4);
    expect(Object.fromEntries(d.overdue.byShop.map((r) => [r.shopId, r.count]))).toEqual({ [ids.A]: 3, [ids.B]: 1 });
    // most days late first; a tie goes by job number (a1 was numbered before b8)
    expect(d.overdue.oldest.map((j) => [j.id, j.daysLate])).toEqual([[ids.a7, 4], [ids.a2, 3], [ids.a1, 1], [ids.b8, 1]]);

    expect(d.transfersInFlight.total).toBe(2);
    expect(d.transfersInFlight.late).toBe(1);
    expect(d.transfersInFlight.items.map((t) => [t.fromShopName, t.toShopName, t.late])).toEqual([
      ['Alder bench', 'Cedar bench', true],
      ['Birch bench', 'Alder bench', false],
    ]);

    const load = Object.fromEntries(d.benchLoad.map((r) => [`${r.shopId}:${r.skillId}`, r]));
    // ready (a3) and on-the-road (a7) work is not waiting for Alder's bench; a1 has no estimate yet
    expect(load[`${ids.A}:${ids.woodwind}`]).toMatchObject({ weeklyBenchHours: 40, openHours: 12, openJobs: 2, unestimatedJobs: 1, weeksOfWork: 0.3 });
    expect(load[`${ids.A}:${ids.brass}`]).toMatchObject({ weeklyBenchHours: 10, openHours: 10.5, openJobs: 2, weeksOfWork: 1.05 });
    expect(load[`${ids.B}:${ids.woodwind}`]).toMatchObject({ weeklyBenchHours: 20, openHours: 7.5, openJobs: 1, weeksOfWork: 0.38 });
    // Birch has brass work but no brass bench hours: shown, with no ratio
    expect(load[`${ids.B}:${ids.brass}`]).toMatchObject({ weeklyBenchHours: 0, openHours: 2, openJobs: 1, weeksOfWork: null });
    expect(d.benchLoad).toHaveLength(4);

    // 52 weeks, every week present; the job taken in 400 days ago is outside
    expect(d.weeklyIntake).toHaveLength(52);
    // nine jobs opened in the last 100 days, plus the two billed jobs while February 2026 is within the 52 weeks
    const firstWeek = Date.parse(`${d.weeklyIntake[0].weekStart}T00:00:00Z`);
    const billedInWindow = [Date.parse('2026-02-20T17:00:00Z'), Date.parse('2026-02-25T17:00:00Z')].filter((t) => t >= firstWeek).length;
    expect(d.weeklyIntake.reduce((a, w) => a + w.total, 0)).toBe(9 + billedInWindow);
    expect(new Date(`${d.weeklyIntake[0].weekStart}T00:00:00Z`).getUTCDay()).toBe(1); // Mondays
  });

  it('each role sees only its shops’ figures', async () => {
    const shopsOf = (d: DashboardReport) => ({
      shops: d.shops.map((s) => s.id).sort(),
      stageShops: [...new Set(d.openJobsByStage.map((r) => r.shopId))].sort(),
      loadShops: [...new Set(d.benchLoad.map((r) => r.shopId))].sort(),
      overdue: d.overdue.total,
      transfers: d.transfersInFlight.items.map((t) => `${t.fromShopName}>${t.toShopName}`).sort(),
    });
    const sorted = (...xs: string[]) => xs.sort();

    expect(shopsOf(await dashboard('manager'))).toEqual({
      shops: sorted(ids.A, ids.B), stageShops: sorted(ids.A, ids.B), loadShops: sorted(ids.A, ids.B), overdue: 4,
      transfers: ['Alder bench>Cedar bench', 'Birch bench>Alder bench'],
    });
    expect(shopsOf(await dashboard('desk'))).toEqual({
      shops: [ids.A], stageShops: [ids.A], loadShops: [ids.A], overdue: 3,
      transfers: ['Alder bench>Cedar bench', 'Birch bench>Alder bench'],
    });
    expect(shopsOf(await dashboard('tech'))).toEqual({
      shops: [ids.B], stageShops: [ids.B], loadShops: [ids.B], overdue: 1, transfers: ['Birch bench>Alder bench'],
    });
    expect(shopsOf(await dashboard('auditor'))).toEqual({
      shops: [ids.C], stageShops: [ids.C], loadShops: [], overdue: 0, transfers: ['Alder bench>Cedar bench'],
    });
    // the owner may narrow to one shop
    expect(shopsOf(await dashboard('owner', `?shop=${ids.B}`))).toMatchObject({ shops: [ids.B], overdue: 1 });
  });

  it('refuses another shop’s figures, hides another network’s shop, and needs sign-in', async () => {
    const get = (who: string | null, path: string) => {
      const r = request(app).get(path);
      return who ? r.set('Cookie', cookies[who]) : r;
    };
    await get('desk', `/api/reports/dashboard?shop=${ids.B}`).expect(403);
    await get('tech', `/api/reports/overdue?shop=${ids.A}`).expect(403);
    await get('auditor', `/api/reports/jobs?shop=${ids.A}`).expect(403);
    await get('manager', `/api/reports/bench-load.csv?shop=${ids.C}`).expect(403);
    await get('owner', `/api/reports/dashboard?shop=${ids.otherShop}`).expect(404);
    const bad = await get('owner', '/api/reports/dashboard?shop=not-a-shop').expect(400);
    expect(bad.body.error.fields.shop).toBeTruthy();
    const badWeek = await get('owner', '/api/reports/jobs?week=2026-02-30').expect(400);
    expect(badWeek.body.error.fields.week).toBe('That date does not exist.');
    await get('owner', '/api/reports/jobs?stage=sideways').expect(400);
    await get(null, '/api/reports/dashboard').expect(401);
    await get(null, '/api/reports/overdue.csv').expect(401);
  });

  it('lists the jobs behind a figure, within the person’s shops', async () => {
    const list = async (who: string, query: string) =>
      (await request(app).get(`/api/reports/jobs?${query}`).set('Cookie', cookies[who]).expect(200)).body as { total: number; items: Array<{ id: string }> };
    const idsOf = (l: { items: Array<{ id: string }> }) => l.items.map((j) => j.id).sort();

    expect(idsOf(await list('owner', `shop=${ids.A}&stage=intake`))).toEqual([ids.a1]);
    // the bench-load bar of Alder's woodwind bench
    expect(idsOf(await list('owner', `shop=${ids.A}&skill=${ids.woodwind}`))).toEqual([ids.a1, ids.a2].sort());
    expect((await list('owner', `shop=${ids.A}&stage=open`)).total).toBe(6);
    expect((await list('owner', 'family=trumpet&stage=open')).total).toBe(2);
    // stage=bench is the bench-load stages: not ready (a3) and not on the road (a7)
    expect(idsOf(await list('owner', `shop=${ids.A}&stage=bench`))).toEqual([ids.a1, ids.a2, ids.a5, ids.a6].sort());
    // front desk at Alder asking for every open job gets Alder's only
    const desk = await list('desk', 'stage=open');
    expect(desk.total).toBe(6);
    expect(idsOf(desk)).not.toContain(ids.b8);

    const overdue = (await request(app).get('/api/reports/overdue').set('Cookie', cookies.tech).expect(200)).body;
    expect(overdue.items.map((j: { id: string; assigneeName: string }) => [j.id, j.assigneeName])).toEqual([[ids.b8, 'Tamsin Reedley']]);
  });

  it('exports figures as CSV files with a name, escaping commas, quotes and would-be formulas', async () => {
    const res = await request(app).get('/api/reports/overdue.csv').set('Cookie', cookies.owner).expect(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv; charset=utf-8/);
    expect(res.headers['content-disposition']).toMatch(/^attachment; filename="benchrelay-overdue-all-shops-\d{4}-\d{2}-\d{2}\.csv"$/);
    const lines = res.text.trimEnd().split('\r\n');
    expect(lines[0]).toBe('job_number,shop,stage,family,maker,model,serial,customer,promised_on,days_late,assignee');
    expect(lines).toHaveLength(5);
    expect(res.text).toContain('"Quillfeather ""North"" School, Band Dept"');
    expect(res.text).toContain(`"'=HYPERLINK(""http://example.test"",""pay"")"`);

    const one = await request(app).get(`/api/reports/bench-load.csv?shop=${ids.B}`).set('Cookie', cookies.manager).expect(200);
    expect(one.headers['content-disposition']).toMatch(/filename="benchrelay-bench-load-t[0-9a-z]+-/);
    expect(one.text.split('\r\n')[0]).toBe('shop_code,shop,skill,weekly_bench_hours,open_hours,open_jobs,unestimated_jobs,weeks_of_work');
    expect(one.text).toContain('Birch bench,Brass dent work,0,2,1,0,\r\n');

    for (const name of ['open-jobs', 'transfers', 'turnaround', 'weekly-intake', 'jobs']) {
      const r = await request(app).get(`/api/reports/${name}.csv`).set('Cookie', cookies.manager).expect(200);
      expect(r.headers['content-type']).toMatch(/^text\/csv/);
      expect(r.text.endsWith('\r\n')).toBe(true);
    }
    const weekly = await request(app).get('/api/reports/weekly-intake.csv').set('Cookie', cookies.manager).expect(200);
    expect(weekly.text.trimEnd().split('\r\n')).toHaveLength(53);
  });

  it('every report CSV needs the export permission: technicians and auditors read the figures but download no file', async () => {
    const files = ['open-jobs', 'overdue', 'transfers', 'bench-load', 'turnaround', 'weekly-intake', 'jobs'];
    for (const name of files) {
      for (const [who, shop] of [['tech', ids.B], ['auditor', ids.C]] as const) {
        const scoped = await request(app).get(`/api/reports/${name}.csv?shop=${shop}`).set('Cookie', cookies[who]);
        expect([name, who, scoped.status]).toEqual([name, who, 403]);
        expect(scoped.headers['content-type']).toMatch(/json/);
        expect(scoped.text).not.toContain('job_number');
        const all = await request(app).get(`/api/reports/${name}.csv`).set('Cookie', cookies[who]);
        expect([name, who, all.status]).toEqual([name, who, 403]);
      }
    }
    // the same people still read the figures on screen
    await request(app).get(`/api/reports/overdue?shop=${ids.B}`).set('Cookie', cookies.tech).expect(200);
    await request(app).get(`/api/reports/jobs?shop=${ids.C}`).set('Cookie', cookies.auditor).expect(200);
    // front desk, who bills at the counter, downloads their shop's files
    await request(app).get(`/api/reports/overdue.csv?shop=${ids.A}`).set('Cookie', cookies.desk).expect(200);
  });

  it('invoice CSV: released jobs by the shop’s release date, line totals, tax and totals in whole cents', async () => {
    const res = await request(app)
      .get('/api/reports/invoices.csv?from=2026-03-01&to=2026-03-01')
      .set('Cookie', cookies.owner)
      .expect(200);
    expect(res.headers['content-disposition']).toContain('benchrelay-invoices-2026-03-01-to-2026-03-01-all-shops');
    const [header, ...rows] = res.text.trimEnd().split('\r\n');
    expect(header).toBe(
      'job_number,released_on,shop_code,shop,customer,instrument,serial,line_no,line_kind,description,hours_or_quantity,unit_price_cents,line_total_cents,line_total,subtotal_cents,tax_rate_percent,tax_cents,total_cents,subtotal,tax,total,po_number,tax_exempt_certificate',
    );
    expect(rows).toHaveLength(4);
    const alder = rows.filter((r) => r.startsWith(`${ids['inv1#']},2026-03-01,`));
    expect(alder).toHaveLength(3);
    // 1.25 h × $92.50 = $115.625 → 11 563 ¢; 0.5 × 125 ¢ = 62.5 → 63 ¢; 719 ¢. Subtotal 12 345 ¢,
    // 10 % tax (invented for the test) = 1 234.5 → 1 235 ¢ (half away from zero, Benchrelay's rule), total 13 580 ¢.
    expect(alder[0]).toContain(',1,labor,Repad — alto saxophone,1.25,9250,11563,115.63,12345,10,1235,13580,123.45,12.35,135.80');
    expect(alder[1]).toContain(',2,part,Glued pad 10.0 mm,0.5,125,63,0.63,12345,');
    expect(alder[2]).toContain(',3,part,Pad cement stick,1,719,719,7.19,12345,');
    expect(alder[0]).toContain('"Quillfeather ""North"" School, Band Dept"');
    // Birch's job has no line items: one row, zero totals, the customer's formula defused
    const birch = rows.find((r) => r.startsWith(`${ids['binv2#']},2026-03-01,`))!;
    expect(birch).toContain(`"'=HYPERLINK(""http://example.test"",""pay"")"`);
    expect(birch.endsWith(',,,,,,,0,10,0,0,0.00,0.00,0.00,,')).toBe(true);

    // released at 05:30 UTC on 2 March is still 1 March in Seattle: not in a 2 March export
    const next = await request(app).get('/api/reports/invoices.csv?from=2026-03-02&to=2026-03-31').set('Cookie', cookies.owner).expect(200);
    expect(next.text.trimEnd().split('\r\n')).toHaveLength(1);
  });

  it('invoice CSV: front desk exports their shop only; technicians and auditors may not export; bad dates are field errors', async () => {
    const desk = await request(app).get('/api/reports/invoices.csv?from=2026-03-01&to=2026-03-01').set('Cookie', cookies.desk).expect(200);
    const deskRows = desk.text.trimEnd().split('\r\n').slice(1);
    expect(deskRows).toHaveLength(3);
    expect(deskRows.every((r) => r.includes(',Alder bench,'))).toBe(true);
    await request(app).get('/api/reports/invoices.csv?from=2026-03-01&to=2026-03-01').set('Cookie', cookies.tech).expect(403);
    await request(app).get('/api/reports/invoices.csv?from=2026-03-01&to=2026-03-01').set('Cookie', cookies.auditor).expect(403);
    await request(app).get(`/api/reports/invoices.csv?from=2026-03-01&to=2026-03-01&shop=${ids.C}`).set('Cookie', cookies.manager).expect(403);
    const bad = await request(app).get('/api/reports/invoices.csv?from=2026-03-09&to=2026-03-01').set('Cookie', cookies.owner).expect(400);
    expect(bad.body.error.fields.to).toMatch(/before the start/);
    const missing = await request(app).get('/api/reports/invoices.csv').set('Cookie', cookies.owner).expect(400);
    expect(Object.keys(missing.body.error.fields).sort()).toEqual(['from', 'to']);
  });
});
