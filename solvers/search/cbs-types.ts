/** Options, switches and the result of the CBS engine (solvers/search/cbs.ts). */

/**
 * The CBS improvements, each ablatable by a sweep. All on by default; every combination
 * returns the same optimal sum-of-costs.
 */
export interface CbsSwitches {
  /** Whether conflicts are classified by MDDs and cardinal ones split first (Boyarski et al., IJCAI 2015). */
  readonly prioritizeConflicts: boolean;
  /** Whether a child with equal cost and fewer conflicts replaces its parent's paths (ICBS bypass, Boyarski et al., IJCAI 2015). */
  readonly bypass: boolean;
  /** Whether the weighted dependency graph heuristic is used (Li, Felner, Boyarski, Ma, Koenig, IJCAI 2019). */
  readonly wdg: boolean;
  /** Whether conflicts split into a positive and a negative constraint (Li, Harabor, Stuckey, Ma, Koenig, ICAPS 2019). */
  readonly disjointSplitting: boolean;
  /** Whether goal conflicts are resolved by length constraints (target reasoning, Li et al., AIJ 2021). */
  readonly targetReasoning: boolean;
  /** Whether head-on conflicts in corridors are resolved by range constraints (Li et al., AIJ 2021). */
  readonly corridorReasoning: boolean;
  /** Whether cardinal rectangle conflicts are resolved by barrier constraints (Li et al., AIJ 2021). */
  readonly rectangleReasoning: boolean;
}

/** Every improvement on. */
export const DEFAULT_SWITCHES: CbsSwitches = Object.freeze({
  prioritizeConflicts: true,
  bypass: true,
  wdg: true,
  disjointSplitting: true,
  targetReasoning: true,
  corridorReasoning: true,
  rectangleReasoning: true,
});

/** Every improvement off: the CBS of Sharon, Stern, Felner, Sturtevant (AIJ 2015). */
export const PLAIN_CBS_SWITCHES: CbsSwitches = Object.freeze({
  prioritizeConflicts: false,
  bypass: false,
  wdg: false,
  disjointSplitting: false,
  targetReasoning: false,
  corridorReasoning: false,
  rectangleReasoning: false,
});

/** Names of the switches in a fixed order (for sweeps and ablation tests). */
export const SWITCH_NAMES = Object.keys(DEFAULT_SWITCHES) as (keyof CbsSwitches)[];

/** Limits and settings of one solve. */
export interface CbsOptions {
  /**
   * Wall-clock limit in ms, measured with `now`. Without `now` it cannot be enforced (the
   * solver library owns no clock): then only `nodeLimit`, `memoryLimitMb` and `signal` apply.
   */
  readonly timeLimitMs?: number;
  /** Maximum number of CT nodes generated. */
  readonly nodeLimit?: number;
  /** Guard on the estimated bytes held by the constraint tree and its caches, in MB (default 1024). */
  readonly memoryLimitMb?: number;
  /** Stops the search (checked between CT nodes and every 256 low-level expansions). */
  readonly signal?: AbortSignal;
  /** Injected clock in ms (the CLI and workers pass `performance.now`). */
  readonly now?: () => number;
  /** Improvements to use; missing ones default to on. */
  readonly switches?: Partial<CbsSwitches>;
  /**
   * Suboptimality factor w ≥ 1 (default 1 = optimal search, today's code path): with w > 1 the
   * search is bounded-suboptimal (solvers/search/suboptimality.ts) and returns a plan whose
   * sum-of-costs is at most w × `lowerBound`.
   */
  readonly suboptimality?: number;
}

/** How a solve ended. */
export type CbsStatus = 'solved' | 'timeout' | 'infeasible' | 'error';

/** Result of one solve; sizes are in unit steps. */
export interface CbsResult {
  readonly status: CbsStatus;
  /** For infeasible, error and timeout: why (which agent, which limit). */
  readonly reason?: string;
  /** Per agent the cell per time step (trimmed at the goal); empty unless solved. */
  readonly paths: readonly (readonly number[])[];
  /** Sum-of-costs of `paths` (null unless solved). */
  readonly soc: number | null;
  /** Makespan of `paths` (null unless solved). */
  readonly makespan: number | null;
  /**
   * Proven lower bound on the optimal sum-of-costs (= soc when solved optimally; for a bounded
   * solve the bound the search proved, soc ≤ w × lowerBound; min f of the open list on a limit;
   * null if infeasible/error).
   */
  readonly lowerBound: number | null;
  /** Wall time by the injected clock (0 without one). */
  readonly runtimeMs: number;
  /** CT nodes generated (the root included). */
  readonly nodesGenerated: number;
  /** CT nodes expanded. */
  readonly nodesExpanded: number;
  /** Low-level A* expansions, including those of the WDG sub-searches. */
  readonly lowLevelExpansions: number;
  /** The switches this solve used. */
  readonly switches: CbsSwitches;
}
