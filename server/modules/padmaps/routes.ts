import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { notFound } from '../../lib/errors.js';
import { INSTRUMENT_FAMILIES } from '../../../shared/domain.js';
import { savePadMapSchema } from '../../../shared/padmap/entries.js';
import { DEFAULT_PAD_RULES, padRulesSchema } from '../../../shared/padmap/rules.js';
import { getPadRules, latestPadMapOf, padMapSuggestions, padMapWorkspace, savePadMap, updatePadRules } from './service.js';

/** An id from the path that is not a uuid names nothing: answer 404 rather than a database error. */
const uuid = z.uuid();
function idParam(value: unknown, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

export const suggestionsQuery = z.object({
  family: z.enum(INSTRUMENT_FAMILIES),
  maker: z.string().trim().min(1).max(120),
  model: z.string().trim().max(120).optional(),
});

export const padmapsRouter = Router();

padmapsRouter.get('/api/pad-rules', requireActor, async (req, res) => {
  res.json({ rules: await getPadRules(actorOf(req)), defaults: DEFAULT_PAD_RULES });
});

padmapsRouter.put('/api/pad-rules', requireActor, async (req, res) => {
  const actor = actorOf(req);
  const input = padRulesSchema.parse(req.body);
  res.json({ rules: await updatePadRules(actor, input), defaults: DEFAULT_PAD_RULES });
});

padmapsRouter.get('/api/jobs/:jobId/pad-map', requireActor, async (req, res) => {
  res.json(await padMapWorkspace(actorOf(req), idParam(req.params.jobId, 'That job')));
});

padmapsRouter.put('/api/jobs/:jobId/pad-map', requireActor, async (req, res) => {
  const actor = actorOf(req);
  const jobId = idParam(req.params.jobId, 'That job');
  res.json(await savePadMap(actor, jobId, savePadMapSchema.parse(req.body)));
});

padmapsRouter.get('/api/instruments/:instrumentId/pad-map', requireActor, async (req, res) => {
  res.json(await latestPadMapOf(actorOf(req), idParam(req.params.instrumentId, 'That instrument')));
});

padmapsRouter.get('/api/pad-maps/suggestions', requireActor, async (req, res) => {
  res.json(await padMapSuggestions(actorOf(req), suggestionsQuery.parse(req.query)));
});
