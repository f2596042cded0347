/**
 * Runs the CBS engine to an optimum on any unit-step model (orientation-split, k-robust):
 * the driver part of `solveClassic` written once against the model interface, returning the
 * raw state paths so that each model decodes them its own way.
 */
import type { SearchModel } from '../models/model';
import { Budget, LimitReached } from './budget';
import { CbsEngine } from './cbs';
import type { CbsOptions, CbsStatus, CbsSwitches } from './cbs-types';
import { ConflictAvoidanceTable } from './conflict-avoidance-table';
import { SpaceTimeAStar } from './space-time-astar';
import { FocalSpaceTimeAStar } from './focal-space-time-astar';
import { switchesForSuboptimality } from './bounded-switches';
import { checkSuboptimality } from './suboptimality';

/** What one driven CBS search ends with; sizes in unit steps. */
export interface ModelCbsOutcome {
  readonly status: Exclude<CbsStatus, 'error'>;
  readonly reason?: string;
  /** Per agent its states per step (trimmed at the goal); empty unless solved. */
  readonly statePaths: readonly Int32Array[];
  readonly soc: number | null;
  readonly makespan: number | null;
  /** Proven lower bound on the optimal SOC (= soc when solved optimally, soc ≤ w × it for w > 1; null when infeasible). */
  readonly lowerBound: number | null;
  readonly runtimeMs: number;
  readonly nodesGenerated: number;
  readonly nodesExpanded: number;
  readonly lowLevelExpansions: number;
}

/**
 * Optimal CBS over `model` with `switches` (the caller has already switched off what is unsound
 * for the model); `degree` is the cell degree table of corridor reasoning. Honours the limits
 * of `options` (time only with an injected clock) and returns `timeout` with the best bound.
 * With `options.suboptimality` w > 1 it runs the bounded EECBS search of cbs.ts instead (WDG and
 * rectangle reasoning off, bounded-switches.ts).
 */
export function runModelCbs(model: SearchModel, degree: Uint8Array, exactSwitches: CbsSwitches, options: CbsOptions): ModelCbsOutcome {
  const w = checkSuboptimality(options.suboptimality);
  const switches = switchesForSuboptimality(exactSwitches, w);
  const budget = new Budget(options.now, options.timeLimitMs, options.signal);
  const planner = new SpaceTimeAStar(model, budget);
  const focal = w > 1 ? new FocalSpaceTimeAStar(model, budget) : undefined;
  const engine = new CbsEngine({
    model,
    agents: Array.from({ length: model.agentCount }, (_, i) => i),
    switches,
    budget,
    planner,
    // The bounded search's focal order counts k-delay conflicts too (exact search keeps the plain table).
    cat: new ConflictAvoidanceTable(model.cellCount, model.forbidsFollowing === true, w > 1 ? model.delayWindow ?? 0 : 0),
    degree,
    nodeLimit: options.nodeLimit ?? Number.MAX_SAFE_INTEGER,
    expandLimit: Number.MAX_SAFE_INTEGER,
    isLimitFatal: true,
    memoryLimitBytes: (options.memoryLimitMb ?? 1024) * 1024 * 1024,
    isSub: false,
    ...(focal !== undefined ? { suboptimality: w, focalPlanner: focal } : {}),
  });
  const counters = (): Pick<ModelCbsOutcome, 'nodesGenerated' | 'nodesExpanded' | 'lowLevelExpansions'> => ({
    nodesGenerated: engine.generated, nodesExpanded: engine.expanded, lowLevelExpansions: planner.expansions + (focal?.expansions ?? 0),
  });
  try {
    const out = engine.run();
    if (out.kind === 'solved') {
      const makespan = out.paths.reduce((mk, p) => Math.max(mk, p.length - 1), 0);
      return { status: 'solved', statePaths: out.paths, soc: out.soc, makespan, lowerBound: out.lowerBound, runtimeMs: budget.elapsedMs(), ...counters() };
    }
    return { status: 'infeasible', reason: out.reason, statePaths: [], soc: null, makespan: null, lowerBound: null, runtimeMs: budget.elapsedMs(), ...counters() };
  } catch (e) {
    if (!(e instanceof LimitReached)) throw e;
    const lb = engine.lowerBound();
    return {
      status: 'timeout', reason: `${e.reason} limit reached`, statePaths: [], soc: null, makespan: null,
      lowerBound: Number.isFinite(lb) ? lb : null, runtimeMs: budget.elapsedMs(), ...counters(),
    };
  }
}
