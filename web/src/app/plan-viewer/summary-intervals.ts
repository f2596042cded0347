/**
 * The 95 % intervals of a Monte Carlo summary as the card shows them. Summaries computed since
 * issue 12 carry them (Wilson for the execution success rate, Student t for means, an
 * order-statistic interval for the p95, shared/confidence-interval.ts); for one stored or computed
 * before, the success-rate interval is recomputed from the rate and the runs (the Wilson interval
 * needs nothing else) and the others are shown as not available.
 */
import type { ExecutionSummaryView, MetricStatsView } from '@shared/executions';
import { meanInterval, quantileInterval, wilsonInterval, type Interval95 } from '@shared/confidence-interval';

/** A metric with the interval fields it may carry. */
export type MetricWithIntervals = MetricStatsView & { readonly meanCi95?: Interval95 | null; readonly p95Ci95?: Interval95 | null };

/** A summary with the interval and per-robot waiting fields it may carry. */
export type SummaryWithIntervals = ExecutionSummaryView & {
  readonly successRateCi95?: Interval95;
  readonly waitingPerRobotMs?: { readonly mean: MetricWithIntervals; readonly max: MetricWithIntervals };
};

/** The Wilson interval of the success rate: the summary's, or recomputed from rate × runs. */
export function successRateInterval(s: ExecutionSummaryView): Interval95 | null {
  const own = (s as SummaryWithIntervals).successRateCi95;
  if (own) return own;
  if (s.runs <= 0) return null;
  return wilsonInterval(Math.round(s.successRate * s.runs), s.runs);
}

/** The interval of a metric's mean, or null. */
export function meanIntervalOf(m: MetricStatsView): Interval95 | null {
  return (m as MetricWithIntervals).meanCi95 ?? null;
}

/** The interval of a metric's p95, or null. */
export function p95IntervalOf(m: MetricStatsView): Interval95 | null {
  return (m as MetricWithIntervals).p95Ci95 ?? null;
}

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
