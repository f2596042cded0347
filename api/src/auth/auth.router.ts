/** Sign-in through the OAuth provider, the callback, and sign-out. */
import { Router, type NextFunction, type Request, type Response } from 'express';
import type { Passport } from 'passport';
import { SIGN_IN_FAILED_PATH } from '@shared/auth';
import type { Csrf } from '../http/csrf';
import { SESSION_COOKIE } from './session';

/** Errors passport-oauth2 raises when the provider misbehaves or refuses; they end in a redirect, not a 500. */
const PROVIDER_ERRORS = new Set(['AuthorizationError', 'TokenError', 'InternalOAuthError']);

/** Routes under /api/auth; `csrf` reissues the token bound to the session when sign-in or sign-out replaces it. */
export function authRouter(passport: InstanceType<typeof Passport>, csrf: Csrf): Router {
  const r = Router();

  r.get('/github', passport.authenticate('github', { session: true }));

  r.get('/github/callback', (req: Request, res: Response, next: NextFunction) => {
    passport.authenticate('github', (err: unknown, user: Express.User | false) => {
      if (err) {
        if (err instanceof Error && PROVIDER_ERRORS.has(err.name)) {
          req.log?.warn({ err }, 'sign-in refused by the OAuth provider');
          return res.redirect(302, SIGN_IN_FAILED_PATH);
        }
        return next(err);
      }
      // No user: the person cancelled, or the state check failed (stale or forged callback).
      if (!user) return res.redirect(302, SIGN_IN_FAILED_PATH);
      // passport ≥ 0.6 regenerates the session id inside logIn (session fixation defence).
      req.logIn(user, (loginErr: unknown) => {
        if (loginErr) return next(loginErr);
        req.log?.info({ userId: user.id, login: user.login }, 'signed in');
        csrf.reissue(res, req.sessionID);
        res.redirect(302, '/');
      });
    })(req, res, next);
  });

  r.post('/logout', (req: Request, res: Response, next: NextFunction) => {
    req.logout((err: unknown) => {
      if (err) return next(err);
      // logout() already regenerated the session; drop the fresh empty one too.
      req.session.destroy((destroyErr: unknown) => {
        if (destroyErr) return next(destroyErr);
        res.clearCookie(SESSION_COOKIE, { path: '/' });
        csrf.reissue(res, undefined);
        res.status(204).end();
      });
    });
  });

  return r;
}
