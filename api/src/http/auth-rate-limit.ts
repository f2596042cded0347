/** Rate limit for /api/auth: slows password-less guessing of callbacks and sign-in floods. */
import type { RequestHandler } from 'express';
import { rateLimit } from 'express-rate-limit';
import { AppError } from '../errors/app-error';

/** At most `limit` requests per client address per `windowMs`; the excess gets 429 RATE_LIMITED. */
export function authRateLimit(limit: number, windowMs: number): RequestHandler {
  return rateLimit({
    windowMs,
    limit,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    handler: (_req, _res, next) => {
      next(new AppError('RATE_LIMITED', 429, `Too many sign-in requests; try again in ${Math.ceil(windowMs / 60000)} minutes.`));
    },
  });
}
