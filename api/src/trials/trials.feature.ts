/** Wires the field-trials feature: the service over the interactive pool and the /api/trials router. */
import type { Router } from 'express';
import type { AppContext } from '../app-context';
import { UploadGate } from '../instance-sets/upload-gate';
import { trialsRouter } from './trials.router';
import { createTrialsService } from './trials.service';

/** The /api/trials router for `ctx`; logs are parsed and checked in the interactive pool, never on the event loop. */
export function trialsFeature(ctx: AppContext): Router {
  const svc = createTrialsService({
    models: ctx.models, sequelize: ctx.sequelize, check: (job, requester, signal) => ctx.interactive.checkTrials(job, requester, signal),
  });
  return trialsRouter(svc, new UploadGate(ctx.config.uploadsPerUser));
}
