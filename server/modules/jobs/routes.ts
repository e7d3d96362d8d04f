import { Router } from 'express';
import { z } from 'zod';
import { actorOf, requireActor } from '../../lib/auth.js';
import {
  approvalSchema,
  boardQuerySchema,
  catalogItemSchema,
  catalogItemUpdateSchema,
  catalogQuerySchema,
  jobUpdateSchema,
  lineItemCreateSchema,
  lineItemUpdateSchema,
  myBenchQuerySchema,
  stageMoveSchema,
  timeLogSchema,
} from '../../../shared/jobs/schemas.js';
import {
  addLineItem,
  createCatalogItem,
  jobBoard,
  jobDetail,
  listCatalog,
  logTime,
  moveJobStage,
  myBench,
  recordApproval,
  removeLineItem,
  removeTimeLog,
  updateCatalogItem,
  updateJob,
  updateLineItem,
} from './service.js';

import { claimTicketPdf, issueCustomerLink, publicJobView, recordCustomerDecision, revokeCustomerLinks, sendEstimate, updateJobCustomer } from './customer-link.js';
import { customerDecisionSchema, jobCustomerUpdateSchema } from '../../../shared/customers/public-page.js';

export const jobsRouter = Router();

// A malformed id is a record that does not exist, not a server error.
const id = z.uuid().catch('00000000-0000-0000-0000-000000000000');
const param = (value: unknown) => id.parse(value);

jobsRouter.get('/api/jobs', requireActor, async (req, res) => {
  res.json(await jobBoard(actorOf(req), boardQuerySchema.parse(req.query)));
});

jobsRouter.get('/api/jobs/mine', requireActor, async (req, res) => {
  res.json(await myBench(actorOf(req), myBenchQuerySchema.parse(req.query).shop));
});

jobsRouter.get('/api/jobs/:jobId', requireActor, async (req, res) => {
  res.json(await jobDetail(actorOf(req), param(req.params.jobId)));
});

jobsRouter.patch('/api/jobs/:jobId', requireActor, async (req, res) => {
  res.json(await updateJob(actorOf(req), param(req.params.jobId), jobUpdateSchema.parse(req.body)));
});

jobsRouter.post('/api/jobs/:jobId/stage', requireActor, async (req, res) => {
  res.json(await moveJobStage(actorOf(req), param(req.params.jobId), stageMoveSchema.parse(req.body)));
});

jobsRouter.post('/api/jobs/:jobId/line-items', requireActor, async (req, res) => {
  res.status(201).json(await addLineItem(actorOf(req), param(req.params.jobId), lineItemCreateSchema.parse(req.body)));
});

jobsRouter.patch('/api/jobs/:jobId/line-items/:itemId', requireActor, async (req, res) => {
  res.json(
    await updateLineItem(actorOf(req), param(req.params.jobId), param(req.params.itemId), lineItemUpdateSchema.parse(req.body)),
  );
});

jobsRouter.delete('/api/jobs/:jobId/line-items/:itemId', requireActor, async (req, res) => {
  res.json(await removeLineItem(actorOf(req), param(req.params.jobId), param(req.params.itemId)));
});

jobsRouter.post('/api/jobs/:jobId/approval', requireActor, async (req, res) => {
  res.json(await recordApproval(actorOf(req), param(req.params.jobId), approvalSchema.parse(req.body)));
});

jobsRouter.post('/api/jobs/:jobId/time-logs', requireActor, async (req, res) => {
  res.status(201).json(await logTime(actorOf(req), param(req.params.jobId), timeLogSchema.parse(req.body)));
});

jobsRouter.delete('/api/jobs/:jobId/time-logs/:logId', requireActor, async (req, res) => {
  res.json(await removeTimeLog(actorOf(req), param(req.params.jobId), param(req.params.logId)));
});

jobsRouter.get('/api/service-catalog', requireActor, async (req, res) => {
  res.json(await listCatalog(actorOf(req), catalogQuerySchema.parse(req.query)));
});

jobsRouter.post('/api/service-catalog', requireActor, async (req, res) => {
  res.status(201).json({ item: await createCatalogItem(actorOf(req), catalogItemSchema.parse(req.body)) });
});

jobsRouter.patch('/api/service-catalog/:itemId', requireActor, async (req, res) => {
  res.json({ item: await updateCatalogItem(actorOf(req), param(req.params.itemId), catalogItemUpdateSchema.parse(req.body)) });
});

jobsRouter.post('/api/jobs/:jobId/customer-link', requireActor, async (req, res) => {
  res.status(201).json(await issueCustomerLink(actorOf(req), param(req.params.jobId)));
});

jobsRouter.delete('/api/jobs/:jobId/customer-link', requireActor, async (req, res) => {
  res.json(await revokeCustomerLinks(actorOf(req), param(req.params.jobId)));
});

jobsRouter.post('/api/jobs/:jobId/estimate/send', requireActor, async (req, res) => {
  res.json(await sendEstimate(actorOf(req), param(req.params.jobId)));
});

jobsRouter.patch('/api/jobs/:jobId/customer', requireActor, async (req, res) => {
  res.json(await updateJobCustomer(actorOf(req), param(req.params.jobId), jobCustomerUpdateSchema.parse(req.body)));
});

jobsRouter.get('/api/jobs/:jobId/claim-ticket.pdf', requireActor, async (req, res) => {
  const { number, pdf } = await claimTicketPdf(actorOf(req), param(req.params.jobId));
  res.set('Cache-Control', 'no-store');
  res.type('application/pdf').set('Content-Disposition', `inline; filename="claim-ticket-job-${number}.pdf"`).send(pdf);
});

/**
 * The customer's page of a job: no account, the token in the link is the key (rate limited in
 * server/app.ts). Never cached, so a shared computer's back button does not show it after the link is revoked.
 */
export const publicJobsRouter = Router();

publicJobsRouter.get('/api/public/jobs/:token', async (req, res) => {
  res.set('Cache-Control', 'no-store');
  res.json(await publicJobView(String(req.params.token)));
});

publicJobsRouter.post('/api/public/jobs/:token/decision', async (req, res) => {
  res.set('Cache-Control', 'no-store');
  res.json(await recordCustomerDecision(String(req.params.token), customerDecisionSchema.parse(req.body)));
});
