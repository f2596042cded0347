/**
 * Corridor reasoning for the classic model (Li, Harabor, Stuckey, Koenig, "Pairwise symmetry
 * reasoning for multi-agent path finding search", AIJ 2021; first in Li, Gange, Harabor,
 * Stuckey, Ma, Koenig, "New techniques for pairwise symmetry breaking in multi-agent path
 * finding", ICAPS 2020). Two agents meeting head-on in a chain of degree-2 cells cannot pass;
 * plain CBS would add one constraint per time step. Instead one child forbids agent 1 the far
 * end of the corridor until t1 and the other forbids agent 2 its far end until t2, where t1 and
 * t2 come from earliest arrival times with and without the corridor. The earliest arrivals
 * are lower bounds (SpaceTimeAStar.earliestArrival), which can only weaken the constraints, never make
 * them unsound.
 */
import { C_RANGE, constraint } from './constraint';
import type { ConstraintTable } from './constraint-table';
import { type Conflict, K_CORRIDOR, K_EDGE, makeConflict } from './conflict';
import type { SpaceTimeAStar } from './space-time-astar';

/** Path cell at time t (agents rest at their last cell). */
function at(path: Int32Array, t: number): number {
  return path[t < path.length ? t : path.length - 1];
}

/**
 * A corridor conflict replacing the vertex or edge conflict `c`, or null when `c` is not a
 * corridor conflict. `paths`/`tables` are indexed by agent id through `local`.
 */
export function findCorridorConflict(planner: SpaceTimeAStar, degree: Uint8Array, c: Conflict,
  pathOf: (agent: number) => Int32Array, tableOf: (agent: number) => ConstraintTable): Conflict | null {
  let timestep = c.t;
  let curr = -1;
  if (degree[c.cell] === 2) {
    curr = c.cell;
    if (c.kind === K_EDGE) timestep--;
  } else if (c.kind === K_EDGE && degree[c.cell2] === 2) {
    curr = c.cell2;
  }
  if (curr < 0) return null;
  let a0 = c.a1;
  let a1 = c.a2;
  const enteringTime = (p: Int32Array, other: Int32Array, t: number): number => {
    if (t >= p.length) t = p.length - 1;
    let loc = p[t];
    const otherGoal = other[other.length - 1];
    while (loc !== p[0] && loc !== otherGoal && degree[loc] === 2) {
      t--;
      loc = p[t];
    }
    return t;
  };
  let t0 = enteringTime(pathOf(a0), pathOf(a1), timestep);
  let t1e = enteringTime(pathOf(a1), pathOf(a0), timestep);
  if (t0 > t1e) {
    [t0, t1e] = [t1e, t0];
    [a0, a1] = [a1, a0];
  }
  const p0 = pathOf(a0);
  const p1 = pathOf(a1);
  const u0 = p0[t0];
  const u1 = p1[t1e];
  if (u0 === u1) return null;
  const visitsFrom = (p: Int32Array, from: number, cell: number): boolean => {
    for (let t = from; t < p.length; t++) if (p[t] === cell) return true;
    return false;
  };
  if (!visitsFrom(p0, t0, u1) || !visitsFrom(p1, t1e, u0)) return null;
  // Corridor length along agent a0's path from u0 to u1, and its first forward edge.
  let cur = p0[t0];
  let prev = -1;
  let length = 0;
  let t = t0;
  let forward = true;
  let edgeA = -1;
  let edgeB = -1;
  while (cur !== u1) {
    t++;
    const next = at(p0, t);
    if (next === cur) continue;
    if (next === prev) forward = !forward;
    if (forward) {
      if (edgeA < 0) { edgeA = cur; edgeB = next; }
      length++;
    } else {
      length--;
    }
    prev = cur;
    cur = next;
  }
  if (edgeA < 0 || length <= 0) return null;
  const ct0 = tableOf(a0);
  const ct1 = tableOf(a1);
  const big = 0x3fffff;
  const t3 = planner.earliestArrival(a0, ct0, u1, big);
  const t4 = planner.earliestArrival(a1, ct1, u0, big);
  if (t3 > big || t4 > big || Math.abs(t3 - t4) > length) return null;
  const t3b = planner.earliestArrival(a0, ct0, u1, t3 + 2 * length + 1, edgeA, edgeB);
  const t4b = planner.earliestArrival(a1, ct1, u0, t4 + 2 * length + 1, edgeA, edgeB);
  if (!(t3b > t3 && t4b > t4)) return null;
  const r1 = Math.min(t3b - 1, t4 + length);
  const r2 = Math.min(t4b - 1, t3 + length);
  const c1 = constraint(C_RANGE, a0, u1, -1, 0, r1);
  const c2 = constraint(C_RANGE, a1, u0, -1, 0, r2);
  // Both current paths must break their constraint, or the split would not make progress.
  const breaks = (p: Int32Array, cell: number, until: number): boolean => {
    for (let k = 0; k <= until && k < p.length; k++) if (p[k] === cell) return true;
    return until >= p.length - 1 && p[p.length - 1] === cell;
  };
  if (!breaks(p0, u1, r1) || !breaks(p1, u0, r2)) return null;
  const out = makeConflict(K_CORRIDOR, a0, a1, curr, -1, c.t);
  out.constraints1 = [c1];
  out.constraints2 = [c2];
  return out;
}
