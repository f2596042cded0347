/**
 * Robot poses at time t, interpolated from a FleetTrack into reusable buffers (nothing is
 * allocated per frame). Forward moves are straight lines at constant speed and turns rotate at
 * constant rate over the drawn duration, the same motion the simulator's collision check assumes.
 */
import { KIND, type FleetTrack } from './fleet-track';

/** What a robot is doing at t (drawn in its own colour). */
export const POSE_STATE = {
  /** Driving, turning or waiting as planned. */
  active: 0,
  /** Idle because a barrier or a dependency holds its next action. */
  held: 1,
  /** At its goal with nothing left to do. */
  done: 2,
  /** Stopped for good by a collision (stop-on-collision runs). */
  stopped: 3,
  /** Its next action can never start (dependency deadlock). */
  blocked: 4,
} as const;

/** Reusable pose buffers for every robot of a track. */
export class FleetPoses {
  /** Centre, in cells. */
  readonly x: Float32Array;
  readonly y: Float32Array;
  /** Heading angle, radians (E = 0, S = π/2). */
  readonly angle: Float32Array;
  /** POSE_STATE code. */
  readonly state: Uint8Array;
  /** Per robot: the action index reached so far (a cursor that makes forward play O(1) per robot). */
  private readonly cursor: Int32Array;
  private lastT = -Infinity;

  constructor(readonly track: FleetTrack) {
    const n = track.robotCount;
    this.x = new Float32Array(n);
    this.y = new Float32Array(n);
    this.angle = new Float32Array(n);
    this.state = new Uint8Array(n);
    this.cursor = Int32Array.from(track.first.subarray(0, n));
  }

  /** Fills the buffers with every robot's pose at `t` ms. */
  update(t: number): void {
    const tr = this.track;
    if (t < this.lastT) this.cursor.set(tr.first.subarray(0, tr.robotCount));
    this.lastT = t;
    for (let r = 0; r < tr.robotCount; r++) this.poseOf(r, t);
  }

  private poseOf(r: number, t: number): void {
    const tr = this.track;
    const first = tr.first[r];
    const last = tr.first[r + 1];
    if (first === last) {
      this.set(r, tr.startX[r], tr.startY[r], tr.startAngle[r], POSE_STATE.done);
      return;
    }
    // Advance to the last action that has started by t.
    let k = this.cursor[r];
    while (k + 1 < last && tr.start[k + 1] <= t) k++;
    this.cursor[r] = k;
    if (!(tr.start[k] <= t)) {
      // Before its first action starts: at the start cell, held when a dependency keeps it there.
      const state = tr.start[k] === Infinity ? this.neverState(r) : t > 0 && tr.waited[k] > 0 ? POSE_STATE.held : POSE_STATE.active;
      this.set(r, tr.fromX[k], tr.fromY[k], tr.angleBefore[k], state);
      return;
    }
    const isCut = tr.cutAt[k] <= t;
    if (t < tr.end[k]) {
      const until = isCut ? tr.cutAt[k] : t;
      const f = tr.duration[k] > 0 ? Math.min(1, (until - tr.start[k]) / tr.duration[k]) : 1;
      const kind = tr.kind[k];
      const x = kind === KIND.forward ? tr.fromX[k] + (tr.toX[k] - tr.fromX[k]) * f : tr.fromX[k];
      const y = kind === KIND.forward ? tr.fromY[k] + (tr.toY[k] - tr.fromY[k]) * f : tr.fromY[k];
      const angle = tr.angleBefore[k] + (tr.angleAfter[k] - tr.angleBefore[k]) * f;
      const state = isCut ? POSE_STATE.stopped : tr.isPadding[k] === 1 ? POSE_STATE.done : POSE_STATE.active;
      this.set(r, x, y, angle, state);
      return;
    }
    // Between actions, or after the last one.
    const next = k + 1;
    let state: number = POSE_STATE.done;
    if (next < last) state = tr.start[next] === Infinity ? this.neverState(r) : POSE_STATE.held;
    this.set(r, tr.toX[k], tr.toY[k], tr.angleAfter[k], state);
  }

  /** Why robot r's next action never starts: it was stopped by a collision, or a dependency cycle holds it. */
  private neverState(r: number): number {
    return this.track.stoppedAt[r] < Infinity ? POSE_STATE.stopped : POSE_STATE.blocked;
  }

  private set(r: number, x: number, y: number, angle: number, state: number): void {
    this.x[r] = x;
    this.y[r] = y;
    this.angle[r] = angle;
    this.state[r] = state;
  }
}
