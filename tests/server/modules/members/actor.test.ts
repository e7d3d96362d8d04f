import { describe, expect, it } from 'vitest';
import { sequelize } from '../../../../server/lib/db.js';
import { User } from '../../../../server/lib/models.js';
import { loadActorRecord } from '../../../../server/modules/members/service.js';
import { makeNetwork, makeShop, makeUser } from '../../../helpers/factories.js';

/** Counts the statements Sequelize sends while `fn` runs. */
async function statementsDuring(fn: () => Promise<unknown>): Promise<string[]> {
  const seen: string[] = [];
  const options = (sequelize as unknown as { options: { logging: unknown } }).options;
  const before = options.logging;
  options.logging = (sql: string) => void seen.push(sql);
  try {
    await fn();
  } finally {
    options.logging = before;
  }
  return seen;
}

describe('loadActorRecord (runs on every signed-in request)', () => {
  it('loads the person and every role in one query', async () => {
    const network = await makeNetwork();
    const [north, south] = [await makeShop(network.id), await makeShop(network.id)];
    const person = await makeUser(network.id, [
      { shopId: north.id, role: 'technician' },
      { shopId: south.id, role: 'front_desk' },
    ]);
    let actor: Awaited<ReturnType<typeof loadActorRecord>> = null;
    const statements = await statementsDuring(async () => {
      actor = await loadActorRecord(person.id, network.id);
    });
    expect(statements).toHaveLength(1);
    expect(actor).toMatchObject({ id: person.id, networkId: network.id, email: person.email, name: person.name });
    expect(actor!.memberships).toHaveLength(2);
    expect(actor!.memberships).toEqual(
      expect.arrayContaining([
        { shopId: north.id, role: 'technician' },
        { shopId: south.id, role: 'front_desk' },
      ]),
    );
  });

  it('keeps the network-wide owner role (no shop)', async () => {
    const network = await makeNetwork();
    const owner = await makeUser(network.id, [{ shopId: null, role: 'owner' }]);
    expect((await loadActorRecord(owner.id, network.id))?.memberships).toEqual([{ shopId: null, role: 'owner' }]);
  });

  it('finds nobody for a deactivated person, a person without roles, or the right id in another network', async () => {
    const network = await makeNetwork();
    const other = await makeNetwork();
    const shop = await makeShop(network.id);
    const gone = await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }]);
    await User.update({ active: false }, { where: { id: gone.id, networkId: network.id } });
    const roleless = await makeUser(network.id, []);
    const here = await makeUser(network.id, [{ shopId: shop.id, role: 'auditor' }]);
    expect(await loadActorRecord(gone.id, network.id)).toBeNull();
    expect(await loadActorRecord(roleless.id, network.id)).toBeNull();
    expect(await loadActorRecord(here.id, other.id)).toBeNull();
  });
});
