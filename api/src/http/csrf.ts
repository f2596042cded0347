/**
 * Double-submit CSRF defence (see shared/auth.ts): every response carries a random token in
 * the JS-readable cookie `qt_csrf`; state-changing requests must echo it in `x-csrf-token`,
 * and a present Origin header must be the app's own origin. A cross-site page can make the
 * browser send our cookies but can neither read the cookie nor set the custom header.
 */
import { randomBytes, timingSafeEqual } from 'node:crypto';
import type { RequestHandler } from 'express';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { AppError } from '../errors/app-error';
import { readCookie } from './cookies';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
const TOKEN_PATTERN = /^[A-Za-z0-9_-]{32,128}$/;

function sameToken(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

/** Issues the CSRF cookie when missing and rejects unsafe requests without a matching token or with a foreign Origin. */
export function csrfProtection(options: { readonly publicUrl: string }): RequestHandler {
  const ownOrigin = new URL(options.publicUrl).origin;
  const isSecure = ownOrigin.startsWith('https:');
  return (req, res, next) => {
    const cookieToken = readCookie(req, CSRF_COOKIE);
    const hasValidCookie = cookieToken !== undefined && TOKEN_PATTERN.test(cookieToken);
    if (!hasValidCookie) {
      res.cookie(CSRF_COOKIE, randomBytes(32).toString('base64url'), {
        httpOnly: false, // the web app must read it to echo it in the header
        sameSite: 'strict',
        secure: isSecure,
        path: '/',
      });
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
    const headerToken = req.get(CSRF_HEADER);
    if (!hasValidCookie || !headerToken || !sameToken(headerToken, cookieToken)) {
      next(new AppError('CSRF_REJECTED', 403, `Missing or wrong ${CSRF_HEADER} header: echo the ${CSRF_COOKIE} cookie in it.`));
      return;
    }
    next();
  };
}
