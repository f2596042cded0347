/**
 * Realised start and end times of every action under an execution policy, given the drawn
 * durations and, for `stop` on collision, the times robots were stopped. The policies' rules are
 * stated in execution-types.ts (ExecutionPolicy); here they become, for action a of robot r with
 * own = end of r's previous action (0 for its first):
 *   open-loop                start = own
 *   lockstep, steps timeline start = max(own, max end of every action of steps < step(a))
 *   lockstep, ms timeline    start = max(own, plannedStart(a), max end of every action b with plannedEnd(b) ≤ plannedStart(a))
 *   dependency-gated         start = max(own, max end of a's ADG predecessors)
 * and end = start + drawn duration (cut at the robot's stop time, if any).
 *
 * Lockstep on the ms timeline at zero noise runs exactly on the plan's times. By induction over
 * actions in planned-start order: if every action planned to start earlier started (hence
 * ended, durations being nominal) at its planned time, then for a: own = plannedEnd(prev) =
 * plannedStart(a) (lists are back to back), every b with plannedEnd(b) ≤ plannedStart(a)
 * ended at plannedEnd(b) ≤ plannedStart(a), so start(a) = plannedStart(a). Such a b always has
 * plannedStart(b) < plannedEnd(b) ≤ plannedStart(a), so computing in planned-start order has
 * every such b done first. (Times are integer ms in schedules, so the sums are exact.)
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
  /** Lockstep on the ms timeline: every action sorted by planned end (ties by index). */
  readonly byPlannedEnd?: Int32Array;
  /** Lockstep on the ms timeline: each action's planned end as the schedule states it (no float sums). */
  readonly plannedEnd?: Float64Array;
}

/** `RunTimes.releasedBy` when the action did not wait (or never started). */
export const RELEASED_BY_NONE = -1;
/** `RunTimes.releasedBy` when the plan's clock (its planned start) released the action. */
export const RELEASED_BY_PLANNED_START = -2;

/** Per-action realised times of one run (buffers reused between runs). */
export interface RunTimes {
  readonly start: Float64Array;
  /** Infinity when the action never finishes (never starts, or cut by a stop). */
  readonly end: Float64Array;
  /** When a stop cut the action short (the robot stands there for good), else Infinity. */
  readonly cutAt: Float64Array;
  /** Idle time before the action (barrier, planned start or dependency); 0 when it never starts. */
  readonly waited: Float64Array;
  /**
   * Whose end released the action after a wait: an action index (of another robot), or
   * RELEASED_BY_PLANNED_START, or RELEASED_BY_NONE (no wait, or never started).
   */
  readonly releasedBy: Int32Array;
}

/** Allocates buffers for `n` actions. */
export function createRunTimes(n: number): RunTimes {
  return {
    start: new Float64Array(n), end: new Float64Array(n), cutAt: new Float64Array(n), waited: new Float64Array(n), releasedBy: new Int32Array(n),
  };
}

/**
 * The release order of a policy: plan order (open-loop), by step (lockstep, steps timeline), by
 * planned start (lockstep, ms timeline), topological (dependency-gated).
 */
export function releasePlan(p: PreparedPlan, policy: ExecutionPolicy, dependencies?: ActionDependencies): ReleasePlan {
  if (policy === 'dependency-gated') {
    if (!dependencies) throw new Error('dependency-gated execution needs the action dependency graph');
    return { policy, order: dependencies.order, dependencies };
  }
  const order = Int32Array.from({ length: p.actionCount }, (_, i) => i);
  if (policy === 'lockstep' && p.timeline === 'ms') {
    // Ties keep plan order; a robot's own actions have increasing planned starts (positive durations).
    const byStart = Array.from(order).sort((a, b) => p.plannedStart[a] - p.plannedStart[b] || a - b);
    const plannedEnd = Float64Array.from(p.actions, (a) => a.end);
    const byEnd = Array.from(order).sort((a, b) => plannedEnd[a] - plannedEnd[b] || a - b);
    return { policy, order: Int32Array.from(byStart), byPlannedEnd: Int32Array.from(byEnd), plannedEnd };
  }
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
  const { start, end, cutAt, waited, releasedBy } = out;
  const { order, policy, dependencies, byPlannedEnd, plannedEnd } = release;
  const first = p.first;
  const robotOf = p.robotOf;
  const stepOf = p.step;
  const plannedStart = p.plannedStart;
  // The loop writes every action in the order; only actions left out of it (on or behind a
  // dependency cycle) need the never-started defaults.
  if (order.length < p.actionCount) {
    start.fill(Infinity);
    end.fill(Infinity);
    cutAt.fill(Infinity);
    waited.fill(0);
    releasedBy.fill(RELEASED_BY_NONE);
  }
  // Lockstep: the barrier (latest end so far of the actions it covers) and the action that set it.
  let barrier = 0;
  let barrierBy = RELEASED_BY_NONE;
  let runningMax = 0;
  let runningMaxBy = RELEASED_BY_NONE;
  let currentStep = -1;
  let endCursor = 0;
  const isLockstep = policy === 'lockstep';
  const isClocked = isLockstep && byPlannedEnd !== undefined && plannedEnd !== undefined;
  const depStart = dependencies?.depStart;
  const deps = dependencies?.deps;
  for (let k = 0; k < order.length; k++) {
    const a = order[k];
    const r = robotOf[a];
    const own = a > first[r] ? end[a - 1] : 0;
    let ready = own;
    let by = RELEASED_BY_NONE;
    if (isClocked) {
      // Every action planned to end by a's planned start has started (its planned start is
      // earlier, and `order` is by planned start), so its end is known.
      const at = plannedStart[a];
      while (endCursor < byPlannedEnd.length) {
        const b = byPlannedEnd[endCursor];
        if (plannedEnd[b] > at) break;
        if (end[b] > barrier) {
          barrier = end[b];
          barrierBy = b;
        }
        endCursor++;
      }
      if (at > ready) {
        ready = at;
        by = RELEASED_BY_PLANNED_START;
      }
      if (barrier > ready) {
        ready = barrier;
        by = barrierBy;
      }
    } else if (isLockstep) {
      if (stepOf[a] !== currentStep) {
        currentStep = stepOf[a];
        barrier = runningMax;
        barrierBy = runningMaxBy;
      }
      if (barrier > ready) {
        ready = barrier;
        by = barrierBy;
      }
    } else if (depStart !== undefined && deps !== undefined) {
      for (let j = depStart[a]; j < depStart[a + 1]; j++) {
        const e = end[deps[j]];
        if (e > ready) {
          ready = e;
          by = deps[j];
        }
      }
    }
    const stop = stoppedAt[r];
    if (ready < stop) {
      start[a] = ready;
      waited[a] = ready - own;
      releasedBy[a] = by;
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
      releasedBy[a] = RELEASED_BY_NONE;
    }
    if (isLockstep && !isClocked && end[a] > runningMax) {
      runningMax = end[a];
      runningMaxBy = a;
    }
  }
}
