/** GET /api/history: the history of one leaderboard row (issue 16, item 5). Open to visitors for public sets. */
import { Router } from 'express';
import { HistoryQuery } from '@shared/history';
import type { AppContext } from '../app-context';
import { validate } from '../errors/validate';
import { createHistoryService, type HistoryService } from './history.service';

/** The history routes over the service. */
export function historyRouter(svc: HistoryService): Router {
  const r = Router();
  r.get('/', async (req, res) => {
    res.json(await svc.history(req.user ?? null, validate(HistoryQuery, req.query)));
  });
  return r;
}

/** The feature wired onto an app context (one line in api-router.ts). */
export function historyFeature(ctx: AppContext): Router {
  return historyRouter(createHistoryService({ sequelize: ctx.sequelize }));
}
