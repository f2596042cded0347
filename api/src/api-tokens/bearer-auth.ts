/**
 * `Authorization: Bearer qtk_…` on /api (issue 16, item 1). A request with a Bearer Authorization
 * header is a token request, whatever cookies it also carries: the session is not read (Bearer
 * wins), the CSRF check does not apply (`isTokenRequest`, used by api/src/http/csrf.ts; a
 * cross-site page cannot make a browser send this header, and the ambient cookie session is
 * ignored anyway), and the token must be valid (401 otherwise, never a fall-back to the session),
 * rate limited per token and hold the scope the route needs (403 naming it). Role and visibility
 * rules stay those of the account's current role, read fresh on every request.
 * Other schemes (`Basic`, which browsers resend by themselves behind a password-protected proxy)
 * are not token requests: they are ignored here and keep the session and the CSRF check.
 */
import type { Request, RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { hasRole } from '@shared/auth';
import type { TokenScope } from '@shared/api-tokens';
import { AppError } from '../errors/app-error';
import { toAccount } from '../users/account';
import type { ApiTokensService } from './api-tokens.service';
import { SCOPE_ROLES, scopeNeeded } from './token-scopes';
import { isSecretShaped } from './token-secret';

declare module 'express-serve-static-core' {
  interface Request {
    /** The API token a Bearer request was authenticated with. */
    apiToken?: { readonly id: number; readonly scopes: readonly TokenScope[] };
  }
}

/** Whether the request carries `Authorization: Bearer …`, which makes it a token request. */
export function isTokenRequest(req: Request): boolean {
  return /^bearer(\s|$)/i.test(req.headers.authorization ?? '');
}

/** Runs `handler` only for requests that are not token requests (the session middleware). */
export function unlessToken(handler: RequestHandler): RequestHandler {
  return (req, res, next) => (isTokenRequest(req) ? next() : handler(req, res, next));
}

/** Options of the token rate limit. */
export interface TokenRateLimit {
  /** Requests per token per window. */
  readonly limit: number;
  readonly windowMs: number;
}

/** The middleware chain that authenticates, rate-limits and scope-checks token requests. */
export function bearerAuth(tokens: ApiTokensService, rate: TokenRateLimit): RequestHandler[] {
  const authenticate: RequestHandler = (req, res, next) => {
    if (!isTokenRequest(req)) return next();
    const match = /^Bearer +(\S+) *$/i.exec(req.headers.authorization ?? '');
    const refuse = (message: string) => {
      // RFC 6750, section 3: a refused bearer token is answered with this challenge.
      res.setHeader('www-authenticate', 'Bearer realm="quarterturn", error="invalid_token"');
      next(new AppError('UNAUTHENTICATED', 401, message));
    };
    if (!match) return refuse('The Authorization header must be "Bearer" followed by one API token (qtk_…).');
    if (!isSecretShaped(match[1])) return refuse('That is not a Quarterturn API token (qtk_ followed by 43 characters).');
    tokens.authenticate(match[1]).then((principal) => {
      if (!principal) return refuse('The API token is unknown, revoked or expired.');
      req.user = toAccount(principal.user);
      req.apiToken = { id: principal.tokenId, scopes: principal.scopes };
      next();
    }, next);
  };

  const limit = rateLimit({
    windowMs: rate.windowMs,
    limit: rate.limit,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    skip: (req) => req.apiToken === undefined,
    keyGenerator: (req) => `token:${req.apiToken?.id}`,
    handler: (_req, _res, next) => {
      next(new AppError('RATE_LIMITED', 429, `This API token made more than ${rate.limit} requests in ${Math.round(rate.windowMs / 1000)} s; slow down and retry after the Retry-After header's seconds.`));
    },
  });

  const checkScope: RequestHandler = (req, _res, next) => {
    const token = req.apiToken;
    if (!token) return next();
    const needed = scopeNeeded(req.method, req.path);
    if (needed === null) {
      return next(new AppError('FORBIDDEN', 403, `No API token scope opens ${req.method} /api${req.path}; use the web app.`, { missingScope: null }));
    }
    if (!token.scopes.includes(needed)) {
      return next(new AppError('FORBIDDEN', 403, `This needs an API token with the ${needed} scope; this token has ${token.scopes.join(', ')}.`, { missingScope: needed }));
    }
    const role = SCOPE_ROLES[needed];
    if (role && req.user && !hasRole(req.user.role, role)) {
      return next(new AppError('FORBIDDEN', 403, `The ${needed} scope works only while the account is a ${role} or admin; it is ${req.user.role} now.`, { missingScope: null }));
    }
    next();
  };

  return [authenticate, limit, checkScope];
}
