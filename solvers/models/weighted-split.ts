/**
 * The weighted-split plan model: state (cell, heading), actions forward, turn left, turn
 * right and wait with their real durations (profile.forwardMs, profile.quarterTurnMs; waits of
 * any positive integer length), minimum sum of arrival times in ms, solved optimally by CBS
 * with time-interval constraints over a SIPP low level (solvers/search/ccbs.ts).
 *
 * Occupancy rule: an agent occupies its cell while turning or waiting, and BOTH cells for the
 * whole of a forward move; before its first action it occupies its start, after its last
 * action its goal cell forever. Intervals are half-open [start, end); a conflict is two agents'
 * occupancy of one cell with overlapping intervals (a.start < b.end && b.start < a.end);
 * touching intervals are fine. Cost of an agent = end time (ms) of its last action that
 * arrives at the goal; SOC = sum of arrival times in ms. Start heading: the instance's when it
 * has one, else the `startHeading` option (one heading for all, or `free` = any heading at
 * time 0 at no cost). Goal heading: any.
 *
 * Schedule: per agent its contiguous timed actions from time 0 (`heading` = heading at the end
 * of the action, `step` = index of the action in the agent's list); an agent whose start is its
 * goal and that is never disturbed has an empty list.
 */
import type { CellXY, RobotProfile, Schedule, ScheduledAction, StartHeading } from '@shared/plan';
import { cellXY } from '../grid/grid';
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import { headingIndex, headingLetter } from '../grid/heading-graph';
import type { MapfInstance } from '../instance';
import { ccbsSearch, type CcbsAgent } from '../search/ccbs';
import type { SippPlan } from '../search/sipp';
import { checkSuboptimality } from '../search/suboptimality';

/** Options of one weighted-split solve. */
export interface WeightedSplitOptions {
  /** Robot timing; forwardMs and quarterTurnMs must be positive integers. */
  readonly profile: RobotProfile;
  /** Start heading of agents whose task has none. */
  readonly startHeading: StartHeading;
  /** Wall-clock budget, measured with `now`. */
  readonly timeLimitMs?: number;
  /** Maximum number of high-level nodes to expand. */
  readonly nodeLimit?: number;
  /** Aborts the solve (status `aborted`). */
  readonly signal?: AbortSignal;
  /** Injected clock in ms (defaults to performance.now). */
  readonly now?: () => number;
  /**
   * Suboptimality factor w ≥ 1 (default 1 = optimal): with w > 1 a bounded search whose plan's
   * SOC is at most w × `lowerBoundMs` (solvers/search/suboptimality.ts).
   */
  readonly suboptimality?: number;
  /** Exact search: disjoint splitting (solvers/search/ccbs-branch.ts); on unless false (for ablation). */
  readonly disjointSplitting?: boolean;
}

/** How a weighted-split solve ended: `timeout` covers both the time and the node limit. */
export type WeightedSplitStatus = 'solved' | 'infeasible' | 'timeout' | 'aborted';

/** Why an instance is infeasible when that is known without search. */
export type InfeasibleReason = 'goal-unreachable' | 'shared-goal' | 'search-exhausted';

/** A weighted-split result; all figures in ms (the model's own unit is ms, so soc = socMs). */
export interface WeightedSplitResult {
  readonly model: 'weighted-split';
  readonly profile: RobotProfile;
  readonly startHeading: StartHeading;
  readonly status: WeightedSplitStatus;
  /** Set when status is `infeasible`. */
  readonly infeasibleReason?: InfeasibleReason;
  /** The plan when solved, otherwise empty. */
  readonly schedule: Schedule;
  /** Sum of arrival times in the model's own unit (ms). */
  readonly soc: number | null;
  /** Latest arrival time in the model's own unit (ms). */
  readonly makespan: number | null;
  /** Turn-inclusive sum of arrival times in ms. */
  readonly socMs: number | null;
  /** Turn-inclusive makespan in ms. */
  readonly makespanMs: number | null;
  /** Proven lower bound on the optimal SOC (= socMs when solved optimally; soc ≤ w × it for a bounded solve). */
  readonly lowerBoundMs: number | null;
  /** Number of quarter turns in the schedule. */
  readonly turns: number | null;
  readonly runtimeMs: number;
  /** High-level (constraint tree) nodes. */
  readonly nodes: { readonly generated: number; readonly expanded: number };
  /** Nodes expanded by all SIPP searches together. */
  readonly lowLevelExpansions: number;
}

/** Solves an instance optimally under the weighted-split model; throws only on invalid input. */
export function solveWeightedSplit(instance: MapfInstance, options: WeightedSplitOptions): WeightedSplitResult {
  const now = options.now ?? (() => performance.now());
  const t0 = now();
  checkInput(instance, options);
  const { grid } = instance;
  const F = options.profile.forwardMs;
  const T = options.profile.quarterTurnMs;
  const base = {
    model: 'weighted-split' as const,
    profile: options.profile,
    startHeading: options.startHeading,
  };
  const empty = { schedule: [], soc: null, makespan: null, socMs: null, makespanMs: null, turns: null };
  const zeroNodes = { generated: 0, expanded: 0 };

  const goals = new Map<number, number>();
  for (const [i, a] of instance.agents.entries()) {
    if (goals.has(a.goal)) {
      return { ...base, ...empty, status: 'infeasible', infeasibleReason: 'shared-goal', lowerBoundMs: null, runtimeMs: now() - t0, nodes: zeroNodes, lowLevelExpansions: 0 };
    }
    goals.set(a.goal, i);
  }
  const cache = new Map<number, Float64Array>();
  const agents: CcbsAgent[] = instance.agents.map((a) => {
    let heuristic = cache.get(a.goal);
    if (!heuristic) {
      heuristic = headingDistancesToGoal(grid, a.goal, { forwardMs: F, quarterTurnMs: T });
      cache.set(a.goal, heuristic);
    }
    const rule = a.startHeading ?? options.startHeading;
    const startHeadings = rule === 'free' ? [0, 1, 2, 3] : [headingIndex(rule)];
    return { start: a.start, goal: a.goal, startHeadings, heuristic };
  });
  if (agents.some((a) => a.startHeadings.every((h) => a.heuristic[a.start * 4 + h] === Infinity))) {
    return { ...base, ...empty, status: 'infeasible', infeasibleReason: 'goal-unreachable', lowerBoundMs: null, runtimeMs: now() - t0, nodes: zeroNodes, lowLevelExpansions: 0 };
  }

  const limit = options.timeLimitMs ?? Infinity;
  let isAborted = false;
  const shouldStop = (): boolean => {
    if (options.signal?.aborted) isAborted = true;
    return isAborted || now() - t0 >= limit;
  };
  const out = ccbsSearch({
    grid,
    agents,
    forwardMs: F,
    quarterTurnMs: T,
    nodeLimit: options.nodeLimit ?? Infinity,
    shouldStop,
    suboptimality: checkSuboptimality(options.suboptimality),
    disjointSplitting: options.disjointSplitting,
  });
  const tail = {
    lowerBoundMs: out.lowerBound,
    nodes: { generated: out.generated, expanded: out.expanded },
    lowLevelExpansions: out.lowLevelExpansions,
  };
  if (out.status !== 'solved' || !out.plans) {
    const status: WeightedSplitStatus = out.status === 'infeasible' ? 'infeasible' : isAborted ? 'aborted' : 'timeout';
    return {
      ...base,
      ...empty,
      status,
      ...(status === 'infeasible' ? { infeasibleReason: 'search-exhausted' as const } : {}),
      ...tail,
      runtimeMs: now() - t0,
    };
  }
  const schedule = out.plans.map((p) => toSchedule(grid, p));
  const makespan = out.plans.reduce((m, p) => Math.max(m, p.cost), 0);
  const turns = schedule.reduce((n, list) => n + list.filter((s) => s.action === 'turn-left' || s.action === 'turn-right').length, 0);
  return {
    ...base,
    status: 'solved',
    schedule,
    soc: out.soc,
    makespan,
    socMs: out.soc,
    makespanMs: makespan,
    turns,
    ...tail,
    runtimeMs: now() - t0,
  };
}

function toSchedule(grid: MapfInstance['grid'], plan: SippPlan): ScheduledAction[] {
  const xy = (c: number): CellXY => cellXY(grid, c);
  return plan.steps.map((s, step) => ({
    action: s.kind,
    from: xy(s.from),
    to: xy(s.to),
    heading: headingLetter(s.heading),
    start: s.start,
    end: s.end,
    step,
  }));
}

function checkInput(instance: MapfInstance, options: WeightedSplitOptions): void {
  const { profile, startHeading } = options;
  for (const field of ['forwardMs', 'quarterTurnMs', 'waitMs'] as const) {
    const v = profile[field];
    if (!Number.isInteger(v) || v <= 0) throw new Error(`weighted-split: robot profile field ${field} must be a positive integer of ms, got ${v}`);
  }
  if (!['N', 'E', 'S', 'W', 'free'].includes(startHeading)) throw new Error(`weighted-split: option startHeading must be N, E, S, W or free, got ${String(startHeading)}`);
  const { grid } = instance;
  const cells = grid.width * grid.height;
  const starts = new Map<number, number>();
  instance.agents.forEach((a, i) => {
    for (const field of ['start', 'goal'] as const) {
      const c = a[field];
      if (!Number.isInteger(c) || c < 0 || c >= cells) throw new Error(`weighted-split: agent ${i} ${field} ${c} is off the ${grid.width}×${grid.height} grid`);
      if (grid.passable[c] !== 1) throw new Error(`weighted-split: agent ${i} ${field} (${c % grid.width}, ${Math.floor(c / grid.width)}) is a blocked cell`);
    }
    if (a.startHeading !== undefined && !['N', 'E', 'S', 'W'].includes(a.startHeading)) throw new Error(`weighted-split: agent ${i} startHeading must be N, E, S or W, got ${String(a.startHeading)}`);
    const other = starts.get(a.start);
    if (other !== undefined) throw new Error(`weighted-split: agents ${other} and ${i} share the start cell (${a.start % grid.width}, ${Math.floor(a.start / grid.width)})`);
    starts.set(a.start, i);
  });
}
