import type { ExecutionSummaryView } from '@shared/executions';
import { collisionIntervals } from './summary-intervals';

/** A summary with only the fields these helpers read. */
function summary(counts: readonly number[]): ExecutionSummaryView {
  return {
    runs: counts.length,
    successRate: counts.filter((c) => c === 0).length / counts.length,
    perRun: counts.map((c, run) => ({ run, collisions: Array.from({ length: c }, () => ({})) })),
  } as unknown as ExecutionSummaryView;
}

describe('summary intervals', () => {
  it('collisions per run: Student t interval of the mean of the per-run counts, cut at 0', () => {
    // Counts 0, 1, 2, 1, 0: mean 0.8, s = √0.7, t(0.975, 4) = 2.776445 (printed t tables; value recalled from memory),
    // half-width 2.776445 · √0.7 / √5 = 1.03884, worked by hand.
    const { mean, p95 } = collisionIntervals(summary([0, 1, 2, 1, 0]));
    // 0.8 − 1.03884 < 0: cut at 0, since a count of collisions is never negative.
    expect(mean![0]).toBe(0);
    expect(mean![1]).toBeCloseTo(0.8 + 1.03884, 4);
    // Five runs are far too few for a distribution-free interval of the p95.
    expect(p95).toBeNull();
  });
});
