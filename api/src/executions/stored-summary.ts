/**
 * A stored Monte Carlo summary (plan_executions.summary) as the current ExecutionSummaryView.
 * Summaries stored before issue 12 lack the 95 % intervals, the metric counts and the per-robot
 * waiting. They kept every run's metrics (`perRun`), from which the summary itself was computed,
 * so the missing counts and intervals are computed here from those same values by the same
 * methods (shared/confidence-interval.ts): nothing is estimated. The success-rate interval is
 * Wilson from rate × runs. Per-robot waiting was never recorded per run, so it stays null.
 */
import { meanInterval, quantileIntervalOfSorted, wilsonFromRate, type Interval95 } from '@shared/confidence-interval';
import type { ExecutionSummaryView, MetricStatsView, RunMetricsView } from '@shared/executions';

/** A summary as it may be stored: the current shape, or one written before some fields existed. */
export type StoredSummary = Omit<ExecutionSummaryView, 'successRateCi95' | 'ci95' | 'waitingPerRobotMs' | 'perRun'
  | 'realisedMakespanMs' | 'realisedSocMs' | 'finishSpreadMs' | 'waitingMs'> & {
  readonly successRateCi95?: Interval95;
  readonly ci95?: ExecutionSummaryView['ci95'];
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

/** `stored` with every field of the current view; fields it already has are kept as stored. */
export function currentSummary(s: StoredSummary): ExecutionSummaryView {
  const metric = (key: RunMetricKey): MetricStatsView => {
    const m = s[key];
    if (m.count !== undefined && m.meanCi95 !== undefined && m.p95Ci95 !== undefined) return m as MetricStatsView;
    // Sorted ascending as the simulator's metricStats sums them, so the floating-point results agree to the digit.
    const values = s.perRun.map((r) => r[key]).filter((v): v is number => typeof v === 'number').sort((a, b) => a - b);
    return { ...m, count: values.length, meanCi95: meanInterval(values), p95Ci95: quantileIntervalOfSorted(values, 0.95) };
  };
  const realisedMakespanMs = metric('realisedMakespanMs');
  const finishSpreadMs = metric('finishSpreadMs');
  // No runs: nothing is known ([0, 1], as wilsonInterval gives for n = 0).
  const successRateCi95 = s.successRateCi95 ?? (s.runs > 0 ? wilsonFromRate(s.successRate, s.runs) : [0, 1]);
  return {
    ...s,
    successRateCi95,
    ci95: s.ci95 ?? { successRate: successRateCi95, realisedMakespanMs: realisedMakespanMs.meanCi95, finishSpreadMs: finishSpreadMs.meanCi95 },
    realisedMakespanMs,
    realisedSocMs: metric('realisedSocMs'),
    finishSpreadMs,
    waitingMs: metric('waitingMs'),
    waitingPerRobotMs: s.waitingPerRobotMs ?? null,
    perRun: s.perRun.map((r) => ({ ...r, waitingMeanPerRobotMs: r.waitingMeanPerRobotMs ?? null, waitingMaxPerRobotMs: r.waitingMaxPerRobotMs ?? null })),
  };
}
