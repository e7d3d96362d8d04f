import { afterAll, describe, expect, it } from 'vitest';
import { Notification, NotificationPreference, OutboxMessage } from '../../../server/lib/models.js';
import { sequelize } from '../../../server/lib/db.js';
import { deliverOutbox, notify, peopleAt } from '../../../server/modules/notifications/service.js';
import { waitForMail } from '../../../server/lib/mail.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop, makeUser, uniq } from '../../helpers/factories.js';

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
});
