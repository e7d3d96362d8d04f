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
}

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
}

/**
 * Refusals the runner accepts: anonymous → 401; another network's record → 404 (its existence must
 * not leak) where the route names a record; everything else → 403 or 404.
 */
export interface AreaCases {
  cases: RouteCase[];
  extendWorld?: (world: World) => Promise<void>;
}
