/**
 * Which scope a Bearer request needs (issue 16, item 1). Least privilege: a scope opens only the
 * routes listed here; every other state-changing route (instance library writes, settings, roles,
 * quotas, executions on the server, sign-out) and the token routes themselves are for the browser
 * session only, so a leaked token can never mint tokens, change a role or delete data.
 */
import type { TokenScope } from '@shared/api-tokens';

const SAFE_METHODS = new Set(['GET', 'HEAD']);

/** Routes (method, path under /api) a state-changing scope opens. */
const WRITE_SCOPES: ReadonlyArray<{ readonly method: string; readonly path: RegExp; readonly scope: TokenScope }> = [
  { method: 'POST', path: /^\/submissions\/?$/i, scope: 'submit' },
  { method: 'POST', path: /^\/submissions\/batches\/?$/i, scope: 'submit' },
  { method: 'POST', path: /^\/sweeps\/?$/i, scope: 'sweep' },
  { method: 'POST', path: /^\/sweeps\/preview\/?$/i, scope: 'sweep' },
  { method: 'POST', path: /^\/sweeps\/[^/]+\/cancel\/?$/i, scope: 'sweep' },
];

/** Paths no token opens, whatever the method: the token routes and sign-in/sign-out. */
// Case-insensitive like Express's routing, so /api/ME/tokens is the same route here as there.
const SESSION_ONLY = [/^\/me\/tokens(\/|$)/i, /^\/auth(\/|$)/i];

/**
 * The scope a Bearer request for `method` on `path` (relative to /api, e.g. `/sweeps/3/cancel`)
 * needs, or null when no scope opens it.
 */
export function scopeNeeded(method: string, path: string): TokenScope | null {
  if (SESSION_ONLY.some((p) => p.test(path))) return null;
  const upper = method.toUpperCase();
  if (SAFE_METHODS.has(upper)) return 'read';
  return WRITE_SCOPES.find((w) => w.method === upper && w.path.test(path))?.scope ?? null;
}

/** Scopes that work only while the account has at least this role. */
export const SCOPE_ROLES: Partial<Record<TokenScope, 'maintainer'>> = { sweep: 'maintainer' };
