/**
 * GET /api/health: liveness plus a database round trip. A down database answers 200 with
 * status "degraded" (the body is the HealthResponse contract, not the error shape), so
 * monitors read `status` rather than the HTTP code.
 */
import { Router } from 'express';
import type { Sequelize } from 'sequelize';
import type { HealthResponse } from '@shared/auth';

/** Routes under /api/health; `version` is the package version. */
export function healthRouter(sequelize: Sequelize, version: string): Router {
  const r = Router();
  r.get('/', async (req, res) => {
    let isDbUp = true;
    try {
      await sequelize.query('SELECT 1');
    } catch (err) {
      isDbUp = false;
      req.log?.warn({ err }, 'health check: database unreachable');
    }
    const body: HealthResponse = { status: isDbUp ? 'ok' : 'degraded', db: isDbUp ? 'up' : 'down', version };
    res.set('Cache-Control', 'no-store').json(body);
  });
  return r;
}
