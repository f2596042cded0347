// The validator gate: a solver that returns a conflicting plan must be recorded as error, never solved.
import { tinyInstance } from '../testing/tiny-instance';
import { runPlanTask } from './run-plan-task';
import { toTaskInstance } from './task-instance';

jest.mock('../models/classic', () => ({
  // Both agents claim cell (1, 0) at t = 1: a vertex conflict the classic validator must catch.
  solveClassic: () => ({
    status: 'solved', paths: [[0, 1, 2], [2, 1, 0]], soc: 4, makespan: 2, lowerBound: 4, runtimeMs: 1,
    nodesGenerated: 1, nodesExpanded: 1, lowLevelExpansions: 1, switches: {},
  }),
}));

it('records a plan that fails the independent validator as error', () => {
  const inst = tinyInstance('...', [[[0, 0], [2, 0]], [[2, 0], [0, 0]]]);
  const r = runPlanTask({
    model: { model: 'classic', startHeading: 'free', switches: {} },
    instance: toTaskInstance(inst),
    profile: { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 400, robotDiameterMm: 300, timingJitter: 0 },
    timeLimitMs: 1000, memoryLimitMb: 256, seed: 1,
    execution: { policies: ['open-loop'], stallProbability: 0, stallMs: 0, runs: 1 },
  });
  expect(r.status).toBe('error');
  expect(r.reason).toMatch(/failed the classic validator/);
  expect(r.soc).toBeNull();
  expect(r.plan).toBeNull();
  expect(r.executions).toEqual([]);
});
