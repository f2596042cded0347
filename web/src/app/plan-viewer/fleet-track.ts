/**
 * One simulated run in the form the viewer animates: per action its realised start and end, its
 * drawn duration and its geometry in cell units, as typed arrays so a frame reads numbers and
 * allocates nothing. Built from an ExecutionRunner right after `run(r)` (its buffers hold that run).
 */
import type { ExecutionRunner } from '@solvers/execute';
import type { Heading } from '@shared/plan';

/** Action kind codes (the simulator's own: forward, turn-left, turn-right, wait). */
export const KIND = { forward: 0, turnLeft: 1, turnRight: 2, wait: 3 } as const;

/** Heading angle on screen (y grows downwards): E = 0, S = π/2, W = π, N = −π/2. */
export const HEADING_ANGLE: Readonly<Record<Heading, number>> = { N: -Math.PI / 2, E: 0, S: Math.PI / 2, W: Math.PI };

/** A run's realised actions, robots one after another. Positions are in cells (cell centre = integer x, y). */
export interface FleetTrack {
  readonly robotCount: number;
  readonly actionCount: number;
  /** Actions of robot r are first[r] … first[r + 1] − 1. */
  readonly first: Int32Array;
  readonly kind: Uint8Array;
  readonly fromX: Float32Array;
  readonly fromY: Float32Array;
  readonly toX: Float32Array;
  readonly toY: Float32Array;
  /** Heading angle before and after the action (a turn rotates from one to the other). */
  readonly angleBefore: Float32Array;
  readonly angleAfter: Float32Array;
  /** Realised start, Infinity when the action never starts. */
  readonly start: Float64Array;
  /** Realised end, Infinity when it never finishes (never started, or cut by a stop). */
  readonly end: Float64Array;
  /** When a collision stop cut the action short, else Infinity. */
  readonly cutAt: Float64Array;
  /** The drawn duration (also for a cut action, so its frozen position is exact). */
  readonly duration: Float64Array;
  /** Idle time before the action spent on a barrier or dependency. */
  readonly waited: Float64Array;
  /** 1 for padding added to reach the plan's makespan. */
  readonly isPadding: Uint8Array;
  /** Per robot: when a collision stopped it for good, else Infinity. */
  readonly stoppedAt: Float64Array;
  /** Per robot: heading angle before its first action. */
  readonly startAngle: Float32Array;
  /** Per robot: start cell. */
  readonly startX: Float32Array;
  readonly startY: Float32Array;
  /** Latest finite time of the run (the end of the animation). */
  readonly horizonMs: number;
}

/** Copies the last simulated run of `runner` into a FleetTrack. */
export function trackFromRunner(runner: ExecutionRunner): FleetTrack {
  const p = runner.prepared;
  const n = p.actionCount;
  const pitch = p.profile.cellPitchMm;
  const w = p.instance.grid.width;
  const t = {
    kind: Uint8Array.from(p.kind),
    fromX: new Float32Array(n), fromY: new Float32Array(n), toX: new Float32Array(n), toY: new Float32Array(n),
    angleBefore: new Float32Array(n), angleAfter: new Float32Array(n),
  };
  const startAngle = new Float32Array(p.robotCount);
  const startX = new Float32Array(p.robotCount);
  const startY = new Float32Array(p.robotCount);
  let horizon = 0;
  for (let r = 0; r < p.robotCount; r++) {
    const task = p.instance.agents[r];
    startX[r] = task.start % w;
    startY[r] = Math.floor(task.start / w);
    let before = HEADING_ANGLE[task.startHeading ?? 'N'];
    for (let a = p.first[r]; a < p.first[r + 1]; a++) {
      const after = HEADING_ANGLE[p.actions[a].heading];
      // The first action fixes the start heading when the task leaves it open (a `free` start).
      if (a === p.first[r]) before = p.kind[a] === KIND.turnLeft ? after + Math.PI / 2 : p.kind[a] === KIND.turnRight ? after - Math.PI / 2 : after;
      t.fromX[a] = p.fromX[a] / pitch;
      t.fromY[a] = p.fromY[a] / pitch;
      t.toX[a] = p.toX[a] / pitch;
      t.toY[a] = p.toY[a] / pitch;
      t.angleBefore[a] = before;
      // Turns rotate by exactly ±90°; keeping the angle continuous makes interpolation a plain lerp.
      t.angleAfter[a] = p.kind[a] === KIND.turnLeft ? before - Math.PI / 2 : p.kind[a] === KIND.turnRight ? before + Math.PI / 2 : before;
      before = t.angleAfter[a];
      if (a === p.first[r]) startAngle[r] = t.angleBefore[a];
    }
    if (p.first[r] === p.first[r + 1]) startAngle[r] = before;
  }
  const { start, end, cutAt, waited } = runner.times;
  for (let a = 0; a < n; a++) {
    if (Number.isFinite(end[a]) && end[a] > horizon) horizon = end[a];
    if (Number.isFinite(cutAt[a]) && cutAt[a] > horizon) horizon = cutAt[a];
  }
  return {
    robotCount: p.robotCount, actionCount: n, first: Int32Array.from(p.first), ...t,
    start: Float64Array.from(start), end: Float64Array.from(end), cutAt: Float64Array.from(cutAt),
    duration: Float64Array.from(runner.duration), waited: Float64Array.from(waited), isPadding: Uint8Array.from(p.isPadding),
    stoppedAt: Float64Array.from(runner.stoppedAt), startAngle, startX, startY, horizonMs: horizon,
  };
}
