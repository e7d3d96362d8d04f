import { z } from 'zod';
import { ROLES, type Role } from '../domain.js';

/**
 * People, roles and invitations: the shapes the API accepts, shared with the client's forms so both
 * show the same field errors.
 */

/** Roles given at one shop; the owner role is network-wide and has no shop. */
export const SHOP_ROLES = ROLES.filter((r): r is Exclude<Role, 'owner'> => r !== 'owner');

export const emailSchema = z
  .string({ error: 'Enter an e-mail address.' })
  .trim()
  .toLowerCase()
  .pipe(z.email({ error: 'Enter a valid e-mail address.' }).max(254, { error: 'That e-mail address is too long.' }));

export const roleAssignmentSchema = z
  .object({
    shopId: z.uuid({ error: 'Choose a shop.' }).nullable(),
    role: z.enum(ROLES, { error: 'Choose a role.' }),
  })
  .refine((r) => (r.role === 'owner') === (r.shopId === null), {
    error: 'The owner role covers the whole network; every other role needs a shop.',
    path: ['shopId'],
  });
export type RoleAssignment = z.infer<typeof roleAssignmentSchema>;

export const invitationCreateSchema = z.object({
  email: emailSchema,
  roles: z
    .array(roleAssignmentSchema)
    .min(1, { error: 'Give at least one role.' })
    .max(200)
    .refine((roles) => new Set(roles.map((r) => r.shopId ?? 'network')).size === roles.length, {
      error: 'One role per shop.',
    }),
});
export type InvitationCreate = z.infer<typeof invitationCreateSchema>;

/** A role change at the membership's own shop; moving the owner role is done by adding and removing. */
export const membershipUpdateSchema = z.object({
  role: z.enum(SHOP_ROLES, { error: 'Choose a role for this shop.' }),
});
export type MembershipUpdate = z.infer<typeof membershipUpdateSchema>;

/** The token in an invitation link: 32 random bytes, base64url. */
export const invitationTokenSchema = z.string().regex(/^[A-Za-z0-9_-]{43}$/, { error: 'That invitation link is not valid.' });
export const invitationAcceptSchema = z.object({ token: invitationTokenSchema });

export const PERSON_STATUSES = ['active', 'inactive', 'all'] as const;
export const peopleQuerySchema = z.object({
  q: z.string().trim().max(100).optional(),
  status: z.enum(PERSON_STATUSES).default('all'),
  shopId: z.uuid().optional(),
});
export type PeopleQuery = z.infer<typeof peopleQuerySchema>;

export const personUpdateSchema = z.object({
  name: z.string().trim().min(1, { error: 'Enter a name.' }).max(120),
});
export type PersonUpdate = z.infer<typeof personUpdateSchema>;

/** The kinds of record the audit log tells about (its `entity` column). */
export const AUDIT_ENTITIES = ['User', 'Membership', 'Invitation', 'Shop', 'Skill', 'RelayRun'] as const;
export type AuditEntity = (typeof AUDIT_ENTITIES)[number];

const instant = (what: string) =>
  z.iso.datetime({ offset: true, error: `${what}: use a date and time such as 2026-12-05T00:00:00Z.` }).optional();

export const auditLogQuerySchema = z
  .object({
    entity: z.enum(AUDIT_ENTITIES, { error: 'Choose a kind of record.' }).optional(),
    /** One kind of change, e.g. `membership.updated`. */
    action: z.string().trim().regex(/^[a-z_]+\.[a-z_]+$/, { error: 'Choose a kind of change.' }).max(60).optional(),
    entityId: z.string().trim().max(80).optional(),
    /** Changes made by this person or about them (their account, roles and skills). */
    personId: z.uuid({ error: 'Choose a person.' }).optional(),
    /** Changes about this shop: the shop itself, roles and invitations there, relay runs from or to it. */
    shopId: z.uuid({ error: 'Choose a shop.' }).optional(),
    /** From this instant (inclusive) to that one (exclusive); the client sends the viewer's midnights. */
    from: instant('From'),
    to: instant('To'),
    /** Keyset cursor: the `cursor` the previous page returned. */
    cursor: z.string().max(200).optional(),
    limit: z.coerce.number().int().min(1).max(200).default(50),
  })
  .refine((q) => !q.from || !q.to || Date.parse(q.from) < Date.parse(q.to), {
    error: 'The end of the range must come after its start.',
    path: ['to'],
  });
export type AuditLogQuery = z.infer<typeof auditLogQuerySchema>;

export const INVITATION_STATUSES = ['pending', 'expired', 'accepted', 'revoked'] as const;
export type InvitationStatus = (typeof INVITATION_STATUSES)[number];

/** How long an invitation link works. */
export const INVITATION_VALID_DAYS = 7;
