/**
 * A per-user limit on uploads in progress (issue 13, item 1: four parallel uploads of one user held
 * 720 MB and a minute of checking). An upload counts from before its body is read until its
 * response is closed, finished or abandoned; one more is refused at once with 429 TOO_MANY_UPLOADS,
 * before its body is read. The count lives in this process (one API process serves the app).
 */
import type { RequestHandler } from 'express';
import { AppError } from '../errors/app-error';

/** The error code of an upload refused by the per-user limit (429). */
export const TOO_MANY_UPLOADS = 'TOO_MANY_UPLOADS';

/** Counts uploads in progress per user. */
export class UploadGate {
  private readonly inProgress = new Map<number, number>();

  /** `perUser`: uploads one user may have in progress at once (UPLOADS_PER_USER). */
  constructor(readonly perUser: number) {}

  /** Uploads `userId` has in progress now. */
  countOf(userId: number): number {
    return this.inProgress.get(userId) ?? 0;
  }

  /** Middleware: holds one of the user's places until the response closes; 429 when none is free. Put it after the sign-in check. */
  middleware(): RequestHandler {
    return (req, res, next) => {
      const userId = req.user?.id;
      if (userId === undefined) {
        next(new AppError('UNAUTHENTICATED', 401, 'Sign in to upload files.'));
        return;
      }
      const now = this.countOf(userId);
      if (now >= this.perUser) {
        next(new AppError(TOO_MANY_UPLOADS, 429,
          `You have ${now} upload${now === 1 ? '' : 's'} in progress; at most ${this.perUser} at a time are accepted (UPLOADS_PER_USER). `
          + 'Wait for one to finish, then send this one again.',
          { limit: this.perUser, inProgress: now }));
        return;
      }
      this.inProgress.set(userId, now + 1);
      // 'close' comes once per response, whether it finished or the client went away.
      res.once('close', () => {
        const left = this.countOf(userId) - 1;
        if (left <= 0) this.inProgress.delete(userId);
        else this.inProgress.set(userId, left);
      });
      next();
    };
  }
}
