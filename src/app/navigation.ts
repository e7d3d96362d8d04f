import type { AppAbility } from '@/lib/ability';

export interface NavItem {
  to: string;
  label: string;
  /** Match the path exactly (for Home, which would otherwise be active everywhere). */
  end?: boolean;
  /** Shown only when the ability allows this; the same check guards the route itself. */
  requires?: { action: string; subject: string };
}

// Only screens that exist are listed. Each new area adds its entry here and its route in router.tsx.
export const navItems: NavItem[] = [
  { to: '/', label: 'Home', end: true },
  { to: '/dashboard', label: 'Dashboard', requires: { action: 'read', subject: 'Report' } },
  { to: '/reports', label: 'Reports', requires: { action: 'read', subject: 'Report' } },
  { to: '/registry', label: 'Registry', requires: { action: 'read', subject: 'Instrument' } },
  { to: '/intake', label: 'Intake', requires: { action: 'create', subject: 'Job' } },
  { to: '/jobs', label: 'Job board', requires: { action: 'read', subject: 'Job' } },
  { to: '/bench', label: 'My bench', requires: { action: 'update', subject: 'Job' } },
  { to: '/transfers', label: 'Transfers', requires: { action: 'read', subject: 'Transfer' } },
  { to: '/people', label: 'People', requires: { action: 'manage', subject: 'Membership' } },
  { to: '/shops', label: 'Shops', requires: { action: 'manage', subject: 'Shop' } },
  { to: '/catalog', label: 'Service catalog', requires: { action: 'create', subject: 'ServiceCatalog' } },
  { to: '/stock', label: 'Stock', requires: { action: 'read', subject: 'Stock' } },
  { to: '/pad-rules', label: 'Pad rules', requires: { action: 'update', subject: 'Network' } },
];

export function visibleNavItems(ability: AppAbility): NavItem[] {
  return navItems.filter((item) => !item.requires || ability.can(item.requires.action, item.requires.subject));
}
