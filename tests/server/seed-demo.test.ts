import { afterAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../server/lib/db.js';
import { loadDemoNetwork, countNetworkRows } from '../../server/seed/demo.js';
import { closeServerResources } from '../helpers/close.js';
import { ALL_JOB_STAGES } from '../../shared/domain.js';

describe('demo network', () => {
  afterAll(closeServerResources);

  it('loads once; loading again changes nothing', async () => {
    const first = await loadDemoNetwork();
    const before = await countNetworkRows(first.networkId);
    const again = await loadDemoNetwork();
    expect(again.created).toBe(false);
    expect(again.networkId).toBe(first.networkId);
    expect(await countNetworkRows(first.networkId)).toEqual(before);
  });

  it('has what a demo needs: 4+ shops, 40+ instruments with baritones, every stage, a transfer in flight, two roles for one person', async () => {
    const { networkId } = await loadDemoNetwork();
    const q = <T extends object>(sql: string) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements: { networkId } });
    const [{ shops }] = await q<{ shops: number }>('select count(*)::int as shops from shops where network_id = :networkId');
    expect(shops).toBeGreaterThanOrEqual(4);
    const [{ n, baris }] = await q<{ n: number; baris: number }>(
      `select count(*)::int as n, count(*) filter (where family = 'baritone_saxophone')::int as baris from instruments where network_id = :networkId`,
    );
    expect(n).toBeGreaterThanOrEqual(40);
    expect(baris).toBeGreaterThanOrEqual(1);
    const stages = (await q<{ stage: string }>('select distinct stage from jobs where network_id = :networkId')).map((r) => r.stage);
    expect(stages.sort()).toEqual([...ALL_JOB_STAGES].sort());
    const inFlight = await q<{ id: string }>(`select id from transfers where network_id = :networkId and state = 'in_transit'`);
    expect(inFlight.length).toBeGreaterThanOrEqual(1);
    const twoRoles = await q<{ user_id: string }>(
      `select user_id from memberships where network_id = :networkId and shop_id is not null
        group by user_id having count(distinct role) > 1 and count(distinct shop_id) > 1`,
    );
    expect(twoRoles.length).toBeGreaterThanOrEqual(1);
    const roles = (await q<{ role: string }>('select distinct role from memberships where network_id = :networkId')).map((r) => r.role);
    expect(roles.sort()).toEqual(['auditor', 'front_desk', 'owner', 'regional_manager', 'technician']);
    const runs = await q<{ id: string }>('select id from relay_runs where network_id = :networkId');
    expect(runs.length).toBeGreaterThan(0);
  });
});
