/**
 * The following rule of unit-step plans when `following: forbidden` (the "following conflict"
 * of Stern et al., "Multi-Agent Pathfinding: Definitions, Variants, and Benchmarks", SoCS 2019):
 * no agent may enter at t + 1 a cell that another agent occupies at t. Written on its own, on
 * plain cell sequences, so that the search code (solvers/search/following-conflicts.ts) cannot
 * hide a bug of its own in its check.
 *
 * An entry that is also a vertex conflict (the occupant is still there at t + 1) or a swap is
 * left to firstCellConflict, which names it as such; every other entry into an occupied cell is
 * a 'following' violation, dated at t (a move under way from t to t + 1, phase 1, like a swap).
 * The cell sequences are one cell per unit step, the last cell held forever; for
 * orientation-split plans the cells of the states, so waiting or turning in a cell occupies it.
 */
import type { Grid } from '../grid/grid';
import { xyOf } from './grid-cells';
import { pair, showCell, type RankedViolation } from './plan-check';

/** The cell of a sequence at time t (its last cell after its end). */
function cellAt(cells: readonly number[], t: number): number {
  return cells[Math.min(t, cells.length - 1)];
}

/** The first following violation between any two agents (earliest t, then lowest agent pair), or undefined. */
export function firstFollowingViolation(grid: Grid, seqs: readonly (readonly number[])[]): RankedViolation | undefined {
  const agents = seqs.map((s, i) => ({ s, i })).filter(({ s }) => s.length > 0);
  const horizon = agents.reduce((m, { s }) => Math.max(m, s.length - 1), 0);
  for (let t = 0; t < horizon; t++) {
    const occupant = new Map<number, number[]>();
    for (const { s, i } of agents) {
      const c = cellAt(s, t);
      const list = occupant.get(c);
      if (list) list.push(i);
      else occupant.set(c, [i]);
    }
    let best: { follower: number; leader: number; cell: number } | undefined;
    let bestPair: readonly [number, number] | undefined;
    for (const { s, i } of agents) {
      const from = cellAt(s, t);
      const to = cellAt(s, t + 1);
      if (from === to) continue;
      for (const j of occupant.get(to) ?? []) {
        if (j === i) continue;
        const leaderNext = cellAt(seqs[j], t + 1);
        // Still there: a vertex (or goal) conflict at t + 1; back into i's cell: a swap.
        if (leaderNext === to || leaderNext === from) continue;
        const p = pair(i, j);
        if (!bestPair || p[0] < bestPair[0] || (p[0] === bestPair[0] && p[1] < bestPair[1])) {
          bestPair = p;
          best = { follower: i, leader: j, cell: to };
        }
      }
    }
    if (best && bestPair) {
      const xy = xyOf(grid, best.cell);
      return {
        phase: 1,
        violation: {
          kind: 'following',
          agents: bestPair,
          time: t,
          cell: xy,
          message: `agent ${best.follower} enters ${showCell(xy)} at t = ${t + 1}, which agent ${best.leader} occupies at t = ${t} (following is forbidden)`,
        },
      };
    }
  }
  return undefined;
}
