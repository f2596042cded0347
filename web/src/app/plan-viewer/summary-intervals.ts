/**
 * The 95 % intervals of the collisions per run as the card shows them. Every summary carries the
 * intervals of its rate and metrics (Wilson for the execution success rate, Student t for means,
 * an order-statistic interval for the p95, shared/confidence-interval.ts): the simulator computes
 * them, and the server fills them in for summaries stored before they existed
 * (api/src/executions/stored-summary.ts), collisions included.
 */
import type { ExecutionSummaryView } from '@shared/executions';
import type { Interval95 } from '@shared/confidence-interval';

/** Intervals of the collisions per run (mean by Student t cut at 0, p95 by order statistics). */
export function collisionIntervals(s: ExecutionSummaryView): { readonly mean: Interval95 | null; readonly p95: Interval95 | null } {
  return { mean: s.collisions.meanCi95, p95: s.collisions.p95Ci95 };
}
