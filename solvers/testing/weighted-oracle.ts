/**
 * Exhaustive optimal-SOC oracle for the weighted-split model on tiny instances: continuous
 * time, forward = profile.forwardMs, quarter turn = profile.quarterTurnMs, waits of any
 * length, the occupancy rule of the schedule validator (a forward move holds both cells for
 * its whole duration; half-open intervals), cost = end of the last forward into the goal.
 *
 * Why a time grid of step g = gcd(forwardMs, quarterTurnMs) is exact. Take any valid plan
 * and fix its discrete choices: each agent's sequence of forward/turn actions (waits only fill
 * gaps) and, for every cell, the order in which agents' occupancies of it follow each other
 * (half-open intervals that do not overlap are totally ordered). The start times s of the
 * non-wait actions must then satisfy only difference constraints s_y − s_x ≥ c: an agent's
 * next action starts no earlier than the previous one ends (c = its duration), the first
 * starts at ≥ 0, and an agent entering a cell starts its forward move no earlier than the end
 * of the previous occupant's forward move out of it (c = forwardMs, or the occupant's own
 * chain). Every constant is 0 or a sum of durations, so a multiple of g. Such a system's
 * feasible set is closed under componentwise minimum, so it has a least solution, given by
 * longest paths from the time-0 node in the constraint graph: sums of constants, hence
 * multiples of g. The least solution is feasible (the given plan shows there is no positive
 * cycle), keeps every ordering and every action, has each start no later than in the given
 * plan — so each arrival time (a start + forwardMs) is no later and the SOC no larger — and
 * its gaps are multiples of g, i.e. waits of whole units. So some optimal plan lives on the
 * grid, and a joint search on ticks of g with waits of one tick finds the optimum exactly.
 *
 * The search itself: per agent (cell, heading, action in progress with ticks left), plus the
 * `done` flag of classic-oracle.ts (an agent idle at its goal may commit to stay forever).
 * Each tick costs g ms per agent not done; two agents may not share a cell during a tick
 * (every occupancy interval is a union of whole ticks, so this is exactly the overlap rule).
 * Heuristic: per agent not done, the ticks left of its action plus forwardMs/g times the BFS
 * distance (from the cell it is moving to), which never falls by more than 1 per tick: consistent.
 */
import type { CellXY, Heading, RobotProfile, Schedule, ScheduledAction, StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { cheapestPath, type StateSpace } from './best-first';
import { CLOCKWISE, ahead, distancesTo } from './grid-moves';
import { DEFAULT_MAX_EXPANSIONS, type OracleOptions, type OracleOutcome } from './oracle-outcome';

type Busy = { readonly kind: 'forward' | 'turn-left' | 'turn-right' | 'wait'; readonly to: number; readonly heading: Heading; readonly left: number };

interface Agent {
  readonly cell: number;
  readonly heading: Heading;
  /** The action under way (with whole ticks left), or null when idle at a tick boundary. */
  readonly busy: Busy | null;
  readonly done: boolean;
}

/** Options of the weighted oracle. */
export interface WeightedOracleOptions extends OracleOptions {
  /**
   * The time grid in ms; default gcd(forwardMs, quarterTurnMs), which is exact (see above).
   * A finer divisor searches a superset of plans (slower); tests use it to check the argument.
   */
  readonly tickMs?: number;
}

/** The greatest common divisor of two positive integers. */
export function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** The optimal weighted-split SOC (ms) of a tiny instance, with an optimal schedule. */
export function weightedOracle(
  instance: MapfInstance,
  profile: RobotProfile,
  startHeading: StartHeading,
  options: WeightedOracleOptions = {},
): OracleOutcome<Schedule> {
  const { grid, agents } = instance;
  const n = agents.length;
  const g = options.tickMs ?? gcd(profile.forwardMs, profile.quarterTurnMs);
  if (!Number.isInteger(g) || g <= 0 || profile.forwardMs % g !== 0 || profile.quarterTurnMs % g !== 0) {
    throw new RangeError(`tick ${g} ms must be a positive integer dividing forwardMs and quarterTurnMs`);
  }
  const F = profile.forwardMs / g;
  const Q = profile.quarterTurnMs / g;
  const dist = agents.map((a) => distancesTo(grid, a.goal));
  const turn = (h: Heading, by: number): Heading => CLOCKWISE[(CLOCKWISE.indexOf(h) + by + 4) % 4];

  /** One tick of an agent that is under way: its new state. */
  const tick = (a: Agent, b: Busy): Agent =>
    b.left > 1 ? { ...a, busy: { ...b, left: b.left - 1 } } : { cell: b.to, heading: b.heading, busy: null, done: false };

  /** The actions an idle agent may start now. */
  const choices = (a: Agent): Busy[] => {
    const out: Busy[] = [
      { kind: 'wait', to: a.cell, heading: a.heading, left: 1 },
      { kind: 'turn-left', to: a.cell, heading: turn(a.heading, -1), left: Q },
      { kind: 'turn-right', to: a.cell, heading: turn(a.heading, 1), left: Q },
    ];
    const f = ahead(grid, a.cell, a.heading);
    if (f >= 0) out.push({ kind: 'forward', to: f, heading: a.heading, left: F });
    return out;
  };

  const withCommits = (joint: readonly Agent[]): Agent[][] => {
    let out: Agent[][] = [joint.slice()];
    joint.forEach((a, i) => {
      if (a.done || a.busy || a.cell !== agents[i].goal) return;
      out = out.flatMap((j) => [j, j.map((x, k) => (k === i ? { ...x, done: true } : x))]);
    });
    return out;
  };

  let starts: Agent[][] = [[]];
  agents.forEach((task) => {
    const rule = task.startHeading ?? startHeading;
    const hs: readonly Heading[] = rule === 'free' ? CLOCKWISE : [rule];
    starts = starts.flatMap((s) => hs.map((h) => [...s, { cell: task.start, heading: h, busy: null, done: false }]));
  });

  const space: StateSpace<readonly Agent[]> = {
    starts: starts.flatMap(withCommits),
    key: (s) => s.map((a) => (a.done ? `${a.cell}!` : `${a.cell}${a.heading}${a.busy ? `:${a.busy.kind}>${a.busy.to}${a.busy.heading}:${a.busy.left}` : ''}`)).join(','),
    heuristic: (s) =>
      s.reduce((h, a, i) => (a.done ? h : h + (a.busy ? a.busy.left + F * dist[i][a.busy.to] : F * dist[i][a.cell])), 0),
    isGoal: (s) => s.every((a) => a.done),
    *successors(s) {
      const cost = s.filter((a) => !a.done).length;
      const plans: Busy[] = new Array(n);
      const held: number[][] = new Array(n);
      function* assign(i: number): Generator<Agent[]> {
        if (i === n) {
          yield s.map((a, k) => (a.done ? a : tick(a, plans[k])));
          return;
        }
        const a = s[i];
        const options: (Busy | null)[] = a.done ? [null] : a.busy ? [a.busy] : choices(a);
        for (const b of options) {
          // Cells held during this tick: the agent's cell, and the target of a forward move.
          const cells = b && b.kind === 'forward' ? [a.cell, b.to] : [a.cell];
          let clash = false;
          for (let j = 0; j < i && !clash; j++) clash = held[j].some((c) => cells.includes(c));
          if (clash) continue;
          plans[i] = b!;
          held[i] = cells;
          yield* assign(i + 1);
        }
      }
      for (const next of assign(0)) for (const c of withCommits(next)) yield [c, cost * g] as const;
    },
  };

  const found = cheapestPath(space, options.maxExpansions ?? DEFAULT_MAX_EXPANSIONS);
  if (found.kind === 'exhausted') return { kind: 'unsolvable', expanded: found.expanded };
  return { kind: 'solved', soc: found.cost, plan: toSchedule(instance, found.states, g), expanded: found.expanded };
}

/** Rebuilds each agent's timed actions from the sequence of joint states (one per tick), merging waits. */
function toSchedule(instance: MapfInstance, states: readonly (readonly Agent[])[], g: number): Schedule {
  const xy = (c: number): CellXY => [c % instance.grid.width, Math.floor(c / instance.grid.width)];
  return instance.agents.map((_, i) => {
    const acts: ScheduledAction[] = [];
    for (let t = 0; t + 1 < states.length; t++) {
      const a = states[t][i];
      if (a.done) break;
      if (a.busy) continue;
      // Idle at tick t: the action it started is the next state's busy one, or, for a
      // one-tick action, the difference between the two states.
      const b = states[t + 1][i];
      let kind: ScheduledAction['action'];
      let to: number;
      let heading: Heading;
      let ticks: number;
      if (b.busy) {
        kind = b.busy.kind;
        to = b.busy.to;
        heading = b.busy.heading;
        ticks = b.busy.left + 1;
      } else {
        to = b.cell;
        heading = b.heading;
        ticks = 1;
        kind = b.cell !== a.cell ? 'forward' : b.heading === a.heading ? 'wait' : CLOCKWISE[(CLOCKWISE.indexOf(a.heading) + 1) % 4] === b.heading ? 'turn-right' : 'turn-left';
      }
      const start = t * g;
      const end = (t + ticks) * g;
      const prev = acts[acts.length - 1];
      if (kind === 'wait' && prev?.action === 'wait') {
        acts[acts.length - 1] = { ...prev, end };
      } else {
        acts.push({ action: kind, from: xy(a.cell), to: xy(to), heading, start, end, step: acts.length });
      }
    }
    return acts;
  });
}
