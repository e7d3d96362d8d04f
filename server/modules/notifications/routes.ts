import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { listInbox, markRead } from './service.js';

/** The minimal inbox: what the transfer screens need; the full inbox screen builds on the same calls. */
export const notificationsRouter = Router();

const idParam = z.object({ id: z.string().uuid() });
const listQuery = z.object({ limit: z.coerce.number().int().min(1).max(200).optional() });

notificationsRouter.get('/api/notifications', requireActor, async (req, res) => {
  const query = listQuery.parse(req.query);
  res.json(await listInbox(actorOf(req), query));
});

notificationsRouter.post('/api/notifications/:id/read', requireActor, async (req, res) => {
  const { id } = idParam.parse(req.params);
  res.json(await markRead(actorOf(req), id));
});
