/**
 * Realised start and end times of every action under an execution policy, given the drawn
 * durations and, for `stop` on collision, the times robots were stopped.
 */
import type { ExecutionPolicy } from './execution-types';
import type { ActionDependencies } from './dependency-graph';
import type { PreparedPlan } from './prepared-plan';

/** What realiseTimes needs besides durations: the release order and, for dependency-gated, the ADG. */
export interface ReleasePlan {
  readonly policy: ExecutionPolicy;
  /** Actions in the order their times are computed (every predecessor first). */
  readonly order: Int32Array;
  readonly dependencies?: ActionDependencies;
}

/** Per-action realised times of one run (buffers reused between runs). */
export interface RunTimes {
  readonly start: Float64Array;
  /** Infinity when the action never finishes (never starts, or cut by a stop). */
  readonly end: Float64Array;
  /** When a stop cut the action short (the robot stands there for good), else Infinity. */
  readonly cutAt: Float64Array;
  /** Idle time before the action (barrier or dependency); 0 when it never starts. */
  readonly waited: Float64Array;
}

/** Allocates buffers for `n` actions. */
export function createRunTimes(n: number): RunTimes {
  return { start: new Float64Array(n), end: new Float64Array(n), cutAt: new Float64Array(n), waited: new Float64Array(n) };
}

/** The release order of a policy: plan order (open-loop), by step (lockstep), topological (dependency-gated). */
export function releasePlan(p: PreparedPlan, policy: ExecutionPolicy, dependencies?: ActionDependencies): ReleasePlan {
  if (policy === 'dependency-gated') {
    if (!dependencies) throw new Error('dependency-gated execution needs the action dependency graph');
    return { policy, order: dependencies.order, dependencies };
  }
  const order = Int32Array.from({ length: p.actionCount }, (_, i) => i);
  if (policy === 'lockstep') {
    // Ties keep plan order (robot, then position), which keeps each robot's actions in sequence.
    const sorted = Array.from(order).sort((a, b) => p.step[a] - p.step[b] || a - b);
    return { policy, order: Int32Array.from(sorted) };
  }
  return { policy, order };
}

/**
 * Computes realised times. `duration[a]` is the drawn duration; `stoppedAt[r]` is when robot r
 * was stopped (Infinity if never): actions that would start at or after it never start, and one
 * in progress is cut there.
 */
export function realiseTimes(p: PreparedPlan, release: ReleasePlan, duration: Float64Array, stoppedAt: Float64Array, out: RunTimes): void {
  const { start, end, cutAt, waited } = out;
  const { order, policy, dependencies } = release;
  const first = p.first;
  const robotOf = p.robotOf;
  const stepOf = p.step;
  // The loop writes every action in the order; only actions left out of it (on or behind a
  // dependency cycle) need the never-started defaults.
  if (order.length < p.actionCount) {
    start.fill(Infinity);
    end.fill(Infinity);
    cutAt.fill(Infinity);
    waited.fill(0);
  }
  let barrier = 0;
  let runningMax = 0;
  let currentStep = -1;
  const isLockstep = policy === 'lockstep';
  const depStart = dependencies?.depStart;
  const deps = dependencies?.deps;
  for (let k = 0; k < order.length; k++) {
    const a = order[k];
    const r = robotOf[a];
    const own = a > first[r] ? end[a - 1] : 0;
    let ready = own;
    if (isLockstep) {
      if (stepOf[a] !== currentStep) {
        currentStep = stepOf[a];
        barrier = runningMax;
      }
      if (barrier > ready) ready = barrier;
    } else if (depStart !== undefined && deps !== undefined) {
      for (let j = depStart[a]; j < depStart[a + 1]; j++) {
        const e = end[deps[j]];
        if (e > ready) ready = e;
      }
    }
    const stop = stoppedAt[r];
    if (ready < stop) {
      start[a] = ready;
      waited[a] = ready - own;
      const e = ready + duration[a];
      if (e > stop) {
        cutAt[a] = stop;
        end[a] = Infinity;
      } else {
        cutAt[a] = Infinity;
        end[a] = e;
      }
    } else {
      start[a] = Infinity;
      end[a] = Infinity;
      cutAt[a] = Infinity;
      waited[a] = 0;
    }
    if (isLockstep && end[a] > runningMax) runningMax = end[a];
  }
}
