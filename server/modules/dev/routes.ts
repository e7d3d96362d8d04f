import { Router } from 'express';
import { config } from '../../config.js';
import { listCaughtMail } from '../../lib/mail.js';
import { notFound } from '../../lib/errors.js';

/** Development only: the mail the local catcher received, so people can follow invitation and notice links. */
export const devRouter = Router();

devRouter.get('/api/dev/mail', async (_req, res) => {
  if (config.production || !config.mailCatcherDir) throw notFound('GET /api/dev/mail');
  res.json({ messages: await listCaughtMail(config.mailCatcherDir) });
});
