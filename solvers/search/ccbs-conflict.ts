/**
 * Conflict detection of the weighted-split CBS: every agent's plan becomes a list of cell
 * visits under the occupancy rule (sipp.ts), and a conflict is two agents' visits of one cell
 * whose half-open intervals overlap. Conflicts are ordered by the instant they begin; ties go
 * to the lower agent pair, then the lower cell, so the search is deterministic.
 */
import type { SippPlan } from './sipp';

/**
 * One stay of an agent in a cell, from the start of the forward move that brought it in (0 for
 * its start cell) to the end of the forward move that takes it out (Infinity for its goal).
 */
export interface CellVisit {
  readonly agent: number;
  readonly cell: number;
  /** First instant in the cell. */
  readonly enter: number;
  /** First instant no longer in the cell (Infinity for the final visit). */
  readonly leave: number;
  /** Cell of the move into this visit, -1 for the start visit. */
  readonly inFrom: number;
  /** Cell of the move out of this visit, -1 for the final visit. */
  readonly outTo: number;
  /** Start time of the move out, -1 for the final visit. */
  readonly outStart: number;
}

/** Two agents' visits of one cell overlapping from `time` on; `late` entered at `time` by a forward move (never a start visit). */
export interface OccupancyConflict {
  readonly time: number;
  readonly cell: number;
  /** The visit that began first (or, on a tie, the lower agent's). */
  readonly early: CellVisit;
  /** The visit whose entering move began at `time`. */
  readonly late: CellVisit;
}

/** The visits of one agent's plan (`plan.steps` from time 0 at `start`). */
export function cellVisits(agent: number, start: number, plan: SippPlan, forwardMs: number): CellVisit[] {
  const visits: CellVisit[] = [];
  let cell = start;
  let enter = 0;
  let inFrom = -1;
  for (const step of plan.steps) {
    if (step.kind !== 'forward') continue;
    visits.push({ agent, cell, enter, leave: step.start + forwardMs, inFrom, outTo: step.to, outStart: step.start });
    inFrom = cell;
    cell = step.to;
    enter = step.start;
  }
  visits.push({ agent, cell, enter, leave: Infinity, inFrom, outTo: -1, outStart: -1 });
  return visits;
}

/**
 * The conflicts among all agents' visits, earliest first (at most `limit` of them), and the
 * number of agent pairs in conflict.
 */
export function findConflicts(visits: readonly (readonly CellVisit[])[], limit: number, isEveryPair = false): {
  readonly conflicts: readonly OccupancyConflict[];
  readonly conflictingPairs: number;
} {
  const byCell = new Map<number, CellVisit[]>();
  for (const list of visits) {
    for (const v of list) {
      const bucket = byCell.get(v.cell);
      if (bucket) bucket.push(v);
      else byCell.set(v.cell, [v]);
    }
  }
  const found: OccupancyConflict[] = [];
  const pairs = new Set<number>();
  const n = visits.length;
  for (const [cell, bucket] of byCell) {
    if (bucket.length < 2) continue;
    for (let a = 0; a < bucket.length; a++) {
      for (let b = a + 1; b < bucket.length; b++) {
        const va = bucket[a];
        const vb = bucket[b];
        if (va.agent === vb.agent) continue;
        if (!(va.enter < vb.leave && vb.enter < va.leave)) continue;
        pairs.add(Math.min(va.agent, vb.agent) * n + Math.max(va.agent, vb.agent));
        const time = Math.max(va.enter, vb.enter);
        const [early, late] = isEarlyVisit(va, vb) ? [va, vb] : [vb, va];
        found.push({ time, cell, early, late });
      }
    }
  }
  found.sort(compareConflicts);
  if (!isEveryPair) return { conflicts: found.slice(0, limit), conflictingPairs: pairs.size };
  // The first `limit` conflicts, then the earliest conflict of every other agent pair.
  const chosen = found.slice(0, limit);
  const seen = new Set<number>();
  for (const c of chosen) seen.add(Math.min(c.early.agent, c.late.agent) * n + Math.max(c.early.agent, c.late.agent));
  for (const c of found.slice(limit)) {
    const key = Math.min(c.early.agent, c.late.agent) * n + Math.max(c.early.agent, c.late.agent);
    if (seen.has(key)) continue;
    seen.add(key);
    chosen.push(c);
  }
  return { conflicts: chosen, conflictingPairs: pairs.size };
}

/**
 * Whether `a` is the `early` side of a conflict with `b`: it began first; on a tie at time 0
 * the start visit (no entering move) is early, so that `late` always entered by a move;
 * otherwise the lower agent.
 */
function isEarlyVisit(a: CellVisit, b: CellVisit): boolean {
  if (a.enter !== b.enter) return a.enter < b.enter;
  if ((a.inFrom < 0) !== (b.inFrom < 0)) return a.inFrom < 0;
  return a.agent < b.agent;
}

function compareConflicts(x: OccupancyConflict, y: OccupancyConflict): number {
  if (x.time !== y.time) return x.time - y.time;
  const xl = Math.min(x.early.agent, x.late.agent);
  const yl = Math.min(y.early.agent, y.late.agent);
  if (xl !== yl) return xl - yl;
  const xh = Math.max(x.early.agent, x.late.agent);
  const yh = Math.max(y.early.agent, y.late.agent);
  if (xh !== yh) return xh - yh;
  return x.cell - y.cell;
}

/** All agents' visits grouped by cell. */
export function visitsByCell(visits: readonly (readonly CellVisit[])[]): Map<number, CellVisit[]> {
  const byCell = new Map<number, CellVisit[]>();
  for (const list of visits) {
    for (const v of list) {
      const bucket = byCell.get(v.cell);
      if (bucket) bucket.push(v);
      else byCell.set(v.cell, [v]);
    }
  }
  return byCell;
}

/** How many other agents have a visit overlapping one of `list` (the visits of `agent`), and how many overlapping visit pairs. */
export function conflictPartners(byCell: ReadonlyMap<number, readonly CellVisit[]>, agent: number, list: readonly CellVisit[]): { partners: number; overlaps: number } {
  const partners = new Set<number>();
  let overlaps = 0;
  for (const v of list) {
    const bucket = byCell.get(v.cell);
    if (!bucket) continue;
    for (const u of bucket) {
      if (u.agent === agent || !(u.enter < v.leave && v.enter < u.leave)) continue;
      partners.add(u.agent);
      overlaps++;
    }
  }
  return { partners: partners.size, overlaps };
}
