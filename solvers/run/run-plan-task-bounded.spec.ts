/**
 * Sweep runs with a suboptimality factor (issue 15, item 1): a spec's `suboptimality` w reaches
 * every model's solver through runPlanTask; the run is solved with SOC ≤ w × its lower bound,
 * that bound never exceeds the exact run's optimum, and a factor out of range is the run's error.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { PLAN_MODELS, type PlanModel, type RobotProfile } from '@shared/plan';
import type { ModelSpec } from '@shared/sweeps';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import type { PlanTask } from './plan-task';
import { runPlanTask } from './run-plan-task';
import { toTaskInstance } from './task-instance';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 600, timingJitter: 0 };

/** The first `agents` rows of an open benchmark scenario (Stern et al., SoCS 2019; read in place). */
function benchmark(agents: number): PlanTask['instance'] {
  const map = parseMap(readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8.map'), 'utf8'));
  const scen = parseScenario(readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8-even-1.scen'), 'utf8'));
  if (!map.ok || !scen.ok) throw new Error('dataset files did not parse');
  const inst = instanceFromScenario(map.value, scen.value, agents);
  if (!inst.ok) throw new Error('instance');
  return toTaskInstance(inst.value);
}

function spec(model: PlanModel, w?: number): ModelSpec {
  const base = model === 'weighted-split' ? { model, startHeading: 'free' }
    : model === 'k-robust' ? { model, k: 1, startHeading: 'free', switches: {} } : { model, startHeading: 'free', switches: {} };
  return (w === undefined ? base : { ...base, suboptimality: w }) as ModelSpec;
}

const task = (model: ModelSpec, agents: number): PlanTask => ({
  model, instance: benchmark(agents), profile: PROFILE, timeLimitMs: 60_000, memoryLimitMb: 256, seed: 1,
  execution: { policies: [], stallProbability: 0, stallMs: 0, runs: 1 },
});

describe('runPlanTask with a suboptimality factor', () => {
  it('solves every model within w × its lower bound, and the bound never exceeds the exact optimum', () => {
    let compared = 0;
    for (const model of PLAN_MODELS) {
      const agents = model === 'weighted-split' ? 4 : 8;
      const exact = runPlanTask(task(spec(model), agents));
      expect([model, exact.status]).toEqual([model, 'solved']);
      const bounded = runPlanTask(task(spec(model, 1.5), agents));
      expect([model, bounded.status, bounded.reason]).toEqual([model, 'solved', undefined]);
      const soc = bounded.soc as number;
      const lb = bounded.lowerBound as number;
      expect(soc).toBeLessThanOrEqual(1.5 * lb);
      expect(lb).toBeLessThanOrEqual(exact.soc as number);
      expect(soc).toBeGreaterThanOrEqual(exact.soc as number);
      compared++;
    }
    expect(compared).toBe(5);
  });

  it('makes a factor out of range the run\'s error, naming the option', () => {
    const r = runPlanTask(task(spec('classic', 0.5), 2));
    expect([r.status, r.reason]).toEqual(['error', 'option suboptimality must be a number from 1 to 10 (1 = optimal), got 0.5']);
  });
});
