/** Wires the field-trials feature: the services over the interactive pool, the /api/trials and /api/robot-profiles routers. */
import type { Router } from 'express';
import type { AppContext } from '../app-context';
import { UploadGate } from '../instance-sets/upload-gate';
import { createRobotProfilesService } from './robot-profiles.service';
import { robotProfilesRouter, trialsRouter } from './trials.router';
import { createTrialsService } from './trials.service';

/** The /api/trials and /api/robot-profiles routers for `ctx`; logs are parsed, checked and fitted in the interactive pool, never on the event loop. */
export function trialsFeature(ctx: AppContext): { trials: Router; robotProfiles: Router } {
  const svc = createTrialsService({
    models: ctx.models, sequelize: ctx.sequelize, check: (job, requester, signal) => ctx.interactive.checkTrials(job, requester, signal),
  });
  const profiles = createRobotProfilesService({
    models: ctx.models, sequelize: ctx.sequelize, fit: (logs, requester, signal) => ctx.interactive.calibrateTrials(logs, requester, signal),
  });
  return { trials: trialsRouter(svc, profiles, new UploadGate(ctx.config.uploadsPerUser)), robotProfiles: robotProfilesRouter(profiles) };
}
