import { ROLE_LABELS, type Role } from '@shared/domain';
import type { InvitationStatus } from '@shared/schemas/people';
import { formatCents } from '@shared/money';

export const roleLabel = (role: Role) => ROLE_LABELS[role];

/** "Technician at North Bench", or "Owner of the whole network". */
export function describeRole(role: Role, shopName: string | null): string {
  return shopName ? `${ROLE_LABELS[role]} at ${shopName}` : `${ROLE_LABELS[role]} of the whole network`;
}

export const invitationStatusLabels: Record<InvitationStatus, string> = {
  pending: 'Waiting for acceptance',
  expired: 'Link expired',
  accepted: 'Accepted',
  revoked: 'Withdrawn',
};

const dateTime = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium', timeStyle: 'short' });
const dateOnly = new Intl.DateTimeFormat(undefined, { dateStyle: 'medium' });

/** In the reader's own time zone: people and invitations are not tied to one shop's clock. */
export const formatDateTime = (iso: string) => dateTime.format(new Date(iso));
export const formatDate = (iso: string) => dateOnly.format(new Date(iso));

const ACTIONS: Record<string, string> = {
  'person.updated': 'Renamed a person',
  'person.deactivated': 'Deactivated a person',
  'person.reactivated': 'Reactivated a person',
  'membership.created': 'Gave a role',
  'membership.updated': 'Changed a role',
  'membership.removed': 'Removed a role',
  'invitation.created': 'Sent an invitation',
  'invitation.resent': 'Sent an invitation again',
  'invitation.replaced': 'Replaced an invitation',
  'invitation.revoked': 'Withdrew an invitation',
  'invitation.accepted': 'Accepted an invitation',
  'shop.created': 'Opened a shop',
  'shop.updated': 'Edited a shop',
  'shop.skills_set': 'Set a shop’s skills',
  'technician.skills_set': 'Set a technician’s hours',
  'shop.closing_day_added': 'Closed a shop for a day',
  'shop.closing_day_removed': 'Opened a shop again on a closing day',
  'skill.created': 'Added a skill',
  'skill.updated': 'Edited a skill',
  'relay_run.created': 'Added a relay run',
  'relay_run.updated': 'Edited a relay run',
  'relay_run.removed': 'Removed a relay run',
  'relay_run.deactivated': 'Switched off a relay run',
};

export const auditActionLabel = (action: string) => ACTIONS[action] ?? action;

const FIELD_LABELS: Record<string, string> = {
  name: 'Name',
  email: 'E-mail',
  role: 'Role',
  roles: 'Roles',
  shopId: 'Shop',
  userId: 'Person',
  active: 'Active',
  deactivatedAt: 'Deactivated',
  expiresAt: 'Link expires',
  acceptedAt: 'Accepted',
  revokedAt: 'Withdrawn',
  fromShopId: 'From',
  toShopId: 'To',
  weekdays: 'Days',
  departureTime: 'Leaves at',
  transitHours: 'Hours on the road',
  skills: 'Skills',
  skillId: 'Skill',
  weeklyBenchHours: 'Bench hours a week',
  weeklyHours: 'Hours a week',
  timeZone: 'Time zone',
  openingDays: 'Opening days',
  laborRateCents: 'Labor rate',
  taxRateBps: 'Tax rate',
};

/** "laborRateCents" → "Labor rate cents" for a field the list above does not know yet. */
const fieldLabel = (key: string) =>
  FIELD_LABELS[key] ?? key.replace(/([a-z])([A-Z])/g, '$1 $2').replace(/^./, (c) => c.toUpperCase()).replace(/ (\w)/g, (_m, c: string) => ` ${c.toLowerCase()}`);

const WEEKDAY_NAMES = ['', 'Mon', 'Tue', 'Wed', 'Thu', 'Fri', 'Sat', 'Sun'];
const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;
const ISO_INSTANT = /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}/;

/** One value of a logged record in words: names for ids, role labels, local times. */
function show(key: string, value: unknown, names: Record<string, string>): string {
  if (value === null || value === undefined || value === '') return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') {
    if (UUID.test(value)) return names[value] ?? 'a removed record';
    if (key === 'role' && value in ROLE_LABELS) return ROLE_LABELS[value as Role];
    if (ISO_INSTANT.test(value) && !Number.isNaN(Date.parse(value))) return formatDateTime(value);
    return value;
  }
  if (typeof value === 'number') {
    if (key.endsWith('Cents')) return formatCents(value);
    if (key.endsWith('Bps')) return `${(value / 100).toLocaleString()} %`;
    return value.toLocaleString();
  }
  if (Array.isArray(value)) {
    if (value.length === 0) return 'none';
    if ((key === 'weekdays' || key === 'openingDays') && value.every((d) => typeof d === 'number')) {
      return value.map((d) => WEEKDAY_NAMES[d] ?? String(d)).join(', ');
    }
    return value
      .map((item) => {
        if (item && typeof item === 'object') {
          const o = item as Record<string, unknown>;
          if (typeof o.role === 'string' && 'shopId' in o) {
            return describeRole(o.role as Role, typeof o.shopId === 'string' ? (names[o.shopId] ?? 'a removed shop') : null);
          }
          if (typeof o.skillId === 'string') {
            const hours = o.weeklyBenchHours ?? o.weeklyHours;
            return `${names[o.skillId] ?? 'a removed skill'}${typeof hours === 'number' ? ` (${hours} h a week)` : ''}`;
          }
          return Object.entries(o).map(([k, v]) => `${fieldLabel(k)} ${show(k, v, names)}`).join(', ');
        }
        return show(key, item, names);
      })
      .join('; ');
  }
  if (typeof value === 'object') {
    return Object.entries(value as Record<string, unknown>).map(([k, v]) => `${fieldLabel(k)}: ${show(k, v, names)}`).join(', ');
  }
  // a logged record is JSON: every kind of value it can hold is handled above
  return '—';
}

/**
 * The fields a change touched, in words ("Role: Technician → Auditor"), with names for the ids of
 * people, shops and skills (`names` comes with the log page). Identical values are left out.
 */
export function describeChanges(
  before: Record<string, unknown> | null,
  after: Record<string, unknown> | null,
  names: Record<string, string> = {},
): string[] {
  const skip = new Set(['id', 'createdAt', 'updatedAt', 'networkId', 'tokenHash']);
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].filter((k) => !skip.has(k));
  const raw = (v: unknown) => JSON.stringify(v ?? null);
  return keys
    .filter((k) => raw(before?.[k]) !== raw(after?.[k]) || !before || !after)
    .filter((k) => before?.[k] !== undefined || after?.[k] !== undefined)
    .map((k) => {
      const label = fieldLabel(k);
      if (!before) return `${label}: ${show(k, after?.[k], names)}`;
      if (!after) return `${label}: ${show(k, before[k], names)} (removed)`;
      return `${label}: ${show(k, before[k], names)} → ${show(k, after[k], names)}`;
    });
}

/** The kinds of change the log records, by kind of record, for the log's filter. */
export const AUDIT_KIND_GROUPS: Array<{ entity: string; label: string; actions: string[] }> = [
  { entity: 'User', label: 'People', actions: ['person.updated', 'person.deactivated', 'person.reactivated'] },
  { entity: 'Membership', label: 'Roles', actions: ['membership.created', 'membership.updated', 'membership.removed'] },
  { entity: 'Invitation', label: 'Invitations', actions: ['invitation.created', 'invitation.resent', 'invitation.replaced', 'invitation.revoked', 'invitation.accepted'] },
  { entity: 'Shop', label: 'Shops', actions: ['shop.created', 'shop.updated', 'shop.skills_set', 'technician.skills_set', 'shop.closing_day_added', 'shop.closing_day_removed'] },
  { entity: 'Skill', label: 'Skills', actions: ['skill.created', 'skill.updated'] },
  { entity: 'RelayRun', label: 'Relay runs', actions: ['relay_run.created', 'relay_run.updated', 'relay_run.deactivated', 'relay_run.removed'] },
];

/** The viewer's own time zone, named once on pages that show times in it. */
export const viewerTimeZone = () => Intl.DateTimeFormat().resolvedOptions().timeZone;

/** The instant a calendar day starts in the viewer's zone ("2026-03-09" → that local midnight, as ISO). */
export function startOfLocalDay(date: string, plusDays = 0): string | undefined {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(date);
  if (!m) return undefined;
  return new Date(Number(m[1]), Number(m[2]) - 1, Number(m[3]) + plusDays).toISOString();
}
