/**
 * Conflict detection of the weighted-split CBS: every agent's plan becomes a list of cell
 * visits under the occupancy rule (sipp.ts), and a conflict is two agents' visits of one cell
 * whose half-open intervals overlap. The conflict CBS splits on is the one that begins
 * earliest; ties go to the lower agent pair, then the lower cell, so the search is
 * deterministic.
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

/** Two agents' visits of one cell overlapping from `time` on; `late` entered at `time` by a forward move. */
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

/** The earliest conflict among all agents' visits and the number of agent pairs in conflict. */
export function findEarliestConflict(visits: readonly (readonly CellVisit[])[]): {
  readonly conflict: OccupancyConflict | undefined;
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
  let found: OccupancyConflict | undefined;
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
        const lo = Math.min(va.agent, vb.agent);
        const hi = Math.max(va.agent, vb.agent);
        pairs.add(lo * n + hi);
        const time = Math.max(va.enter, vb.enter);
        const [early, late] =
          va.enter < vb.enter || (va.enter === vb.enter && va.agent < vb.agent) ? [va, vb] : [vb, va];
        if (!found || isBefore(time, lo, hi, cell, found)) found = { time, cell, early, late };
      }
    }
  }
  return { conflict: found, conflictingPairs: pairs.size };
}

function isBefore(time: number, lo: number, hi: number, cell: number, than: OccupancyConflict): boolean {
  if (time !== than.time) return time < than.time;
  const tlo = Math.min(than.early.agent, than.late.agent);
  const thi = Math.max(than.early.agent, than.late.agent);
  if (lo !== tlo) return lo < tlo;
  if (hi !== thi) return hi < thi;
  return cell < than.cell;
}
