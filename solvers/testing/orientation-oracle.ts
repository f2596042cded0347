/**
 * Exhaustive optimal-SOC oracle for the orientation-split model on tiny instances: per agent
 * a state (cell, heading), each unit step a forward move, a quarter turn or a wait; conflicts
 * on cells only (vertex, swap, goal); cost = arrival step of the final arrival at the goal
 * cell, any heading. Cost accounting as in classic-oracle.ts (a per-agent `done` flag, a step
 * costing 1 per agent not done). A 'free' start heading becomes one start state per heading
 * choice, all at cost 0. Heuristic: the sum of BFS cell distances of the agents not done
 * (turns ignored), which is consistent, so A* is exact.
 */
import type { Heading, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import type { OrientedState } from '../validate/orientation-split';
import { cheapestPath, type StateSpace } from './best-first';
import { CLOCKWISE, ahead, distancesTo } from './grid-moves';
import { DEFAULT_MAX_EXPANSIONS, type OracleOptions, type OracleOutcome } from './oracle-outcome';

interface Joint {
  readonly at: readonly number[];
  readonly facing: readonly Heading[];
  readonly done: readonly boolean[];
}

/** The optimal orientation-split SOC of a tiny instance, with an optimal plan (state sequences end on the final arrival). */
export function orientationOracle(
  instance: MapfInstance,
  startHeading: StartHeading,
  options: OracleOptions = {},
): OracleOutcome<OrientedState[][]> {
  const { grid, agents } = instance;
  const n = agents.length;
  const dist = agents.map((a) => distancesTo(grid, a.goal));
  const turn = (h: Heading, by: number): Heading => CLOCKWISE[(CLOCKWISE.indexOf(h) + by + 4) % 4];

  /** The states one step from (cell, heading): wait, left, right, forward if the cell ahead is free. */
  const options1 = (cell: number, h: Heading): [number, Heading][] => {
    const out: [number, Heading][] = [
      [cell, h],
      [cell, turn(h, -1)],
      [cell, turn(h, 1)],
    ];
    const f = ahead(grid, cell, h);
    if (f >= 0) out.push([f, h]);
    return out;
  };

  const withCommits = (j: Joint): Joint[] => {
    let out: Joint[] = [j];
    for (let i = 0; i < n; i++) {
      if (j.done[i] || j.at[i] !== agents[i].goal) continue;
      out = out.flatMap((s) => [s, { ...s, done: s.done.map((d, x) => (x === i ? true : d)) }]);
    }
    return out;
  };

  let starts: Joint[] = [{ at: agents.map((a) => a.start), facing: [], done: agents.map(() => false) }];
  agents.forEach((a) => {
    const rule = a.startHeading ?? startHeading;
    const choices: readonly Heading[] = rule === 'free' ? CLOCKWISE : [rule];
    starts = starts.flatMap((s) => choices.map((h) => ({ ...s, facing: [...s.facing, h] })));
  });

  const space: StateSpace<Joint> = {
    starts: starts.flatMap(withCommits),
    key: (s) => `${s.at.join(',')}|${s.facing.join('')}|${s.done.map((d) => (d ? 1 : 0)).join('')}`,
    heuristic: (s) => s.at.reduce((h, c, i) => (s.done[i] ? h : h + dist[i][c]), 0),
    isGoal: (s) => s.done.every((d) => d),
    *successors(s) {
      const stepCost = s.done.filter((d) => !d).length;
      const at = new Array<number>(n);
      const facing = new Array<Heading>(n);
      function* assign(i: number): Generator<Joint> {
        if (i === n) {
          yield { at: at.slice(), facing: facing.slice(), done: s.done };
          return;
        }
        const choices: [number, Heading][] = s.done[i] ? [[s.at[i], s.facing[i]]] : options1(s.at[i], s.facing[i]);
        for (const [c, h] of choices) {
          let clash = false;
          for (let j = 0; j < i && !clash; j++) {
            clash = at[j] === c || (c !== s.at[i] && at[j] === s.at[i] && c === s.at[j]);
          }
          if (clash) continue;
          at[i] = c;
          facing[i] = h;
          yield* assign(i + 1);
        }
      }
      for (const j of assign(0)) for (const c of withCommits(j)) yield [c, stepCost] as const;
    },
  };

  const found = cheapestPath(space, options.maxExpansions ?? DEFAULT_MAX_EXPANSIONS);
  if (found.kind === 'exhausted') return { kind: 'unsolvable', expanded: found.expanded };
  const plan = agents.map((_, i) => {
    const seq: OrientedState[] = [];
    for (const s of found.states) {
      seq.push({ cell: s.at[i], heading: s.facing[i] });
      if (s.done[i]) break;
    }
    return seq;
  });
  return { kind: 'solved', soc: found.cost, plan, expanded: found.expanded };
}
