/** Summary statistics of per-run metrics. */
import type { MetricStats } from './execution-types';

/** Mean and nearest-rank 95th percentile (the value at rank ⌈0.95·N⌉ of the sorted values; common practice) of the defined values. */
export function metricStats(values: readonly (number | null)[]): MetricStats {
  const xs = values.filter((v): v is number => v !== null).sort((a, b) => a - b);
  if (xs.length === 0) return { mean: null, p95: null };
  const mean = xs.reduce((s, v) => s + v, 0) / xs.length;
  return { mean, p95: xs[Math.ceil(0.95 * xs.length) - 1] };
}
