import fc from 'fast-check';
import type { RobotProfile, Schedule } from '@shared/plan';
import { scheduleFromPaths } from '../models/turn-schedule';
import { tinyInstance } from '../testing/tiny-instance';
import { validateClassicPlan } from '../validate/classic';
import { ExecutionRunner } from './index';
import { datasetInstance } from './testing/dataset-instances';
import { prioritisedPaths } from './testing/prioritised-paths';

// pitch ≥ diameter: the condition under which dependency-gated execution keeps disks apart
// (see dependency-graph.ts); 1 = touching cells, the tightest case.
const profiles: RobotProfile[] = [
  { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 500, timingJitter: 0 },
  { forwardMs: 800, quarterTurnMs: 300, waitMs: 500, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0 },
];

// Valid classic plans by prioritised planning on open benchmark maps (Stern et al., SoCS 2019),
// each confirmed by the independent classic validator.
const plans = ([
  ['empty-8-8', 'empty-8-8-even-1', 10],
  ['empty-8-8', 'empty-8-8-even-3', 12],
  ['empty-16-16', 'empty-16-16-even-5', 16],
] as const).map(([m, s, k]) => {
  const instance = datasetInstance(m, s, k);
  const paths = prioritisedPaths(instance) as number[][];
  return { instance, paths };
});

describe('dependency-gated execution under noise', () => {
  it('the plans are valid classic plans', () => {
    for (const { instance, paths } of plans) expect(validateClassicPlan(instance, paths).ok).toBe(true);
  });

  it('never collides, whatever the seed, jitter and stalls (property)', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 0, max: 2 ** 31 }),
        fc.constantFrom(0, 0.1, 0.5, 1.5),
        fc.constantFrom(0, 0.2),
        fc.integer({ min: 0, max: plans.length - 1 }),
        fc.integer({ min: 0, max: profiles.length - 1 }),
        fc.constantFrom('free', 'N', 'S'),
        (seed, jitterCv, stallProbability, which, pi, startHeading) => {
          const { instance, paths } = plans[which];
          const profile = profiles[pi];
          const ts = scheduleFromPaths(instance, paths, profile, { startHeading: startHeading as 'free', stretch: 'none' });
          const runner = new ExecutionRunner(instance, { timeline: 'steps', schedule: ts.schedule }, profile, {
            policy: 'dependency-gated', seed, noise: { jitterCv, stallProbability, stallMs: 4000 },
          });
          for (let run = 0; run < 3; run++) {
            const m = runner.run(run);
            expect(m.collisions).toEqual([]);
            if (!m.isDeadlocked) expect(m.isSuccess).toBe(true);
          }
        },
      ),
      { numRuns: 60, seed: 7 },
    );
  });

  it('never collides on a hand-made schedule in ms with long waits (weighted-split style)', () => {
    // Agent 0 crosses (1, 1) from the W, agent 1 from the N after it; valid under the occupancy rule.
    const instance = tinyInstance('...\n...\n...', [[[0, 1], [2, 1], 'E'], [[1, 0], [1, 2], 'S']]);
    const schedule: Schedule = [
      [
        { action: 'forward', from: [0, 1], to: [1, 1], heading: 'E', start: 0, end: 1000, step: 0 },
        { action: 'forward', from: [1, 1], to: [2, 1], heading: 'E', start: 1000, end: 2000, step: 1 },
      ],
      [
        { action: 'wait', from: [1, 0], to: [1, 0], heading: 'S', start: 0, end: 2000, step: 0 },
        { action: 'forward', from: [1, 0], to: [1, 1], heading: 'S', start: 2000, end: 3000, step: 1 },
        { action: 'forward', from: [1, 1], to: [1, 2], heading: 'S', start: 3000, end: 4000, step: 2 },
      ],
    ];
    const profile = profiles[0];
    const open = new ExecutionRunner(instance, { timeline: 'ms', schedule }, profile, { policy: 'open-loop', seed: 1, noise: { stallProbability: 1, stallMs: 5000 } });
    // Open-loop with agent 0 stalled everywhere drifts into a collision...
    expect(open.run(0).collisions.length).toBeGreaterThan(0);
    const gated = new ExecutionRunner(instance, { timeline: 'ms', schedule }, profile, { policy: 'dependency-gated', seed: 1, noise: { stallProbability: 1, stallMs: 5000 } });
    // ...dependency-gated waits: agent 1 enters (1, 1) only after agent 0's move out of it ends.
    for (let run = 0; run < 20; run++) expect(gated.run(run)).toMatchObject({ collisions: [], isSuccess: true });
    expect(Array.from(gated.dependencies?.deps ?? [])).toEqual([1]);
  });
});
