/**
 * An outside reference for the k-robust optimum: the instance with a time horizon T encoded as
 * Boolean satisfiability and minimised by a general-purpose SAT solver, logic-solver 2.0.1
 * (MiniSat compiled to JavaScript; `Solver#minimizeWeightedSum`). Test-only, tiny instances only.
 *
 * The model's definition (Atzmon et al., "Robust multi-agent path finding and executing", JAIR
 * 2020): paths as in the classic model, and two agents may not occupy one cell at times t1, t2
 * with |t1 − t2| ≤ k; k = 0 is the classic rule set, swaps included (for k ≥ 1 a swap is such a
 * pair of occupancies, so no separate rule is needed).
 * Variables x(a, t, v): agent a is at cell v at time t, t = 0 … T. Constraints: one cell per
 * agent and time; start at 0 and goal at T; each step a wait or a move to a 4-neighbour; no two
 * agents in one cell at times at most k apart (both within 0 … T); for k = 0 no swaps. After T
 * everyone rests at its goal, and any occupancy window reaching past T already shows at T (the
 * resting agent is at its goal at T too, no farther from the other occupancy), so 0 … T suffices.
 * Cost of a: the number of t < T at which it is not yet "at its goal from t to T".
 * The minimum over plans of makespan ≤ T is ≥ the true optimum, and equal to it once T is at
 * least the makespan of some optimal plan. Written apart from classic-sat-reference.ts and from
 * the solver and validator code (only the grid neighbours are shared).
 */
import Logic from 'logic-solver';
import type { MapfInstance } from '../instance';
import { neighbours } from './grid-moves';

/** The SAT minimum: its SOC and the plan the solver chose (per agent one cell per step, 0 … horizon). */
export interface SatKRobustMinimum {
  readonly soc: number;
  readonly plan: number[][];
}

/** The minimal SOC among k-robust plans of makespan ≤ horizon, with such a plan; undefined if there is none. */
export function satMinimumKRobust(instance: MapfInstance, k: number, horizon: number): SatKRobustMinimum | undefined {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be a non-negative integer, got ${k}`);
  const { grid, agents } = instance;
  const cells = [...grid.passable.keys()].filter((c) => grid.passable[c] === 1);
  const x = (a: number, t: number, v: number): string => `x${a}_${t}_${v}`;
  const solver = new Logic.Solver();
  agents.forEach((task, a) => {
    for (let t = 0; t <= horizon; t++) solver.require(Logic.exactlyOne(...cells.map((v) => x(a, t, v))));
    solver.require(x(a, 0, task.start));
    solver.require(x(a, horizon, task.goal));
    for (let t = 0; t < horizon; t++) {
      for (const v of cells) {
        solver.require(Logic.implies(x(a, t, v), Logic.or(x(a, t + 1, v), ...neighbours(grid, v).map((u) => x(a, t + 1, u)))));
      }
    }
  });
  // The k-robust rule: for every pair of agents, cell and pair of times at most k apart.
  for (let a = 0; a < agents.length; a++) {
    for (let b = a + 1; b < agents.length; b++) {
      for (const v of cells) {
        for (let t1 = 0; t1 <= horizon; t1++) {
          for (let t2 = Math.max(0, t1 - k); t2 <= Math.min(horizon, t1 + k); t2++) {
            solver.forbid(Logic.and(x(a, t1, v), x(b, t2, v)));
          }
        }
      }
    }
  }
  if (k === 0) {
    for (let t = 0; t < horizon; t++) {
      for (const u of cells) {
        for (const v of neighbours(grid, u)) {
          for (let a = 0; a < agents.length; a++) {
            for (let b = 0; b < agents.length; b++) {
              if (a !== b) solver.forbid(Logic.and(x(a, t, u), x(a, t + 1, v), x(b, t, v), x(b, t + 1, u)));
            }
          }
        }
      }
    }
  }
  const terms: unknown[] = [];
  agents.forEach((task, a) => {
    for (let t = 0; t < horizon; t++) {
      const restingFromT = Array.from({ length: horizon - t + 1 }, (_, d) => x(a, t + d, task.goal));
      terms.push(Logic.not(Logic.and(...restingFromT)));
    }
  });
  const first = solver.solve();
  if (!first) return undefined;
  const best = solver.minimizeWeightedSum(first, terms, 1);
  const plan = agents.map((_, a) =>
    Array.from({ length: horizon + 1 }, (_, t) => cells.find((v) => best.evaluate(x(a, t, v)) === true) as number));
  return { soc: best.getWeightedSum(terms, 1) as number, plan };
}
