/**
 * An outside reference for the classic optimum: the MAPF instance with a time horizon T
 * encoded as Boolean satisfiability and minimised with logic-solver 2.0.1 (MiniSat compiled
 * to JavaScript; `Solver#minimizeWeightedSum`). Test-only and tiny instances only.
 * Variables x(a, t, v): agent a is at cell v at time t, t = 0 … T. Constraints: one cell per
 * agent and time; start at 0 and goal at T; each step a wait or a move to a 4-neighbour; no
 * two agents in a cell at one time; no swaps. Beyond T everyone rests, so no other conflict
 * can occur. Cost of a: the number of t < T at which it is not yet "at its goal from t to T".
 * The minimum over plans of makespan ≤ T is ≥ the true optimum, and equal to it once T is at
 * least the makespan of some optimal plan.
 */
import Logic from 'logic-solver';
import type { MapfInstance } from '../instance';
import { neighbours } from './grid-moves';

/** The minimal SOC among classic plans of makespan ≤ horizon, or undefined if there is none. */
export function satMinimumSoc(instance: MapfInstance, horizon: number): number | undefined {
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
  for (let t = 0; t <= horizon; t++) {
    for (const v of cells) solver.require(Logic.atMostOne(...agents.map((_, a) => x(a, t, v))));
  }
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
  const terms: unknown[] = [];
  agents.forEach((task, a) => {
    for (let t = 0; t < horizon; t++) {
      const restingFromT = Array.from({ length: horizon - t + 1 }, (_, k) => x(a, t + k, task.goal));
      terms.push(Logic.not(Logic.and(...restingFromT)));
    }
  });
  const first = solver.solve();
  if (!first) return undefined;
  const best = solver.minimizeWeightedSum(first, terms, 1);
  return best.getWeightedSum(terms, 1) as number;
}
