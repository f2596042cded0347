import { simulateExecution } from '@solvers/execute';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { rerunInBrowser, toMapfInstance } from './fleet-rerun';
import { TEST_PROFILE, testInstance } from './plan-viewer-testing';

describe('rerunInBrowser', () => {
  const instance = testInstance('............', [[3, 10], [2, 9], [1, 8], [0, 7]]);
  const paths = [[3, 4, 5, 6, 7, 8, 9, 10], [2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3, 4, 5, 6, 7, 8], [0, 1, 2, 3, 4, 5, 6, 7]];
  const plan = { timeline: 'steps' as const, schedule: scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: 'none' }).schedule };

  it.each(['open-loop', 'lockstep', 'dependency-gated'] as const)('gives the summary simulateExecution gives (%s), in chunks', async (policy) => {
    let clock = 0;
    let yields = 0;
    const settings = { policy, noise: { jitterCv: 0.3 }, seed: 11, runs: 30, onCollision: 'count' as const, shownRun: 4 };
    const got = await rerunInBrowser(instance, plan, TEST_PROFILE, settings, {
      now: () => (clock += 5), chunkMs: 12, yieldToPage: async () => { yields++; },
    });
    const want = simulateExecution(instance, plan, TEST_PROFILE, { policy, noise: { jitterCv: 0.3 }, seed: 11, runs: 30 });
    expect(got.summary).toEqual({ ...want, perRun: want.perRun.map((m) => ({ ...m, collisions: m.collisions.map((c) => ({ ...c })) })) });
    expect(yields).toBeGreaterThan(0);
    expect(got.track.robotCount).toBe(4);
  });

  it('returns the track of the shown run', async () => {
    const settings = { policy: 'open-loop' as const, noise: { jitterCv: 0.3 }, seed: 11, runs: 5, onCollision: 'count' as const, shownRun: 2 };
    const got = await rerunInBrowser(instance, plan, TEST_PROFILE, settings);
    const third = got.summary.perRun[2];
    let last = 0;
    for (let r = 0; r < 4; r++) for (let a = got.track.first[r]; a < got.track.first[r + 1]; a++) if (got.track.kind[a] === 0) last = Math.max(last, got.track.end[a]);
    expect(last).toBe(third.realisedMakespanMs);
  });
});

describe('toMapfInstance', () => {
  it('reads rows and [x, y] tasks into cells y · width + x', () => {
    const inst = toMapfInstance({ width: 3, height: 2, rows: ['.@.', '...'], agents: [{ start: [2, 0], goal: [0, 1], startHeading: 'S' }] });
    expect(Array.from(inst.grid.passable)).toEqual([1, 0, 1, 1, 1, 1]);
    expect(inst.agents).toEqual([{ start: 2, goal: 3, startHeading: 'S' }]);
  });
});
