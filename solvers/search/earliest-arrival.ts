/**
 * Earliest time an agent can be in a cell under its vertex and edge constraints, optionally
 * with one edge removed: a layered breadth-first search in time. It ignores landmarks and
 * length bounds, so it returns a lower bound on the true earliest arrival, which is what
 * corridor reasoning needs to stay sound.
 */
import type { SearchModel } from '../models/model';
import type { ConstraintTable } from './constraint-table';

/**
 * The earliest t ≤ limit at which `agent` (from its start at time 0) can be in `target`, or
 * limit + 1 if it cannot be there by then. The undirected edge {blockA, blockB} is unusable
 * when blockA ≥ 0. States are cells (classic model).
 */
export function earliestArrival(model: SearchModel, agent: number, table: ConstraintTable, target: number,
  limit: number, blockA = -1, blockB = -1): number {
  const { succStart, succ } = model;
  const n = model.cellCount;
  const start = model.startStates[agent];
  if (table.isVertexBlocked(start, 0)) return limit + 1;
  let cur = new Int32Array(n);
  let next = new Int32Array(n);
  const mark = new Int32Array(n).fill(-1);
  let curLen = 1;
  cur[0] = start;
  mark[start] = 0;
  let stableSince = -1;
  for (let t = 0; t <= limit; t++) {
    for (let i = 0; i < curLen; i++) if (cur[i] === target) return t;
    if (t >= table.horizon) {
      // From the horizon on nothing depends on time: if the set stopped growing it never will.
      if (stableSince >= 0 && curLen === stableSince) return limit + 1;
      stableSince = curLen;
    }
    let nextLen = 0;
    const t2 = t + 1;
    for (let i = 0; i < curLen; i++) {
      const c = cur[i];
      for (let k = succStart[c]; k < succStart[c + 1]; k++) {
        const c2 = succ[k];
        if (mark[c2] === t2) continue;
        if (blockA >= 0 && ((c === blockA && c2 === blockB) || (c === blockB && c2 === blockA))) continue;
        if (table.isVertexBlocked(c2, t2)) continue;
        if (c2 !== c && table.isEdgeBlocked(c, c2, t2)) continue;
        mark[c2] = t2;
        next[nextLen++] = c2;
      }
    }
    const tmp = cur;
    cur = next;
    next = tmp;
    curLen = nextLen;
    if (curLen === 0) return limit + 1;
  }
  return limit + 1;
}
