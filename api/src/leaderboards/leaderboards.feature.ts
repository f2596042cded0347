/** Wires the leaderboards, exports and submissions routers onto one app context (one line in api-router.ts). */
import { Router } from 'express';
import type { AppContext } from '../app-context';
import { createProvenanceReader } from '../exports/export-provenance';
import { exportsRouter } from '../exports/exports.router';
import { submissionsFeature } from '../submissions/submissions.feature';
import { leaderboardsRouter } from './leaderboards.router';
import { createLeaderboardsService } from './leaderboards.service';

/** /api/leaderboards, /api/exports and /api/submissions. */
export function leaderboardsFeature(ctx: AppContext): Router {
  const boards = createLeaderboardsService({ sequelize: ctx.sequelize });
  const r = Router();
  r.use('/leaderboards', leaderboardsRouter(boards));
  r.use('/exports', exportsRouter(boards, createProvenanceReader(ctx.sequelize)));
  r.use('/submissions', submissionsFeature(ctx));
  return r;
}
