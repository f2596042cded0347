/**
 * Rectangle reasoning with MDD-modified barrier constraints, for the classic model on a
 * 4-connected grid (Li, Harabor, Stuckey, Ma, Koenig, "Symmetry-breaking constraints for
 * grid-based multi-agent path finding", AAAI 2019; generalised with MDDs in Li, Harabor,
 * Stuckey, Koenig, "Pairwise symmetry reasoning for multi-agent path finding search", AIJ 2021).
 *
 * Two agents crossing a rectangle on Manhattan-optimal routes in compatible directions meet
 * inside it whichever optimal routes they take; plain CBS would branch over every meeting
 * cell. Instead one child forbids agent 1 its exit border of the rectangle (at the times a
 * Manhattan-optimal traversal would be there) and the other child forbids agent 2 its border.
 *
 * Soundness guards kept from the paper: the entry cells are MDD singletons, so every path that
 * reaches a barrier node of the MDD passes the entry at its MDD time and then moves
 * monotonically; barrier constraints are only placed on MDD nodes, within the rectangle and
 * the time span of the MDD; both current paths must violate their barrier. Only cardinal
 * rectangles (both children raise a cost) are used.
 */
import { C_VERTEX, constraint, type Constraint } from './constraint';
import { type Conflict, K_RECTANGLE, makeConflict, P_CARDINAL } from './conflict';
import type { Mdd } from './mdd';

/** Path cell at time t (agents rest at their last cell). */
function at(path: Int32Array, t: number): number {
  return path[t < path.length ? t : path.length - 1];
}

/**
 * A cardinal rectangle conflict for the vertex conflict of agents a1, a2 at time t (both
 * paths are cell paths, the MDDs are of their current costs), or null.
 */
export function findRectangleConflict(width: number, a1: number, a2: number, p1: Int32Array, p2: Int32Array,
  t: number, mdd1: Mdd, mdd2: Mdd): Conflict | null {
  if (p1.length <= t || p2.length <= t || p1.length <= 1 || p2.length <= 1) return null;
  const row = (c: number): number => Math.floor(c / width);
  const col = (c: number): number => c % width;
  const manhattan = (a: number, b: number): number => Math.abs(row(a) - row(b)) + Math.abs(col(a) - col(b));
  const loc = p1[t];
  const starts = (p: Int32Array, mdd: Mdd): number[] => {
    const out: number[] = [];
    for (let s = 0; s <= t; s++) if (mdd.width(s) === 1 && mdd.cellIfSingleton(s) === p[s] && manhattan(p[s], loc) === t - s) out.push(s);
    return out;
  };
  const goals = (p: Int32Array, mdd: Mdd): number[] => {
    const out: number[] = [];
    for (let g = p.length - 1; g >= t; g--) if (mdd.width(g) === 1 && mdd.cellIfSingleton(g) === p[g] && manhattan(p[g], loc) === g - t) out.push(g);
    return out;
  };
  const s1s = starts(p1, mdd1);
  const g1s = goals(p1, mdd1);
  const s2s = starts(p2, mdd2);
  const g2s = goals(p2, mdd2);
  let bestArea = 0;
  let best: Conflict | null = null;
  for (const t1s of s1s) {
    for (const t1e of g1s) {
      const s1 = p1[t1s];
      const g1 = p1[t1e];
      if (manhattan(s1, g1) !== t1e - t1s) continue;
      for (const t2s of s2s) {
        for (const t2e of g2s) {
          const s2 = p2[t2s];
          const g2 = p2[t2e];
          if (manhattan(s2, g2) !== t2e - t2s) continue;
          const s1x = row(s1), s1y = col(s1), g1x = row(g1), g1y = col(g1);
          const s2x = row(s2), s2y = col(s2), g2x = row(g2), g2y = col(g2);
          if (!isRectangle(s1x, s1y, g1x, g1y, s2x, s2y, g2x, g2y)) continue;
          const rgx = cornerG(s1x, g1x, g2x);
          const rgy = cornerG(s1y, g1y, g2y);
          const rsx = cornerS(s1x, s2x, g1x);
          const rsy = cornerS(s1y, s2y, g1y);
          const area = (Math.abs(rsx - rgx) + 1) * (Math.abs(rsy - rgy) + 1);
          // Which agent gets the vertical barrier (the column rgy) and which the horizontal one (the row rgx).
          const firstVertical = s1x === s2x ? (s1y - s2y) * (s2y - rgy) >= 0 : (s1x - s2x) * (s2x - rgx) < 0;
          const cardinal1 = firstVertical ? rgx === g1x : rgy === g1y;
          const cardinal2 = firstVertical ? rgy === g2y : rgx === g2x;
          if (!cardinal1 || !cardinal2 || area <= bestArea) continue;
          const rgt = t + Math.abs(rgx - row(loc)) + Math.abs(rgy - col(loc));
          // Entry singletons must be Manhattan-consistent with the corner time (guards the proof's timing).
          if (t1s + manhattan(s1, rgx * width + rgy) !== rgt || t2s + manhattan(s2, rgx * width + rgy) !== rgt) continue;
          const c1 = firstVertical
            ? verticalBarrier(a1, mdd1, width, rgy, rsx, rgx, rgt)
            : horizontalBarrier(a1, mdd1, width, rgx, rsy, rgy, rgt);
          const c2 = firstVertical
            ? horizontalBarrier(a2, mdd2, width, rgx, rsy, rgy, rgt)
            : verticalBarrier(a2, mdd2, width, rgy, rsx, rgx, rgt);
          if (c1.length === 0 || c2.length === 0 || !violates(p1, c1) || !violates(p2, c2)) continue;
          const conflict = makeConflict(K_RECTANGLE, a1, a2, loc, -1, t);
          conflict.priority = P_CARDINAL;
          conflict.constraints1 = c1;
          conflict.constraints2 = c2;
          best = conflict;
          bestArea = area;
        }
      }
    }
  }
  return best;

  function violates(p: Int32Array, cs: Constraint[]): boolean {
    return cs.some((c) => at(p, c.t1) === c.a);
  }
}

function isRectangle(s1x: number, s1y: number, g1x: number, g1y: number, s2x: number, s2y: number, g2x: number, g2y: number): boolean {
  if (s1x === s2x && s1y === s2y) return false; // a plain cardinal conflict at the entry
  if ((s1x === g1x && s1y === g1y) || (s2x === g2x && s2y === g2y)) return false;
  if ((s1x - g1x) * (s2x - g2x) < 0 || (s1y - g1y) * (s2y - g2y) < 0) return false; // opposite directions
  if ((s2x - s1x) * (s1x - g1x) < 0 && (s2y - s1y) * (s1y - g1y) < 0) return false; // s1 strictly inside
  if ((s1x - s2x) * (s2x - g2x) < 0 && (s1y - s2y) * (s2y - g2y) < 0) return false; // s2 strictly inside
  if ((s1x === g1x && s2y === g2y) || (s1y === g1y && s2x === g2x)) return false; // a one-cell rectangle
  return true;
}

/** Exit corner coordinate (one axis). */
function cornerG(s1: number, g1: number, g2: number): number {
  if (s1 === g1) return g1;
  return s1 < g1 ? Math.min(g1, g2) : Math.max(g1, g2);
}

/** Entry corner coordinate (one axis). */
function cornerS(s1: number, s2: number, g1: number): number {
  if (s1 === g1) return s1;
  return s1 < g1 ? Math.max(s1, s2) : Math.min(s1, s2);
}

/** Vertex constraints on the MDD nodes of row x between columns riy → rgy, timed to reach (x, rgy) at rgt. */
function horizontalBarrier(agent: number, mdd: Mdd, width: number, x: number, riy: number, rgy: number, rgt: number): Constraint[] {
  const sign = riy < rgy ? 1 : -1;
  const rit = rgt - Math.abs(riy - rgy);
  const out: Constraint[] = [];
  const tMax = Math.min(rgt, mdd.cost);
  for (let t = Math.max(rit, 0); t <= tMax; t++) {
    const cell = x * width + (riy + (t - rit) * sign);
    if (mdd.levelHasCell(t, cell)) out.push(constraint(C_VERTEX, agent, cell, -1, t, t));
  }
  return out;
}

/** Vertex constraints on the MDD nodes of column y between rows rix → rgx, timed to reach (rgx, y) at rgt. */
function verticalBarrier(agent: number, mdd: Mdd, width: number, y: number, rix: number, rgx: number, rgt: number): Constraint[] {
  const sign = rix < rgx ? 1 : -1;
  const rit = rgt - Math.abs(rix - rgx);
  const out: Constraint[] = [];
  const tMax = Math.min(rgt, mdd.cost);
  for (let t = Math.max(rit, 0); t <= tMax; t++) {
    const cell = (rix + (t - rit) * sign) * width + y;
    if (mdd.levelHasCell(t, cell)) out.push(constraint(C_VERTEX, agent, cell, -1, t, t));
  }
  return out;
}
