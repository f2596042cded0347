/**
 * Exhaustive optimal-SOC oracle for the classic model on tiny instances (a handful of agents
 * on grids of a few dozen cells). It searches the joint configuration space with A*, and
 * shares no code with the CBS engine, so a CBS bug shows up as a mismatch.
 *
 * Why a joint state of positions alone is not enough: an agent's cost is its LAST arrival at
 * its goal, and an agent may have to leave its goal to let another pass and come back. If the
 * search treated "at goal" as "finished", it would undercount such agents (or miss plans).
 * So each agent carries a flag `done`: the promise "I stay at my goal forever from now on".
 * - A step costs 1 for every agent that is not done (its clock is still running), 0 for done ones.
 * - After a step (and at t = 0) every agent standing at its goal may become done, or not;
 *   both branches are searched. A done agent never moves again, and still occupies its goal,
 *   so later agents entering it are goal conflicts, rejected like any vertex conflict.
 * - The goal state is "all agents done".
 * An agent that becomes done at time t has paid exactly t, which is the time of its last
 * arrival at its goal in that plan (it is at its goal from t on and never leaves); a plan in
 * which it waits at the goal before committing is dominated by committing on arrival, which
 * is also searched. Hence min total cost = min SOC over all valid plans. The state space
 * (positions × flags) is finite and the step cost depends only on the state, so exhausting
 * it proves there is no plan. Heuristic: the sum over agents not done of the BFS distance to
 * the goal; each step lowers every term by at most 1 while costing 1 per such agent, so it is
 * consistent and the first goal state A* takes off its queue is optimal.
 */
import type { MapfInstance } from '../instance';
import { cheapestPath, type StateSpace } from './best-first';
import { distancesTo, neighbours } from './grid-moves';
import { DEFAULT_MAX_EXPANSIONS, type OracleOptions, type OracleOutcome } from './oracle-outcome';

interface Joint {
  readonly at: readonly number[];
  readonly done: readonly boolean[];
}

/** The optimal classic SOC of a tiny instance, with an optimal plan (paths end on the final arrival). */
export function classicOracle(instance: MapfInstance, options: OracleOptions = {}): OracleOutcome<number[][]> {
  const { grid, agents } = instance;
  const n = agents.length;
  const dist = agents.map((a) => distancesTo(grid, a.goal));
  const moves = (cell: number): number[] => [cell, ...neighbours(grid, cell)];

  /** Every subset of the agents at their goal (and not done yet) may commit now. */
  const withCommits = (at: readonly number[], done: readonly boolean[]): Joint[] => {
    let out: Joint[] = [{ at, done }];
    for (let i = 0; i < n; i++) {
      if (done[i] || at[i] !== agents[i].goal) continue;
      out = out.flatMap((j) => [j, { at: j.at, done: j.done.map((d, k) => (k === i ? true : d)) }]);
    }
    return out;
  };

  const space: StateSpace<Joint> = {
    starts: withCommits(
      agents.map((a) => a.start),
      agents.map(() => false),
    ),
    key: (s) => `${s.at.join(',')}|${s.done.map((d) => (d ? 1 : 0)).join('')}`,
    heuristic: (s) => s.at.reduce((h, c, i) => (s.done[i] ? h : h + dist[i][c]), 0),
    isGoal: (s) => s.done.every((d) => d),
    *successors(s) {
      const stepCost = s.done.filter((d) => !d).length;
      const next = new Array<number>(n);
      // Assign agents one by one, rejecting a partial assignment as soon as it conflicts.
      function* assign(i: number): Generator<number[]> {
        if (i === n) {
          yield next.slice();
          return;
        }
        for (const c of s.done[i] ? [s.at[i]] : moves(s.at[i])) {
          let clash = false;
          for (let j = 0; j < i && !clash; j++) {
            const vertex = next[j] === c;
            const swap = c !== s.at[i] && next[j] === s.at[i] && c === s.at[j];
            clash = vertex || swap;
          }
          if (clash) continue;
          next[i] = c;
          yield* assign(i + 1);
        }
      }
      for (const at of assign(0)) {
        for (const j of withCommits(at, s.done)) yield [j, stepCost] as const;
      }
    },
  };

  const found = cheapestPath(space, options.maxExpansions ?? DEFAULT_MAX_EXPANSIONS);
  if (found.kind === 'exhausted') return { kind: 'unsolvable', expanded: found.expanded };
  // Agent i's path runs up to the first state where it is done.
  const plan = agents.map((_, i) => {
    const path: number[] = [];
    for (const s of found.states) {
      path.push(s.at[i]);
      if (s.done[i]) break;
    }
    return path;
  });
  return { kind: 'solved', soc: found.cost, plan, expanded: found.expanded };
}
