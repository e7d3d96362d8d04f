import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { attachmentCreateSchema } from '../../../shared/files/limits.js';
import {
  confirmUpload,
  createUpload,
  deleteAttachment,
  downloadLink,
  listInstrumentPhotos,
  listJobAttachments,
  renewUpload,
} from './service.js';

export const filesRouter = Router();

// A malformed id is a record that does not exist, not a server error.
const param = (value: unknown) => z.uuid().catch('00000000-0000-0000-0000-000000000000').parse(value);

filesRouter.get('/api/jobs/:jobId/attachments', requireActor, async (req, res) => {
  res.json(await listJobAttachments(actorOf(req), param(req.params.jobId)));
});

filesRouter.post('/api/jobs/:jobId/attachments', requireActor, async (req, res) => {
  res.status(201).json(await createUpload(actorOf(req), param(req.params.jobId), attachmentCreateSchema.parse(req.body)));
});

filesRouter.post('/api/attachments/:attachmentId/upload-url', requireActor, async (req, res) => {
  res.json(await renewUpload(actorOf(req), param(req.params.attachmentId)));
});

filesRouter.post('/api/attachments/:attachmentId/confirm', requireActor, async (req, res) => {
  res.json({ attachment: await confirmUpload(actorOf(req), param(req.params.attachmentId)) });
});

filesRouter.get('/api/attachments/:attachmentId/download', requireActor, async (req, res) => {
  res.json(await downloadLink(actorOf(req), param(req.params.attachmentId)));
});

filesRouter.delete('/api/attachments/:attachmentId', requireActor, async (req, res) => {
  await deleteAttachment(actorOf(req), param(req.params.attachmentId));
  res.status(204).end();
});

filesRouter.get('/api/instruments/:instrumentId/photos', requireActor, async (req, res) => {
  res.json(await listInstrumentPhotos(actorOf(req), param(req.params.instrumentId)));
});
