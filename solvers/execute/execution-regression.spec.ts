import { CollisionSweep } from './collision-sweep';
import { ExecutionRunner, simulateExecution } from './index';
import { perRunDigest, regressionCases } from './testing/regression-cases';

// Recorded from the simulator as it was before the candidate-pair broadphase and the inlined
// noise stream (commit 16336ae): the rewrite must give the same numbers, run for run.
const PINNED = new Map<string, { collisions: number; successRate: number; makespanMeanMs: number | null; waitingMeanMs: number; digest: string }>([
  ['sparse open-loop count', { collisions: 216, successRate: 0, makespanMeanMs: 78254.27597941487, waitingMeanMs: 0, digest: 'b6a2ad842e5cc493' }],
  ['sparse open-loop stop', { collisions: 94, successRate: 0, makespanMeanMs: null, waitingMeanMs: 0, digest: '7f8f04df6b5b71f4' }],
  ['sparse lockstep count', { collisions: 266, successRate: 0, makespanMeanMs: 130471.90222628662, waitingMeanMs: 1187839.4481737164, digest: '9d4ddf1f5ed18d8a' }],
  ['sparse lockstep stop', { collisions: 20, successRate: 0, makespanMeanMs: null, waitingMeanMs: 36765.700755444355, digest: 'f75d5287bdeb9c51' }],
  ['sparse dependency-gated count', { collisions: 73, successRate: 0, makespanMeanMs: null, waitingMeanMs: 9677.33180105612, digest: 'f3c235973a733230' }],
  ['sparse dependency-gated stop', { collisions: 45, successRate: 0, makespanMeanMs: null, waitingMeanMs: 6518.719680592806, digest: 'acffb27ade500154' }],
  ['dense ties open-loop stop', { collisions: 184, successRate: 0, makespanMeanMs: null, waitingMeanMs: 0, digest: 'af1f99d6714f4298' }],
  ['dense wide lockstep count', { collisions: 2517, successRate: 0, makespanMeanMs: 141273.72254260237, waitingMeanMs: 2053142.458847834, digest: 'ed962df6fcd401c6' }],
  ['dense wide lockstep stop', { collisions: 324, successRate: 0, makespanMeanMs: null, waitingMeanMs: 0, digest: '7e10bf736456fe90' }],
  ['sparse ms-timeline dependency-gated zero noise', { collisions: 66, successRate: 0, makespanMeanMs: 108500, waitingMeanMs: 170500, digest: '91922eb72158571b' }],
]);

describe('execution simulator regression (pinned seeded batches)', () => {
  const cases = regressionCases();

  it('gives the pinned metrics, and the same per-run digest, for every batch', () => {
    expect(cases.map((c) => c.name)).toEqual([...PINNED.keys()]);
    for (const c of cases) {
      const s = simulateExecution(c.instance, c.plan, c.profile, c.options);
      const got = { collisions: s.collisions.total, successRate: s.successRate, makespanMeanMs: s.realisedMakespanMs.mean, waitingMeanMs: s.waitingMs.mean, digest: perRunDigest(s) };
      expect({ name: c.name, ...got }).toEqual({ name: c.name, ...PINNED.get(c.name) });
    }
  });

  it('gives the same runs with either broadphase forced', () => {
    for (const c of cases) {
      const expected = simulateExecution(c.instance, c.plan, c.profile, c.options).perRun;
      for (const strategy of ['pairs', 'sweep'] as const) {
        const runner = new ExecutionRunner(c.instance, c.plan, c.profile, c.options, strategy);
        expect({ name: c.name, strategy, perRun: expected.map((_, r) => runner.run(r)) }).toEqual({ name: c.name, strategy, perRun: expected });
      }
    }
  });

  it('covers both broadphases in auto mode', () => {
    const usesList = cases.map((c) => new CollisionSweep(new ExecutionRunner(c.instance, c.plan, c.profile, c.options).prepared).usesPairList);
    expect(new Set(usesList)).toEqual(new Set([true, false]));
  });
});
