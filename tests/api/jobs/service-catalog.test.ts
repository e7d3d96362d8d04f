import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Skill } from '../../../server/lib/models.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork } from '../../helpers/factories.js';
import { makeBenchWorld } from '../../helpers/bench-world.js';
import type { CatalogItemDto } from '../../../shared/jobs/dto.js';

describe('the service catalog', () => {
  const app = buildApp();
  let w: Awaited<ReturnType<typeof makeBenchWorld>>;

  beforeAll(async () => {
    w = await makeBenchWorld(app, ['owner', 'front_desk', 'technician', 'auditor']);
  });
  afterAll(closeServerResources);

  const names = (items: CatalogItemDto[]) => items.map((i) => i.name);

  it('the owner adds and edits services; the list is the network’s own', async () => {
    const created = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name: 'Neck cork replacement', family: null, standardHours: 0.75, skillId: w.skill.id })
      .expect(201);
    expect(created.body.item).toMatchObject({ name: 'Neck cork replacement', standardHours: 0.75, skill: { id: w.skill.id }, active: true });
    const changed = await request(app)
      .patch(`/api/service-catalog/${created.body.item.id}`)
      .set('Cookie', w.cookies.owner)
      .send({ standardHours: 1.25, active: false })
      .expect(200);
    expect(changed.body.item).toMatchObject({ standardHours: 1.25, active: false });

    const list = await request(app).get('/api/service-catalog').set('Cookie', w.cookies.front_desk).expect(200);
    expect(names(list.body.items)).toEqual(['Leak test & adjust', 'Repad — alto saxophone', 'Repad — flute']);
    const all = await request(app).get('/api/service-catalog').query({ includeInactive: 'true' }).set('Cookie', w.cookies.owner).expect(200);
    expect(names(all.body.items)).toContain('Neck cork replacement');
  });

  it('filters by family, keeping services for any family', async () => {
    const res = await request(app).get('/api/service-catalog').query({ family: 'alto_saxophone' }).set('Cookie', w.cookies.technician).expect(200);
    expect(names(res.body.items)).toEqual(['Leak test & adjust', 'Repad — alto saxophone']);
    // the cautions come from the owner's tags (tests/helpers/bench-world.ts tags the repad), not from the name
    const repad = (res.body.items as CatalogItemDto[]).find((i) => i.name.startsWith('Repad'))!;
    expect(repad.hazards).toEqual(['adhesive', 'solvent', 'heat_flame', 'springs_sharp', 'pad_removal']);
    expect(repad.cautions.map((c) => c.hazard)).toEqual(repad.hazards);
    expect((res.body.items as CatalogItemDto[]).find((i) => i.name.startsWith('Leak'))!.cautions).toEqual([]);
  });

  it('only the owner edits; auditors do not read it; field errors come back by name', async () => {
    await request(app).post('/api/service-catalog').set('Cookie', w.cookies.front_desk).send({ name: 'X', family: null, standardHours: 1, skillId: null }).expect(403);
    await request(app).patch(`/api/service-catalog/${w.catalog.leakTest.id}`).set('Cookie', w.cookies.technician).send({ standardHours: 2 }).expect(403);
    await request(app).get('/api/service-catalog').set('Cookie', w.cookies.auditor).expect(403);
    const bad = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name: '', family: 'kazoo', standardHours: 1.005, skillId: null })
      .expect(400);
    expect(Object.keys(bad.body.error.fields).sort()).toEqual(['family', 'name', 'standardHours']);
    const foreign = await makeNetwork();
    const foreignSkill = await Skill.create({ networkId: foreign.id, code: 'flute', name: 'Flutes' });
    const wrongSkill = await request(app)
      .post('/api/service-catalog')
      .set('Cookie', w.cookies.owner)
      .send({ name: 'Headjoint cork', family: 'flute', standardHours: 0.5, skillId: foreignSkill.id })
      .expect(400);
    expect(wrongSkill.body.error.fields.skillId).toBeTruthy();
  });
});
