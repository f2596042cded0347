/** GET /api/stats. */
import { Router } from 'express';
import type { StatsService } from './stats.service';

/** Routes under /api/stats. */
export function statsRouter(stats: StatsService): Router {
  const r = Router();
  r.get('/', async (req, res) => {
    res.json(await stats.read(req.user ?? null));
  });
  return r;
}
