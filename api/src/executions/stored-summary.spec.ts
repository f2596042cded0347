import { currentSummary, type StoredSummary } from './stored-summary';

/** A summary in the shape stored before issue 12 (no intervals, no counts, no per-robot waiting). */
function oldSummary(policy: string, collisionCounts: readonly number[], extra: object = {}): StoredSummary {
  const runs = collisionCounts.map((c, run) => ({
    run, success: c === 0, collisions: Array.from({ length: c }, () => ({})),
    realisedMakespanMs: 5000 + 100 * run, realisedSocMs: 9000, finishSpreadMs: 0, waitingMs: 2000,
  }));
  return {
    policy, noise: { jitterCv: 0.1, stallProbability: 0, stallMs: 0 }, onCollision: 'count', seed: 3, runs: runs.length,
    isAborted: false, successRate: collisionCounts.filter((c) => c === 0).length / runs.length,
    collisions: { mean: collisionCounts.reduce((s, c) => s + c, 0) / runs.length, p95: Math.max(...collisionCounts), total: collisionCounts.reduce((s, c) => s + c, 0) },
    realisedMakespanMs: { mean: 5200, p95: 5400 }, realisedSocMs: { mean: 9000, p95: 9000 },
    finishSpreadMs: { mean: 0, p95: 0 }, waitingMs: { mean: 2000, p95: 2000 },
    firstCollision: null, perRun: runs, ...extra,
  } as unknown as StoredSummary;
}

describe('currentSummary', () => {
  it('old lockstep summary: finish spread (forced to 0) and waiting (barrier holds at the goal) are "not stored"; the rest stays', () => {
    const v = currentSummary(oldSummary('lockstep', [0, 1, 2, 1, 0]));
    expect(v.finishSpreadMs).toEqual({ mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null });
    expect(v.waitingMs).toEqual({ mean: null, p95: null, count: 0, meanCi95: null, p95Ci95: null });
    expect(v.waitingPerRobotMs).toBeNull();
    expect(v.ci95.finishSpreadMs).toBeNull();
    expect(v.perRun.map((r) => r.finishSpreadMs)).toEqual([null, null, null, null, null]);
    expect(v.realisedMakespanMs.mean).toBe(5200);
    expect(v.realisedMakespanMs.count).toBe(5);
    expect(v.successRate).toBe(0.4);
  });

  it('other policies and lockstep summaries stored since e4f5ddf (with per-robot waiting) keep their spread and waiting', () => {
    const openLoop = currentSummary(oldSummary('open-loop', [0, 0, 1]));
    expect(openLoop.finishSpreadMs.mean).toBe(0);
    expect(openLoop.finishSpreadMs.count).toBe(3);
    expect(openLoop.waitingMs.mean).toBe(2000);
    const perRobot = { mean: { mean: 700, p95: 800, count: 3, meanCi95: null, p95Ci95: null }, max: { mean: 900, p95: 1000, count: 3, meanCi95: null, p95Ci95: null } };
    const current = currentSummary(oldSummary('lockstep', [0, 0, 1], { waitingPerRobotMs: perRobot, finishSpreadMs: { mean: 300, p95: 400 } }));
    expect(current.finishSpreadMs.mean).toBe(300);
    expect(current.waitingMs.mean).toBe(2000);
    expect(current.waitingPerRobotMs).toEqual(perRobot);
  });

  it('collisions per run, summary stored without their intervals: Student t interval of the mean of the per-run counts, cut at 0', () => {
    // Counts 0, 1, 2, 1, 0: mean 0.8, s = √0.7, t(0.975, 4) = 2.776445 (printed t tables; value recalled from memory),
    // half-width 2.776445 · √0.7 / √5 = 1.03884, worked by hand.
    const { meanCi95, p95Ci95 } = currentSummary(oldSummary('open-loop', [0, 1, 2, 1, 0])).collisions;
    // 0.8 − 1.03884 < 0: cut at 0, since a mean count of collisions is never negative.
    expect(meanCi95![0]).toBe(0);
    expect(meanCi95![1]).toBeCloseTo(0.8 + 1.03884, 4);
    // Five runs are far too few for a distribution-free interval of the p95.
    expect(p95Ci95).toBeNull();
  });

  it('collisions intervals the summary carries are kept as stored', () => {
    // Deliberately not what the counts would give, to show they are read, not recomputed.
    const s = oldSummary('open-loop', [0, 1, 2, 1, 0]);
    const v = currentSummary({ ...s, collisions: { ...s.collisions, meanCi95: [0.25, 1.5], p95Ci95: null } });
    expect(v.collisions.meanCi95).toEqual([0.25, 1.5]);
    expect(v.collisions.p95Ci95).toBeNull();
  });
});
