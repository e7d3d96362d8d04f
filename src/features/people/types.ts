import type { Role } from '@shared/domain';
import type { InvitationStatus } from '@shared/schemas/people';

/** The bodies of the People API (server/modules/members). */
export interface PersonMembership {
  id: string;
  shopId: string | null;
  shopName: string | null;
  role: Role;
}

export interface Person {
  id: string;
  name: string;
  email: string;
  active: boolean;
  deactivatedAt: string | null;
  lastSignInAt: string | null;
  createdAt: string;
  memberships: PersonMembership[];
  skills?: Array<{ shopId: string; shopName: string | null; skillId: string; skillName: string | null; weeklyHours: number }>;
}

export interface InvitationSummary {
  id: string;
  email: string;
  roles: Array<{ shopId: string | null; shopName: string | null; role: Role }>;
  status: InvitationStatus;
  expiresAt: string;
  createdAt: string;
  acceptedAt: string | null;
  invitedBy: { id: string; name: string } | null;
}

export interface InvitationPreview {
  email: string;
  networkName: string;
  invitedByName: string | null;
  roles: Array<{ shopName: string | null; role: Role }>;
  status: InvitationStatus;
  expiresAt: string;
}

export interface AuditEntry {
  id: string;
  subject: string;
  at: string;
  actor: { id: string; name: string; email: string } | null;
  action: string;
  entity: string;
  entityId: string | null;
  before: Record<string, unknown> | null;
  after: Record<string, unknown> | null;
}

export interface AuditPage {
  entries: AuditEntry[];
  /** Today's names of the people, shops and skills the page's before and after values mention, by id. */
  names: Record<string, string>;
  nextCursor: string | null;
}
