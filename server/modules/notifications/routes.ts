import { Router } from 'express';
import { z } from 'zod';
import { NOTIFICATION_KINDS } from '../../../shared/domain.js';
import { actorOf, requireActor } from '../../lib/auth.js';
import { getPreferences, listInbox, markAllRead, markRead, setPreferences, unreadCount } from './service.js';

/** The signed-in person's inbox and their e-mail choices; every route reads and writes only their own rows. */
export const notificationsRouter = Router();

const idParam = z.object({ id: z.string().uuid() });
export const listQuery = z.object({
  limit: z.coerce.number().int().min(1).max(200).optional(),
  unread: z.enum(['true', 'false']).optional(),
});
export const readAllBody = z.object({ upTo: z.coerce.date().optional() }).strict();
export const preferencesBody = z
  .object({
    preferences: z
      .array(z.object({ kind: z.enum(NOTIFICATION_KINDS), email: z.boolean() }).strict())
      .min(1, 'Choose at least one kind of notice.')
      .max(NOTIFICATION_KINDS.length)
      .refine((list) => new Set(list.map((p) => p.kind)).size === list.length, 'Each kind of notice may appear once.'),
  })
  .strict();

notificationsRouter.get('/api/notifications', requireActor, async (req, res) => {
  const query = listQuery.parse(req.query);
  res.json(await listInbox(actorOf(req), { limit: query.limit, unreadOnly: query.unread === 'true' }));
});

notificationsRouter.get('/api/notifications/unread-count', requireActor, async (req, res) => {
  res.json(await unreadCount(actorOf(req)));
});

notificationsRouter.post('/api/notifications/read-all', requireActor, async (req, res) => {
  const body = readAllBody.parse(req.body ?? {});
  res.json(await markAllRead(actorOf(req), body.upTo));
});

notificationsRouter.post('/api/notifications/:id/read', requireActor, async (req, res) => {
  const { id } = idParam.parse(req.params);
  res.json(await markRead(actorOf(req), id));
});

notificationsRouter.get('/api/notification-preferences', requireActor, async (req, res) => {
  res.json(await getPreferences(actorOf(req)));
});

notificationsRouter.put('/api/notification-preferences', requireActor, async (req, res) => {
  const body = preferencesBody.parse(req.body);
  res.json(await setPreferences(actorOf(req), body.preferences));
});
