/**
 * The classic conflict rules on per-agent cell sequences (one cell per unit step, the last
 * cell held forever): vertex (two agents in one cell at one t), swap (two agents exchange
 * cells between t and t + 1) and goal (an agent that has stayed at its goal since its arrival
 * is hit by another agent entering that cell later). Following (entering a cell at t + 1
 * that another agent leaves at t + 1) is allowed. Used by the classic and orientation-split
 * validators; written for clarity, O(agents × makespan) with hash maps.
 */
import type { Grid } from '../grid/grid';
import { arrivalStep, xyOf } from './grid-cells';
import { pair, showCell, type RankedViolation } from './plan-check';

/** The cell of agent `a` at time t: its sequence padded with its last cell. */
function at(cells: readonly number[], t: number): number {
  return cells[Math.min(t, cells.length - 1)];
}

/**
 * The first vertex, goal or swap conflict between any two agents, or undefined.
 * `goals[i]` is agent i's goal (to tell a goal conflict from a vertex conflict).
 */
export function firstCellConflict(
  grid: Grid,
  seqs: readonly (readonly number[])[],
  goals: readonly number[],
): RankedViolation | undefined {
  const live = seqs.map((s, i) => ({ s, i })).filter(({ s }) => s.length > 0);
  const horizon = live.reduce((m, { s }) => Math.max(m, s.length - 1), 0);
  const arrival = seqs.map((s, i) => arrivalStep(s, goals[i]));
  for (let t = 0; t <= horizon; t++) {
    const vertex = firstVertex(grid, live, t, goals, arrival);
    if (vertex) return vertex;
    if (t < horizon) {
      const swap = firstSwap(grid, live, t);
      if (swap) return swap;
    }
  }
  return undefined;
}

function firstVertex(
  grid: Grid,
  live: readonly { s: readonly number[]; i: number }[],
  t: number,
  goals: readonly number[],
  arrival: readonly number[],
): RankedViolation | undefined {
  const byCell = new Map<number, number[]>();
  for (const { s, i } of live) {
    const c = at(s, t);
    const list = byCell.get(c);
    if (list) list.push(i);
    else byCell.set(c, [i]);
  }
  let best: readonly [number, number] | undefined;
  let bestCell = 0;
  for (const [c, agents] of byCell) {
    if (agents.length < 2) continue;
    // Agents were pushed in ascending order, so the group's smallest pair is its first two.
    const p = pair(agents[0], agents[1]);
    if (!best || p[0] < best[0] || (p[0] === best[0] && p[1] < best[1])) {
      best = p;
      bestCell = c;
    }
  }
  if (!best) return undefined;
  const [a, b] = best;
  const xy = xyOf(grid, bestCell);
  // A goal conflict: one of the two has been sitting at its goal since before t.
  // (Both at the cell at t; one whose arrival is before t has stayed there ever since.)
  const resting = [a, b].find((i) => goals[i] === bestCell && arrival[i] < t);
  if (resting !== undefined) {
    const other = resting === a ? b : a;
    return {
      phase: 0,
      violation: {
        kind: 'goal',
        agents: best,
        time: t,
        cell: xy,
        message: `agent ${other} enters ${showCell(xy)} at t = ${t}, where agent ${resting} has stayed at its goal since t = ${arrival[resting]}`,
      },
    };
  }
  return {
    phase: 0,
    violation: { kind: 'vertex', agents: best, time: t, cell: xy, message: `agents ${a} and ${b} both at ${showCell(xy)} at t = ${t}` },
  };
}

function firstSwap(
  grid: Grid,
  live: readonly { s: readonly number[]; i: number }[],
  t: number,
): RankedViolation | undefined {
  const moves = new Map<string, number>();
  for (const { s, i } of live) {
    const from = at(s, t);
    const to = at(s, t + 1);
    if (from !== to) moves.set(`${from}>${to}`, i);
  }
  let best: readonly [number, number] | undefined;
  let bestFrom = 0;
  let bestTo = 0;
  for (const { s, i } of live) {
    const from = at(s, t);
    const to = at(s, t + 1);
    if (from === to) continue;
    const j = moves.get(`${to}>${from}`);
    if (j === undefined || j === i) continue;
    const p = pair(i, j);
    if (!best || p[0] < best[0] || (p[0] === best[0] && p[1] < best[1])) {
      best = p;
      // Report the cell the lower-numbered agent leaves.
      bestFrom = i === p[0] ? from : to;
      bestTo = i === p[0] ? to : from;
    }
  }
  if (!best) return undefined;
  const a = xyOf(grid, bestFrom);
  const b = xyOf(grid, bestTo);
  return {
    phase: 1,
    violation: {
      kind: 'swap',
      agents: best,
      time: t,
      cell: a,
      message: `agents ${best[0]} and ${best[1]} swap ${showCell(a)} and ${showCell(b)} between t = ${t} and t = ${t + 1}`,
    },
  };
}
