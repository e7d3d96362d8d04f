import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import { signIn } from '../../helpers/sign-in.js';
import { localDate } from '../../../shared/jobs/promised-date.js';
import type { BoardResponse, JobSummary } from '../../../shared/jobs/dto.js';
import type { InstrumentFamily, JobStage } from '../../../shared/domain.js';

const DAY = 86_400_000;
const dateIn = (days: number) => localDate(new Date(Date.now() + days * DAY), 'America/Denver');

describe('the job board and my bench', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;
  let secondTech: { id: string; name: string; email: string };
  const numbers: Record<string, number> = {};

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner', 'technician', 'auditor', 'front_desk']);
    secondTech = await makeUser(w.network.id, [{ shopId: w.shop.id, role: 'technician' }], { name: 'Zora Second-Tech' });
    const add = async (
      key: string,
      stage: JobStage,
      over: { family?: InstrumentFamily; promised?: number | null; assignee?: string | null; skill?: boolean; customer?: boolean } = {},
    ) => {
      const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.front_desk.id, { stage, family: over.family });
      await job.update({
        promisedOn: over.promised == null ? null : dateIn(over.promised),
        assignedUserId: over.assignee ?? null,
        requiredSkillId: over.skill ? w.skill.id : null,
        customerId: over.customer ? w.customer.id : null,
      });
      numbers[key] = job.number;
    };
    await add('late-bench', 'on_bench', { promised: -3, assignee: w.people.technician.id, skill: true, customer: true });
    await add('soon-bench', 'on_bench', { promised: 2, assignee: w.people.technician.id });
    await add('later-qc', 'quality_check', { promised: 9, assignee: w.people.technician.id, family: 'flute' });
    await add('no-promise', 'approved', { promised: null, assignee: w.people.technician.id });
    await add('late-ready', 'ready', { promised: -2, assignee: w.people.technician.id }); // ready: not overdue
    await add('other-tech', 'on_bench', { promised: 1, assignee: secondTech.id, family: 'clarinet' });
    await add('intake-1', 'intake', { promised: 5 });
    await add('intake-2', 'intake', { promised: 6, family: 'flute' });
    await add('held', 'waiting_for_parts', { promised: -1, skill: true });
    await add('done', 'released', { promised: -10, assignee: w.people.technician.id });
    // another shop and another network never show up here
    await makeInstrumentWithJob(w.network.id, w.otherShop.id, w.people.owner.id, { stage: 'intake' });
    const net = await makeNetwork();
    const foreignShop = await makeShop(net.id);
    const foreignOwner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    await makeInstrumentWithJob(net.id, foreignShop.id, foreignOwner.id, { stage: 'intake' });
  });
  afterAll(closeServerResources);

  const board = async (query: Record<string, string | number | boolean>, cookie = w.cookies.owner) => {
    const res = await request(app).get('/api/jobs').query({ shop: w.shop.id, ...query }).set('Cookie', cookie).expect(200);
    return res.body as BoardResponse;
  };
  const nums = (jobs: JobSummary[]) => jobs.map((j) => j.number);
  const n = (...keys: string[]) => keys.map((k) => numbers[k]);

  it('lists open jobs soonest promise first, no promise last, with counts per stage', async () => {
    const b = await board({});
    expect(nums(b.jobs)).toEqual(n('late-bench', 'late-ready', 'held', 'other-tech', 'soon-bench', 'intake-1', 'intake-2', 'later-qc', 'no-promise'));
    expect(b.total).toBe(9);
    expect(b.counts).toEqual({ intake: 2, approved: 1, on_bench: 3, quality_check: 1, ready: 1, waiting_for_parts: 1, released: 1 });
    const late = b.jobs.find((j) => j.number === numbers['late-bench'])!;
    expect(late).toMatchObject({ overdue: true, stage: 'on_bench', customerName: w.customer.name, requiredSkill: { id: w.skill.id } });
    expect(b.jobs.find((j) => j.number === numbers['late-ready'])!.overdue).toBe(false);
    expect(b.filters.technicians.map((t) => t.name).sort()).toEqual([w.people.technician.name, 'Zora Second-Tech'].sort());
  });

  it('filters by stage, technician, skill, family and overdue; counts follow the other filters', async () => {
    expect(nums((await board({ stage: 'on_bench' })).jobs)).toEqual(n('late-bench', 'other-tech', 'soon-bench'));
    expect(nums((await board({ stage: 'released' })).jobs)).toEqual(n('done'));
    const mine = await board({ technician: w.people.technician.id });
    expect(nums(mine.jobs)).toEqual(n('late-bench', 'late-ready', 'soon-bench', 'later-qc', 'no-promise'));
    expect(mine.counts.on_bench).toBe(2);
    expect(nums((await board({ technician: 'unassigned' })).jobs)).toEqual(n('held', 'intake-1', 'intake-2'));
    expect(nums((await board({ skill: w.skill.id })).jobs)).toEqual(n('late-bench', 'held'));
    expect(nums((await board({ family: 'flute' })).jobs)).toEqual(n('intake-2', 'later-qc'));
    expect(nums((await board({ overdue: true })).jobs)).toEqual(n('late-bench', 'held'));
    expect(nums((await board({ overdue: true, stage: 'all' })).jobs)).toEqual(n('late-bench', 'held'));
  });

  it('sorts and pages', async () => {
    const byNumber = await board({ sort: 'number' });
    const sorted = [...nums(byNumber.jobs)].sort((a, b) => a - b);
    expect(nums(byNumber.jobs)).toEqual(sorted);
    expect(nums((await board({ sort: 'number', dir: 'desc' })).jobs)).toEqual([...sorted].reverse());
    const page1 = await board({ sort: 'number', pageSize: 4, page: 1 });
    const page3 = await board({ sort: 'number', pageSize: 4, page: 3 });
    expect(nums(page1.jobs)).toEqual(sorted.slice(0, 4));
    expect(nums(page3.jobs)).toEqual(sorted.slice(8));
    expect(page3.total).toBe(9);
  });

  it('rejects bad filters with field errors', async () => {
    const res = await request(app).get('/api/jobs').query({ shop: w.shop.id, stage: 'polishing', pageSize: 500 }).set('Cookie', w.cookies.owner).expect(400);
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['pageSize', 'stage']);
    await request(app).get('/api/jobs').set('Cookie', w.cookies.owner).expect(400);
  });

  it('shows an auditor their shop’s board but not another shop’s; another network’s shop is not found', async () => {
    expect((await board({}, w.cookies.auditor)).total).toBe(9);
    await request(app).get('/api/jobs').query({ shop: w.otherShop.id }).set('Cookie', w.cookies.auditor).expect(403);
    const net = await makeNetwork();
    const foreignShop = await makeShop(net.id);
    await request(app).get('/api/jobs').query({ shop: foreignShop.id }).set('Cookie', w.cookies.owner).expect(404);
    await request(app).get('/api/jobs').query({ shop: w.shop.id }).expect(401);
  });

  it('my bench: the technician’s own open jobs in order of promise date', async () => {
    const res = await request(app).get('/api/jobs/mine').set('Cookie', w.cookies.technician).expect(200);
    expect(nums(res.body.jobs)).toEqual(n('late-bench', 'late-ready', 'soon-bench', 'later-qc', 'no-promise'));
    const second = await signIn(app, secondTech.email);
    const theirs = await request(app).get('/api/jobs/mine').set('Cookie', second).expect(200);
    expect(nums(theirs.body.jobs)).toEqual(n('other-tech'));
  });
});
