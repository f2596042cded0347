/** Wires plan submissions, single and batch, onto one app context: /api/submissions and /api/submissions/batches. */
import { Router } from 'express';
import type { AppContext } from '../app-context';
import { createSubmissionBatchesService } from './submission-batches.service';
import { submissionBatchesRouter } from './submission-batches.router';
import { createSubmissionsService } from './submissions.service';
import { submissionsRouter } from './submissions.router';

/** The /api/submissions router; batch runners stop when the app is disposed. */
export function submissionsFeature(ctx: AppContext): Router {
  const submissions = createSubmissionsService({
    sequelize: ctx.sequelize, models: ctx.models,
    checkPlan: (instance, sub, requester, signal) => ctx.interactive.checkPlan(instance, sub, requester, signal),
  });
  const batches = createSubmissionBatchesService({ sequelize: ctx.sequelize, users: ctx.users, submissions, logger: ctx.logger });
  ctx.onDispose(() => batches.close());
  const r = Router();
  r.use('/batches', submissionBatchesRouter(batches));
  r.use(submissionsRouter(submissions));
  return r;
}
