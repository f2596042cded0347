// The 95 % intervals of a Monte Carlo summary (issue 12, item 5): computed from the batch's own
// per-run figures with the methods of shared/confidence-interval.ts, once per batch.
import type { RobotProfile } from '@shared/plan';
import { meanInterval, quantileRanks, wilsonInterval } from '@shared/confidence-interval';
import { scheduleFromPaths } from '../models/turn-schedule';
import { ExecutionRunner, simulateExecution, summariseRuns } from './index';
import { datasetInstance } from './testing/dataset-instances';
import { prioritisedPaths } from './testing/prioritised-paths';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 450, timingJitter: 0 };
// Open dataset (Stern et al., SoCS 2019 scenarios; first 8 rows), a prioritised classic plan.
const instance = datasetInstance('empty-8-8', 'empty-8-8-even-4', 8);
const ts = scheduleFromPaths(instance, prioritisedPaths(instance) as number[][], profile, { startHeading: 'N', stretch: 'none' });
const plan = { timeline: 'steps' as const, schedule: ts.schedule };
const noise = { jitterCv: 0.3, stallProbability: 0.05, stallMs: 3000 };

describe('Monte Carlo summary intervals', () => {
  const s = simulateExecution(instance, plan, profile, { policy: 'open-loop', seed: 21, runs: 120, noise });
  const g = simulateExecution(instance, plan, profile, { policy: 'dependency-gated', seed: 21, runs: 120, noise });

  it('the success rate carries its Wilson interval, in the summary and in ci95', () => {
    const successes = s.perRun.filter((m) => m.isSuccess).length;
    // The batch must have both outcomes, or the check would only see an edge case.
    expect(successes).toBeGreaterThan(0);
    expect(successes).toBeLessThan(120);
    expect(s.successRateCi95).toEqual(wilsonInterval(successes, 120));
    expect(s.ci95.successRate).toEqual(s.successRateCi95);
    expect(s.successRateCi95[0]).toBeLessThan(s.successRate);
    expect(s.successRateCi95[1]).toBeGreaterThan(s.successRate);
  });

  it('means carry x̄ ± t·s/√n over the runs where they are defined (t(0.975, 119) = 1.980, from a t table, recalled from memory)', () => {
    const xs = g.perRun.map((m) => m.realisedMakespanMs).filter((v): v is number => v !== null);
    expect(g.realisedMakespanMs.count).toBe(xs.length);
    const mean = xs.reduce((t, v) => t + v, 0) / xs.length;
    const sd = Math.sqrt(xs.reduce((t, v) => t + (v - mean) ** 2, 0) / (xs.length - 1));
    const half = 1.98 * sd / Math.sqrt(xs.length);
    const [lo, hi] = g.realisedMakespanMs.meanCi95 as [number, number];
    expect(xs.length).toBe(120);
    expect((hi - lo) / 2 / half).toBeCloseTo(1, 3);
    expect((lo + hi) / 2).toBeCloseTo(mean, 6);
    expect(g.ci95.realisedMakespanMs).toEqual(g.realisedMakespanMs.meanCi95);
    expect(g.ci95.finishSpreadMs).toEqual(g.finishSpreadMs.meanCi95);
  });

  it('the p95 carries the order-statistic interval of the sorted runs; it contains the p95', () => {
    const xs = g.perRun.map((m) => m.realisedMakespanMs as number).sort((a, b) => a - b);
    const [l, u] = quantileRanks(120, 0.95) as [number, number];
    expect(g.realisedMakespanMs.p95Ci95).toEqual([xs[l - 1], xs[u - 1]]);
    const [lo, hi] = g.realisedMakespanMs.p95Ci95 as [number, number];
    expect(lo).toBeLessThanOrEqual(g.realisedMakespanMs.p95 as number);
    expect(hi).toBeGreaterThanOrEqual(g.realisedMakespanMs.p95 as number);
  });

  it('collisions per run carry the t interval of the mean and the order-statistic interval of the p95 of the counts', () => {
    const counts = s.perRun.map((m) => m.collisions.length);
    expect(counts.some((c) => c > 0)).toBe(true);
    expect(s.collisions.meanCi95).toEqual(meanInterval(counts));
    const sorted = [...counts].sort((a, b) => a - b);
    const [l, u] = quantileRanks(120, 0.95) as [number, number];
    expect(s.collisions.p95Ci95).toEqual([sorted[l - 1], sorted[u - 1]]);
  });

  it('collisions per run: the mean interval is cut at 0 (a mean of counts cannot be negative)', () => {
    // Four runs with 0, 0, 0 and 1 collisions: the t interval is [−0.5456, 1.0456] (hand-worked in
    // shared/confidence-interval.spec.ts); the summary keeps [0, 1.0456].
    const collision = s.perRun.find((m) => m.collisions.length > 0)!.collisions[0];
    const perRun = [0, 0, 0, 1].map((c, run) => ({ ...s.perRun[run], run, collisions: c > 0 ? [collision] : [] }));
    const runner = new ExecutionRunner(instance, plan, profile, { policy: 'open-loop', seed: 21, noise });
    const four = summariseRuns(runner, { policy: 'open-loop', seed: 21 }, perRun, false);
    const [tLo, tHi] = meanInterval([0, 0, 0, 1])!;
    expect(tLo).toBeLessThan(0);
    expect(four.collisions).toMatchObject({ mean: 0.25, total: 1, meanCi95: [0, tHi], p95Ci95: null });
  });

  it('waiting: the sum over robots stays, per robot mean and max come with it', () => {
    const robots = instance.agents.length;
    let waited = 0;
    for (const m of g.perRun) {
      expect(m.waitingMeanPerRobotMs).toBeCloseTo(m.waitingMs / robots, 9);
      expect(m.waitingMaxPerRobotMs).toBeGreaterThanOrEqual(m.waitingMeanPerRobotMs);
      expect(m.waitingMaxPerRobotMs).toBeLessThanOrEqual(m.waitingMs);
      if (m.waitingMs > 0) waited++;
    }
    expect(waited).toBeGreaterThan(10);
    expect(g.waitingPerRobotMs.mean.mean).toBeCloseTo((g.waitingMs.mean as number) / robots, 6);
    expect(g.waitingPerRobotMs.max.count).toBe(120);
    // The complaint: the sum can exceed the makespan; the per-robot mean cannot.
    for (const m of g.perRun) if (m.realisedMakespanMs !== null) expect(m.waitingMeanPerRobotMs).toBeLessThan(m.realisedMakespanMs);
  });

  it('a small batch has no p95 interval and one run no mean interval', () => {
    const few = simulateExecution(instance, plan, profile, { policy: 'open-loop', seed: 2, runs: 20, noise });
    expect(few.realisedMakespanMs.p95Ci95).toBeNull();
    expect(few.realisedMakespanMs.meanCi95).not.toBeNull();
    const one = simulateExecution(instance, plan, profile, { policy: 'open-loop', seed: 2, runs: 1, noise });
    expect(one.realisedMakespanMs.meanCi95).toBeNull();
    expect(one.successRateCi95[1] - one.successRateCi95[0]).toBeGreaterThan(0.7);
  });
});
