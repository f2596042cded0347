/** Role checks for routes: 401 when nobody is signed in, 403 when the role is too low. */
import type { Request, RequestHandler } from 'express';
import { hasRole, type Role } from '@shared/auth';
import { AppError } from '../errors/app-error';

/** The role of the requester (`visitor` when not signed in). */
export function currentRole(req: Request): Role {
  return req.user?.role ?? 'visitor';
}

/** The signed-in user, or throws 401 UNAUTHENTICATED. */
export function requireUser(req: Request): Express.User {
  if (!req.user) throw new AppError('UNAUTHENTICATED', 401, 'Sign in to do this.');
  return req.user;
}

/** Lets the request through only when the requester has at least `needed`. */
export function requireRole(needed: Role): RequestHandler {
  return (req, _res, next) => {
    const role = currentRole(req);
    if (hasRole(role, needed)) return next();
    if (!req.user) return next(new AppError('UNAUTHENTICATED', 401, 'Sign in to do this.'));
    next(new AppError('FORBIDDEN', 403, `This needs the ${needed} role; your account is ${role}.`));
  };
}
