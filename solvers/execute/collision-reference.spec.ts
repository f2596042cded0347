import fc from 'fast-check';
import type { CellXY, RobotProfile } from '@shared/plan';
import { scheduleFromPaths } from '../models/turn-schedule';
import { createRng } from '../random';
import { tinyInstance } from '../testing/tiny-instance';
import { CollisionSweep } from './collision-sweep';
import type { Collision, ExecutionPolicy } from './execution-types';
import { ExecutionRunner, realisedTimeline } from './index';
import { bruteForceOverlaps, type ReferenceOverlap } from './testing/brute-force-collisions';

const base: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 800, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
/** The simulator's contact distance and merge gap (collision-sweep.ts). */
const SLACK_MM = 1e-6;
const MERGE_MS = 1e-6;

/** Random walks (mostly colliding) of `robots` robots on a side × side open grid, distinct starts and goals; null otherwise. */
function randomWalks(seed: number, side: number, robots: number, steps: number) {
  const grid = tinyInstance(Array.from({ length: side }, () => '.'.repeat(side)).join('\n'), []).grid;
  const rng = createRng(seed);
  const w = grid.width;
  const cells = grid.passable.length;
  const paths = Array.from({ length: robots }, () => {
    const path = [rng.int(cells)];
    for (let t = 0; t < steps; t++) {
      const c = path[path.length - 1];
      const options = [c, c - w, c % w + 1 < w ? c + 1 : -1, c + w, c % w > 0 ? c - 1 : -1].filter((n) => n >= 0 && n < cells);
      path.push(options[rng.int(options.length)]);
    }
    return path;
  });
  if (new Set(paths.map((p) => p[0])).size < robots || new Set(paths.map((p) => p[p.length - 1])).size < robots) return null;
  return { instance: { grid, agents: paths.map((p) => ({ start: p[0], goal: p[p.length - 1] })) }, paths };
}

function sortCollisions(cs: readonly Collision[]): Collision[] {
  return [...cs].sort((a, b) => a.timeMs - b.timeMs || a.robots[0] - b.robots[0] || a.robots[1] - b.robots[1]);
}

/** Whether a simulator collision and a reference overlap are the same (float results of different formulas agree to ≈ 1e-6). */
function agrees(c: Collision, r: ReferenceOverlap): boolean {
  const close = (x: number, y: number, tol: number): boolean => (x === Infinity || y === Infinity ? x === y : Math.abs(x - y) <= tol);
  return c.robots[0] === r.robots[0] && c.robots[1] === r.robots[1] && close(c.timeMs, r.timeMs, 1e-5) && close(c.untilMs, r.untilMs, 1e-5)
    && close(c.at[0], r.at[0], 1e-4) && close(c.at[1], r.at[1], 1e-4);
}

const arbitraryCase = fc.record({
  seed: fc.integer({ min: 0, max: 2 ** 31 - 1 }),
  side: fc.integer({ min: 3, max: 7 }),
  robots: fc.integer({ min: 2, max: 6 }),
  steps: fc.integer({ min: 2, max: 10 }),
  // Pitch-to-diameter ratios below, at and above 1 (reach 0, 1 and 2 cells).
  ratio: fc.constantFrom(0.3, 0.8, 1, 1.2, 2.5),
  policy: fc.constantFrom<ExecutionPolicy>('open-loop', 'lockstep', 'dependency-gated'),
  jitterCv: fc.constantFrom(0, 0.1, 0.4),
  stallProbability: fc.constantFrom(0, 0.15),
  run: fc.integer({ min: 0, max: 5 }),
});

/** A case's walks, disk size and turn-inclusive plan, and the brute-force overlaps of a realised run of it; null when no walk fits. */
function caseSetup(k: { seed: number; side: number; robots: number; steps: number; ratio: number }) {
  const walk = randomWalks(k.seed, k.side, k.robots, k.steps);
  if (!walk) return null;
  const profile = { ...base, robotDiameterMm: base.cellPitchMm * k.ratio };
  const ts = scheduleFromPaths(walk.instance, walk.paths, profile, { startHeading: 'free', stretch: 'none' });
  const plan = { timeline: 'steps' as const, schedule: ts.schedule };
  const starts = walk.instance.agents.map((a): CellXY => [a.start % k.side, Math.floor(a.start / k.side)]);
  const reference = (robots: Parameters<typeof bruteForceOverlaps>[0]) =>
    bruteForceOverlaps(robots, starts, profile.cellPitchMm, profile.robotDiameterMm - SLACK_MM, MERGE_MS);
  return { walk, profile, plan, reference };
}

describe('collision check against a brute-force reference (all pairs, all intervals, exact)', () => {
  it('both broadphases report exactly the overlaps of the reference, when collisions are only counted', () => {
    let seen = 0;
    fc.assert(
      fc.property(arbitraryCase, (k) => {
        const setup = caseSetup(k);
        if (!setup) return;
        const { walk, profile, plan } = setup;
        const options = { policy: k.policy, seed: k.seed, noise: { jitterCv: k.jitterCv, stallProbability: k.stallProbability, stallMs: 700 } };
        const timeline = realisedTimeline(walk.instance, plan, profile, options, k.run);
        const reference = setup.reference(timeline.robots);
        seen += reference.length;

        const runner = new ExecutionRunner(walk.instance, plan, profile, options);
        runner.run(k.run);
        for (const strategy of ['pairs', 'sweep'] as const) {
          const found = sortCollisions(new CollisionSweep(runner.prepared, strategy).detect(runner.times, runner.duration));
          expect(found).toHaveLength(reference.length);
          found.forEach((c, i) => expect({ strategy, c, agrees: agrees(c, reference[i]) }).toEqual({ strategy, c, agrees: true }));
        }
        expect(timeline.metrics.collisions).toHaveLength(reference.length);
      }),
      { numRuns: 300, seed: 20261202 },
    );
    expect(seen).toBeGreaterThan(100);
  });

  it('with stop on collision, every overlap left in the realised run is recorded or between two robots already stopped', () => {
    let recorded = 0;
    fc.assert(
      fc.property(arbitraryCase, (k) => {
        const setup = caseSetup(k);
        if (!setup) return;
        const { walk, profile, plan } = setup;
        const options = {
          policy: k.policy, seed: k.seed, onCollision: 'stop' as const,
          noise: { jitterCv: k.jitterCv, stallProbability: k.stallProbability, stallMs: 700 },
        };
        const timeline = realisedTimeline(walk.instance, plan, profile, options, k.run);
        const reference = setup.reference(timeline.robots);
        // A robot already at its goal has no action to carry its stop time: read it from the runner.
        const runner = new ExecutionRunner(walk.instance, plan, profile, options);
        runner.run(k.run);
        const stoppedAt = Array.from(runner.stoppedAt);
        const { collisions } = timeline.metrics;
        recorded += collisions.length;
        // Each recorded collision stopped both robots at its start.
        for (const c of collisions) {
          expect(stoppedAt[c.robots[0]]).toBeLessThanOrEqual(c.timeMs + 1e-6);
          expect(stoppedAt[c.robots[1]]).toBeLessThanOrEqual(c.timeMs + 1e-6);
        }
        for (const r of reference) {
          const [i, j] = r.robots;
          const isRecorded = collisions.some((c) => c.robots[0] === i && c.robots[1] === j && Math.abs(c.timeMs - r.timeMs) <= 1e-5);
          const isSettled = stoppedAt[i] <= r.timeMs + 1e-5 && stoppedAt[j] <= r.timeMs + 1e-5;
          expect({ r, ok: isRecorded || isSettled }).toEqual({ r, ok: true });
        }
      }),
      { numRuns: 300, seed: 977 },
    );
    expect(recorded).toBeGreaterThan(50);
  });
});
