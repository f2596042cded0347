/**
 * Independent validator of k-robust plans.
 *
 * Paths as in the classic model (per agent one cell per unit step, `path[0]` the start, the
 * last entry the goal, held forever; cost = time of the last arrival at the goal). A k-robust
 * plan (Atzmon et al., "Robust multi-agent path finding and executing", JAIR 2020; SoCS 2018)
 * additionally has a conflict when two agents occupy the same cell at times t1, t2 with
 * |t1 − t2| ≤ k, so that any agent may run up to k steps late without a collision. k = 0 is
 * exactly classic, swaps included; for k ≥ 1 a swap or a following move is such a conflict.
 *
 * A conflict is reported at the time the second occupancy happens (max(t1, t2)); as 'vertex'
 * (or 'goal' when one agent is resting at its goal) if t1 = t2, else as 'k-robust'.
 */
import type { MapfInstance } from '../instance';
import { firstCellConflict } from './cell-conflicts';
import { arrivalStep, xyOf } from './grid-cells';
import { agentCountViolation, firstPathRuleViolation } from './path-rules';
import { firstOf, pair, showCell, verdict, type PlanCheck, type RankedViolation } from './plan-check';

/** Checks a k-robust plan (k a non-negative integer); reports the first violation and recomputes SOC and makespan (steps). */
export function validateKRobustPlan(instance: MapfInstance, paths: readonly (readonly number[])[], k: number): PlanCheck {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be a non-negative integer, got ${k}`);
  const goals = instance.agents.map((a) => a.goal);
  const costs = paths.map((p, i) => (i < goals.length ? arrivalStep(p, goals[i]) : Math.max(0, p.length - 1)));
  const count = agentCountViolation(instance.agents.length, paths.length);
  if (count) return verdict(count, costs);
  const candidates: (RankedViolation | undefined)[] = paths.map((p, i) => firstPathRuleViolation(instance, i, p));
  // k = 0 is exactly the classic rule set; the classic scan also names swaps.
  candidates.push(k === 0 ? firstCellConflict(instance.grid, paths, goals) : firstWindowConflict(instance, paths, goals, costs, k));
  return verdict(firstOf(candidates), costs);
}

/** The first pair of occupancies of one cell by two agents at most k steps apart (k ≥ 1). */
function firstWindowConflict(
  instance: MapfInstance,
  paths: readonly (readonly number[])[],
  goals: readonly number[],
  arrival: readonly number[],
  k: number,
): RankedViolation | undefined {
  const live = paths.map((p, i) => ({ p, i })).filter(({ p }) => p.length > 0);
  // After the longest path everyone stands still, so any conflict shows by then (a resting
  // agent is at its goal at the horizon too, at most as far from the other occupancy).
  const horizon = live.reduce((m, { p }) => Math.max(m, p.length - 1), 0);
  const at = (p: readonly number[], t: number): number => p[Math.min(t, p.length - 1)];
  // lastSeen.get(cell).get(agent) = the latest time ≤ t the agent was in the cell.
  const lastSeen = new Map<number, Map<number, number>>();
  for (let t = 0; t <= horizon; t++) {
    for (const { p, i } of live) {
      const c = at(p, t);
      let m = lastSeen.get(c);
      if (!m) lastSeen.set(c, (m = new Map()));
      m.set(i, t);
    }
    let best: { a: number; b: number; cell: number; earlier: number; first: number } | undefined;
    for (const { p, i } of live) {
      const c = at(p, t);
      for (const [j, tj] of lastSeen.get(c)!) {
        if (j === i || tj < t - k) continue;
        // Agent i is in c now; j was there at tj (tj = t: both now). Keep the lowest pair.
        const [a, b] = pair(i, j);
        if (!best || a < best.a || (a === best.a && b < best.b)) {
          best = { a, b, cell: c, earlier: tj, first: j };
        } else if (a === best.a && b === best.b && tj === t) {
          best = { a, b, cell: c, earlier: tj, first: j };
        }
      }
    }
    if (best) return describe(instance, best, t, goals, arrival, k);
  }
  return undefined;
}

function describe(
  instance: MapfInstance,
  c: { a: number; b: number; cell: number; earlier: number; first: number },
  t: number,
  goals: readonly number[],
  arrival: readonly number[],
  k: number,
): RankedViolation {
  const xy = xyOf(instance.grid, c.cell);
  const agents = [c.a, c.b] as const;
  if (c.earlier === t) {
    const resting = agents.find((i) => goals[i] === c.cell && arrival[i] < t);
    if (resting !== undefined) {
      const other = resting === c.a ? c.b : c.a;
      return {
        phase: 0,
        violation: {
          kind: 'goal',
          agents,
          time: t,
          cell: xy,
          message: `agent ${other} enters ${showCell(xy)} at t = ${t}, where agent ${resting} has stayed at its goal since t = ${arrival[resting]}`,
        },
      };
    }
    return { phase: 0, violation: { kind: 'vertex', agents, time: t, cell: xy, message: `agents ${c.a} and ${c.b} both at ${showCell(xy)} at t = ${t}` } };
  }
  const later = c.first === c.a ? c.b : c.a;
  const gap = t - c.earlier;
  return {
    phase: 0,
    violation: {
      kind: 'k-robust',
      agents,
      time: t,
      cell: xy,
      message: `agent ${later} is at ${showCell(xy)} at t = ${t}, only ${gap} step${gap === 1 ? '' : 's'} after agent ${c.first} was there at t = ${c.earlier} (k = ${k})`,
    },
  };
}
