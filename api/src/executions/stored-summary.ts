/**
 * A stored Monte Carlo summary (plan_executions.summary) as the current ExecutionSummaryView.
 * Summaries stored before issue 12 lack the 95 % intervals, the metric counts and the per-robot
 * waiting. They kept every run's metrics (`perRun`), from which the summary itself was computed,
 * so the missing counts and intervals are computed here from those same values by the same
 * methods (shared/confidence-interval.ts): nothing is estimated. The success-rate interval is
 * Wilson from rate × runs. Per-robot waiting was never recorded per run, so it stays null. The
 * collisions intervals are computed from each run's collision count (nonNegativeMeanInterval,
 * quantileInterval), as the simulator computes them.
 *
 * Lockstep summaries stored before commit e4f5ddf carry a finish spread forced to 0 and a waiting
 * that counted barrier holds at the goal (both corrected in 0da65da). They are recognised by the
 * per-robot waiting every summary has recorded since e4f5ddf; those between e4f5ddf and 0da65da
 * exist only in databases made during that day's development. Their spread and waiting are
 * shown as "not stored" (null), their success rate, collisions and realised makespan stay.
 */
import { meanInterval, nonNegativeMeanInterval, quantileInterval, quantileIntervalOfSorted, wilsonFromRate, type Interval95 } from '@shared/confidence-interval';
import type { ExecutionSummaryView, MetricStatsView, RunMetricsView } from '@shared/executions';

/** A summary as it may be stored: the current shape, or one written before some fields existed. */
export type StoredSummary = Omit<ExecutionSummaryView, 'collisions' | 'successRateCi95' | 'ci95' | 'waitingPerRobotMs' | 'perRun'
  | 'realisedMakespanMs' | 'realisedSocMs' | 'finishSpreadMs' | 'waitingMs'> & {
  readonly successRateCi95?: Interval95;
  readonly ci95?: ExecutionSummaryView['ci95'];
  readonly collisions: Omit<ExecutionSummaryView['collisions'], 'meanCi95' | 'p95Ci95'> & { readonly meanCi95?: Interval95 | null; readonly p95Ci95?: Interval95 | null };
  readonly waitingPerRobotMs?: ExecutionSummaryView['waitingPerRobotMs'];
  readonly realisedMakespanMs: StoredMetric;
  readonly realisedSocMs: StoredMetric;
  readonly finishSpreadMs: StoredMetric;
  readonly waitingMs: StoredMetric;
  readonly perRun: readonly StoredRun[];
};
type StoredMetric = Pick<MetricStatsView, 'mean' | 'p95'> & Partial<Pick<MetricStatsView, 'count' | 'meanCi95' | 'p95Ci95'>>;
type StoredRun = Omit<RunMetricsView, 'waitingMeanPerRobotMs' | 'waitingMaxPerRobotMs'> & Partial<Pick<RunMetricsView, 'waitingMeanPerRobotMs' | 'waitingMaxPerRobotMs'>>;

/** The metrics of one run a MetricStatsView may summarise. */
type RunMetricKey = 'realisedMakespanMs' | 'realisedSocMs' | 'finishSpreadMs' | 'waitingMs';

/** A figure not stored (computed by a superseded rule): no value, no interval. */
const NOT_STORED: MetricStatsView = { mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null };

/** `stored` with every field of the current view; fields it already has are kept as stored. */
export function currentSummary(s: StoredSummary): ExecutionSummaryView {
  const staleLockstep = s.policy === 'lockstep' && s.waitingPerRobotMs === undefined;
  const metric = (key: RunMetricKey): MetricStatsView => {
    if (staleLockstep && (key === 'finishSpreadMs' || key === 'waitingMs')) return NOT_STORED;
    const m = s[key];
    if (m.count !== undefined && m.meanCi95 !== undefined && m.p95Ci95 !== undefined) return m as MetricStatsView;
    // Sorted ascending as the simulator's metricStats sums them, so the floating-point results agree to the digit.
    const values = s.perRun.map((r) => r[key]).filter((v): v is number => typeof v === 'number').sort((a, b) => a - b);
    return { ...m, count: values.length, meanCi95: meanInterval(values), p95Ci95: quantileIntervalOfSorted(values, 0.95) };
  };
  const realisedMakespanMs = metric('realisedMakespanMs');
  const finishSpreadMs = metric('finishSpreadMs');
  // No runs: nothing is known ([0, 1], as wilsonInterval gives for n = 0).
  const collisionCounts = s.perRun.map((r) => r.collisions.length);
  const collisions = {
    ...s.collisions,
    meanCi95: s.collisions.meanCi95 !== undefined ? s.collisions.meanCi95 : nonNegativeMeanInterval(collisionCounts),
    p95Ci95: s.collisions.p95Ci95 !== undefined ? s.collisions.p95Ci95 : quantileInterval(collisionCounts, 0.95),
  };
  const successRateCi95 = s.successRateCi95 ?? (s.runs > 0 ? wilsonFromRate(s.successRate, s.runs) : [0, 1]);
  return {
    ...s,
    successRateCi95,
    ci95: staleLockstep && s.ci95 ? { ...s.ci95, finishSpreadMs: null }
      : s.ci95 ?? { successRate: successRateCi95, realisedMakespanMs: realisedMakespanMs.meanCi95, finishSpreadMs: finishSpreadMs.meanCi95 },
    collisions,
    realisedMakespanMs,
    realisedSocMs: metric('realisedSocMs'),
    finishSpreadMs,
    waitingMs: metric('waitingMs'),
    waitingPerRobotMs: s.waitingPerRobotMs ?? null,
    // A stale lockstep run's forced-0 spread is not stored either (its per-run waiting is a number in the view; the summary's is null).
    perRun: s.perRun.map((r) => ({ ...r, ...(staleLockstep ? { finishSpreadMs: null } : {}), waitingMeanPerRobotMs: r.waitingMeanPerRobotMs ?? null, waitingMaxPerRobotMs: r.waitingMaxPerRobotMs ?? null })),
  };
}
