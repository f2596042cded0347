/**
 * CSRF defence (see shared/auth.ts): every response carries the token in the JS-readable cookie
 * `qt_csrf`; state-changing requests must echo it in `x-csrf-token`, and a present Origin header
 * must be the app's own origin. A cross-site page can make the browser send our cookies but can
 * neither read the cookie nor set the custom header.
 *
 * The token is bound to the session (issue 13): with a session cookie the only accepted token is
 * an HMAC of the session id under the session secret, whatever the `qt_csrf` cookie holds, so a
 * token taken from another session, or a cookie planted next to a victim's session, is refused.
 * Without a session (a visitor, who has no authority to abuse) it stays a random double-submit
 * token. The cookie is reissued whenever the session it belongs to changes: on every request
 * that arrives with another session's token, and by `reissue()` where sign-in and sign-out
 * change the session within one response.
 */
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import type { Request, RequestHandler, Response } from 'express';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { isTokenRequest } from '../api-tokens/bearer-auth';
import { AppError } from '../errors/app-error';
import { readCookie } from './cookies';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{32,128}$/;

/** What the CSRF middleware needs to know. */
export interface CsrfOptions {
  readonly publicUrl: string;
  /** The session secret: signs the session cookie and keys the token. */
  readonly secret: string;
  /** Name of the session cookie whose id the token is bound to. */
  readonly sessionCookie: string;
}

/** The middleware and the hook for routes that change the session. */
export interface Csrf {
  /** Issues or reissues the token cookie and rejects unsafe requests without the right token or with a foreign Origin. */
  readonly protect: RequestHandler;
  /** Sets the token cookie for `sessionId`, the session the response leaves the client with (undefined: none). */
  reissue(res: Response, sessionId: string | undefined): void;
}

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** Builds the CSRF defence of one app. */
export function createCsrf(options: CsrfOptions): Csrf {
  const ownOrigin = new URL(options.publicUrl).origin;
  const isSecure = ownOrigin.startsWith('https:');
  const tokenFor = (sessionId: string) => createHmac('sha256', options.secret).update(`qt-csrf\0${sessionId}`).digest('base64url');

  /**
   * The session id of the request's session cookie when its signature is ours, else undefined.
   * express-session writes `s:` + id + `.` + base64 HMAC-SHA256(id, secret) without padding
   * (its cookie-signature dependency, `sign()`); an unsigned or forged cookie is no session to it either.
   */
  const sessionIdOf = (req: Request): string | undefined => {
    const raw = readCookie(req, options.sessionCookie);
    if (!raw?.startsWith('s:')) return undefined;
    const dot = raw.lastIndexOf('.');
    if (dot <= 2) return undefined;
    const id = raw.slice(2, dot);
    const signature = createHmac('sha256', options.secret).update(id).digest('base64').replace(/=+$/, '');
    return sameToken(raw.slice(dot + 1), signature) ? id : undefined;
  };

  const setTokenCookie = (res: Response, token: string): void => {
    // Replace a token cookie set earlier in this response, so the client never sees two.
    const earlier = res.getHeader('set-cookie');
    if (earlier !== undefined) {
      const kept = (Array.isArray(earlier) ? earlier : [String(earlier)]).filter((c) => !c.startsWith(`${CSRF_COOKIE}=`));
      res.setHeader('set-cookie', kept);
    }
    res.cookie(CSRF_COOKIE, token, {
      httpOnly: false, // the web app must read it to echo it in the header
      sameSite: 'strict',
      secure: isSecure,
      path: '/',
    });
  };

  const protect: RequestHandler = (req, res, next) => {
    // A token request (Authorization: Bearer) uses no cookie, so there is nothing to forge; the
    // token itself is checked by api-tokens/bearer-auth.ts (issue 16, item 1).
    if (isTokenRequest(req)) {
      next();
      return;
    }
    const sessionId = sessionIdOf(req);
    const boundToken = sessionId === undefined ? undefined : tokenFor(sessionId);
    const cookieToken = readCookie(req, CSRF_COOKIE);
    const hasValidCookie = cookieToken !== undefined && TOKEN_PATTERN.test(cookieToken);
    if (boundToken !== undefined ? cookieToken !== boundToken : !hasValidCookie) {
      setTokenCookie(res, boundToken ?? randomBytes(32).toString('base64url'));
    }
    if (SAFE_METHODS.has(req.method)) {
      next();
      return;
    }
    const origin = req.headers.origin;
    if (origin !== undefined && origin !== ownOrigin) {
      next(new AppError('CSRF_REJECTED', 403, `Requests from origin ${origin} are not accepted.`));
      return;
    }
    const wanted = boundToken ?? (hasValidCookie ? cookieToken : undefined);
    const headerToken = req.get(CSRF_HEADER);
    if (wanted === undefined || !headerToken || !sameToken(headerToken, wanted)) {
      next(new AppError('CSRF_REJECTED', 403, `Missing or wrong ${CSRF_HEADER} header: echo the ${CSRF_COOKIE} cookie in it.`));
      return;
    }
    next();
  };

  return {
    protect,
    reissue(res, sessionId) {
      setTokenCookie(res, sessionId === undefined ? randomBytes(32).toString('base64url') : tokenFor(sessionId));
    },
  };
}
