import type { ExecutionSummaryView } from '@shared/executions';
import { collisionIntervals } from './summary-intervals';

/** A summary with only the fields these helpers read; `intervals` as the simulator records them (the server fills them for old stored ones). */
function summary(counts: readonly number[], intervals: object): ExecutionSummaryView {
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

});
