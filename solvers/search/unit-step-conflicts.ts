/**
 * The conflict rule of the unit-step models (classic and orientation-split): vertex conflicts,
 * swaps, and goal conflicts (an agent resting at its goal is hit by a later visitor).
 * Following is allowed here; models with `following: forbidden` add following-conflicts.ts.
 */
import { type Conflict, K_EDGE, K_VERTEX, makeConflict } from './conflict';

/**
 * Appends every vertex and swap conflict between agents `a` and `b` to `out`. Paths are
 * state arrays trimmed at the goal (the agent stays at its last entry); `stateCell` maps
 * states to cells. A vertex conflict at a time past one agent's path end is a goal conflict
 * (it is reported as a vertex conflict with that agent as `a1`; target reasoning relabels it).
 */
export function findUnitStepConflicts(
  stateCell: Int32Array, a: number, pa: Int32Array, b: number, pb: Int32Array, out: Conflict[],
): void {
  const la = pa.length - 1;
  const lb = pb.length - 1;
  const end = la > lb ? la : lb;
  let prevA = -1;
  let prevB = -1;
  for (let t = 0; t <= end; t++) {
    const ca = stateCell[pa[t <= la ? t : la]];
    const cb = stateCell[pb[t <= lb ? t : lb]];
    if (ca === cb) {
      // The finished agent (if any) goes first so target reasoning knows whose goal it is.
      if (t >= la && t < lb) out.push(makeConflict(K_VERTEX, a, b, ca, -1, t));
      else if (t >= lb && t < la) out.push(makeConflict(K_VERTEX, b, a, ca, -1, t));
      else out.push(makeConflict(K_VERTEX, a, b, ca, -1, t));
    } else if (t > 0 && ca === prevB && cb === prevA && ca !== prevA) {
      out.push(makeConflict(K_EDGE, a, b, prevA, ca, t));
    }
    prevA = ca;
    prevB = cb;
  }
}
