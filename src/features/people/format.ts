import { ROLE_LABELS, type Role } from '@shared/domain';
import type { InvitationStatus } from '@shared/schemas/people';

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
  'skill.created': 'Added a skill',
  'skill.updated': 'Edited a skill',
  'relay_run.created': 'Added a relay run',
  'relay_run.updated': 'Edited a relay run',
  'relay_run.removed': 'Removed a relay run',
  'relay_run.deactivated': 'Switched off a relay run',
};

export const auditActionLabel = (action: string) => ACTIONS[action] ?? action;

const show = (value: unknown): string => {
  if (value === null || value === undefined) return '—';
  if (typeof value === 'string') return value;
  return JSON.stringify(value);
};

/** The fields a change touched, as "field: before → after". Identical values are left out. */
export function describeChanges(before: Record<string, unknown> | null, after: Record<string, unknown> | null): string[] {
  const skip = new Set(['id', 'createdAt', 'updatedAt', 'networkId']);
  const keys = [...new Set([...Object.keys(before ?? {}), ...Object.keys(after ?? {})])].filter((k) => !skip.has(k));
  return keys
    .filter((k) => show(before?.[k]) !== show(after?.[k]))
    .map((k) => {
      if (!before) return `${k}: ${show(after?.[k])}`;
      if (!after) return `${k}: ${show(before[k])} (removed)`;
      return `${k}: ${show(before[k])} → ${show(after[k])}`;
    });
}
