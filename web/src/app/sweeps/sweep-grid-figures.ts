/**
 * The 95 % intervals the sweep grid shows beside execution figures, from what the sweep's stored
 * summaries hold: the intervals stored with new results (executions.metrics.ci95), else, for the
 * execution success rate, the Wilson interval recomputed from the stored rate and run count (a rate
 * is a count over runs, so that is exact). Means of older rows have no interval: their per-run values
 * were not kept, and none is invented.
 */
import { wilsonFromRate, type Interval95 } from '@shared/confidence-interval';
import type { ExecutionView } from '@shared/runs';

/** The execution success rate's 95 % interval: stored, or Wilson from successRate × runs. */
export function successRateInterval(e: Pick<ExecutionView, 'successRate' | 'runs' | 'ci95'>): Interval95 | null {
  if (e.ci95?.successRate) return e.ci95.successRate;
  if (!(Number.isInteger(e.runs) && e.runs > 0)) return null;
  return wilsonFromRate(e.successRate, e.runs);
}

/** The stored 95 % interval of the mean realised makespan (ms), or null. */
export function realisedMakespanInterval(e: Pick<ExecutionView, 'ci95'>): Interval95 | null {
  return e.ci95?.realisedMakespanMs ?? null;
}

/** Whole percent, or one decimal when that is needed to tell a value from 0 or 100. */
function percent(fraction: number): string {
  const pct = fraction * 100;
  const whole = Math.round(pct);
  return (whole === 0 && pct > 0) || (whole === 100 && pct < 100) ? pct.toFixed(1) : String(whole);
}

/** "85 % (72–93 %) of 40 runs". */
export function formatRateWithInterval(rate: number, ci: Interval95 | null, runs: number): string {
  const interval = ci ? ` (${percent(ci[0])}–${percent(ci[1])} %)` : '';
  return `${percent(rate)} %${interval} of ${runs} runs`;
}

/** Whole ms with thousands separators, e.g. "47,700" (the unit is in the column header). */
export function formatMs(ms: number): string {
  return ms.toLocaleString('en', { maximumFractionDigits: 0 });
}
