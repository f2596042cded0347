/**
 * The human-readable lines of `execute` read the intervals of the Monte Carlo summary
 * (solvers/execute computes them once); here the collisions per run of a batch with a rare
 * collision, whose uncut t interval would start below 0.
 */
import type { RobotProfile } from '../../shared/plan';
import { meanInterval } from '../../shared/confidence-interval';
import { ExecutionRunner, simulateExecution, summariseRuns } from '../execute';
import type { ExecutionSummary } from '../execute';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import { scheduleFromPaths } from '../models/turn-schedule';
import { executeJson, executeReportLines } from './execution-report';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
// Two robots swapping along a corridor of one row: open-loop, they collide in every run.
const instance = tinyInstance('...', [[[0, 0], [2, 0], 'E'], [[2, 0], [0, 0], 'W']]);
const paths = [cellsOf(instance.grid, [[0, 0], [1, 0], [2, 0]]), cellsOf(instance.grid, [[2, 0], [1, 0], [0, 0]])];
const plan = { timeline: 'steps' as const, schedule: scheduleFromPaths(instance, paths, profile, { startHeading: 'free', stretch: 'none' }).schedule };
const options = { policy: 'open-loop' as const, seed: 1 };
const context = { model: 'classic' as const, profile, seed: 1, stallProbability: 0, stallMs: 0 };
const line = (s: ExecutionSummary, label: string) => executeReportLines(s, context).find((l) => l.startsWith(label));

/** A batch of four runs with 0, 0, 0 and 1 collisions (the runs' other figures as simulated). */
function rareCollisions(): ExecutionSummary {
  const colliding = simulateExecution(instance, plan, profile, { ...options, runs: 4 });
  expect(colliding.perRun.every((m) => m.collisions.length > 0)).toBe(true);
  const perRun = [0, 0, 0, 1].map((c, run) => ({ ...colliding.perRun[run], collisions: colliding.perRun[run].collisions.slice(0, c) }));
  return summariseRuns(new ExecutionRunner(instance, plan, profile, options), options, perRun, false);
}

describe('execute report lines', () => {
  it('print the collisions-per-run interval cut at 0: counts 0, 0, 0, 1 give 0.00–1.05, not −0.55–1.05', () => {
    const s = rareCollisions();
    // The uncut Student t interval (hand-worked in shared/confidence-interval.spec.ts): [−0.5456, 1.0456].
    expect(meanInterval([0, 0, 0, 1])![0]).toBeLessThan(-0.5);
    expect(line(s, 'collisions per run')).toBe('collisions per run            mean 0.25 (95 % CI 0.00–1.05), total 1 over all runs');
  });

  it('take the interval from the summary, not from a computation of their own', () => {
    const s = rareCollisions();
    const other: ExecutionSummary = { ...s, collisions: { ...s.collisions, meanCi95: [0.125, 0.5] } };
    expect(line(other, 'collisions per run')).toContain('(95 % CI 0.13–0.50)');
    const none: ExecutionSummary = { ...s, collisions: { ...s.collisions, meanCi95: null } };
    expect(line(none, 'collisions per run')).toContain('(95 % CI n/a)');
  });

  it('leave the --json contract as it was: collisions keep only mean and total', () => {
    const out = executeJson(rareCollisions());
    expect(out.collisions).toEqual({ mean: 0.25, total: 1 });
  });
});
