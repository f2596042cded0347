/**
 * Sweep runs with the following rule (issue 12, item 3): a spec's `following: 'forbidden'`
 * reaches the solver and the validator through runPlanTask, and a spec without the field (a
 * definition stored before the rule existed) runs the classic rule. Hand-worked chain: three
 * agents in a 4 × 1 corridor each move one cell right; allowed 1 + 1 + 1 = 3, forbidden (no
 * entry into a cell occupied one step earlier) 1 + 2 + 3 = 6.
 */
import type { RobotProfile } from '@shared/plan';
import type { ModelSpec } from '@shared/sweeps';
import { tinyInstance } from '../testing/tiny-instance';
import { validateClassicPlan } from '../validate/classic';
import type { PlanTask } from './plan-task';
import { runPlanTask } from './run-plan-task';
import { toTaskInstance } from './task-instance';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 600, timingJitter: 0 };
const chain = tinyInstance('....', [[[2, 0], [3, 0]], [[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
const task = (model: ModelSpec): PlanTask => ({
  model, instance: toTaskInstance(chain), profile: PROFILE, timeLimitMs: 10_000, memoryLimitMb: 256, seed: 1,
  execution: { policies: [], stallProbability: 0, stallMs: 0, runs: 1 },
});

describe('runPlanTask with the following rule', () => {
  it('solves each unit-step model under the rule its spec names (absent = allowed)', () => {
    const socs = (['classic', 'uniform-duration', 'orientation-split'] as const).map((model) => [
      runPlanTask(task({ model, startHeading: 'E', switches: {} })).soc,
      runPlanTask(task({ model, startHeading: 'E', switches: {}, following: 'allowed' })).soc,
      runPlanTask(task({ model, startHeading: 'E', switches: {}, following: 'forbidden' })).soc,
    ]);
    expect(socs).toEqual([[3, 3, 6], [3, 3, 6], [3, 3, 6]]);
  });

  it('returns a plan that passes the forbidden-following validator', () => {
    const r = runPlanTask(task({ model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden' }));
    expect(r.status).toBe('solved');
    if (r.plan?.kind !== 'paths') throw new Error('classic runs return paths');
    expect(validateClassicPlan(chain, r.plan.paths, { following: 'forbidden' })).toEqual({ ok: true, soc: 6, makespan: 3 });
    expect(validateClassicPlan(chain, r.plan.paths).ok).toBe(true);
  });
});
