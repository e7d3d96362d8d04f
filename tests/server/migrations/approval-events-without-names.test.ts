import { afterAll, describe, expect, it } from 'vitest';
import { sequelize } from '../../../server/lib/db.js';
import { HistoryEvent, Instrument } from '../../../server/lib/models.js';
import { up } from '../../../server/migrations/0011-approval-events-without-names.js';
import { closeServerResources } from '../../helpers/close.js';
import { makeNetwork, makeShop } from '../../helpers/factories.js';

/** Approval events written before the timeline stopped naming the approver lose the name, nothing else. */
describe('migration 0011: approval events without names', () => {
  afterAll(closeServerResources);

  it('rewrites the old wording and drops the name from the data; other events stay', async () => {
    const networkId = (await makeNetwork()).id;
    const shop = await makeShop(networkId);
    const instrument = await Instrument.create({ networkId, family: 'flute', maker: 'Quellstone', serial: 'MIG 1', ownerKind: 'rental_fleet', currentShopId: shop.id });
    const old = await HistoryEvent.create({
      networkId, instrumentId: instrument.id, shopId: shop.id, kind: 'estimate_approved',
      summary: 'Job 12: estimate approved by Marisol Quennevard (in person)',
      data: { approvedByName: 'Marisol Quennevard', method: 'in_person', approvedAt: '2026-11-01T10:00:00.000Z' },
    });
    const other = await HistoryEvent.create({
      networkId, instrumentId: instrument.id, shopId: shop.id, kind: 'note', summary: 'Case approved by the school (spare)', data: { approvedByName: 'x' },
    });
    await up({ context: sequelize.getQueryInterface() });
    await old.reload();
    await other.reload();
    expect(old.summary).toBe('Job 12: estimate approved (in person)');
    expect(old.data).toEqual({ method: 'in_person', approvedAt: '2026-11-01T10:00:00.000Z' });
    expect(other.summary).toBe('Case approved by the school (spare)');
    expect(other.data).toEqual({ approvedByName: 'x' });
  });
});
