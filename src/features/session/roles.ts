import { roleLabels, type Membership, type Role } from './types';

/**
 * The roles a person holds at one shop. Network-wide memberships (shopId null, such as the owner's)
 * apply to every shop, so they are included too.
 */
export function rolesAtShop(memberships: Membership[], shopId: string | undefined): Role[] {
  const roles = memberships
    .filter((membership) => membership.shopId === null || membership.shopId === shopId)
    .map((membership) => membership.role);
  return [...new Set(roles)];
}

export function describeRoles(roles: Role[]): string {
  return roles.map((role) => roleLabels[role]).join(', ');
}
