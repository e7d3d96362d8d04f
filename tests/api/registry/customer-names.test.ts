import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { Op } from 'sequelize';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Customer, Instrument, Job, Notification, OutboxMessage, Transfer } from '../../../server/lib/models.js';
import { applyTransferStep } from '../../../server/modules/transfers/service.js';
import type { Role } from '../../../shared/domain.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';
import { pdfText } from '../../helpers/transfers.js';

/**
 * The registry's rule for customer names, tried on every answer that carries a customer: a private
 * person's name (and contact) stays with the shops that serve them; a school shows its name.
 *
 * Denver serves a private customer and a school. People of Seattle (front desk, technician, regional
 * manager) read Denver's work — the registry is network-wide — and each answer is searched for the
 * private name. Denver's own staff and the owner still see it.
 */
describe('private customers’ names never leave the shops that serve them', () => {
  const app = buildApp();
  const PRIVATE = 'Marisol Quennevard';
  const PRIVATE_EMAIL = `marisol.quennevard.${uniq()}@mail.test`;
  const SCHOOL = 'Thornbury Academy Band';
  const cookies: Record<string, string> = {};
  const users: Record<string, { id: string; email: string }> = {};
  let networkId: string;
  let seattle: { id: string };
  let denver: { id: string };
  let privateJob: Job;
  let schoolJob: Job;
  let privateFlute: Instrument;
  const today = new Date(Date.now() + 864e5).toISOString().slice(0, 10);
  const monthAgo = new Date(Date.now() - 30 * 864e5).toISOString().slice(0, 10);

  beforeAll(async () => {
    networkId = (await makeNetwork()).id;
    seattle = await makeShop(networkId, { name: 'Seattle bench' });
    denver = await makeShop(networkId, { name: 'Denver bench' });
    const people: Array<[string, Array<{ shopId: string | null; role: Role }>]> = [
      ['owner', [{ shopId: null, role: 'owner' }]],
      ['seaDesk', [{ shopId: seattle.id, role: 'front_desk' }]],
      ['seaTech', [{ shopId: seattle.id, role: 'technician' }]],
      ['seaManager', [{ shopId: seattle.id, role: 'regional_manager' }]],
      ['denDesk', [{ shopId: denver.id, role: 'front_desk' }]],
      ['denTech', [{ shopId: denver.id, role: 'technician' }]],
    ];
    for (const [key, roles] of people) users[key] = await makeUser(networkId, roles, { name: `${key} ${uniq()}` });

    const person = await Customer.create({ networkId, kind: 'person', name: PRIVATE, email: PRIVATE_EMAIL, phone: '+1 555 0199', homeShopId: denver.id });
    const school = await Customer.create({ networkId, kind: 'school', name: SCHOOL, email: `band.${uniq()}@school.test`, homeShopId: denver.id });
    privateFlute = await Instrument.create({
      networkId, family: 'flute', maker: 'Quellstone', serial: `PQ-${uniq()}`, ownerKind: 'customer', ownerCustomerId: person.id,
      currentShopId: denver.id, status: 'in_shop',
    });
    const schoolHorn = await Instrument.create({
      networkId, family: 'trumpet', maker: 'Brassmere', serial: `ST-${uniq()}`, ownerKind: 'school', ownerCustomerId: school.id,
      currentShopId: denver.id, status: 'in_shop',
    });
    const weekAgo = new Date(Date.now() - 7 * 864e5).toISOString().slice(0, 10);
    privateJob = await Job.create({
      networkId, number: 101, instrumentId: privateFlute.id, shopId: denver.id, customerId: person.id, stage: 'approved',
      complaint: 'Low C does not speak', openedByUserId: users.denDesk.id, promisedOn: weekAgo, assignedUserId: users.denTech.id,
      estimateApprovedAt: new Date(), estimateApprovedByName: PRIVATE, estimateApprovalMethod: 'phone',
    });
    schoolJob = await Job.create({
      networkId, number: 102, instrumentId: schoolHorn.id, shopId: denver.id, customerId: school.id, stage: 'on_bench',
      complaint: 'Stuck slide', openedByUserId: users.denDesk.id, promisedOn: weekAgo,
    });
    // released today, for the invoice export
    const released = await Instrument.create({
      networkId, family: 'clarinet', maker: 'Harrowgate', serial: `PR-${uniq()}`, ownerKind: 'customer', ownerCustomerId: person.id,
      currentShopId: denver.id, status: 'in_service',
    });
    await Job.create({
      networkId, number: 103, instrumentId: released.id, shopId: denver.id, customerId: person.id, stage: 'released',
      complaint: 'Cracked tenon', openedByUserId: users.denDesk.id, releasedAt: new Date(),
    });
    for (const key of Object.keys(users)) cookies[key] = await signIn(app, users[key].email);
  });
  afterAll(closeServerResources);

  const get = (who: string, path: string) => request(app).get(path).set('Cookie', cookies[who]);
  const outsiders = ['seaDesk', 'seaTech', 'seaManager'];

  describe('job board and job page', () => {
    it.each(outsiders)('%s reads Denver’s board: no private name, the school’s name shown', async (who) => {
      const res = await get(who, `/api/jobs?shop=${denver.id}&stage=all`).expect(200);
      expect(res.text).not.toContain(PRIVATE);
      expect(res.text).not.toContain(PRIVATE_EMAIL);
      const byNumber = Object.fromEntries(res.body.jobs.map((j: { number: number }) => [j.number, j]));
      expect(byNumber[101]).toMatchObject({ customerName: null, customerHidden: true });
      expect(byNumber[103]).toMatchObject({ customerName: null, customerHidden: true });
      expect(byNumber[102]).toMatchObject({ customerName: SCHOOL, customerHidden: false });
    });

    it.each(outsiders)('%s opens the private customer’s job: no name, no contact, no approver’s name', async (who) => {
      const res = await get(who, `/api/jobs/${privateJob.id}`).expect(200);
      expect(res.text).not.toContain(PRIVATE);
      expect(res.text).not.toContain(PRIVATE_EMAIL);
      expect(res.body.customer).toMatchObject({ name: null, email: null, phone: null, contactShown: false, kind: 'person' });
      expect(res.body.job).toMatchObject({ customerName: null, customerHidden: true });
      expect(res.body.job.estimateApproval).toMatchObject({ byName: null, method: 'phone' });
      const school = await get(who, `/api/jobs/${schoolJob.id}`).expect(200);
      expect(school.body.customer.name).toBe(SCHOOL);
    });

    it.each(['denDesk', 'denTech', 'owner'])('%s, who serves the customer, sees the name and contact', async (who) => {
      const board = await get(who, `/api/jobs?shop=${denver.id}&stage=all`).expect(200);
      expect(board.body.jobs.find((j: { number: number }) => j.number === 101)).toMatchObject({ customerName: PRIVATE, customerHidden: false });
      const page = await get(who, `/api/jobs/${privateJob.id}`).expect(200);
      expect(page.body.customer).toMatchObject({ name: PRIVATE, email: PRIVATE_EMAIL, contactShown: true });
      expect(page.body.job.estimateApproval.byName).toBe(PRIVATE);
    });

    it('the technician’s own bench list keeps the name for the shop that serves', async () => {
      const res = await get('denTech', '/api/jobs/mine').expect(200);
      expect(res.body.jobs.find((j: { number: number }) => j.number === 101).customerName).toBe(PRIVATE);
    });
  });

  describe('reports and their CSV files', () => {
    it('Seattle staff get no Denver figures, lists or files at all', async () => {
      for (const path of [`/api/reports/overdue?shop=${denver.id}`, `/api/reports/jobs?shop=${denver.id}`, `/api/reports/overdue.csv?shop=${denver.id}`,
        `/api/reports/jobs.csv?shop=${denver.id}`, `/api/reports/invoices.csv?shop=${denver.id}&from=${monthAgo}&to=${today}`]) {
        for (const who of outsiders) {
          const res = await get(who, path);
          expect([path, who, res.status]).toEqual([path, who, 403]);
          expect(res.text).not.toContain(PRIVATE);
        }
      }
      // their own shops' files hold none of Denver's customers
      const own = await get('seaDesk', '/api/reports/jobs.csv').expect(200);
      expect(own.text).not.toContain(PRIVATE);
      const invoices = await get('seaDesk', `/api/reports/invoices.csv?from=${monthAgo}&to=${today}`).expect(200);
      expect(invoices.text).not.toContain(PRIVATE);
    });

    it('Denver’s desk and the owner see the name in lists, the dashboard and every file; the school shows too', async () => {
      for (const who of ['denDesk', 'owner']) {
        const overdue = await get(who, `/api/reports/overdue?shop=${denver.id}`).expect(200);
        expect(overdue.body.items.find((j: { number: number }) => j.number === 101)).toMatchObject({ customerName: PRIVATE, customerHidden: false });
        expect(overdue.body.items.find((j: { number: number }) => j.number === 102)).toMatchObject({ customerName: SCHOOL });
        const dashboard = await get(who, `/api/reports/dashboard?shop=${denver.id}`).expect(200);
        expect(dashboard.body.overdue.oldest.map((j: { customerName: string }) => j.customerName).sort()).toEqual([PRIVATE, SCHOOL].sort());
        const jobs = await get(who, `/api/reports/jobs?shop=${denver.id}&stage=open`).expect(200);
        expect(jobs.body.items.find((j: { number: number }) => j.number === 101).customerName).toBe(PRIVATE);
        for (const file of ['overdue.csv', 'jobs.csv']) {
          const csv = await get(who, `/api/reports/${file}?shop=${denver.id}`).expect(200);
          expect(csv.text).toContain(PRIVATE);
          expect(csv.text).toContain(SCHOOL);
        }
        const invoices = await get(who, `/api/reports/invoices.csv?shop=${denver.id}&from=${monthAgo}&to=${today}`).expect(200);
        expect(invoices.text).toContain(`,${PRIVATE},`);
      }
    });
  });

  describe('the registry: search, instrument page, timeline, customer lookup', () => {
    it.each(outsiders)('%s finds the instrument and its history, never the private owner', async (who) => {
      const search = await get(who, `/api/instruments/search?q=${encodeURIComponent(privateFlute.serial)}`).expect(200);
      expect(search.body.results.map((r: { id: string }) => r.id)).toContain(privateFlute.id);
      expect(search.text).not.toContain(PRIVATE);
      const page = await get(who, `/api/instruments/${privateFlute.id}`).expect(200);
      expect(page.body.owner).toMatchObject({ name: null, contactVisible: false, contact: null });
      expect(page.text).not.toContain(PRIVATE);
      if (who !== 'seaTech') {
        const lookup = await get(who, `/api/customers?q=${encodeURIComponent('Quennevard')}`).expect(200);
        expect(lookup.body.customers).toEqual([]);
      }
    });

    it('an estimate approval recorded at Denver leaves the approver’s name off the network-wide timeline', async () => {
      const job = await Job.create({
        networkId, number: 104, instrumentId: (await Instrument.create({
          networkId, family: 'oboe', maker: 'Quellstone', serial: `PO-${uniq()}`, ownerKind: 'customer', ownerCustomerId: privateJob.customerId,
          currentShopId: denver.id, status: 'in_shop',
        })).id, shopId: denver.id, customerId: privateJob.customerId, stage: 'assessed', complaint: 'Octave key sticks', openedByUserId: users.denDesk.id,
      });
      await request(app).post(`/api/jobs/${job.id}/approval`).set('Cookie', cookies.denDesk)
        .send({ approvedByName: PRIVATE, method: 'phone' }).expect(200);
      const timeline = await get('seaDesk', `/api/instruments/${job.instrumentId}/timeline`).expect(200);
      expect(timeline.body.items.some((i: { kind: string }) => i.kind === 'estimate_approved')).toBe(true);
      expect(timeline.text).not.toContain(PRIVATE);
      const page = await get('seaDesk', `/api/jobs/${job.id}`).expect(200);
      expect(page.text).not.toContain(PRIVATE);
      // Denver's desk still reads who approved, on the job
      const own = await get('denDesk', `/api/jobs/${job.id}`).expect(200);
      expect(own.body.job.estimateApproval.byName).toBe(PRIVATE);
    });
  });

  describe('transfers, the manifest, notices and e-mails', () => {
    let transferId: string;

    beforeAll(async () => {
      const t = await Transfer.create({
        networkId, jobId: privateJob.id, instrumentId: privateFlute.id, fromShopId: denver.id, toShopId: seattle.id,
        reason: 'Seattle has the low flute bench', requestedByUserId: users.denDesk.id,
      });
      transferId = t.id;
      await applyTransferStep({ networkId, transferId, to: 'requested', actorUserId: users.denDesk.id, at: new Date().toISOString() });
      await applyTransferStep({ networkId, transferId, to: 'approved', actorUserId: users.owner.id, at: new Date().toISOString() });
    });

    it.each(['seaDesk', 'seaTech'])('%s reads the incoming transfer, list and page, without the private name', async (who) => {
      const list = await get(who, `/api/transfers?view=incoming&shopId=${seattle.id}&status=any`).expect(200);
      expect(list.body.transfers.map((t: { id: string }) => t.id)).toContain(transferId);
      expect(list.text).not.toContain(PRIVATE);
      const page = await get(who, `/api/transfers/${transferId}`).expect(200);
      expect(page.text).not.toContain(PRIVATE);
      expect(page.text).not.toContain(PRIVATE_EMAIL);
    });

    it('the manifest PDF that travels with the instrument names no private customer', async () => {
      // the manifest is written at the pack step
      await applyTransferStep({
        networkId, transferId, to: 'packed', actorUserId: users.denDesk.id, at: new Date().toISOString(),
        caseCount: 1, contents: 'Flute in its case', departureCondition: 'Pads dry; no dents',
      });
      const res = await get('seaDesk', `/api/transfers/${transferId}/manifest`).buffer(true)
        .parse((r, done) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => done(null, Buffer.concat(chunks)));
        })
        .expect(200);
      const text = await pdfText(res.body as Buffer);
      expect(text).toContain(privateFlute.serial); // the reader works: the serial is on the page
      expect(text).not.toContain(PRIVATE);
    });

    it('Seattle’s notices and e-mails about Denver’s job carry no private name', async () => {
      const seattlePeople = [users.seaDesk.id, users.seaTech.id, users.seaManager.id];
      const notices = await Notification.findAll({ where: { networkId, userId: { [Op.in]: seattlePeople }, link: `/transfers/${transferId}` } });
      expect(notices.length).toBeGreaterThan(0);
      for (const n of notices) expect(`${n.title}\n${n.body}`).not.toContain(PRIVATE);
      const mails = await OutboxMessage.findAll({ where: { networkId } });
      const seattleAddresses = [users.seaDesk.email, users.seaTech.email, users.seaManager.email];
      const toSeattle = mails.filter((m) => seattleAddresses.some((address) => String(m.payload.to).includes(`<${address}>`)));
      expect(toSeattle.length).toBeGreaterThan(0);
      for (const m of toSeattle) expect(JSON.stringify(m.payload)).not.toContain(PRIVATE);
    });
  });
});
