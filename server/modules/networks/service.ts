import { QueryTypes } from 'sequelize';
import { sequelize } from '../../lib/db.js';
import { Shop } from '../../lib/models.js';
import type { Actor } from '../../lib/auth.js';
import { accessibleWhere } from '../../lib/access.js';
import { OPEN_JOB_STAGES } from '../../../shared/domain.js';

/** The shops a person may see, each with its open jobs counted per stage (one aggregate query). */
export async function shopSummaries(actor: Actor) {
  const where = accessibleWhere(actor.ability, 'read', 'Shop');
  if (!where) return [];
  const shops = await Shop.findAll({ where: { ...where, networkId: actor.networkId }, order: [['name', 'ASC']] });
  if (!shops.length) return [];
  const counts = await sequelize.query<{ shop_id: string; stage: string; n: string }>(
    `select shop_id, stage, count(*) as n
       from jobs
      where network_id = :networkId and shop_id in (:shopIds)
      group by shop_id, stage`,
    { type: QueryTypes.SELECT, replacements: { networkId: actor.networkId, shopIds: shops.map((s) => s.id) } },
  );
  return shops.map((s) => {
    const jobsByStage: Record<string, number> = {};
    for (const c of counts) if (c.shop_id === s.id) jobsByStage[c.stage] = Number(c.n); // COUNT comes back as a string
    const openJobs = OPEN_JOB_STAGES.reduce((sum, stage) => sum + (jobsByStage[stage] ?? 0), 0);
    return { id: s.id, name: s.name, city: s.city, timeZone: s.timeZone, openJobs, jobsByStage };
  });
}
