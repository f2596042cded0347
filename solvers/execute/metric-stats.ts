/** Summary statistics of per-run metrics, with their 95 % intervals (computed once per batch). */
import { meanInterval, quantileIntervalOfSorted } from '@shared/confidence-interval';
import type { MetricStats } from './execution-types';

/**
 * Mean and nearest-rank 95th percentile (the value at rank ⌈0.95·N⌉ of the sorted values; common
 * practice) of the defined values, their count, the Student t interval of the mean and the
 * distribution-free order-statistic interval of the p95 (shared/confidence-interval.ts).
 */
export function metricStats(values: readonly (number | null)[]): MetricStats {
  const xs = values.filter((v): v is number => v !== null).sort((a, b) => a - b);
  if (xs.length === 0) return { mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null };
  const mean = xs.reduce((s, v) => s + v, 0) / xs.length;
  return {
    mean,
    p95: xs[Math.ceil(0.95 * xs.length) - 1],
    count: xs.length,
    meanCi95: meanInterval(xs),
    p95Ci95: quantileIntervalOfSorted(xs, 0.95),
  };
}
