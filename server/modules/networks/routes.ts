import { Router } from 'express';
import { actorOf, requireActor } from '../../lib/auth.js';
import { shopSummaries } from './service.js';

export const networksRouter = Router();

networksRouter.get('/api/shops/summary', requireActor, async (req, res) => {
  res.json({ shops: await shopSummaries(actorOf(req)) });
});
