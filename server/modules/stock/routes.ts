import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import { notFound } from '../../lib/errors.js';
import {
  adjustStock,
  cancelPartTransfer,
  listStock,
  receivePartTransfer,
  releaseReservationsOfJob,
  requestPartTransfer,
  sendPartTransfer,
  setPartHazards,
} from './service.js';
import { hazardsSchema } from '../../../shared/safety/hazards.js';

/** An id from the path that is not a uuid names nothing: answer 404 rather than a database error. */
const uuid = z.uuid();
function idParam(value: unknown, what: string): string {
  const parsed = uuid.safeParse(value);
  if (!parsed.success) throw notFound(what);
  return parsed.data;
}

export const stockQuery = z.object({
  shopId: z.uuid({ error: 'Choose a shop.' }),
  kind: z.enum(['pad', 'other']).optional(),
  attention: z.enum(['true', 'false']).optional().transform((v) => v === 'true'),
  q: z.string().trim().max(80).optional(),
});

export const adjustBody = z
  .object({
    onHand: z.number().int('Count whole parts.').min(0, 'Cannot be below zero.').max(100_000).optional(),
    reorderPoint: z.number().int('Count whole parts.').min(0, 'Cannot be below zero.').max(100_000).optional(),
  })
  .refine((b) => b.onHand != null || b.reorderPoint != null, 'Give a count on hand or a reorder point.');

export const requestBody = z.object({
  partId: z.uuid(),
  fromShopId: z.uuid({ error: 'Choose the shop that sends the parts.' }),
  toShopId: z.uuid(),
  quantity: z.number().int('Count whole parts.').min(1, 'Ask for at least one.').max(500, 'Ask for at most 500 at a time.'),
  jobId: z.uuid().nullish(),
  note: z.string().trim().max(500).nullish(),
});

export const stockRouter = Router();

stockRouter.get('/api/stock', requireActor, async (req, res) => {
  res.json(await listStock(actorOf(req), stockQuery.parse(req.query)));
});

stockRouter.patch('/api/stock/:shopId/parts/:partId', requireActor, async (req, res) => {
  const actor = actorOf(req);
  const shopId = idParam(req.params.shopId, 'That shop');
  const partId = idParam(req.params.partId, 'That part');
  res.json(await adjustStock(actor, shopId, partId, adjustBody.parse(req.body)));
});

const hazardsBody = z.object({ hazards: hazardsSchema });

stockRouter.put('/api/parts/:partId/hazards', requireActor, async (req, res) => {
  const partId = idParam(req.params.partId, 'That part');
  res.json(await setPartHazards(actorOf(req), partId, hazardsBody.parse(req.body).hazards));
});

stockRouter.post('/api/stock/part-transfers', requireActor, async (req, res) => {
  const result = await requestPartTransfer(actorOf(req), requestBody.parse(req.body));
  res.status(result.created ? 201 : 200).json(result);
});

stockRouter.post('/api/stock/part-transfers/:id/send', requireActor, async (req, res) => {
  res.json({ transfer: await sendPartTransfer(actorOf(req), idParam(req.params.id, 'That parts transfer')) });
});

stockRouter.post('/api/stock/part-transfers/:id/receive', requireActor, async (req, res) => {
  res.json({ transfer: await receivePartTransfer(actorOf(req), idParam(req.params.id, 'That parts transfer')) });
});

stockRouter.post('/api/stock/part-transfers/:id/cancel', requireActor, async (req, res) => {
  res.json({ transfer: await cancelPartTransfer(actorOf(req), idParam(req.params.id, 'That parts transfer')) });
});

stockRouter.post('/api/jobs/:jobId/reservations/release', requireActor, async (req, res) => {
  res.json(await releaseReservationsOfJob(actorOf(req), idParam(req.params.jobId, 'That job')));
});
