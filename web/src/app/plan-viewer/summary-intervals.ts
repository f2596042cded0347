/**
 * The 95 % intervals of a Monte Carlo summary the card computes itself. Every summary carries the
 * intervals of its rate and metrics (Wilson for the execution success rate, Student t for means,
 * an order-statistic interval for the p95, shared/confidence-interval.ts): the simulator computes
 * them, and the server fills them in for summaries stored before they existed. The collisions per
 * run have none in the summary, so they are computed here from the per-run counts.
 */
import type { ExecutionSummaryView } from '@shared/executions';
import { meanInterval, quantileInterval, type Interval95 } from '@shared/confidence-interval';

/**
 * Intervals of the collisions per run (mean by Student t, p95 by order statistics), from the
 * per-run counts the summary lists (the simulator's summary gives the counts no interval itself).
 */
export function collisionIntervals(s: ExecutionSummaryView): { readonly mean: Interval95 | null; readonly p95: Interval95 | null } {
  const counts = s.perRun.map((r) => r.collisions.length);
  const mean = meanInterval(counts);
  // A count is never negative: the symmetric t interval is cut at 0 (its coverage can only grow).
  return { mean: mean && [Math.max(0, mean[0]), mean[1]], p95: quantileInterval(counts, 0.95) };
}
