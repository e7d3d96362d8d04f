import { randomUUID } from 'node:crypto';
import { Network, Shop, User, Membership, Instrument, Job } from '../../server/lib/models.js';
import type { Role, JobStage, InstrumentFamily } from '../../shared/domain.js';

/** Each test makes its own rows: a fresh network with unique names, so tests never collide. */
export const uniq = () => randomUUID().slice(0, 8);

export async function makeNetwork(name = `Test network ${uniq()}`) {
  return Network.create({ name, slug: `t-${uniq()}` });
}

let shopSeq = 0;
export async function makeShop(networkId: string, over: Partial<{ name: string; city: string; timeZone: string }> = {}) {
  shopSeq++;
  return Shop.create({
    networkId,
    name: over.name ?? `Shop ${uniq()}`,
    code: `T${String(shopSeq).padStart(3, '0')}${Math.floor(Math.random() * 100)}`.slice(0, 8),
    city: over.city ?? 'Tacoma',
    timeZone: over.timeZone ?? 'America/Los_Angeles',
    latitude: 47.2529,
    longitude: -122.4443,
    openingDays: [1, 2, 3, 4, 5],
    laborRateCents: 9000,
    // 10 %: a round rate invented for the tests, not any place's sales tax
    taxRateBasisPoints: 1000,
  });
}

export async function makeUser(networkId: string, roles: Array<{ shopId: string | null; role: Role }>, over: Partial<{ email: string; name: string }> = {}) {
  const id = uniq();
  const user = await User.create({
    networkId,
    email: over.email ?? `person-${id}@example.test`,
    name: over.name ?? `Person ${id}`,
  });
  for (const r of roles) await Membership.create({ networkId, userId: user.id, shopId: r.shopId, role: r.role });
  return user;
}

/** The next job number of a network, as the app numbers jobs (max + 1), so the two never collide. */
async function nextJobNumber(networkId: string): Promise<number> {
  const last = await Job.max<number | null, Job>('number', { where: { networkId } });
  return (last ?? 0) + 1;
}

export async function makeInstrumentWithJob(
  networkId: string,
  shopId: string,
  openedByUserId: string,
  over: Partial<{ stage: JobStage; family: InstrumentFamily; serial: string; maker: string }> = {},
) {
  const instrument = await Instrument.create({
    networkId,
    family: over.family ?? 'alto_saxophone',
    maker: over.maker ?? 'Testmaker',
    model: 'Testmodel',
    serial: over.serial ?? `SN-${uniq()}`,
    ownerKind: 'rental_fleet',
    currentShopId: shopId,
  });
  const stage = over.stage ?? 'intake';
  const job = await Job.create({
    networkId,
    number: await nextJobNumber(networkId),
    instrumentId: instrument.id,
    shopId,
    stage,
    complaint: 'Sticky G♯ key',
    openedByUserId,
    ...(stage === 'released' ? { releasedAt: new Date() } : {}),
    ...(stage === 'waiting_for_parts' || stage === 'in_transit' ? { stageBeforeHold: 'approved' as const } : {}),
  });
  return { instrument, job };
}
