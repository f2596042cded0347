/**
 * The parts of shared/auth.ts the web needs as values, copied so the initial bundle does not
 * pull in zod (shared/auth.ts builds its schemas at import time, which costs ~440 kB of zod).
 * auth-contract.spec.ts checks every value here against shared/auth.ts, so the copies cannot drift.
 */
import type { Role } from '@shared/auth';

/** Same as ROLES in shared/auth.ts: least to most privileged. */
export const ROLE_ORDER: readonly Role[] = ['visitor', 'researcher', 'maintainer', 'admin'];

/** Whether `role` is at least `needed` (same rule as hasRole in shared/auth.ts). */
export function isRoleAtLeast(role: Role, needed: Role): boolean {
  return ROLE_ORDER.indexOf(role) >= ROLE_ORDER.indexOf(needed);
}

/** Same as CSRF_COOKIE in shared/auth.ts. */
export const CSRF_COOKIE_NAME = 'qt_csrf';
/** Same as CSRF_HEADER in shared/auth.ts. */
export const CSRF_HEADER_NAME = 'x-csrf-token';

/** Where the sign-in button sends the browser, a full page navigation (SIGN_IN_PATH in shared/auth.ts). */
export const SIGN_IN_URL = '/api/auth/github';
/** Where sign-out is POSTed (SIGN_OUT_PATH in shared/auth.ts). */
export const SIGN_OUT_URL = '/api/auth/logout';
