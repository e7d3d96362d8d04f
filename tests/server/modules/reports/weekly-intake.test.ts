import { afterAll, describe, expect, it } from 'vitest';
import { weeklyIntake } from '../../../../server/modules/reports/service.js';
import { closeServerResources } from '../../../helpers/close.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser } from '../../../helpers/factories.js';

/*
 * Worked by hand. Sunday 1 March 2026 20:00 UTC is Monday 2 March 09:00 in Auckland (NZDT, UTC+13) and
 * Sunday 1 March 12:00 in Los Angeles (PST, UTC−8). Weeks start on Mondays (ISO 8601).
 */
describe('weekly intake counts and lists the same local weeks', () => {
  afterAll(closeServerResources);

  it('a job taken in on Monday morning in Auckland shows in Auckland’s new week, which ends the chart', async () => {
    const network = await makeNetwork();
    const auckland = await makeShop(network.id, { timeZone: 'Pacific/Auckland' });
    const losAngeles = await makeShop(network.id, { timeZone: 'America/Los_Angeles' });
    const desk = await makeUser(network.id, [{ shopId: null, role: 'owner' }]);
    const { job: mondayInAuckland } = await makeInstrumentWithJob(network.id, auckland.id, desk.id);
    await mondayInAuckland.update({ openedAt: new Date('2026-03-01T19:30:00Z') }); // Mon 2 Mar 08:30 NZDT
    const { job: sundayInLa } = await makeInstrumentWithJob(network.id, losAngeles.id, desk.id);
    await sundayInLa.update({ openedAt: new Date('2026-03-01T18:00:00Z') }); // Sun 1 Mar 10:00 PST

    const asOf = '2026-03-01T20:00:00.000Z';
    const both = await weeklyIntake({ networkId: network.id, shops: [], shopIds: [auckland.id, losAngeles.id], asOf });
    expect(both).toHaveLength(52);
    // 2 March 2026 less 51 weeks (357 days) is 10 March 2025
    expect([both[0].weekStart, both.at(-1)!.weekStart]).toEqual(['2025-03-10', '2026-03-02']);
    expect(both.at(-1)).toEqual({ weekStart: '2026-03-02', total: 1, byShop: { [auckland.id]: 1 } });
    expect(both.at(-2)).toEqual({ weekStart: '2026-02-23', total: 1, byShop: { [losAngeles.id]: 1 } });
    expect(both.reduce((n, w) => n + w.total, 0)).toBe(2);

    // Los Angeles alone is still in the week of Monday 23 February
    const la = await weeklyIntake({ networkId: network.id, shops: [], shopIds: [losAngeles.id], asOf });
    expect(la.at(-1)).toEqual({ weekStart: '2026-02-23', total: 1, byShop: { [losAngeles.id]: 1 } });
  });
});
