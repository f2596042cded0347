/**
 * Test helper: a deliberately plain reference for the simulator's collision check. Every robot
 * becomes a list of knots (time, position) read from its realised timeline, moving linearly
 * between knots and standing after the last one; every pair of robots is solved exactly on
 * every interval between consecutive knots of either, with the textbook quadratic formula
 * (no broadphase, no sampling), and overlaps closer than `mergeMs` are joined.
 */
import type { CellXY } from '@shared/plan';
import type { RealisedAction } from '../execution-types';

/** One overlap of two robots, as the reference finds it. */
export interface ReferenceOverlap {
  readonly robots: readonly [number, number];
  readonly timeMs: number;
  readonly untilMs: number;
  readonly at: readonly [number, number];
}

interface Knot {
  readonly t: number;
  readonly x: number;
  readonly y: number;
}

/** The knots of one robot: start at t = 0, then where its motion starts, stops or is cut. */
export function robotKnots(robot: readonly RealisedAction[], start: CellXY, pitch: number): Knot[] {
  const knots: Knot[] = [{ t: 0, x: start[0] * pitch, y: start[1] * pitch }];
  for (const a of robot) {
    if (a.start === Infinity) break;
    if (a.action === 'forward') {
      const [fx, fy] = [a.from[0] * pitch, a.from[1] * pitch];
      const [tx, ty] = [a.to[0] * pitch, a.to[1] * pitch];
      knots.push({ t: a.start, x: fx, y: fy });
      if (a.stoppedAt !== null && a.end === Infinity) {
        const f = (a.stoppedAt - a.start) / a.durationMs;
        knots.push({ t: a.stoppedAt, x: fx + (tx - fx) * f, y: fy + (ty - fy) * f });
        break;
      }
      knots.push({ t: a.start + a.durationMs, x: tx, y: ty });
    }
    if (a.end === Infinity) break;
  }
  return knots;
}

function positionAt(knots: readonly Knot[], t: number): [number, number] {
  let i = 0;
  while (i + 1 < knots.length && knots[i + 1].t <= t) i++;
  const k = knots[i];
  if (i + 1 === knots.length) return [k.x, k.y];
  const n = knots[i + 1];
  const f = (t - k.t) / (n.t - k.t);
  return [k.x + (n.x - k.x) * f, k.y + (n.y - k.y) * f];
}

/** Every overlap (centre distance < `distance`) of every pair of robots, earliest first. */
export function bruteForceOverlaps(
  robots: readonly (readonly RealisedAction[])[], starts: readonly CellXY[], pitch: number, distance: number, mergeMs: number,
): ReferenceOverlap[] {
  const knots = robots.map((r, i) => robotKnots(r, starts[i], pitch));
  const found: ReferenceOverlap[] = [];
  for (let i = 0; i < robots.length; i++) {
    for (let j = i + 1; j < robots.length; j++) {
      const times = [...new Set([...knots[i], ...knots[j]].map((k) => k.t))].sort((a, b) => a - b);
      times.push(Infinity);
      const pair: [number, number][] = [];
      for (let s = 0; s + 1 < times.length; s++) {
        const u = times[s];
        const v = times[s + 1];
        const a0 = positionAt(knots[i], u);
        const b0 = positionAt(knots[j], u);
        // Velocities from positions at u and at a later time inside the interval.
        const probe = v === Infinity ? u + 1 : v;
        const a1 = positionAt(knots[i], probe);
        const b1 = positionAt(knots[j], probe);
        const dx = b0[0] - a0[0], dy = b0[1] - a0[1];
        const wx = (b1[0] - a1[0] - dx) / (probe - u), wy = (b1[1] - a1[1] - dy) / (probe - u);
        // |D + W·τ|² < distance² ⇔ Aτ² + Bτ + C < 0.
        const A = wx * wx + wy * wy;
        const B = 2 * (dx * wx + dy * wy);
        const C = dx * dx + dy * dy - distance * distance;
        let from: number;
        let to: number;
        if (A === 0) {
          if (C >= 0) continue;
          [from, to] = [0, v - u];
        } else {
          const disc = B * B - 4 * A * C;
          if (disc <= 0) continue;
          from = Math.max(0, (-B - Math.sqrt(disc)) / (2 * A));
          to = Math.min(v - u, (-B + Math.sqrt(disc)) / (2 * A));
          if (!(to > from)) continue;
        }
        const last = pair[pair.length - 1];
        if (last && u + from - last[1] <= mergeMs) last[1] = Math.max(last[1], u + to);
        else pair.push([u + from, u + to]);
      }
      for (const [t0, t1] of pair) {
        const a = positionAt(knots[i], t0);
        const b = positionAt(knots[j], t0);
        found.push({ robots: [i, j], timeMs: t0, untilMs: t1, at: [(a[0] + b[0]) / 2, (a[1] + b[1]) / 2] });
      }
    }
  }
  return found.sort((a, b) => a.timeMs - b.timeMs || a.robots[0] - b.robots[0] || a.robots[1] - b.robots[1]);
}
