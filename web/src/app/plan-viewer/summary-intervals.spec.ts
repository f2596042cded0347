import type { ExecutionSummaryView } from '@shared/executions';
import { collisionIntervals } from './summary-intervals';

/** A summary with only the fields these helpers read; `intervals` as the simulator records them (absent on old stored ones). */
function summary(counts: readonly number[], intervals: object = {}): ExecutionSummaryView {
  return {
    runs: counts.length,
    successRate: counts.filter((c) => c === 0).length / counts.length,
    collisions: { mean: counts.reduce((s, c) => s + c, 0) / counts.length, p95: Math.max(...counts), total: counts.reduce((s, c) => s + c, 0), ...intervals },
    perRun: counts.map((c, run) => ({ run, collisions: Array.from({ length: c }, () => ({})) })),
  } as unknown as ExecutionSummaryView;
}

describe('summary intervals', () => {
  it('collisions per run: the intervals the summary carries (the simulator computes them once)', () => {
    // Deliberately not what the counts would give, to show they are read, not recomputed.
    expect(collisionIntervals(summary([0, 1, 2, 1, 0], { meanCi95: [0.25, 1.5], p95Ci95: null }))).toEqual({ mean: [0.25, 1.5], p95: null });
    expect(collisionIntervals(summary([0, 0], { meanCi95: null, p95Ci95: null }))).toEqual({ mean: null, p95: null });
  });

  it('collisions per run, summary stored without them: Student t interval of the mean of the per-run counts, cut at 0', () => {
    // Counts 0, 1, 2, 1, 0: mean 0.8, s = √0.7, t(0.975, 4) = 2.776445 (printed t tables; value recalled from memory),
    // half-width 2.776445 · √0.7 / √5 = 1.03884, worked by hand.
    const { mean, p95 } = collisionIntervals(summary([0, 1, 2, 1, 0]));
    // 0.8 − 1.03884 < 0: cut at 0, since a mean count of collisions is never negative.
    expect(mean![0]).toBe(0);
    expect(mean![1]).toBeCloseTo(0.8 + 1.03884, 4);
    // Five runs are far too few for a distribution-free interval of the p95.
    expect(p95).toBeNull();
  });
});
