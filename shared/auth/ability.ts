import { createMongoAbility, type MongoAbility, type RawRuleOf, type MongoQuery } from '@casl/ability';
import type { Role } from '../domain.js';

/**
 * Benchrelay's permissions, written once. The server builds an ability per request from these rules
 * and turns them into SQL for lists (server/lib/access.ts); the client receives the same rules from
 * /api/me and only uses them to shape the screens.
 *
 * Conditions name model attributes (camelCase). The network is never part of a rule: every query is
 * scoped to the session's network before any rule applies.
 */
export type Action =
  | 'manage' | 'create' | 'read' | 'update' | 'delete'
  | 'request' | 'approve' | 'pack' | 'receive' | 'move_stage' | 'export'
  // an upload becomes a stored file: its uploader does it, or a manager of the shop (through manage)
  | 'confirm'
  /** Add, change and remove a job's estimate lines; a raise over the approved total then waits for a new approval. */
  | 'edit_estimate';

export type SubjectName =
  | 'Network' | 'Shop' | 'Membership' | 'Invitation' | 'AuditLog' | 'ServiceCatalog'
  | 'Customer' | 'CustomerContact' | 'Instrument' | 'Job' | 'Attachment' | 'Transfer'
  | 'Stock' | 'PadMap' | 'Report' | 'Notification'
  | 'User' | 'Skill' | 'RelayRun' | 'all';

export type AppAbility = MongoAbility<[Action, SubjectName | Record<string, unknown>], MongoQuery>;
export type AppRule = RawRuleOf<AppAbility>;

export interface AbilityUser {
  id: string;
  memberships: Array<{ shopId: string | null; role: Role }>;
}

export function shopsWithRole(user: AbilityUser, ...roles: Role[]): string[] {
  return user.memberships.filter((m) => m.shopId && roles.includes(m.role)).map((m) => m.shopId as string);
}

export function isOwner(user: AbilityUser): boolean {
  return user.memberships.some((m) => m.role === 'owner');
}

export function defineRulesFor(user: AbilityUser): AppRule[] {
  const rules: AppRule[] = [];
  const can = (action: Action | Action[], subject: SubjectName | SubjectName[], conditions?: MongoQuery) =>
    rules.push({ action, subject, ...(conditions ? { conditions } : {}) });

  // Everyone signed in reads and marks their own notices.
  can(['read', 'update'], 'Notification', { userId: user.id });

  if (isOwner(user)) {
    can('manage', 'all');
    return rules;
  }

  const managed = shopsWithRole(user, 'regional_manager');
  const desk = shopsWithRole(user, 'front_desk');
  const bench = shopsWithRole(user, 'technician');
  const audited = shopsWithRole(user, 'auditor');
  const anyShop = [...new Set([...managed, ...desk, ...bench, ...audited])];

  if (anyShop.length) {
    can('read', 'Shop', { id: { $in: anyShop } });
    // The skills list names what jobs need; relay runs that touch a shop are part of its week.
    can('read', 'Skill');
    can('read', 'RelayRun', { fromShopId: { $in: anyShop } });
    can('read', 'RelayRun', { toShopId: { $in: anyShop } });
  }

  if (managed.length) {
    // A regional manager reads the whole network's registry and jobs, and runs their own shops.
    can('read', ['Instrument', 'Job', 'Transfer', 'Attachment', 'PadMap', 'Shop', 'ServiceCatalog', 'RelayRun']);
    can(['create', 'update', 'move_stage', 'edit_estimate'], 'Job', { shopId: { $in: managed } });
    can(['read', 'create', 'update'], ['Customer', 'CustomerContact'], { homeShopId: { $in: managed } });
    can(['create', 'update'], 'Instrument', { currentShopId: { $in: managed } });
    can(['manage'], 'Stock', { shopId: { $in: managed } });
    can(['manage'], ['Attachment', 'PadMap'], { shopId: { $in: managed } });
    can('request', 'Transfer', { fromShopId: { $in: managed } });
    can(['approve', 'pack', 'update'], 'Transfer', { fromShopId: { $in: managed } });
    can(['approve', 'receive', 'update'], 'Transfer', { toShopId: { $in: managed } });
    can(['read', 'export'], 'Report', { shopId: { $in: managed } });
  }

  if (desk.length) {
    // Front desk searches the whole registry (work history), but contact details only of their shops' customers.
    can('read', ['Instrument', 'Job', 'Attachment', 'PadMap', 'ServiceCatalog']);
    can(['create', 'update'], 'Instrument', { currentShopId: { $in: desk } });
    can(['read', 'create', 'update'], ['Customer', 'CustomerContact'], { homeShopId: { $in: desk } });
    can(['create', 'update', 'move_stage', 'edit_estimate'], 'Job', { shopId: { $in: desk } });
    can(['create'], 'Attachment', { shopId: { $in: desk } });
    can('confirm', 'Attachment', { shopId: { $in: desk }, uploadedByUserId: user.id });
    // a wrong photo taken at intake can be taken back by whoever took it
    can('delete', 'Attachment', { shopId: { $in: desk }, uploadedByUserId: user.id });
    can('request', 'Transfer', { fromShopId: { $in: desk } });
    can('read', 'Transfer', { fromShopId: { $in: desk } });
    can('read', 'Transfer', { toShopId: { $in: desk } });
    can(['pack', 'receive'], 'Transfer', { fromShopId: { $in: desk } });
    can(['receive'], 'Transfer', { toShopId: { $in: desk } });
    can('read', 'Stock', { shopId: { $in: desk } });
    // their shop's figures on the dashboard; the invoice export, because the counter releases and bills
    can(['read', 'export'], 'Report', { shopId: { $in: desk } });
  }

  if (bench.length) {
    // Technicians work the bench at their shops and read the registry.
    can('read', ['Instrument', 'Job', 'Attachment', 'PadMap', 'ServiceCatalog']);
    can(['update', 'move_stage'], 'Job', { shopId: { $in: bench } });
    // what the bench finds (another pad, a bent key to straighten) goes on the estimate; a total above the
    // approved amount then waits for the front desk to record the customer's new approval
    can('edit_estimate', 'Job', { shopId: { $in: bench } });
    can(['create', 'update', 'delete'], ['Attachment', 'PadMap'], { shopId: { $in: bench } });
    can('confirm', 'Attachment', { shopId: { $in: bench }, uploadedByUserId: user.id });
    can('read', 'Stock', { shopId: { $in: bench } });
    // a saved pad map can leave the bench short: technicians ask another shop for parts and take them in
    can(['request', 'receive'], 'Stock', { shopId: { $in: bench } });
    can('read', 'Transfer', { toShopId: { $in: bench } });
    can('read', 'Transfer', { fromShopId: { $in: bench } });
    can('read', 'Report', { shopId: { $in: bench } });
    // Bench staff may call the customers their shop serves (the registry checks each serving shop as homeShopId).
    can('read', 'CustomerContact', { homeShopId: { $in: bench } });
  }

  if (audited.length) {
    // Auditors read what their shops hold, nothing else.
    can('read', ['Job', 'Stock', 'Attachment', 'PadMap'], { shopId: { $in: audited } });
    can('read', 'Instrument', { currentShopId: { $in: audited } });
    can('read', ['Customer', 'CustomerContact'], { homeShopId: { $in: audited } });
    can('read', 'Transfer', { fromShopId: { $in: audited } });
    can('read', 'Transfer', { toShopId: { $in: audited } });
    can('read', 'Report', { shopId: { $in: audited } });
  }

  return rules;
}

export function buildAbility(rules: AppRule[]): AppAbility {
  return createMongoAbility<AppAbility>(rules);
}

export function abilityFor(user: AbilityUser): AppAbility {
  return buildAbility(defineRulesFor(user));
}
