import type { Express } from 'express';
import { Customer, ServiceCatalogItem, Skill } from '../../server/lib/models.js';
import type { Role } from '../../shared/domain.js';
import { makeNetwork, makeShop, makeUser, uniq } from './factories.js';
import { signIn } from './sign-in.js';

/**
 * A small network for the jobs and files API tests: two shops (the bench and another), one person per
 * role at the bench, a skill and a few catalog services. Sign-ins go through the identity provider
 * stand-in like a browser's, so only the roles a test names are signed in.
 */
export async function makeBenchWorld(app: Express, signInAs: Role[] = []) {
  const network = await makeNetwork();
  const shop = await makeShop(network.id, { name: `Bench ${uniq()}`, timeZone: 'America/Denver' });
  const otherShop = await makeShop(network.id, { name: `Other ${uniq()}` });
  const people = {
    owner: await makeUser(network.id, [{ shopId: null, role: 'owner' }]),
    regional_manager: await makeUser(network.id, [{ shopId: shop.id, role: 'regional_manager' }]),
    front_desk: await makeUser(network.id, [{ shopId: shop.id, role: 'front_desk' }]),
    technician: await makeUser(network.id, [{ shopId: shop.id, role: 'technician' }], { name: `Tech ${uniq()}` }),
    auditor: await makeUser(network.id, [{ shopId: shop.id, role: 'auditor' }]),
  };
  const skill = await Skill.create({ networkId: network.id, code: `woodwind_${uniq().replace(/-/g, '')}`, name: 'General woodwind' });
  const repadAlto = await ServiceCatalogItem.create({
    networkId: network.id, name: 'Repad — alto saxophone', family: 'alto_saxophone', standardHours: 6, skillId: skill.id,
    // tagged as an owner would: the cautions follow the tags, never the name
    hazards: ['pad_removal', 'adhesive', 'heat_flame', 'solvent', 'springs_sharp'],
  });
  const leakTest = await ServiceCatalogItem.create({ networkId: network.id, name: 'Leak test & adjust', family: null, standardHours: 1 });
  const repadFlute = await ServiceCatalogItem.create({ networkId: network.id, name: 'Repad — flute', family: 'flute', standardHours: 5 });
  const customer = await Customer.create({
    networkId: network.id, kind: 'school', name: `Larkspur Middle School ${uniq()}`, contactName: 'Tamsin Ordway, band director',
    email: `band-${uniq()}@larkspur.school.test`, phone: '+1 303 555 0100', homeShopId: shop.id,
  });
  const cookies = {} as Record<Role, string>;
  for (const role of signInAs) cookies[role] = await signIn(app, people[role].email);
  return { network, shop, otherShop, people, skill, catalog: { repadAlto, leakTest, repadFlute }, customer, cookies };
}
