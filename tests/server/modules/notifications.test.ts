import { afterAll, describe, expect, it } from 'vitest';
import { Notification, NotificationPreference, OutboxMessage, Part } from '../../../server/lib/models.js';
import { syncJobReservations } from '../../../server/modules/stock/service.js';
import { setStock } from '../../helpers/pad-catalog.js';
import { sequelize } from '../../../server/lib/db.js';
import { deliverOutbox, notify, peopleAt } from '../../../server/modules/notifications/service.js';
import { waitForMail } from '../../../server/lib/mail.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';

/** Notices on the real database and the local mail catcher: the inbox always, e-mail unless turned off, each once. */
describe('notify and the outbox', () => {
  afterAll(closeServerResources);

  it('writes an inbox entry for everyone, an e-mail only for those who want it, and nothing twice', async () => {
    const network = await makeNetwork();
    const shop = await makeShop(network.id);
    const wantsMail = await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }]);
    const noMail = await makeUser(network.id, [{ shopId: shop.id, role: 'front_desk' }]);
    const auditor = await makeUser(network.id, [{ shopId: shop.id, role: 'auditor' }]);
    await NotificationPreference.create({ networkId: network.id, userId: noMail.id, kind: 'transfer_incoming', email: false });

    const staff = await peopleAt(network.id, [shop.id], ['technician', 'front_desk']);
    expect(staff.sort()).toEqual([wantsMail.id, noMail.id].sort());
    expect(staff).not.toContain(auditor.id);

    const key = `test:${uniq()}`;
    const notice = {
      networkId: network.id, kind: 'transfer_incoming' as const, userIds: staff, title: `Incoming ${key}`, body: 'A tuba is on its way.',
      link: '/transfers/example', dedupeKey: key, email: { subject: `Incoming ${key}`, text: 'A tuba is on its way.' },
    };
    const first = await sequelize.transaction((t) => notify(notice, t));
    expect(first).toMatchObject({ notified: 2, emailsQueued: 1 });
    // the same event again (a retried step): no new rows
    await sequelize.transaction((t) => notify(notice, t));
    expect(await Notification.count({ where: { networkId: network.id } })).toBe(2);
    expect(await OutboxMessage.count({ where: { networkId: network.id } })).toBe(1);

    expect(await deliverOutbox({ dedupePrefix: `${key}:` })).toEqual({ sent: 1 });
    expect(await deliverOutbox({ dedupePrefix: `${key}:` })).toEqual({ sent: 0 });
    const mail = await waitForMail((m) => m.subject === `Incoming ${key}`);
    expect(mail.to).toEqual([wantsMail.email]);
    expect(mail.text).toContain('/transfers/example');
  });

  it('tells the shop’s managers and technicians once when a job’s reservation makes the shop short of a part', async () => {
    const network = await makeNetwork();
    const shop = await makeShop(network.id);
    const otherShop = await makeShop(network.id);
    const manager = await makeUser(network.id, [{ shopId: shop.id, role: 'regional_manager' }]);
    const saver = await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }]);
    const colleague = await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }]);
    const desk = await makeUser(network.id, [{ shopId: shop.id, role: 'front_desk' }]);
    const elsewhere = await makeUser(network.id, [{ shopId: otherShop.id, role: 'technician' }]);
    const pad = await Part.create({
      networkId: network.id, sku: `PAD-G-${uniq()}`, name: 'Glued pad 24.5 mm', kind: 'pad', padKind: 'glued', diameterMm: 24.5, thicknessMm: 3.5, unitPriceCents: 450,
    });
    await setStock(network.id, shop.id, pad.id, 2);
    const { job } = await makeInstrumentWithJob(network.id, shop.id, saver.id, { stage: 'approved' });
    const sync = (quantity: number) =>
      sequelize.transaction((transaction) =>
        syncJobReservations({ networkId: network.id, jobId: job.id, shopId: shop.id, scope: new Set([pad.id]), wanted: new Map([[pad.id, quantity]]), transaction, byUserId: saver.id }),
      );
    const notices = () => Notification.findAll({ where: { networkId: network.id, kind: 'stock_shortage' }, order: [['userId', 'ASC']] });

    // within what the shelf holds: no notice
    expect((await sync(2)).newShortages).toEqual([]);
    expect(await notices()).toHaveLength(0);

    // one more than the shelf holds: the manager and the other technician hear of it, with the shortfall
    expect((await sync(3)).newShortages).toEqual([pad.id]);
    const first = await notices();
    expect(first.map((n) => n.userId).sort()).toEqual([manager.id, colleague.id].sort());
    expect(first[0].body).toContain('short 1');
    expect(first[0].link).toBe(`/stock?shop=${shop.id}`);
    for (const left of [saver, desk, elsewhere]) expect(first.map((n) => n.userId)).not.toContain(left.id);

    // already short and still short: no second notice; back within stock and short again: a new one
    expect((await sync(4)).newShortages).toEqual([]);
    expect(await notices()).toHaveLength(2);
    await sync(1);
    expect((await sync(5)).newShortages).toEqual([pad.id]);
    expect(await notices()).toHaveLength(4);
  });
});
