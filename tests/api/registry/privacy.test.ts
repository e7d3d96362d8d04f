import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { buildApp } from '../../../server/app.js';
import { Customer, HistoryEvent, Instrument, Job } from '../../../server/lib/models.js';
import type { Role } from '../../../shared/domain.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser } from '../../helpers/factories.js';
import { signIn } from '../../helpers/sign-in.js';

/**
 * The privacy rule of the registry: a customer's contact details go only to staff of shops that served
 * that customer, to managers of those shops and to the owner; everyone who may read the instrument sees
 * its whole work history, whichever shop did the work.
 *
 * Shop A served the customer (a job of theirs at A). Shop B did earlier work on the same instrument
 * for nobody in particular. Shop C is the customer's home shop but never served them with a job.
 */
describe('registry privacy: contact details by role and shop', () => {
  const app = buildApp();
  let instrument: Instrument;
  const cookies: Record<string, string> = {};
  let customerEmail: string;

  beforeAll(async () => {
    const net = await makeNetwork();
    const shopA = await makeShop(net.id, { name: 'Served shop' });
    const shopB = await makeShop(net.id, { name: 'Earlier shop' });
    const shopC = await makeShop(net.id, { name: 'Home shop' });
    const shopD = await makeShop(net.id, { name: 'Unrelated shop' });
    const owner = await makeUser(net.id, [{ shopId: null, role: 'owner' }]);
    const people: Array<[string, Role, string]> = [
      ['managerA', 'regional_manager', shopA.id], ['managerD', 'regional_manager', shopD.id],
      ['deskA', 'front_desk', shopA.id], ['deskB', 'front_desk', shopB.id], ['deskC', 'front_desk', shopC.id],
      ['techA', 'technician', shopA.id], ['techB', 'technician', shopB.id],
      ['auditorA', 'auditor', shopA.id], ['auditorB', 'auditor', shopB.id],
    ];
    const users: Record<string, { email: string }> = { owner };
    for (const [key, role, shopId] of people) users[key] = await makeUser(net.id, [{ shopId, role }]);

    customerEmail = `player-${Date.now()}@mail.test`;
    const customer = await Customer.create({
      networkId: net.id, kind: 'person', name: 'Imogen Quartermaine', email: customerEmail, phone: '+1 555 0100', homeShopId: shopC.id,
    });
    instrument = await Instrument.create({
      networkId: net.id, family: 'flute', maker: 'Quellstone', serial: 'Q 771 002', ownerKind: 'customer',
      ownerCustomerId: customer.id, currentShopId: shopA.id,
    });
    const earlier = await Job.create({
      networkId: net.id, number: 1, instrumentId: instrument.id, shopId: shopB.id, stage: 'released', releasedAt: new Date(),
      complaint: 'Pads worn', openedByUserId: owner.id,
    });
    const served = await Job.create({
      networkId: net.id, number: 2, instrumentId: instrument.id, shopId: shopA.id, customerId: customer.id, stage: 'on_bench',
      complaint: 'Will not play below middle C', openedByUserId: owner.id,
    });
    await HistoryEvent.bulkCreate([
      { networkId: net.id, instrumentId: instrument.id, jobId: earlier.id, shopId: shopB.id, kind: 'intake', summary: 'Checked in at Earlier shop', occurredAt: new Date(Date.now() - 90 * 864e5) },
      { networkId: net.id, instrumentId: instrument.id, jobId: served.id, shopId: shopA.id, kind: 'intake', summary: 'Checked in at Served shop', occurredAt: new Date(Date.now() - 864e5) },
    ]);

    for (const key of Object.keys(users)) cookies[key] = await signIn(app, users[key].email);
  });
  afterAll(closeServerResources);

  const page = (who: string) => request(app).get(`/api/instruments/${instrument.id}`).set('Cookie', cookies[who]);
  const timeline = (who: string) => request(app).get(`/api/instruments/${instrument.id}/timeline`).set('Cookie', cookies[who]);

  it.each([
    ['owner', true],
    ['managerA', true], // manager of a shop that served the customer
    ['managerD', false], // manager elsewhere: reads the registry, not the contact
    ['deskA', true],
    ['deskB', false], // did work on the instrument, but never for this customer
    ['deskC', true], // the shop that registered the customer
    ['techA', true],
    ['techB', false],
    ['auditorA', true],
  ])('%s sees the contact details: %s', async (who, sees) => {
    const res = await page(who).expect(200);
    expect(res.body.owner.contactVisible).toBe(sees);
    const text = JSON.stringify(res.body);
    if (sees) {
      expect(res.body.owner.contact).toMatchObject({ email: customerEmail, phone: '+1 555 0100' });
      expect(res.body.owner.name).toBe('Imogen Quartermaine');
    } else {
      // nothing of the contact leaves the server, not even the person's name
      expect(res.body.owner.contact).toBeNull();
      expect(res.body.owner.name).toBeNull();
      expect(text).not.toContain(customerEmail);
      expect(text).not.toContain('555 0100');
      expect(text).not.toContain('Quartermaine');
    }
  });

  it.each(['owner', 'managerA', 'managerD', 'deskA', 'deskB', 'deskC', 'techA', 'techB', 'auditorA'])(
    '%s sees the work history of every shop',
    async (who) => {
      const page1 = await page(who).expect(200);
      expect(page1.body.jobs.map((j: { shop: { name: string } }) => j.shop.name).sort()).toEqual(['Earlier shop', 'Served shop']);
      const res = await timeline(who).expect(200);
      expect(res.body.items.map((i: { shop: { name: string } }) => i.shop.name)).toEqual(['Served shop', 'Earlier shop']);
    },
  );

  it('an auditor of a shop that does not hold the instrument cannot read it at all', async () => {
    await page('auditorB').expect(403);
    await timeline('auditorB').expect(403);
  });

  it('customer search only finds customers of the searcher’s shops', async () => {
    const find = (who: string) => request(app).get('/api/customers').query({ q: 'Quartermaine' }).set('Cookie', cookies[who]);
    expect((await find('deskA').expect(200)).body.customers).toHaveLength(1);
    expect((await find('deskC').expect(200)).body.customers[0].contact.email).toBe(customerEmail);
    expect((await find('deskB').expect(200)).body.customers).toEqual([]);
    expect((await find('owner').expect(200)).body.customers).toHaveLength(1);
    await find('techA').expect(403); // technicians do not look customers up
  });
});
