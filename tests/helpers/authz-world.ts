import { createHash, randomBytes } from 'node:crypto';
import type { Express } from 'express';
import {
  Attachment,
  Customer,
  Invitation,
  Membership,
  RelayRun,
  Skill,
  Transfer,
} from '../../server/lib/models.js';
import type { Role } from '../../shared/domain.js';
import type { Scope, ScopedIds, World } from '../api/authz/types.js';
import { makeInstrumentWithJob, makeNetwork, makeShop, makeUser, uniq } from './factories.js';
import { signIn } from './sign-in.js';

const SHOP_ROLES: Exclude<Role, 'owner'>[] = ['regional_manager', 'front_desk', 'technician', 'auditor'];

/**
 * The world the authorization matrix runs in. Network A has the shop `own` (where each signed-in
 * person holds their role), the shop `otherShop` (where none of them does) and a third shop that only
 * receives transfers; network B mirrors it. For every scope there is one record of each kind, placed
 * at that scope's shop; `destinationShop` is where that scope's transfer and relay run go.
 */
export async function buildWorld(app: Express): Promise<World> {
  const networkA = await makeNetwork();
  const networkB = await makeNetwork();
  const own = await makeShop(networkA.id, { name: `Own bench ${uniq()}` });
  const otherShop = await makeShop(networkA.id, { name: `Other bench ${uniq()}` });
  const thirdA = await makeShop(networkA.id, { name: `Third bench ${uniq()}` });
  const shopB = await makeShop(networkB.id, { name: `Foreign bench ${uniq()}` });
  const thirdB = await makeShop(networkB.id, { name: `Foreign third ${uniq()}` });

  const users = {} as Record<Role, string>;
  const emails = {} as Record<Role, string>;
  const owner = await makeUser(networkA.id, [{ shopId: null, role: 'owner' }], { email: `owner-${uniq()}@matrix.test` });
  users.owner = owner.id;
  emails.owner = owner.email;
  for (const role of SHOP_ROLES) {
    const person = await makeUser(networkA.id, [{ shopId: own.id, role }], { email: `${role}-${uniq()}@matrix.test` });
    users[role] = person.id;
    emails[role] = person.email;
  }
  // network B needs its own owner: its records are opened and requested by someone of that network
  const ownerB = await makeUser(networkB.id, [{ shopId: null, role: 'owner' }]);

  const skillA = await Skill.create({ networkId: networkA.id, code: `skill_${uniq()}`, name: 'Low saxophones' });
  const skillB = await Skill.create({ networkId: networkB.id, code: `skill_${uniq()}`, name: 'Low saxophones' });

  const ids = {} as Record<Scope, ScopedIds>;
  const secrets = {} as World['secrets'];
  const scopeOf = (shopId: string): Scope => (shopId === own.id ? 'own' : shopId === otherShop.id ? 'otherShop' : 'otherNetwork');
  const place = async (networkId: string, shopId: string, destinationId: string, actorId: string, skillId: string) => {
    const staff = await makeUser(networkId, [{ shopId, role: 'technician' }]);
    const membership = await Membership.findOne({ where: { networkId, userId: staff.id } });
    // a private customer (kind 'person'): name and contact stay with the shops that serve them
    const digits = () => String(Math.floor(1000 + Math.random() * 9000));
    const customer = await Customer.create({
      networkId, kind: 'person', name: `Player ${uniq()}`, email: `player-${uniq()}@mail.test`, phone: `+1 555 ${digits()} ${digits()}`,
      address: `${digits()} Reedmaker Lane ${uniq()}`, homeShopId: shopId,
    });
    // a second one, only ever named in mixed-scope cells, so a wrongly accepted id never changes what the first one's shops see
    const foreignCustomer = await Customer.create({ networkId, kind: 'person', name: `Caller ${uniq()}`, email: `caller-${uniq()}@mail.test`, homeShopId: shopId });
    const { instrument, job } = await makeInstrumentWithJob(networkId, shopId, actorId);
    await instrument.update({ ownerKind: 'customer', ownerCustomerId: customer.id });
    await job.update({ customerId: customer.id });
    const transfer = await Transfer.create({
      networkId, jobId: job.id, instrumentId: instrument.id, fromShopId: shopId, toShopId: destinationId,
      reason: 'Needs the low saxophone bench', requestedByUserId: actorId,
    });
    const attachment = await Attachment.create({
      networkId, jobId: job.id, instrumentId: instrument.id, shopId, kind: 'photo', tag: 'before',
      objectKey: `matrix/${uniq()}.jpg`, contentType: 'image/jpeg', sizeBytes: 1024, status: 'stored', uploadedByUserId: actorId,
    });
    const invitation = await Invitation.create({
      networkId, email: `invitee-${uniq()}@matrix.test`, roles: [{ shopId, role: 'front_desk' }],
      tokenHash: createHash('sha256').update(randomBytes(32)).digest('hex'), invitedByUserId: actorId,
      expiresAt: new Date(Date.now() + 7 * 24 * 3600_000),
    });
    const relayRun = await RelayRun.create({
      networkId, fromShopId: shopId, toShopId: destinationId, weekdays: [2, 4], departureTime: '07:30:00', transitHours: 5,
    });
    secrets[scopeOf(shopId)] = {
      customer: [customer.name, customer.email!, customer.phone!, customer.address!],
      staffEmail: staff.email,
    };
    return {
      foreignCustomer: foreignCustomer.id,
      shop: shopId, destinationShop: destinationId, user: staff.id, membership: membership!.id, customer: customer.id, instrument: instrument.id,
      job: job.id, transfer: transfer.id, attachment: attachment.id, invitation: invitation.id, skill: skillId,
      relayRun: relayRun.id,
    };
  };
  ids.own = await place(networkA.id, own.id, thirdA.id, owner.id, skillA.id);
  ids.otherShop = await place(networkA.id, otherShop.id, thirdA.id, owner.id, skillA.id);
  ids.otherNetwork = await place(networkB.id, shopB.id, thirdB.id, ownerB.id, skillB.id);

  const signInAs = (role: Role) => signIn(app, emails[role]);
  const cookies = {} as Record<Role, string>;
  for (const role of ['owner', ...SHOP_ROLES] as Role[]) cookies[role] = await signInAs(role);

  return { networkA: networkA.id, networkB: networkB.id, ids, cookies, users, emails, signInAs, secrets };
}
