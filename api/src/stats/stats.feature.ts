/**
 * GET /api/stats with the counters no other feature owns. Results have no feature of their own
 * (sweeps and submissions both write them), so their counter is registered here; before it was,
 * the figure fell back to 0 for everyone.
 */
import type { Router } from 'express';
import type { AppContext } from '../app-context';
import { countVisibleResults } from './result-count';
import { statsRouter } from './stats.router';

/** Registers the results counter and returns the /api/stats router. */
export function statsFeature(ctx: AppContext): Router {
  ctx.stats.register('results', (viewer) => countVisibleResults(ctx.sequelize, viewer));
  return statsRouter(ctx.stats);
}
