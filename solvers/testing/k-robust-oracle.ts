/**
 * Exhaustive optimal-SOC oracle for k-robust plans (Atzmon et al., JAIR 2020) on tiny
 * instances: two agents may not occupy one cell at times t1, t2 with |t1 − t2| ≤ k.
 *
 * The joint state must remember, per agent, its cells at the last k time steps (t − k + 1 … t),
 * because a move at t + 1 conflicts with any other agent's occupancy in [t + 1 − k, t + 1];
 * times before 0 hold no occupancy (−1). For k = 0 the history is just the current cell and
 * swaps are checked explicitly. Cost accounting is the classic oracle's (see
 * classic-oracle.ts): a per-agent `done` flag ("stays at its goal forever from now on"), a
 * step costing 1 per agent not done, and A* with the sum of BFS distances, which is consistent.
 * The history makes the state space finite and time-independent, so exhaustion proves "no plan".
 * Written separately from the classic oracle so that the two can be checked against each other.
 */
import type { MapfInstance } from '../instance';
import { cheapestPath, type StateSpace } from './best-first';
import { distancesTo, neighbours } from './grid-moves';
import { DEFAULT_MAX_EXPANSIONS, type OracleOptions, type OracleOutcome } from './oracle-outcome';

interface Joint {
  /** Per agent, its cells at times t − m + 1 … t (m = max(k, 1)), oldest first, −1 before time 0. */
  readonly hist: readonly (readonly number[])[];
  readonly done: readonly boolean[];
}

/** The optimal k-robust SOC of a tiny instance, with an optimal plan (paths end on the final arrival). */
export function kRobustOracle(instance: MapfInstance, k: number, options: OracleOptions = {}): OracleOutcome<number[][]> {
  if (!Number.isInteger(k) || k < 0) throw new RangeError(`k must be a non-negative integer, got ${k}`);
  const { grid, agents } = instance;
  const n = agents.length;
  const m = Math.max(k, 1);
  const dist = agents.map((a) => distancesTo(grid, a.goal));
  const now = (h: readonly number[]): number => h[h.length - 1];

  const withCommits = (hist: readonly (readonly number[])[], done: readonly boolean[]): Joint[] => {
    let out: Joint[] = [{ hist, done }];
    for (let i = 0; i < n; i++) {
      if (done[i] || now(hist[i]) !== agents[i].goal) continue;
      out = out.flatMap((j) => [j, { hist: j.hist, done: j.done.map((d, x) => (x === i ? true : d)) }]);
    }
    return out;
  };

  /** Whether agent i moving to c at t + 1 conflicts with agent j (history hj, moving to cj). */
  const clashes = (c: number, hi: readonly number[], cj: number, hj: readonly number[]): boolean => {
    if (c === cj) return true;
    if (k === 0) return c !== now(hi) && c === now(hj) && cj === now(hi);
    // The other's cells at t − k + 1 … t are within k of t + 1 (and its new cell is at t + 1).
    return hj.includes(c) || hi.includes(cj);
  };

  const space: StateSpace<Joint> = {
    starts: withCommits(
      agents.map((a) => [...new Array<number>(m - 1).fill(-1), a.start]),
      agents.map(() => false),
    ),
    key: (s) => `${s.hist.map((h) => h.join(',')).join(';')}|${s.done.map((d) => (d ? 1 : 0)).join('')}`,
    heuristic: (s) => s.hist.reduce((h, hi, i) => (s.done[i] ? h : h + dist[i][now(hi)]), 0),
    isGoal: (s) => s.done.every((d) => d),
    *successors(s) {
      const stepCost = s.done.filter((d) => !d).length;
      const next = new Array<number>(n);
      function* assign(i: number): Generator<number[]> {
        if (i === n) {
          yield next.slice();
          return;
        }
        const here = now(s.hist[i]);
        for (const c of s.done[i] ? [here] : [here, ...neighbours(grid, here)]) {
          let clash = false;
          for (let j = 0; j < i && !clash; j++) clash = clashes(c, s.hist[i], next[j], s.hist[j]);
          if (clash) continue;
          next[i] = c;
          yield* assign(i + 1);
        }
      }
      for (const cells of assign(0)) {
        const hist = s.hist.map((h, i) => [...h.slice(1), cells[i]]);
        for (const j of withCommits(hist, s.done)) yield [j, stepCost] as const;
      }
    },
  };

  const found = cheapestPath(space, options.maxExpansions ?? DEFAULT_MAX_EXPANSIONS);
  if (found.kind === 'exhausted') return { kind: 'unsolvable', expanded: found.expanded };
  const plan = agents.map((_, i) => {
    const path: number[] = [];
    for (const s of found.states) {
      path.push(now(s.hist[i]));
      if (s.done[i]) break;
    }
    return path;
  });
  return { kind: 'solved', soc: found.cost, plan, expanded: found.expanded };
}
