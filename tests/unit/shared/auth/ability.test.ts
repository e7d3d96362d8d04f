import { subject } from '@casl/ability';
import { describe, expect, it } from 'vitest';
import { abilityFor, buildAbility, defineRulesFor } from '../../../../shared/auth/ability.js';

/** The permission table of the README, checked rule by rule on records of two shops. */
const HOME = 'shop-home';
const AWAY = 'shop-away';
const as = (...memberships: Array<{ shopId: string | null; role: 'owner' | 'regional_manager' | 'front_desk' | 'technician' | 'auditor' }>) =>
  abilityFor({ id: 'user-1', memberships });

/** A record of a kind, as the server checks it after loading (plain attributes plus its subject type). */
const rec = (type: string, attrs: Record<string, unknown>) => subject(type, { ...attrs }) as Record<string, unknown>;

const at = (shopId: string) => ({
  job: rec('Job', { shopId }),
  customer: rec('Customer', { homeShopId: shopId }),
  contact: rec('CustomerContact', { homeShopId: shopId }),
  instrument: rec('Instrument', { currentShopId: shopId }),
  transferFrom: rec('Transfer', { fromShopId: shopId, toShopId: 'elsewhere' }),
  transferTo: rec('Transfer', { fromShopId: 'elsewhere', toShopId: shopId }),
  stock: rec('Stock', { shopId }),
  shop: rec('Shop', { id: shopId }),
  run: rec('RelayRun', { fromShopId: shopId, toShopId: 'elsewhere' }),
  attachment: rec('Attachment', { shopId }),
});

describe('roles and permissions (shared/auth/ability.ts)', () => {
  it('owner: everything in the network, including people, shops and the audit log', () => {
    const a = as({ shopId: null, role: 'owner' });
    for (const s of ['Membership', 'Invitation', 'User', 'AuditLog', 'Shop', 'Skill', 'RelayRun'] as const) expect(a.can('manage', s)).toBe(true);
    expect(a.can('approve', at(AWAY).transferFrom)).toBe(true);
  });

  it('regional manager: reads the whole network, runs their own shops, approves transfers from or to them', () => {
    const a = as({ shopId: HOME, role: 'regional_manager' });
    expect(a.can('read', at(AWAY).job)).toBe(true);
    expect(a.can('read', at(AWAY).instrument)).toBe(true);
    expect(a.can('read', at(AWAY).shop)).toBe(true);
    expect(a.can('update', at(HOME).job)).toBe(true);
    expect(a.can('update', at(AWAY).job)).toBe(false);
    expect(a.can('approve', at(HOME).transferFrom)).toBe(true);
    expect(a.can('approve', at(HOME).transferTo)).toBe(true);
    expect(a.can('approve', at(AWAY).transferFrom)).toBe(false);
    expect(a.can('update', at(HOME).stock)).toBe(true);
    expect(a.can('update', at(AWAY).stock)).toBe(false);
    expect(a.can('read', at(AWAY).contact)).toBe(false);
    expect(a.can('manage', 'Membership')).toBe(false);
    expect(a.can('update', at(HOME).shop)).toBe(false);
  });

  it('front desk: customers, instruments and jobs at their shop; the registry everywhere but not other shops’ contacts', () => {
    const a = as({ shopId: HOME, role: 'front_desk' });
    expect(a.can('create', at(HOME).job)).toBe(true);
    expect(a.can('create', at(AWAY).job)).toBe(false);
    expect(a.can('update', at(HOME).instrument)).toBe(true);
    expect(a.can('update', at(AWAY).instrument)).toBe(false);
    expect(a.can('read', at(AWAY).instrument)).toBe(true);
    expect(a.can('read', at(AWAY).job)).toBe(true);
    expect(a.can('read', at(AWAY).customer)).toBe(false);
    expect(a.can('read', at(AWAY).contact)).toBe(false);
    expect(a.can('read', at(HOME).contact)).toBe(true);
    expect(a.can('request', at(HOME).transferFrom)).toBe(true);
    expect(a.can('request', at(AWAY).transferFrom)).toBe(false);
    expect(a.can('approve', at(HOME).transferFrom)).toBe(false);
    expect(a.can('read', at(AWAY).shop)).toBe(false);
  });

  it('technician: the bench at their shop, the registry to read', () => {
    const a = as({ shopId: HOME, role: 'technician' });
    expect(a.can('move_stage', at(HOME).job)).toBe(true);
    expect(a.can('move_stage', at(AWAY).job)).toBe(false);
    expect(a.can('create', at(HOME).job)).toBe(false);
    expect(a.can('create', at(HOME).attachment)).toBe(true);
    expect(a.can('read', at(AWAY).instrument)).toBe(true);
    expect(a.can('update', at(HOME).instrument)).toBe(false);
    // bench staff may call the customers their shop serves, no others
    expect(a.can('read', at(HOME).contact)).toBe(true);
    expect(a.can('read', at(AWAY).contact)).toBe(false);
    expect(a.can('request', at(HOME).transferFrom)).toBe(false);
  });

  it('auditor: reads what their shops hold and changes nothing', () => {
    const a = as({ shopId: HOME, role: 'auditor' });
    expect(a.can('read', at(HOME).job)).toBe(true);
    expect(a.can('read', at(AWAY).job)).toBe(false);
    expect(a.can('read', at(HOME).contact)).toBe(true);
    expect(a.can('read', at(AWAY).instrument)).toBe(false);
    for (const action of ['create', 'update', 'delete', 'move_stage', 'approve', 'request'] as const) {
      for (const record of Object.values(at(HOME))) expect(a.can(action, record)).toBe(false);
    }
  });

  it('roles at two shops add up per shop: technician at one, front desk at the other', () => {
    const a = as({ shopId: HOME, role: 'technician' }, { shopId: AWAY, role: 'front_desk' });
    expect(a.can('create', at(AWAY).job)).toBe(true);
    expect(a.can('create', at(HOME).job)).toBe(false);
    expect(a.can('move_stage', at(HOME).job)).toBe(true);
    expect(a.can('read', at(AWAY).contact)).toBe(true);
    expect(a.can('request', at(AWAY).transferFrom)).toBe(true);
    expect(a.can('request', at(HOME).transferFrom)).toBe(false);
    expect(a.can('read', at(HOME).run)).toBe(true);
  });

  it('an upload is confirmed by its uploader or a manager of the shop, nobody else', () => {
    const upload = (shopId: string, uploadedByUserId: string) => rec('Attachment', { shopId, uploadedByUserId });
    const mine = upload(HOME, 'user-1');
    const colleagues = upload(HOME, 'user-2');
    for (const role of ['technician', 'front_desk'] as const) {
      const a = as({ shopId: HOME, role });
      expect(a.can('confirm', mine)).toBe(true);
      expect(a.can('confirm', colleagues)).toBe(false);
      expect(a.can('confirm', upload(AWAY, 'user-1'))).toBe(false);
    }
    const manager = as({ shopId: HOME, role: 'regional_manager' });
    expect(manager.can('confirm', colleagues)).toBe(true);
    expect(manager.can('confirm', upload(AWAY, 'user-2'))).toBe(false);
    expect(as({ shopId: null, role: 'owner' }).can('confirm', upload(AWAY, 'user-2'))).toBe(true);
    expect(as({ shopId: HOME, role: 'auditor' }).can('confirm', mine)).toBe(false);
  });

  it('the rules survive the trip to the client as JSON', () => {
    const rules = defineRulesFor({ id: 'u', memberships: [{ shopId: HOME, role: 'front_desk' }] });
    const client = buildAbility(JSON.parse(JSON.stringify(rules)));
    expect(client.can('create', at(HOME).job)).toBe(true);
    expect(client.can('create', at(AWAY).job)).toBe(false);
  });
});
