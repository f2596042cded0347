/** Wires plan submissions, single and batch, onto one app context: /api/submissions and /api/submissions/batches. */
import { Router } from 'express';
import type { AppContext } from '../app-context';
import { createSubmissionBatchesService } from './submission-batches.service';
import { submissionBatchesRouter } from './submission-batches.router';
import { createSubmissionsService } from './submissions.service';
import { submissionsRouter } from './submissions.router';

/** The /api/submissions router; unfinished batches resume at once, and batch runners stop when the app is disposed. */
export function submissionsFeature(ctx: AppContext): Router {
  const submissions = createSubmissionsService({
    sequelize: ctx.sequelize, models: ctx.models,
    checkPlan: (instance, sub, requester, signal) => ctx.interactive.checkPlan(instance, sub, requester, signal),
  });
  const batches = createSubmissionBatchesService({ sequelize: ctx.sequelize, users: ctx.users, submissions, logger: ctx.logger });
  ctx.onDispose(() => batches.close());
  // Batches a stopped server left half checked carry on without waiting for their owners to look.
  batches.resumeUnfinished()
    .then((n) => { if (n > 0) ctx.logger.info({ batches: n }, 'resumed unfinished plan batches'); })
    .catch((err: Error) => ctx.logger.warn({ err: err.message }, 'could not look for unfinished plan batches; they resume when their owners open them'));
  const r = Router();
  r.use('/batches', submissionBatchesRouter(batches));
  r.use(submissionsRouter(submissions));
  return r;
}
