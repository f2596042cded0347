import type { RobotProfile } from '@shared/plan';
import { tinyInstance } from '../testing/tiny-instance';
import { checkAtNominal, executablePlanOf } from './nominal-check';
import type { PlanTask } from './plan-task';
import { runPlanTask } from './run-plan-task';
import { toTaskInstance } from './task-instance';

/** Right-angle following on an empty 3 × 3 map: agent 0 leaves (1,1) downwards while agent 1 enters it from the left. */
const FOLLOW = tinyInstance('...\n...\n...', [[[1, 1], [1, 2]], [[0, 1], [1, 1]]]);
const profile = (robotDiameterMm: number): RobotProfile => ({
  forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm, timingJitter: 0.2,
});
const NO_REPLAY = { policies: [], stallProbability: 0, stallMs: 0, runs: 1 } as const;
const classic = { model: 'classic', startHeading: 'free', switches: {} } as const;
const task = (p: RobotProfile): PlanTask => ({
  model: classic, instance: toTaskInstance(FOLLOW), profile: p, timeLimitMs: 10_000, memoryLimitMb: 256, seed: 3, execution: NO_REPLAY,
});

describe('executable at nominal times', () => {
  it('flags right-angle following of robots wider than pitch/√2 and passes narrower ones', () => {
    // Geometry (common practice): two disks at the centres of a cell and its side neighbour, moving at
    // right angles, come closest at half the move, √2/2 · pitch apart; 400 mm > 353.6 mm collides, 300 mm does not.
    const paths = [[4, 7], [3, 4]];
    const wide = checkAtNominal(FOLLOW, executablePlanOf('classic', { kind: 'paths', paths }, FOLLOW, profile(400), 'free'), profile(400));
    const narrow = checkAtNominal(FOLLOW, executablePlanOf('classic', { kind: 'paths', paths }, FOLLOW, profile(300), 'free'), profile(300));
    expect(wide).toEqual({ isCollisionFree: false, collisions: 1 });
    expect(narrow).toEqual({ isCollisionFree: true, collisions: 0 });
  });

  it('ignores the profile jitter: the check is deterministic and noise-free', () => {
    const paths = [[4, 7], [3, 4]];
    const plan = executablePlanOf('classic', { kind: 'paths', paths }, FOLLOW, profile(400), 'free');
    const a = checkAtNominal(FOLLOW, plan, { ...profile(400), timingJitter: 0 });
    const b = checkAtNominal(FOLLOW, plan, { ...profile(400), timingJitter: 0.9 });
    expect(b).toEqual(a);
  });

  it('is part of every solved task result and absent from unsolved ones', () => {
    const wide = runPlanTask(task(profile(400)), { now: () => 0 });
    const narrow = runPlanTask(task(profile(300)), { now: () => 0 });
    expect(wide.status).toBe('solved');
    expect(wide.plan).toEqual({ kind: 'paths', paths: [[4, 7], [3, 4]] });
    expect(wide.atNominal).toEqual({ isCollisionFree: false, collisions: 1 });
    expect(narrow.atNominal).toEqual({ isCollisionFree: true, collisions: 0 });
    const blocked = runPlanTask({ ...task(profile(300)), instance: toTaskInstance(tinyInstance('.#.', [[[0, 0], [2, 0]]])) }, { now: () => 0 });
    expect(blocked.status).not.toBe('solved');
    expect(blocked.atNominal).toBeUndefined();
  });

  it('replays weighted-split schedules on the ms timeline', () => {
    const p = profile(400);
    const r = runPlanTask({ ...task(p), model: { model: 'weighted-split', startHeading: 'free' } }, { now: () => 0 });
    expect(r.status).toBe('solved');
    expect(r.plan?.kind).toBe('schedule');
    const schedule = r.plan?.kind === 'schedule' ? r.plan.schedule : [];
    expect(r.atNominal).toEqual(checkAtNominal(FOLLOW, { timeline: 'ms', schedule }, p));
    expect(executablePlanOf('weighted-split', { kind: 'schedule', schedule }, FOLLOW, p, 'free').timeline).toBe('ms');
    expect(executablePlanOf('orientation-split', { kind: 'schedule', schedule }, FOLLOW, p, 'free').timeline).toBe('steps');
  });
});
