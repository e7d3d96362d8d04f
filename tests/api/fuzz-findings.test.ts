import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../server/app.js';
import { JobLineItem, Skill, Transfer } from '../../server/lib/models.js';
import { closeServerResources } from '../helpers/close.js';
import { makeBenchWorld } from '../helpers/bench-world.js';
import { makeInstrumentWithJob } from '../helpers/factories.js';

/**
 * Found by tests/reliability/fuzz-write-routes.test.ts. A NUL character in any text field made
 * PostgreSQL fail the statement and the API answer 500; a lone surrogate was silently stored as U+FFFD.
 * Both are now refused up front with a field error, and nothing is written.
 */
describe('fuzz findings: text that cannot be stored, quantities that round to zero', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner']);
  });
  afterAll(closeServerResources);

  it.each([
    ['a NUL character', 'Low\u0000 brass'],
    ['a lone surrogate', 'Low \ud800brass'],
  ])('renaming a skill with %s is a 400 naming the field, and the name stays', async (_what, name) => {
    const res = await request(app).patch(`/api/skills/${w.skill.id}`).set('Cookie', w.cookies.owner).send({ name });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('invalid_request');
    expect(res.body.error.fields).toEqual({ name: expect.stringMatching(/cannot be stored/) });
    expect((await Skill.findByPk(w.skill.id))?.name).toBe('General woodwind');
  });

  it('a NUL deep in a body and in a query string is named by its path', async () => {
    const res = await request(app)
      .put('/api/pad-rules')
      .query({ note: 'a\u0000b' })
      .set('Cookie', w.cookies.owner)
      .send({ rules: [{ family: 'flute', note: 'ok' }, { family: 'x\u0000' }] });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toEqual({ 'rules.1.family': expect.any(String), note: expect.any(String) });
  });

  it('cancelling a transfer with a NUL in the reason is refused and the transfer stays requested', async () => {
    const { instrument, job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.owner.id, { stage: 'approved' });
    const transfer = await Transfer.create({
      networkId: w.network.id, jobId: job.id, instrumentId: instrument.id, fromShopId: w.shop.id, toShopId: w.otherShop.id,
      reason: 'Needs the flute bench', requestedByUserId: w.people.owner.id,
    });
    const res = await request(app).post(`/api/transfers/${transfer.id}/cancel`).set('Cookie', w.cookies.owner).send({ reason: 'Changed\u0000 plan' });
    expect(res.status).toBe(400);
    expect(res.body.error.fields).toHaveProperty('reason');
    expect((await Transfer.findByPk(transfer.id))?.state).toBe('requested');
  });

  // a quantity of 1e-30 passed "more than zero" and "two decimals" but is 0.00 once stored: the database's check failed with a 500
  it('a line quantity that rounds to zero is a 400 on quantity, and the line keeps its quantity', async () => {
    const { job } = await makeInstrumentWithJob(w.network.id, w.shop.id, w.people.owner.id, { stage: 'assessed' });
    const made = await request(app).post(`/api/jobs/${job.id}/line-items`).set('Cookie', w.cookies.owner)
      .send({ kind: 'part', description: 'Pad', quantity: 2, unitPriceCents: 500 });
    expect(made.status, made.text).toBe(201);
    const itemId = made.body.lineItem?.id ?? made.body.id ?? made.body.lineItems?.[0]?.id;
    expect(itemId).toBeTruthy();
    const res = await request(app).patch(`/api/jobs/${job.id}/line-items/${itemId}`).set('Cookie', w.cookies.owner).send({ quantity: 9.8e-30 });
    expect(res.status, res.text).toBe(400);
    expect(res.body.error.fields).toHaveProperty('quantity');
    expect(Number((await JobLineItem.findByPk(itemId))?.quantity)).toBe(2);
  });
});
