/**
 * The classic plan model: unit-time moves to a 4-neighbour or waits, vertex, swap and goal
 * conflicts (plus following conflicts with `following: forbidden`, Stern et al., SoCS 2019),
 * minimum sum-of-costs; and `solveClassic`, optimal CBS on it.
 */
import type { FollowingRule } from '@shared/plan';
import { type CbsOptions, type CbsResult, type CbsSwitches, DEFAULT_SWITCHES } from '../search/cbs-types';
import { Budget, LimitReached } from '../search/budget';
import { CbsEngine } from '../search/cbs';
import type { Conflict } from '../search/conflict';
import { ConflictAvoidanceTable } from '../search/conflict-avoidance-table';
import { SpaceTimeAStar } from '../search/space-time-astar';
import { FocalSpaceTimeAStar } from '../search/focal-space-time-astar';
import { switchesForSuboptimality } from '../search/bounded-switches';
import { checkSuboptimality } from '../search/suboptimality';
import { findFollowingConflicts } from '../search/following-conflicts';
import { findUnitStepConflicts } from '../search/unit-step-conflicts';
import { cellDegrees, DistanceCache, UNREACHABLE } from '../grid/distance';
import type { Grid } from '../grid/grid';
import type { MapfInstance } from '../instance';
import type { SearchModel } from './model';

/** The classic model of one instance: states are cells. */
export class ClassicModel implements SearchModel {
  readonly name = 'classic';
  readonly cellCount: number;
  readonly stateCount: number;
  readonly succStart: Int32Array;
  readonly succ: Int32Array;
  readonly stateCell: Int32Array;
  readonly agentCount: number;
  readonly startStates: Int32Array;
  readonly goalCells: Int32Array;
  readonly supportsGridSymmetry = true;
  /** Passable 4-neighbour count per cell. */
  readonly degree: Uint8Array;
  private readonly distances: DistanceCache;

  /** Whether following conflicts are conflicts (`following: forbidden`). */
  readonly forbidsFollowing: boolean;

  /** Builds the state graph of `instance` (no validation: see {@link checkInstance}). */
  constructor(readonly grid: Grid, instance: MapfInstance, following: FollowingRule = 'allowed') {
    this.forbidsFollowing = following === 'forbidden';
    const { width, height, passable } = grid;
    const n = width * height;
    this.cellCount = n;
    this.stateCount = n;
    this.stateCell = new Int32Array(n);
    for (let c = 0; c < n; c++) this.stateCell[c] = c;
    this.succStart = new Int32Array(n + 1);
    const succ: number[] = [];
    for (let c = 0; c < n; c++) {
      this.succStart[c] = succ.length;
      if (passable[c] !== 1) continue;
      const x = c % width;
      if (c >= width && passable[c - width] === 1) succ.push(c - width);
      if (x + 1 < width && passable[c + 1] === 1) succ.push(c + 1);
      if (c + width < n && passable[c + width] === 1) succ.push(c + width);
      if (x > 0 && passable[c - 1] === 1) succ.push(c - 1);
      succ.push(c);
    }
    this.succStart[n] = succ.length;
    this.succ = Int32Array.from(succ);
    this.agentCount = instance.agents.length;
    this.startStates = Int32Array.from(instance.agents.map((a) => a.start));
    this.goalCells = Int32Array.from(instance.agents.map((a) => a.goal));
    this.distances = new DistanceCache(grid);
    this.degree = cellDegrees(grid);
  }

  /** BFS distances to the agent's goal (cached per goal). */
  goalDistances(agent: number): Int32Array {
    return this.distances.from(this.goalCells[agent]);
  }

  /** BFS distances to `cell` (cached). */
  distancesToCell(cell: number): Int32Array {
    return this.distances.from(cell);
  }

  /** Vertex, swap and goal conflicts; following conflicts too when forbidden (the allowed path pays nothing for them). */
  findConflicts(a: number, pathA: Int32Array, b: number, pathB: Int32Array, out: Conflict[]): void {
    findUnitStepConflicts(this.stateCell, a, pathA, b, pathB, out);
    if (this.forbidsFollowing) findFollowingConflicts(this.stateCell, a, pathA, b, pathB, out);
  }
}

/** A problem with an instance found before searching: `error` for malformed input, `infeasible` for an unsolvable task. */
export interface InstanceProblem {
  readonly status: 'error' | 'infeasible';
  readonly reason: string;
}

/** Checks cells and detects the instances no plan can solve (goal unreachable, two equal goals or starts). */
export function checkInstance(instance: MapfInstance, model?: ClassicModel): InstanceProblem | null {
  const { grid, agents } = instance;
  const n = grid.width * grid.height;
  const xy = (c: number): string => `(${c % grid.width}, ${Math.floor(c / grid.width)})`;
  for (let i = 0; i < agents.length; i++) {
    const { start, goal } = agents[i];
    for (const [what, c] of [['start', start], ['goal', goal]] as const) {
      if (!Number.isInteger(c) || c < 0 || c >= n) return { status: 'error', reason: `agent ${i}: ${what} cell ${c} is outside the ${grid.width}×${grid.height} grid` };
      if (grid.passable[c] !== 1) return { status: 'error', reason: `agent ${i}: ${what} ${xy(c)} is a blocked cell` };
    }
  }
  const seenStart = new Map<number, number>();
  const seenGoal = new Map<number, number>();
  for (let i = 0; i < agents.length; i++) {
    const s = seenStart.get(agents[i].start);
    if (s !== undefined) return { status: 'infeasible', reason: `agents ${s} and ${i} start in the same cell ${xy(agents[i].start)}` };
    seenStart.set(agents[i].start, i);
    const g = seenGoal.get(agents[i].goal);
    if (g !== undefined) return { status: 'infeasible', reason: `agents ${g} and ${i} share the goal ${xy(agents[i].goal)}` };
    seenGoal.set(agents[i].goal, i);
  }
  const m = model ?? new ClassicModel(grid, instance);
  for (let i = 0; i < agents.length; i++) {
    if (m.goalDistances(i)[agents[i].start] >= UNREACHABLE) {
      return { status: 'infeasible', reason: `agent ${i}: goal ${xy(agents[i].goal)} is unreachable from start ${xy(agents[i].start)}` };
    }
  }
  return null;
}

/** Options of a classic solve: the CBS limits and the following rule (default allowed). */
export interface ClassicOptions extends CbsOptions {
  readonly following?: FollowingRule;
}

/**
 * Optimal (minimum sum-of-costs) CBS for the classic model, or with `suboptimality` w > 1 the
 * bounded EECBS search of cbs.ts (sum-of-costs ≤ w × the reported lower bound). Deterministic; honours
 * `timeLimitMs` (only with an injected `now`), `nodeLimit`, `memoryLimitMb` and `signal`, and on
 * a limit returns `timeout` with the best proven lower bound. With `following: forbidden` the
 * optimum is over plans without following conflicts (every improvement stays on: see cbs.ts).
 */
export function solveClassic(instance: MapfInstance, options: ClassicOptions = {}): CbsResult {
  const w = checkSuboptimality(options.suboptimality);
  const switches: CbsSwitches = switchesForSuboptimality({ ...DEFAULT_SWITCHES, ...options.switches }, w);
  const budget = new Budget(options.now, options.timeLimitMs, options.signal);
  const base = { switches, nodesGenerated: 0, nodesExpanded: 0, lowLevelExpansions: 0 };
  const model = new ClassicModel(instance.grid, instance, options.following ?? 'allowed');
  const problem = checkInstance(instance, model);
  if (problem !== null) {
    return { ...base, status: problem.status, reason: problem.reason, paths: [], soc: null, makespan: null, lowerBound: null, runtimeMs: budget.elapsedMs() };
  }
  const planner = new SpaceTimeAStar(model, budget);
  const focal = w > 1 ? new FocalSpaceTimeAStar(model, budget) : undefined;
  const lowLevel = (): number => planner.expansions + (focal?.expansions ?? 0);
  const engine = new CbsEngine({
    model,
    agents: instance.agents.map((_, i) => i),
    switches,
    budget,
    planner,
    cat: new ConflictAvoidanceTable(model.cellCount, model.forbidsFollowing),
    degree: model.degree,
    nodeLimit: options.nodeLimit ?? Number.MAX_SAFE_INTEGER,
    expandLimit: Number.MAX_SAFE_INTEGER,
    isLimitFatal: true,
    memoryLimitBytes: (options.memoryLimitMb ?? 1024) * 1024 * 1024,
    isSub: false,
    ...(focal !== undefined ? { suboptimality: w, focalPlanner: focal } : {}),
  });
  try {
    const out = engine.run();
    const stats = { switches, nodesGenerated: engine.generated, nodesExpanded: engine.expanded, lowLevelExpansions: lowLevel() };
    if (out.kind === 'solved') {
      const paths = out.paths.map((p) => Array.from(p));
      return {
        ...stats, status: 'solved', paths, soc: out.soc, makespan: paths.reduce((mk, p) => Math.max(mk, p.length - 1), 0),
        lowerBound: out.lowerBound, runtimeMs: budget.elapsedMs(),
      };
    }
    return { ...stats, status: 'infeasible', reason: out.reason, paths: [], soc: null, makespan: null, lowerBound: null, runtimeMs: budget.elapsedMs() };
  } catch (e) {
    if (!(e instanceof LimitReached)) throw e;
    const lb = engine.lowerBound();
    return {
      switches, nodesGenerated: engine.generated, nodesExpanded: engine.expanded, lowLevelExpansions: lowLevel(),
      status: 'timeout', reason: `${e.reason} limit reached`, paths: [], soc: null, makespan: null,
      lowerBound: Number.isFinite(lb) ? lb : null, runtimeMs: budget.elapsedMs(),
    };
  }
}
