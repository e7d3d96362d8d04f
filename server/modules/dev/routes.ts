import { Router } from 'express';
import { listCaughtMail } from '../../lib/mail.js';

/**
 * Development only: the mail the local catcher received, so people can follow invitation and notice
 * links. server/app.ts mounts it only while the catcher is configured and never in production, so
 * there the path is simply not found.
 */
export function devRouter(mailCatcherDir: string) {
  const router = Router();
  router.get('/api/dev/mail', async (_req, res) => {
    res.json({ messages: await listCaughtMail(mailCatcherDir) });
  });
  return router;
}
