import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { badRequest, notFound } from '../../lib/errors.js';
import {
  closingDayInputSchema,
  closingDayParamSchema,
  relayRunInputSchema,
  relayRunQuerySchema,
  relayRunUpdateSchema,
  shopInputSchema,
  shopSkillsSchema,
  shopUpdateSchema,
  skillInputSchema,
  skillUpdateSchema,
  technicianSkillsSchema,
} from '../../../shared/schemas/shops.js';
import {
  addClosingDay,
  createRelayRun,
  createShop,
  createSkill,
  getShop,
  listClosingDays,
  listRelayRuns,
  listShops,
  listSkills,
  removeClosingDay,
  removeRelayRun,
  setShopSkills,
  setTechnicianSkills,
  shopSummaries,
  updateRelayRun,
  updateShop,
  updateSkill,
} from './service.js';

export const networksRouter = Router();

const uuid = z.uuid();
/** A uuid route parameter; anything else cannot name a record, so it is simply not found. */
function idParam(value: string | string[] | undefined, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

networksRouter.get('/api/shops/summary', requireActor, async (req, res) => {
  res.json({ shops: await shopSummaries(actorOf(req)) });
});

networksRouter.get('/api/shops', requireActor, async (req, res) => {
  res.json({ shops: await listShops(actorOf(req)) });
});

networksRouter.post('/api/shops', requireActor, async (req, res) => {
  res.status(201).json({ shop: await createShop(actorOf(req), shopInputSchema.parse(req.body)) });
});

networksRouter.get('/api/shops/:id', requireActor, async (req, res) => {
  res.json({ shop: await getShop(actorOf(req), idParam(req.params.id, 'That shop')) });
});

networksRouter.patch('/api/shops/:id', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That shop');
  res.json({ shop: await updateShop(actorOf(req), id, shopUpdateSchema.parse(req.body)) });
});

networksRouter.put('/api/shops/:id/skills', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That shop');
  res.json({ shop: await setShopSkills(actorOf(req), id, shopSkillsSchema.parse(req.body)) });
});

networksRouter.put('/api/shops/:id/technician-skills', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That shop');
  res.json({ shop: await setTechnicianSkills(actorOf(req), id, technicianSkillsSchema.parse(req.body)) });
});

networksRouter.get('/api/shops/:id/closing-days', requireActor, async (req, res) => {
  res.json({ closingDays: await listClosingDays(actorOf(req), idParam(req.params.id, 'That shop')) });
});

networksRouter.post('/api/shops/:id/closing-days', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That shop');
  res.status(201).json({ closingDays: await addClosingDay(actorOf(req), id, closingDayInputSchema.parse(req.body)) });
});

networksRouter.delete('/api/shops/:id/closing-days/:date', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That shop');
  const date = closingDayParamSchema.safeParse(req.params.date);
  if (!date.success) throw badRequest('Some fields need attention.', { date: 'Choose a real calendar day as YYYY-MM-DD, e.g. 2027-07-05.' });
  res.json({ closingDays: await removeClosingDay(actorOf(req), id, date.data) });
});

networksRouter.get('/api/skills', requireActor, async (req, res) => {
  res.json({ skills: await listSkills(actorOf(req)) });
});

networksRouter.post('/api/skills', requireActor, async (req, res) => {
  res.status(201).json({ skill: await createSkill(actorOf(req), skillInputSchema.parse(req.body)) });
});

networksRouter.patch('/api/skills/:id', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That skill');
  res.json({ skill: await updateSkill(actorOf(req), id, skillUpdateSchema.parse(req.body)) });
});

networksRouter.get('/api/relay-runs', requireActor, async (req, res) => {
  res.json({ relayRuns: await listRelayRuns(actorOf(req), relayRunQuerySchema.parse(req.query)) });
});

networksRouter.post('/api/relay-runs', requireActor, async (req, res) => {
  res.status(201).json({ relayRun: await createRelayRun(actorOf(req), relayRunInputSchema.parse(req.body)) });
});

networksRouter.patch('/api/relay-runs/:id', requireActor, async (req, res) => {
  const id = idParam(req.params.id, 'That relay run');
  res.json({ relayRun: await updateRelayRun(actorOf(req), id, relayRunUpdateSchema.parse(req.body)) });
});

networksRouter.delete('/api/relay-runs/:id', requireActor, async (req, res) => {
  res.json(await removeRelayRun(actorOf(req), idParam(req.params.id, 'That relay run')));
});
