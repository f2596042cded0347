/**
 * Accounts, roles, CSRF names and the shapes of /api/me, /api/admin/users, /api/stats and
 * /api/health: everything of the account contract that needs no zod, so the web app can
 * import values from here without pulling zod into its bundle. The request schemas are in
 * auth.ts, which re-exports this file.
 */

/** Roles from least to most privileged; `visitor` is anyone not signed in. */
export const ROLES = ['visitor', 'researcher', 'maintainer', 'admin'] as const;
export type Role = (typeof ROLES)[number];

/** Whether `role` is at least `needed` in the ROLES order. */
export function hasRole(role: Role, needed: Role): boolean {
  return ROLES.indexOf(role) >= ROLES.indexOf(needed);
}

/** A signed-in account as the client sees it. */
export interface Account {
  readonly id: number;
  readonly login: string;
  readonly displayName: string;
  readonly email: string | null;
  readonly role: Exclude<Role, 'visitor'>;
  /** Whether sweep-finished e-mails are sent to this account. */
  readonly isEmailOn: boolean;
  readonly createdAt: string;
}

/** GET /api/me: the account, or null with role `visitor` when not signed in. */
export interface MeResponse {
  readonly account: Account | null;
  readonly role: Role;
}

/** GET /api/admin/users (admin only). */
export interface UserListResponse {
  readonly users: readonly Account[];
}

/** GET /api/stats: live counts for the home page (public data only for visitors). */
export interface StatsResponse {
  readonly instanceSets: number;
  readonly maps: number;
  readonly scenarios: number;
  readonly sweeps: number;
  readonly results: number;
}

/** GET /api/health. */
export interface HealthResponse {
  readonly status: 'ok' | 'degraded';
  readonly db: 'up' | 'down';
  readonly version: string;
}

/**
 * CSRF defence (double-submit): the server sets the readable cookie CSRF_COOKIE; every
 * POST/PUT/PATCH/DELETE must echo it in the CSRF_HEADER header, and a present Origin header
 * must match the app's own origin.
 */
export const CSRF_COOKIE = 'qt_csrf';
export const CSRF_HEADER = 'x-csrf-token';

/** Where the browser starts sign-in (a full-page navigation, not an XHR). */
export const SIGN_IN_PATH = '/api/auth/github';
/** POST here (with the CSRF header) to sign out; answers 204. */
export const SIGN_OUT_PATH = '/api/auth/logout';
/** Where the OAuth callback sends the browser when sign-in was cancelled or refused. */
export const SIGN_IN_FAILED_PATH = '/?signin=failed';
