/**
 * The following conflict and its split, for the unit-step models with `following: forbidden`
 * (Stern et al., "Multi-Agent Pathfinding: Definitions, Variants, and Benchmarks", SoCS 2019):
 * agent F enters at t a cell v that another agent L occupied at t − 1.
 *
 * Reported only when it is not also a vertex or swap conflict (those are found by
 * unit-step-conflicts.ts and keep their own splits): F is not in v at t − 1 (it enters), L is
 * not in v at t (it leaves; if it stays, or rests at its goal, F meets it there: a vertex or
 * goal conflict) and L does not go to F's cell (a swap).
 *
 * Split (always the plain two-negative split, even with disjoint splitting on): child 1 "F is
 * not in v at t", child 2 "L is not in v at t − 1".
 * Completeness: in a plan without vertex and following conflicts, F in v at t and L in v at
 * t − 1 cannot both hold (if F was in v at t − 1 too, that is a vertex conflict; else F enters
 * v while L occupies it), so every such plan satisfies one child.
 * Progress: F's current path is in v at t and L's in v at t − 1, so each child forbids its
 * agent's current path.
 * Why not disjoint: a positive "F in v at t" implies (in the engine's vocabulary) only that
 * others are not in v at t; L's path is not in v at t, so that child would keep both paths
 * and find the same conflict again.
 */
import { C_VERTEX, constraint, type Constraint } from './constraint';
import { type Conflict, makeConflict, P_CARDINAL, P_NON, P_SEMI } from './conflict';
import type { Mdd } from './mdd';

/** Conflict kind of a following conflict: a1 = follower F, a2 = leader L, `cell` = v, `cell2` = F's previous cell, `t` = F's arrival. */
export const K_FOLLOW = 6;

/**
 * Appends the following conflicts between agents `a` and `b` (either may follow the other) to
 * `out`. Paths are state arrays trimmed at the goal (the agent rests at its last entry);
 * `stateCell` maps states to cells, so an agent turning in place occupies its cell.
 */
export function findFollowingConflicts(
  stateCell: Int32Array, a: number, pa: Int32Array, b: number, pb: Int32Array, out: Conflict[],
): void {
  const la = pa.length - 1;
  const lb = pb.length - 1;
  // Past both path ends nobody moves.
  const end = la > lb ? la : lb;
  let prevA = stateCell[pa[0]];
  let prevB = stateCell[pb[0]];
  for (let t = 1; t <= end; t++) {
    const ca = stateCell[pa[t <= la ? t : la]];
    const cb = stateCell[pb[t <= lb ? t : lb]];
    if (ca !== prevA && ca === prevB && cb !== prevB && cb !== prevA) out.push(followingConflict(a, b, ca, prevA, t));
    if (cb !== prevB && cb === prevA && ca !== prevA && ca !== prevB) out.push(followingConflict(b, a, cb, prevB, t));
    prevA = ca;
    prevB = cb;
  }
}

function followingConflict(follower: number, leader: number, cell: number, from: number, t: number): Conflict {
  const c = makeConflict(K_FOLLOW, follower, leader, cell, from, t);
  c.constraints1 = [constraint(C_VERTEX, follower, cell, -1, t, t)];
  c.constraints2 = [constraint(C_VERTEX, leader, cell, -1, t - 1, t - 1)];
  return c;
}

/**
 * A classified copy of a following conflict (constraints shared, they are immutable): the
 * follower's child must raise its cost when every path of its current cost is in v at t, the
 * leader's when every one is in v at t − 1 (Boyarski et al., IJCAI 2015, applied to this
 * split); non-cardinal without MDDs. `m1` is the follower's MDD, `m2` the leader's.
 */
export function classifyFollowingConflict(raw: Conflict, m1: Mdd | null, m2: Mdd | null): Conflict {
  const c = makeConflict(K_FOLLOW, raw.a1, raw.a2, raw.cell, raw.cell2, raw.t);
  c.constraints1 = raw.constraints1;
  c.constraints2 = raw.constraints2;
  if (m1 === null || m2 === null) {
    c.priority = P_NON;
    return c;
  }
  const card1 = m1.cellIfSingleton(raw.t) === raw.cell;
  const card2 = m2.cellIfSingleton(raw.t - 1) === raw.cell;
  c.isMddCardinal = card1 && card2;
  c.priority = card1 && card2 ? P_CARDINAL : card1 || card2 ? P_SEMI : P_NON;
  return c;
}

/** The two children's constraint sets of a following conflict. */
export function splitFollowingConflict(c: Conflict): [Constraint[], Constraint[]] {
  return [c.constraints1 as Constraint[], c.constraints2 as Constraint[]];
}
