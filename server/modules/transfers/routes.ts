import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import {
  approveTransferSchema,
  createTransferSchema,
  handOverSchema,
  listTransfersQuery,
  packTransferSchema,
  reasonSchema,
  receiveTransferSchema,
  recommendationQuery,
  requestableJobsQuery,
} from '../../../shared/transfers.js';
import {
  approveTransfer,
  cancelTransfer,
  getTransfer,
  handOverTransfer,
  listRequestableJobs,
  listTransfers,
  manifestFile,
  packTransfer,
  receiveTransfer,
  recommendDestinations,
  rejectTransfer,
  requestTransfer,
} from './service.js';

export const transfersRouter = Router();

const idParam = z.object({ id: z.string().uuid() });
const body = (req: { body?: unknown }) => req.body ?? {};

transfersRouter.get('/api/transfers', requireActor, async (req, res) => {
  res.json(await listTransfers(actorOf(req), listTransfersQuery.parse(req.query)));
});

transfersRouter.get('/api/transfers/recommendation', requireActor, async (req, res) => {
  res.json(await recommendDestinations(actorOf(req), recommendationQuery.parse(req.query)));
});

transfersRouter.get('/api/transfers/requestable-jobs', requireActor, async (req, res) => {
  const { shopId } = requestableJobsQuery.parse(req.query);
  res.json(await listRequestableJobs(actorOf(req), shopId));
});

transfersRouter.post('/api/transfers', requireActor, async (req, res) => {
  res.status(201).json(await requestTransfer(actorOf(req), createTransferSchema.parse(body(req))));
});

transfersRouter.get('/api/transfers/:id', requireActor, async (req, res) => {
  res.json({ transfer: await getTransfer(actorOf(req), idParam.parse(req.params).id) });
});

transfersRouter.get('/api/transfers/:id/manifest', requireActor, async (req, res) => {
  const file = await manifestFile(actorOf(req), idParam.parse(req.params).id);
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `attachment; filename="${file.filename}"`);
  res.setHeader('Cache-Control', 'private, no-store');
  res.send(file.body);
});

// Each step answers 202: it is queued, and the worker carries it out.
transfersRouter.post('/api/transfers/:id/approve', requireActor, async (req, res) => {
  res.status(202).json(await approveTransfer(actorOf(req), idParam.parse(req.params).id, approveTransferSchema.parse(body(req))));
});

transfersRouter.post('/api/transfers/:id/reject', requireActor, async (req, res) => {
  res.status(202).json(await rejectTransfer(actorOf(req), idParam.parse(req.params).id, reasonSchema.parse(body(req))));
});

transfersRouter.post('/api/transfers/:id/cancel', requireActor, async (req, res) => {
  res.status(202).json(await cancelTransfer(actorOf(req), idParam.parse(req.params).id, reasonSchema.parse(body(req))));
});

transfersRouter.post('/api/transfers/:id/pack', requireActor, async (req, res) => {
  res.status(202).json(await packTransfer(actorOf(req), idParam.parse(req.params).id, packTransferSchema.parse(body(req))));
});

transfersRouter.post('/api/transfers/:id/hand-over', requireActor, async (req, res) => {
  res.status(202).json(await handOverTransfer(actorOf(req), idParam.parse(req.params).id, handOverSchema.parse(body(req))));
});

transfersRouter.post('/api/transfers/:id/receive', requireActor, async (req, res) => {
  res.status(202).json(await receiveTransfer(actorOf(req), idParam.parse(req.params).id, receiveTransferSchema.parse(body(req))));
});
