/**
 * Personal API tokens (issue 16, item 1): the zod-free part of the contract, so the web app can
 * import the scope list without pulling zod into its bundle. The request schemas are in
 * api-tokens.ts, which re-exports this file.
 */

/**
 * What a token may do. Each scope opens a fixed set of routes (least privilege; the table is
 * `scopeNeeded` in api/src/api-tokens/token-scopes.ts):
 * - `read`: every GET and HEAD the account's current role may read;
 * - `submit`: POST /api/submissions (submit a plan);
 * - `sweep`: POST /api/sweeps, /api/sweeps/preview and /api/sweeps/:id/cancel, and only while the
 *   account is a maintainer or admin.
 */
export const TOKEN_SCOPES = ['read', 'submit', 'sweep'] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

/** Every token starts with this, so leaked ones are easy to recognise (and to grep for in logs). */
export const TOKEN_PREFIX = 'qtk_';

/** Longest lifetime of a token, in days. */
export const MAX_TOKEN_DAYS = 365;

/** A token as its owner sees it: never the secret, which is shown once at creation. */
export interface ApiTokenView {
  readonly id: number;
  readonly name: string;
  readonly scopes: readonly TokenScope[];
  readonly createdAt: string;
  readonly expiresAt: string;
  /** When a request last used it, to the minute; null: never. */
  readonly lastUsedAt: string | null;
}

/** GET /api/me/tokens: the signed-in person's tokens that are not revoked (expired ones too), newest first. */
export interface ApiTokenListResponse {
  readonly tokens: readonly ApiTokenView[];
}

/** POST /api/me/tokens (201): the new token and its secret, which the server cannot show again. */
export interface CreatedApiToken {
  readonly token: ApiTokenView;
  readonly secret: string;
}
