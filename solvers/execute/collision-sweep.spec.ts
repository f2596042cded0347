import fc from 'fast-check';
import type { RobotProfile } from '@shared/plan';
import { scheduleFromPaths } from '../models/turn-schedule';
import { tinyInstance } from '../testing/tiny-instance';
import { realisedTimeline, type RealisedAction, type RunTimeline } from './index';

const base: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 800, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
const grid5 = tinyInstance('.....\n.....\n.....\n.....\n.....', []).grid;

/** Random walks (collisions galore) for a few robots with distinct starts and goals, or null. */
function randomWalks(seed: number, robots: number, steps: number) {
  let s = seed >>> 0;
  const rand = (n: number): number => {
    s = (Math.imul(s ^ (s >>> 15), 2246822519) + 0x6d2b79f5) >>> 0;
    return s % n;
  };
  const w = grid5.width;
  const paths = Array.from({ length: robots }, () => {
    const path = [rand(grid5.passable.length)];
    for (let t = 0; t < steps; t++) {
      const c = path[path.length - 1];
      const opts = [c, c - w, c % w + 1 < w ? c + 1 : -1, c + w, c % w > 0 ? c - 1 : -1].filter((n) => n >= 0 && n < grid5.passable.length);
      path.push(opts[rand(opts.length)]);
    }
    return path;
  });
  if (new Set(paths.map((p) => p[0])).size < robots || new Set(paths.map((p) => p[p.length - 1])).size < robots) return null;
  return { instance: { grid: grid5, agents: paths.map((p) => ({ start: p[0], goal: p[p.length - 1] })) }, paths };
}

/** Position of a robot at time t from its realised timeline, independently of the sweep (mm). */
function positionAt(robot: readonly RealisedAction[], goal: readonly [number, number], pitch: number, t: number): [number, number] {
  for (const a of robot) {
    if (t < a.start) return [a.from[0] * pitch, a.from[1] * pitch];
    const stop = a.stoppedAt ?? Infinity;
    if (a.action === 'forward' && (t < a.end || stop < Infinity)) {
      const f = (Math.min(t, stop) - a.start) / a.durationMs;
      return [(a.from[0] + (a.to[0] - a.from[0]) * f) * pitch, (a.from[1] + (a.to[1] - a.from[1]) * f) * pitch];
    }
    if (a.end === Infinity) return [a.from[0] * pitch, a.from[1] * pitch];
  }
  return [goal[0] * pitch, goal[1] * pitch];
}

/** Brute force: every pair, every breakpoint of both timelines, a dense scan of each piece. */
function sampledOverlaps(t: RunTimeline, goals: readonly (readonly [number, number])[], profile: RobotProfile): Map<string, number[]> {
  const found = new Map<string, number[]>();
  const end = Math.max(...t.robots.flatMap((r) => r.map((a) => (Number.isFinite(a.end) ? a.end : a.start)).filter(Number.isFinite)), 0) + 1000;
  for (let i = 0; i < t.robots.length; i++) {
    for (let j = i + 1; j < t.robots.length; j++) {
      for (let time = 0; time <= end; time += 5) {
        const a = positionAt(t.robots[i], goals[i], profile.cellPitchMm, time);
        const b = positionAt(t.robots[j], goals[j], profile.cellPitchMm, time);
        if (Math.hypot(a[0] - b[0], a[1] - b[1]) < profile.robotDiameterMm - 1e-3) {
          const key = `${i},${j}`;
          found.set(key, [...(found.get(key) ?? []), time]);
        }
      }
    }
  }
  return found;
}

describe('CollisionSweep', () => {
  it('finds exactly the overlaps a brute-force scan of all pairs finds, for any pitch-to-diameter ratio', () => {
    // Property (fast-check): random, mostly colliding plans and noise; the exact sweep with its
    // broadphase must contain every sampled overlap instant, and every collision it reports
    // must be confirmed by the independent position function at its midpoint in time.
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 1e9 }),
        fc.constantFrom(0.3, 0.6, 0.9, 1, 1.25, 2.5),
        fc.constantFrom('open-loop', 'lockstep', 'dependency-gated'),
        (seed, ratio, policy) => {
          const walk = randomWalks(seed, 3, 6);
          if (!walk) return;
          const profile = { ...base, robotDiameterMm: base.cellPitchMm * ratio };
          const ts = scheduleFromPaths(walk.instance, walk.paths, profile, { startHeading: 'free', stretch: 'none' });
          const t = realisedTimeline(walk.instance, { timeline: 'steps', schedule: ts.schedule }, profile, { policy, seed, noise: { jitterCv: 0.25 } });
          const goals = walk.instance.agents.map((a) => [a.goal % 5, Math.floor(a.goal / 5)] as const);
          const missed: string[] = [];
          for (const [key, times] of sampledOverlaps(t, goals, profile)) {
            const [i, j] = key.split(',').map(Number);
            const own = t.metrics.collisions.filter((c) => c.robots[0] === i && c.robots[1] === j);
            for (const time of times) if (!own.some((c) => c.timeMs <= time && time <= c.untilMs)) missed.push(`${key}@${time}`);
          }
          expect(missed).toEqual([]);
          for (const c of t.metrics.collisions) {
            const mid = Number.isFinite(c.untilMs) ? (c.timeMs + c.untilMs) / 2 : c.timeMs + 1;
            const a = positionAt(t.robots[c.robots[0]], goals[c.robots[0]], profile.cellPitchMm, mid);
            const b = positionAt(t.robots[c.robots[1]], goals[c.robots[1]], profile.cellPitchMm, mid);
            expect(Math.hypot(a[0] - b[0], a[1] - b[1])).toBeLessThan(profile.robotDiameterMm);
          }
        },
      ),
      { numRuns: 40, seed: 20240611 },
    );
  });

  it('computes a head-on collision exactly: time and place', () => {
    // Two robots drive towards each other along row 0 at 0.5 mm/ms each: centres 1000 mm apart,
    // contact at distance 400 mm after (1000 − 400) / 1 = 600 ms, midway at x = 500 mm (worked by hand).
    const instance = tinyInstance('...', [[[0, 0], [1, 0], 'E'], [[2, 0], [1, 0], 'W']]);
    const paths = [[0, 1], [2, 1]];
    const ts = scheduleFromPaths(instance, paths, base, { startHeading: 'free', stretch: 'none' });
    const t = realisedTimeline(instance, { timeline: 'steps', schedule: ts.schedule }, base, { policy: 'open-loop', seed: 1 });
    expect(t.metrics.collisions).toHaveLength(1);
    const c = t.metrics.collisions[0];
    expect(c.robots).toEqual([0, 1]);
    expect(c.timeMs).toBeCloseTo(600, 5); // contact counts from 1 nm of overlap
    expect(c.untilMs).toBe(Infinity); // both end in the same cell and stay
    expect(c.at[0]).toBeCloseTo(500, 6);
    expect(c.at[1]).toBeCloseTo(0, 9);
    expect(c.cell).toEqual([1, 0]);
  });

  it('with stop on collision, freezes both robots where they touched and fails the run', () => {
    const instance = tinyInstance('....', [[[0, 0], [1, 0], 'E'], [[2, 0], [1, 0], 'W'], [[3, 0], [3, 0]]]);
    const paths = [[0, 1], [2, 1], [3]];
    const ts = scheduleFromPaths(instance, paths, base, { startHeading: 'free', stretch: 'none' });
    const t = realisedTimeline(instance, { timeline: 'steps', schedule: ts.schedule }, base, { policy: 'open-loop', seed: 1, onCollision: 'stop' });
    expect(t.metrics.collisions).toHaveLength(1);
    expect(t.metrics.isSuccess).toBe(false);
    expect(t.metrics.realisedMakespanMs).toBeNull();
    expect(t.robots[0][0].stoppedAt).toBeCloseTo(600, 5);
    expect(t.robots[0][0].end).toBe(Infinity);
    // Robot 0 stands at x = 300 mm (0.6 of a cell), robot 1 at 700 mm: exactly touching, no new contact.
    const stoppedAt = t.robots[0][0].stoppedAt as number;
    expect(positionAt(t.robots[0], [1, 0], 500, stoppedAt + 1e6)[0]).toBeCloseTo(300, 5);
  });
});
