/**
 * The 95 % intervals of the collisions per run as the card shows them. Every summary carries the
 * intervals of its rate and metrics (Wilson for the execution success rate, Student t for means,
 * an order-statistic interval for the p95, shared/confidence-interval.ts): the simulator computes
 * them, and the server fills them in for summaries stored before they existed. The collisions
 * intervals come from the summary too (the simulator cuts the mean's at 0); only summaries stored
 * before they were recorded lack them, and then the same shared functions compute them from the
 * per-run counts the summary lists.
 */
import type { ExecutionSummaryView } from '@shared/executions';
import { nonNegativeMeanInterval, quantileInterval, type Interval95 } from '@shared/confidence-interval';

/** Intervals of the collisions per run (mean by Student t cut at 0, p95 by order statistics). */
export function collisionIntervals(s: ExecutionSummaryView): { readonly mean: Interval95 | null; readonly p95: Interval95 | null } {
  const { meanCi95, p95Ci95 } = s.collisions;
  if (meanCi95 !== undefined && p95Ci95 !== undefined) return { mean: meanCi95, p95: p95Ci95 };
  const counts = s.perRun.map((r) => r.collisions.length);
  return { mean: nonNegativeMeanInterval(counts), p95: quantileInterval(counts, 0.95) };
}
