/** Routes under /api/leaderboards: pages of a view, the per-model summary and the chart data. Open to visitors. */
import { Router } from 'express';
import { LEADERBOARD_POLICIES } from '@shared/leaderboards';
import { AppError } from '../errors/app-error';
import type { LeaderboardsService } from './leaderboards.service';
import { bestAmongOf, flatQuery, scopeOf, viewOf, windowOf } from './view-request';

/** Leaderboard routes over the service. */
export function leaderboardsRouter(svc: LeaderboardsService): Router {
  const r = Router();

  r.get('/rows', async (req, res) => {
    const params = flatQuery(req.query);
    res.json(await svc.page(viewOf(params), req.user ?? null, scopeOf(params), windowOf(params), params['count'] !== '0'));
  });

  r.get('/summary', async (req, res) => {
    const params = flatQuery(req.query);
    res.json(await svc.summary(req.user ?? null, scopeOf(params), bestAmongOf(params)));
  });

  r.get('/charts', async (req, res) => {
    const params = flatQuery(req.query);
    const policy = params['policy'] ?? 'open-loop';
    if (!LEADERBOARD_POLICIES.some((p) => p.policy === policy)) {
      throw new AppError('VALIDATION_FAILED', 400, `Query parameter "policy" must be one of ${LEADERBOARD_POLICIES.map((p) => p.policy).join(', ')}`, [{ param: 'policy' }]);
    }
    res.json(await svc.charts(req.user ?? null, scopeOf(params), policy));
  });

  return r;
}
