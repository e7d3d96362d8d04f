import type { Role } from '../../../shared/domain.js';

/**
 * The authorization matrix: every API route × every role × every scope.
 * tests/api/authorization-matrix.test.ts reads the app's registered routes and fails when a route has
 * no case here, so a new route cannot slip through. Each area keeps its cases in tests/api/authz/<area>.ts
 * exporting `cases: RouteCase[]` and, when its routes need rows the shared world lacks, `extendWorld`.
 */

/** Where the target record lives, seen from the signed-in person. */
export type Scope =
  | 'own' //          a shop where the person holds the role (any shop of the network for the owner)
  | 'otherShop' //    another shop of the same network, where the person holds no role
  | 'otherNetwork'; // a record of another network entirely

export type Who = Role | 'anonymous';

export const SCOPES: Scope[] = ['own', 'otherShop', 'otherNetwork'];
export const WHO: Who[] = ['owner', 'regional_manager', 'front_desk', 'technician', 'auditor', 'anonymous'];

/** Ids of records per scope; areas add their own keys through `extendWorld`. */
export type ScopedIds = Record<string, string>;

export interface World {
  networkA: string;
  networkB: string;
  /** ids by scope: shop, instrument, job, customer, transfer, attachment, user, … */
  ids: Record<Scope, ScopedIds>;
  /** signed-in session cookies of network A's people, one per role (each holds its role at the `own` shop) */
  cookies: Record<Role, string>;
  /** user ids of those people */
  users: Record<Role, string>;
  /** e-mail addresses of those people */
  emails: Record<Role, string>;
  /** A fresh signed-in session of that role's person, for a cell whose route ends the session it uses. */
  signInAs(role: Role): Promise<string>;
  /**
   * What a scope's private customer (kind 'person') and its staff member are known by: strings that
   * must never reach someone who may not see them (see `forbiddenFor` in the runner).
   */
  secrets: Record<Scope, { customer: string[]; staffEmail: string }>;
}

/**
 * The kinds of record an id in a body or query names. Each maps to `world.ids[scope][kind]`, so a
 * mixed-scope cell sends the same field with the id of that kind from another shop or network.
 */
export type IdKind =
  | 'shop' | 'destinationShop' | 'partsShop' | 'instrument' | 'registryInstrument' | 'customer' | 'foreignCustomer'
  | 'user' | 'pad' | 'attachment' | 'job' | 'skill' | 'relayRun' | 'transfer' | 'catalogItem' | 'lineItem' | 'timeLog';

/**
 * One id parameter of a route. `otherShop` says what happens when the id is of another shop of the
 * same network (where the person asking holds no role): refused for everyone, refused for everyone but
 * the owner, or allowed (e.g. a transfer's destination); left out when a shop means nothing for the kind
 * (skills are network-wide). Another network's id is always refused. `filter` marks a list filter:
 * a foreign id there may also answer 2xx, as long as nothing of the foreign record comes back.
 */
export interface ForeignId {
  kind: IdKind;
  otherShop?: 'refused' | 'ownerOnly' | 'allowed';
  filter?: boolean;
  /** Merged into the body first, when the id only counts in another shape of it (a part line, a customer-owned batch). */
  with?: Record<string, unknown>;
}

/**
 * Where the id goes: `body.<path>` or `query.<name>`; a dotted path reaches into objects and arrays
 * (`body.roles.0.shopId`). `path.<name>` swaps the own scope's id of that kind inside the URL path
 * (`/api/stock/<own shop>/parts/<another network's part>`); `path.<n>` swaps the n-th path segment
 * (`/api/jobs/<own job>/line-items/<another job's line>`).
 */
export type IdField = `body.${string}` | `query.${string}` | `path.${string}`;

export interface BuiltRequest {
  /** concrete path, e.g. `/api/instruments/${id}` */
  path: string;
  body?: unknown;
  query?: Record<string, string>;
  /** Sent instead of the world's cookie for `who` (e.g. a fresh session from `world.signInAs`). */
  cookie?: string;
}

export interface RouteCase {
  /** exactly as registered: 'GET /api/instruments/:id' (Express path syntax) */
  route: string;
  /**
   * Builds the request for a target in a scope. May create fresh rows (through models) so that a
   * mutating route starts from the same state in every cell.
   */
  build(ctx: { world: World; scope: Scope; who: Who }): Promise<BuiltRequest> | BuiltRequest;
  /** who may do it, for which scopes: a 2xx/3xx answer. Every other cell must be refused. */
  allow: Partial<Record<Who, Scope[]>>;
  /** routes whose answer does not depend on a target record (e.g. /api/me): scope is ignored */
  scopeless?: boolean;
  /** `own` is the person's own record and `otherShop` someone else's (an inbox notice), not two shops */
  scopeIsPerson?: boolean;
  /**
   * Every id the request carries in its body or query besides the scope's own target: the runner
   * sends each with another shop's and another network's id (tests "mixed scopes"). A write route
   * whose body carries ids must declare them, or say `{}` for a deliberate none.
   */
  foreignIds?: Partial<Record<IdField, IdKind | ForeignId>>;
  /**
   * The status an allowed call answers (default: any of 200, 201, 202, 204). A redirect is never
   * "allowed" unless named here.
   */
  status?: number | number[];
  /** For allowed cells: checks that the write happened (reads the database after the call). */
  verify?: (ctx: { world: World; scope: Scope; who: Who; built: BuiltRequest; res: { status: number; body: unknown; text: string } }) => Promise<void> | void;
  /**
   * Extra strings that must not appear in the answer of a cell, on top of the runner's rule that a
   * private customer's name and contact and a staff e-mail never reach someone who may not see them.
   */
  forbiddenInBody?: (ctx: { world: World; scope: Scope; who: Who }) => string[];
  /** Who may see the private customer of a scope in this route's answer, beyond the runner's default. */
  mayShowCustomer?: (ctx: { scope: Scope; who: Who }) => boolean;
}

/**
 * Refusals the runner accepts: anonymous → 401; another network's record → 404 (its existence must
 * not leak) where the route names a record; everything else → 403 or 404.
 */
export interface AreaCases {
  cases: RouteCase[];
  extendWorld?: (world: World) => Promise<void>;
}
