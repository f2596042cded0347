/**
 * k-delay conflicts and their range-constraint split, the model-specific part of the CBS engine
 * for k-robust plans (Atzmon et al., "Robust multi-agent path
 * finding and executing", JAIR 2020; first as "k-robust multi-agent path finding", SoCS 2018).
 *
 * A k-delay conflict: agent a1 is in cell v at time t1 and agent a2 at time t2 with
 * |t1 − t2| ≤ k. With lo = min(t1, t2) it is split by two range constraints on the same window
 * I = [lo, lo + k]: "a1 is never in v during I" or "a2 is never in v during I".
 * Completeness: any two times inside I are at most k apart, so in every k-robust plan at
 * least one of the two agents stays out of v during all of I, i.e. satisfies one child.
 * Progress: both current occupancies (t1, t2) lie in I, so each child forbids its agent's
 * current path (a resting agent included: the window then closes its goal until after I).
 */
import { C_RANGE, constraint } from './constraint';
import { type Conflict, makeConflict, P_CARDINAL, P_NON, P_SEMI } from './conflict';
import type { Mdd } from './mdd';

/** Conflict kind of a k-delay conflict (the engine's kinds 0–4 live in conflict.ts). */
export const K_RANGE = 5;

/**
 * Appends the k-delay conflicts (k ≥ 1) between agents `a` and `b` to `out`. Paths are state
 * arrays trimmed at the goal (the agent rests at its last entry forever). Swaps and following
 * moves are k-delay conflicts for k ≥ 1, so no separate edge rule is needed. Occupancies of
 * one cell whose pair lies in a window already reported are not reported again (they are one
 * encounter; the split of the first resolves or re-finds them).
 */
export function findKDelayConflicts(
  stateCell: Int32Array, k: number, a: number, pa: Int32Array, b: number, pb: Int32Array, out: Conflict[],
): void {
  const la = pa.length - 1;
  const lb = pb.length - 1;
  // Past both path ends nobody moves: a resting agent meets a later visitor by then (goals differ).
  const end = la > lb ? la : lb;
  let lastCell = -1;
  let lastLo = -1;
  const report = (cell: number, lo: number, t: number): void => {
    if (cell === lastCell && lo >= lastLo && t <= lastLo + k) return;
    const c = makeConflict(K_RANGE, a, b, cell, -1, lo);
    c.constraints1 = [constraint(C_RANGE, a, cell, -1, lo, lo + k)];
    c.constraints2 = [constraint(C_RANGE, b, cell, -1, lo, lo + k)];
    out.push(c);
    lastCell = cell;
    lastLo = lo;
  };
  for (let t = 0; t <= end; t++) {
    const ca = stateCell[pa[t <= la ? t : la]];
    const cb = stateCell[pb[t <= lb ? t : lb]];
    // Earliest partner occupancy first: the widest pair this time t closes.
    for (let d = Math.min(k, t); d >= 0; d--) {
      const u = t - d;
      if (stateCell[pb[u <= lb ? u : lb]] === ca) { report(ca, u, t); break; }
    }
    for (let d = Math.min(k, t); d >= 1; d--) {
      const u = t - d;
      if (stateCell[pa[u <= la ? u : la]] === cb) { report(cb, u, t); break; }
    }
  }
}

/**
 * Whether every path of the MDD (cost-c paths, resting at the goal afterwards) is in `cell`
 * at some time of [t0, t1], i.e. a range constraint there must raise the agent's cost.
 */
export function isRangeUnavoidable(m: Mdd, cell: number, t0: number, t1: number, stateCell: Int32Array): boolean {
  const cost = m.cost;
  if (cell === m.goalCell && t1 >= cost) return true;
  if (t0 > cost) return false;
  // Forward sweep over the levels, dropping the nodes the window forbids.
  const reach = new Uint8Array(m.states.length);
  for (let i = m.levelStart[0]; i < m.levelStart[1]; i++) reach[i] = t0 <= 0 && stateCell[m.states[i]] === cell ? 0 : 1;
  for (let t = 0; t < cost; t++) {
    const blocks = t + 1 >= t0 && t + 1 <= t1;
    for (let i = m.levelStart[t]; i < m.levelStart[t + 1]; i++) {
      if (reach[i] === 0) continue;
      for (let x = m.childStart[i]; x < m.childStart[i + 1]; x++) {
        const j = m.children[x];
        if (!blocks || stateCell[m.states[j]] !== cell) reach[j] = 1;
      }
    }
  }
  for (let i = m.levelStart[cost]; i < m.levelStart[cost + 1]; i++) if (reach[i] === 1) return false;
  return true;
}

/**
 * A classified copy of a k-delay conflict (constraints shared, they are immutable): cardinal
 * when both agents' MDDs must pass the cell inside the window (Boyarski et al., IJCAI 2015,
 * applied to range constraints), semi-cardinal when one must; non-cardinal without MDDs.
 */
export function classifyRangeConflict(raw: Conflict, m1: Mdd | null, m2: Mdd | null, stateCell: Int32Array): Conflict {
  const c = makeConflict(K_RANGE, raw.a1, raw.a2, raw.cell, raw.cell2, raw.t);
  c.constraints1 = raw.constraints1;
  c.constraints2 = raw.constraints2;
  if (m1 === null || m2 === null) {
    c.priority = P_NON;
    return c;
  }
  const r1 = (raw.constraints1 as readonly { t0: number; t1: number }[])[0];
  const card1 = isRangeUnavoidable(m1, raw.cell, r1.t0, r1.t1, stateCell);
  const card2 = isRangeUnavoidable(m2, raw.cell, r1.t0, r1.t1, stateCell);
  c.isMddCardinal = card1 && card2;
  c.priority = card1 && card2 ? P_CARDINAL : card1 || card2 ? P_SEMI : P_NON;
  return c;
}
