/** Mounts every feature router under /api. A new feature adds one `r.use(...)` line here. */
import { Router } from 'express';
import type { AppContext } from './app-context';
import { apiTokensRouter } from './api-tokens/api-tokens.router';
import { createApiTokensService } from './api-tokens/api-tokens.service';
import { executionsFeature } from './executions/executions.feature';
import { externalSolversFeature } from './external-solvers/external-solvers.router';
import { healthRouter } from './health/health.router';
import { historyFeature } from './history/history.router';
import { repositoryHelpFiles } from './help/help-files';
import { helpRouter, schemasRouter } from './help/help.router';
import { instanceLibraryRouter } from './instance-sets/instance-library.router';
import { leaderboardsFeature } from './leaderboards/leaderboards.feature';
import { reportsFeature } from './reports/reports.feature';
import { statsFeature } from './stats/stats.feature';
import { sweepsFeature } from './sweeps/sweeps-feature';
import { sweepDownloadsRouter } from './sweeps/sweep-downloads.router';
import { adminUsersRouter } from './users/admin-users.router';
import { meRouter } from './users/me.router';
import { openApiRouter } from './openapi/openapi.router';
import { trialsFeature } from './trials/trials.feature';

/** The /api routes other than /api/auth (which needs passport and the rate limit; see app.ts). */
export function apiRouter(ctx: AppContext): Router {
  const r = Router();
  r.use('/health', healthRouter(ctx.sequelize, ctx.version));
  r.use('/me/tokens', apiTokensRouter(createApiTokensService({ sequelize: ctx.sequelize, users: ctx.users })));
  r.use('/me', meRouter(ctx.users));
  r.use('/admin/users', adminUsersRouter(ctx.users));
  r.use('/stats', statsFeature(ctx));
  r.use('/help', helpRouter(repositoryHelpFiles()));
  r.use('/schemas', schemasRouter(repositoryHelpFiles()));
  r.use('/openapi.json', openApiRouter());
  r.use(instanceLibraryRouter(ctx));
  r.use(sweepsFeature(ctx));
  r.use('/sweeps', sweepDownloadsRouter(ctx));
  r.use('/external-solvers', externalSolversFeature(ctx));
  r.use('/executions', executionsFeature(ctx));
  r.use(leaderboardsFeature(ctx));
  r.use('/history', historyFeature(ctx));
  r.use('/reports', reportsFeature(ctx));
  const trials = trialsFeature(ctx);
  r.use('/trials', trials.trials);
  r.use('/robot-profiles', trials.robotProfiles);
  return r;
}
