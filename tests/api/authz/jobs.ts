import { expect } from 'vitest';
import { Attachment, Job, JobLineItem, ServiceCatalogItem, TimeLog, User } from '../../../server/lib/models.js';
import { putObject } from '../../../server/lib/storage.js';
import { objectKeyFor } from '../../../server/modules/files/service.js';
import type { JobStage } from '../../../shared/domain.js';
import { makeInstrumentWithJob, uniq } from '../../helpers/factories.js';
import type { AreaCases, RouteCase, Scope, Who, World } from './types.js';

/**
 * The jobs and files routes in the authorization matrix. Mutating routes get a fresh job (or line,
 * time entry, upload) in every cell, so each cell starts from the same state.
 *
 * Who reads what (shared/auth/ability.ts): everyone but auditors reads every job of the network;
 * auditors read their own shop's. Bench and desk work happens only at one's own shops; the owner
 * works everywhere.
 */

const EVERY_SHOP: Scope[] = ['own', 'otherShop'];
const OWN: Scope[] = ['own'];
const readJobs = { owner: EVERY_SHOP, regional_manager: EVERY_SHOP, front_desk: EVERY_SHOP, technician: EVERY_SHOP, auditor: OWN };
const workJobs = { owner: EVERY_SHOP, regional_manager: OWN, front_desk: OWN, technician: OWN };

const networkOf = (world: World, scope: Scope) => (scope === 'otherNetwork' ? world.networkB : world.networkA);
const shopOf = (world: World, scope: Scope) => world.ids[scope].shop;
/** Someone of the target's network to open jobs and upload files as (not the person asking). */
const openerOf = (world: World, scope: Scope) => world.ids[scope].jobsOpener;
/** The person asking when they belong to the target's network, else the network's own opener. */
const actorOrOpener = (world: World, scope: Scope, who: Who) =>
  scope !== 'otherNetwork' && who !== 'anonymous' ? world.users[who] : openerOf(world, scope);

/** A job at the scope's shop for that shop's private customer, so every answer about it can be read for leaks. */
async function freshJob(world: World, scope: Scope, stage: JobStage = 'on_bench') {
  const { instrument, job } = await makeInstrumentWithJob(networkOf(world, scope), shopOf(world, scope), openerOf(world, scope), { stage });
  const customerId = world.ids[scope].customer;
  await instrument.update({ ownerKind: 'customer', ownerCustomerId: customerId });
  await job.update({ customerId });
  return job;
}

async function freshAttachment(world: World, scope: Scope, uploadedByUserId: string, status: 'pending' | 'stored') {
  const job = await freshJob(world, scope);
  const id = crypto.randomUUID();
  const networkId = networkOf(world, scope);
  const objectKey = objectKeyFor({ networkId, jobId: job.id, id, kind: 'document', contentType: 'application/pdf' });
  const pdf = Buffer.from(`%PDF-1.4\n% purchase order ${uniq()}\n%%EOF\n`);
  // a pending upload sits where the browser's link wrote it; a stored file under its own key
  await putObject(status === 'pending' ? `uploads/${objectKey}` : objectKey, pdf, 'application/pdf');
  return Attachment.create({
    id, networkId, jobId: job.id, instrumentId: job.instrumentId, shopId: job.shopId, kind: 'document',
    objectKey, contentType: 'application/pdf', sizeBytes: pdf.length, status, uploadedByUserId,
  });
}

/** Stage moves each role makes at its own shop: a technician starts bench work, front desk releases. */
const MOVE_FOR: Record<Who, { from: JobStage; to: JobStage }> = {
  owner: { from: 'ready', to: 'released' },
  regional_manager: { from: 'approved', to: 'on_bench' },
  front_desk: { from: 'ready', to: 'released' },
  technician: { from: 'approved', to: 'on_bench' },
  auditor: { from: 'approved', to: 'on_bench' },
  anonymous: { from: 'approved', to: 'on_bench' },
};

export const cases: RouteCase[] = [
  {
    route: 'GET /api/jobs',
    // every stage, so released jobs and their customers are on the board too
    build: ({ world, scope }) => ({ path: '/api/jobs', query: { shop: shopOf(world, scope), stage: 'all' } }),
    allow: readJobs,
    // `shop` is the scope's target; the other ids narrow the board
    foreignIds: { 'query.technician': { kind: 'user', filter: true }, 'query.skill': { kind: 'skill', filter: true } },
  },
  {
    route: 'GET /api/jobs/mine',
    scopeless: true,
    build: () => ({ path: '/api/jobs/mine' }),
    foreignIds: { 'query.shop': { kind: 'shop', filter: true } },
    allow: { owner: OWN, regional_manager: OWN, front_desk: OWN, technician: OWN, auditor: OWN },
  },
  {
    route: 'GET /api/jobs/:jobId',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope)).id}` }),
    allow: readJobs,
  },
  {
    route: 'PATCH /api/jobs/:jobId',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope)).id}`, body: { conditionNotes: 'Case hinge loose.' } }),
    allow: workJobs,
    // the assignee must work at the job's shop; skills are the network's
    foreignIds: { 'body.assignedUserId': { kind: 'user', otherShop: 'refused' }, 'body.requiredSkillId': 'skill' },
    verify: async ({ built }) => {
      const job = await Job.findByPk(built.path.split('/').pop());
      expect(job?.conditionNotes).toBe('Case hinge loose.');
    },
  },
  {
    route: 'POST /api/jobs/:jobId/stage',
    build: async ({ world, scope, who }) => {
      const { from, to } = MOVE_FOR[who];
      return { path: `/api/jobs/${(await freshJob(world, scope, from)).id}/stage`, body: { to } };
    },
    allow: workJobs,
  },
  {
    route: 'POST /api/jobs/:jobId/line-items',
    build: async ({ world, scope }) => ({
      path: `/api/jobs/${(await freshJob(world, scope, 'assessed')).id}/line-items`,
      body: { kind: 'labor', catalogItemId: world.ids[scope].catalogItem },
    }),
    allow: workJobs,
    verify: async ({ built }) => {
      expect(await JobLineItem.count({ where: { jobId: built.path.split('/')[3] } })).toBe(1);
    },
    foreignIds: {
      'body.catalogItemId': 'catalogItem',
      'body.partId': { kind: 'pad', with: { kind: 'part', description: 'Pad', quantity: 1, unitPriceCents: 500 } },
    },
  },
  {
    route: 'PATCH /api/jobs/:jobId/line-items/:itemId',
    build: async ({ world, scope }) => {
      const job = await freshJob(world, scope, 'assessed');
      const item = await JobLineItem.create({ networkId: job.networkId, jobId: job.id, kind: 'part', description: 'Cork sheet', quantity: 1, unitPriceCents: 650 });
      return { path: `/api/jobs/${job.id}/line-items/${item.id}`, body: { quantity: 2 } };
    },
    allow: workJobs,
    // one's own job, the line of a job of another shop or network
    foreignIds: { 'path.5': { kind: 'lineItem', otherShop: 'refused' } },
  },
  {
    route: 'DELETE /api/jobs/:jobId/line-items/:itemId',
    build: async ({ world, scope }) => {
      const job = await freshJob(world, scope, 'assessed');
      const item = await JobLineItem.create({ networkId: job.networkId, jobId: job.id, kind: 'part', description: 'Felt', quantity: 1, unitPriceCents: 900 });
      return { path: `/api/jobs/${job.id}/line-items/${item.id}` };
    },
    allow: workJobs,
    foreignIds: { 'path.5': { kind: 'lineItem', otherShop: 'refused' } },
  },
  {
    route: 'POST /api/jobs/:jobId/approval',
    build: async ({ world, scope }) => ({
      path: `/api/jobs/${(await freshJob(world, scope, 'assessed')).id}/approval`,
      body: { approvedByName: 'Band director', method: 'phone' },
    }),
    // desk work: technicians and auditors do not record approvals
    allow: { owner: EVERY_SHOP, regional_manager: OWN, front_desk: OWN },
  },
  {
    route: 'POST /api/jobs/:jobId/time-logs',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope)).id}/time-logs`, body: { minutes: 45 } }),
    allow: workJobs,
  },
  {
    route: 'DELETE /api/jobs/:jobId/time-logs/:logId',
    build: async ({ world, scope, who }) => {
      const job = await freshJob(world, scope);
      const today = new Date().toISOString().slice(0, 10);
      const log = await TimeLog.create({ networkId: job.networkId, jobId: job.id, userId: actorOrOpener(world, scope, who), minutes: 30, workedOn: today });
      return { path: `/api/jobs/${job.id}/time-logs/${log.id}` };
    },
    allow: workJobs,
    foreignIds: { 'path.5': { kind: 'timeLog', otherShop: 'refused' } },
  },
  {
    route: 'GET /api/service-catalog',
    scopeless: true,
    build: () => ({ path: '/api/service-catalog' }),
    allow: { owner: OWN, regional_manager: OWN, front_desk: OWN, technician: OWN },
  },
  {
    route: 'POST /api/service-catalog',
    scopeless: true,
    build: () => ({ path: '/api/service-catalog', body: { name: `Key cork set ${uniq()}`, family: null, standardHours: 0.5, skillId: null } }),
    allow: { owner: OWN },
    foreignIds: { 'body.skillId': 'skill' },
  },
  {
    route: 'PATCH /api/service-catalog/:itemId',
    build: ({ world, scope }) => ({ path: `/api/service-catalog/${world.ids[scope].catalogItem}`, body: { standardHours: 1.5 } }),
    allow: { owner: EVERY_SHOP },
    foreignIds: { 'body.skillId': 'skill' },
  },
  {
    route: 'GET /api/jobs/:jobId/attachments',
    build: async ({ world, scope }) => ({ path: `/api/jobs/${(await freshJob(world, scope)).id}/attachments` }),
    allow: readJobs,
  },
  {
    route: 'POST /api/jobs/:jobId/attachments',
    build: async ({ world, scope }) => ({
      path: `/api/jobs/${(await freshJob(world, scope)).id}/attachments`,
      body: { kind: 'photo', tag: 'before', contentType: 'image/jpeg', size: 2048 },
    }),
    allow: workJobs,
  },
  {
    route: 'POST /api/attachments/:attachmentId/upload-url',
    build: async ({ world, scope, who }) => ({
      path: `/api/attachments/${(await freshAttachment(world, scope, actorOrOpener(world, scope, who), 'pending')).id}/upload-url`,
    }),
    allow: workJobs,
  },
  {
    // the caller's own upload; a colleague's is refused (tests/api/files/upload-integrity.test.ts)
    route: 'POST /api/attachments/:attachmentId/confirm',
    build: async ({ world, scope, who }) => ({
      path: `/api/attachments/${(await freshAttachment(world, scope, actorOrOpener(world, scope, who), 'pending')).id}/confirm`,
    }),
    allow: workJobs,
  },
  {
    route: 'GET /api/attachments/:attachmentId/download',
    build: async ({ world, scope }) => ({
      path: `/api/attachments/${(await freshAttachment(world, scope, openerOf(world, scope), 'stored')).id}/download`,
    }),
    allow: readJobs,
  },
  {
    route: 'DELETE /api/attachments/:attachmentId',
    build: async ({ world, scope }) => ({
      path: `/api/attachments/${(await freshAttachment(world, scope, openerOf(world, scope), 'stored')).id}`,
    }),
    // front desk removes only what they uploaded themselves; this one is someone else's
    allow: { owner: EVERY_SHOP, regional_manager: OWN, technician: OWN },
    verify: async ({ built }) => {
      expect(await Attachment.count({ where: { id: built.path.split('/').pop()! } })).toBe(0);
    },
  },
  {
    route: 'GET /api/instruments/:instrumentId/photos',
    build: async ({ world, scope }) => ({ path: `/api/instruments/${(await freshJob(world, scope)).instrumentId}/photos` }),
    allow: readJobs,
  },
];

/** A person in each network to open jobs as, and a catalog service per scope. */
export async function extendWorld(world: World) {
  for (const scope of ['own', 'otherShop', 'otherNetwork'] as const) {
    const networkId = networkOf(world, scope);
    const opener = await User.create({ networkId, email: `opener-${uniq()}@example.test`, name: `Opener ${uniq()}` });
    world.ids[scope].jobsOpener = opener.id;
    const item = await ServiceCatalogItem.create({ networkId, name: `Leak test ${uniq()}`, family: null, standardHours: 1 });
    world.ids[scope].catalogItem = item.id;
    // a line and a time entry on the scope's job, for cells that name them under another job
    const jobId = world.ids[scope].job;
    const line = await JobLineItem.create({ networkId, jobId, kind: 'part', description: 'Pad cup shim', quantity: 1, unitPriceCents: 300 });
    world.ids[scope].lineItem = line.id;
    const log = await TimeLog.create({ networkId, jobId, userId: opener.id, minutes: 20, workedOn: new Date().toISOString().slice(0, 10) });
    world.ids[scope].timeLog = log.id;
  }
}

export const area: AreaCases = { cases, extendWorld };
