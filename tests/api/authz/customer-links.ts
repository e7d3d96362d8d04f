import { createHash, randomBytes } from 'node:crypto';
import { expect } from 'vitest';
import { CustomerLink, EstimateDecision, Job, JobLineItem } from '../../../server/lib/models.js';
import type { JobStage } from '../../../shared/domain.js';
import { makeInstrumentWithJob } from '../../helpers/factories.js';
import type { RouteCase, Scope, World } from './types.js';

/**
 * The customer's link (server/modules/jobs/customer-link.ts): the front desk (and managers) make, send
 * and revoke it; the public page and its decision take no session at all — the token is the key, so
 * every person and every scope reaches the one job its token names, and nothing else.
 */
const EVERY_SHOP: Scope[] = ['own', 'otherShop'];
const OWN: Scope[] = ['own'];
const SCOPES: Scope[] = ['own', 'otherShop', 'otherNetwork'];
const desk = { owner: EVERY_SHOP, regional_manager: OWN, front_desk: OWN };
const anyone = { owner: SCOPES, regional_manager: SCOPES, front_desk: SCOPES, technician: SCOPES, auditor: SCOPES, anonymous: SCOPES };

const networkOf = (world: World, scope: Scope) => (scope === 'otherNetwork' ? world.networkB : world.networkA);

/** A job of the scope's private customer, with a line so it has an estimate. */
async function freshJob(world: World, scope: Scope, stage: JobStage) {
  const networkId = networkOf(world, scope);
  const { instrument, job } = await makeInstrumentWithJob(networkId, world.ids[scope].shop, world.ids[scope].jobsOpener, { stage });
  const customerId = world.ids[scope].customer;
  await instrument.update({ ownerKind: 'customer', ownerCustomerId: customerId });
  await job.update({ customerId });
  await JobLineItem.create({ networkId, jobId: job.id, kind: 'part', description: 'Neck cork', quantity: 1, unitPriceCents: 1800 });
  return job;
}

/** A live link made the way the app stores it: only the SHA-256 of the token. */
async function tokenFor(job: Job) {
  const token = randomBytes(32).toString('base64url');
  await CustomerLink.create({ networkId: job.networkId, jobId: job.id, tokenHash: createHash('sha256').update(token).digest() });
  return token;
}

const jobIdOf = (path: string) => path.split('/')[3];

export const cases: RouteCase[] = [
  {
    route: 'POST /api/jobs/:jobId/customer-link',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope, 'assessed')).id}/customer-link`, body: {} }),
    // desk work: technicians and auditors do not hand out the customer's link
    allow: desk,
    foreignIds: {},
    verify: async ({ built, res }) => {
      expect((res.body as { url: string }).url).toMatch(/\/c\/[A-Za-z0-9_-]{43}$/);
      expect(await CustomerLink.count({ where: { jobId: jobIdOf(built.path) } })).toBe(1);
    },
  },
  {
    route: 'DELETE /api/jobs/:jobId/customer-link',
    build: async ({ world, scope }) => {
      const job = await freshJob(world, scope, 'assessed');
      await tokenFor(job);
      return { path: `/api/jobs/${job.id}/customer-link` };
    },
    allow: desk,
    verify: async ({ built }) => {
      expect(await CustomerLink.count({ where: { jobId: jobIdOf(built.path), revokedAt: null } })).toBe(0);
    },
  },
  {
    route: 'POST /api/jobs/:jobId/estimate/send',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope, 'assessed')).id}/estimate/send`, body: {} }),
    allow: desk,
    foreignIds: {},
  },
  {
    route: 'PATCH /api/jobs/:jobId/customer',
    build: async ({ world, scope }) => ({
      path: `/api/jobs/${(await freshJob(world, scope, 'assessed')).id}/customer`,
      body: { noticesOptOut: true },
    }),
    // the desk of a shop that serves the customer: the owner too, and only at shops where the customer is served
    allow: { owner: EVERY_SHOP, regional_manager: OWN, front_desk: OWN },
    foreignIds: {},
  },
  {
    route: 'GET /api/jobs/:jobId/claim-ticket.pdf',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope, 'intake')).id}/claim-ticket.pdf` }),
    // printed by those who work the job (the counter, the bench); auditors read, they do not print
    allow: { owner: EVERY_SHOP, regional_manager: OWN, front_desk: OWN, technician: OWN },
  },
  {
    // public: the token is the key; the answer names no customer
    route: 'GET /api/public/jobs/:token',
    build: async ({ world, scope }) => ({ path: `/api/public/jobs/${await tokenFor(await freshJob(world, scope, 'assessed'))}` }),
    allow: anyone,
  },
  {
    route: 'POST /api/public/jobs/:token/decision',
    build: async ({ world, scope }) => {
      const job = await freshJob(world, scope, 'assessed');
      return { path: `/api/public/jobs/${await tokenFor(job)}/decision`, body: { decision: 'declined', name: 'Matrix Customer', estimateVersion: 0 } };
    },
    allow: anyone,
    foreignIds: {},
    verify: async ({ built }) => {
      const hash = createHash('sha256').update(built.path.split('/')[4]).digest();
      const link = await CustomerLink.findOne({ where: { tokenHash: hash } });
      expect(await EstimateDecision.count({ where: { jobId: link!.jobId, decision: 'declined', method: 'link' } })).toBe(1);
    },
  },
];
