import { describe, expect, it } from 'vitest';
import { visibleCustomerName } from '../../../../server/modules/registry/service.js';
import { abilityFor } from '../../../../shared/auth/ability.js';
import type { Role } from '../../../../shared/domain.js';

/** The one rule for a customer's name, role by role, with hand-written expectations. */
describe('visibleCustomerName', () => {
  const viewer = (role: Role, shopId: string | null) => ({ ability: abilityFor({ id: 'u', memberships: [{ shopId, role }] }) });
  const person = { id: 'c1', kind: 'person' as const, name: 'Marisol Quennevard', homeShopId: 'denver' };
  const school = { id: 'c2', kind: 'school' as const, name: 'Thornbury Academy Band', homeShopId: 'denver' };

  it('a private person: their home and serving shops see the name, other shops do not', () => {
    expect(visibleCustomerName(viewer('front_desk', 'denver'), person, [])).toBe('Marisol Quennevard');
    expect(visibleCustomerName(viewer('technician', 'denver'), person, [])).toBe('Marisol Quennevard');
    expect(visibleCustomerName(viewer('auditor', 'denver'), person, [])).toBe('Marisol Quennevard');
    expect(visibleCustomerName(viewer('owner', null), person, [])).toBe('Marisol Quennevard');
    expect(visibleCustomerName(viewer('front_desk', 'seattle'), person, [])).toBeNull();
    expect(visibleCustomerName(viewer('technician', 'seattle'), person, [])).toBeNull();
    expect(visibleCustomerName(viewer('regional_manager', 'seattle'), person, [])).toBeNull();
    // once Seattle has served them (a job there), Seattle sees the name too
    expect(visibleCustomerName(viewer('front_desk', 'seattle'), person, ['seattle'])).toBe('Marisol Quennevard');
  });

  it('a school shows its name to everyone', () => {
    expect(visibleCustomerName(viewer('front_desk', 'seattle'), school, [])).toBe('Thornbury Academy Band');
    expect(visibleCustomerName(viewer('technician', 'seattle'), school, [])).toBe('Thornbury Academy Band');
  });
});
