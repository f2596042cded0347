/**
 * Runs, results and progress as the API answers them and the SSE stream sends them:
 * GET /api/sweeps, GET /api/sweeps/:id, GET /api/sweeps/:id/results and the events of
 * GET /api/sweeps/:id/events. Times are ms; cells never appear here.
 */
import type { PlanModel, RobotProfile } from './plan';
import type { CbsSwitchName, SweepDefinition, SweepPolicy, SweepSize } from './sweeps';

/** Lifecycle of a sweep. `failed` = every run ended but at least one ended in `error`. */
export const SWEEP_STATUSES = ['queued', 'running', 'finished', 'failed', 'cancelled'] as const;
export type SweepStatus = (typeof SWEEP_STATUSES)[number];

/** Whether a sweep in this status will change no more. */
export function isSweepOver(status: SweepStatus): boolean {
  return status === 'finished' || status === 'failed' || status === 'cancelled';
}

/**
 * Outcome of one run. `timeout` / `memory`: a limit stopped the solve (the best lower bound is
 * kept); `error`: the solver failed or its plan did not pass the model's validator (never
 * recorded as solved); `infeasible`: proven to have no plan.
 */
export const RUN_OUTCOMES = ['solved', 'infeasible', 'timeout', 'memory', 'error'] as const;
export type RunOutcome = (typeof RUN_OUTCOMES)[number];

/** Every status a run row can hold. */
export const RUN_STATUSES = ['pending', 'running', ...RUN_OUTCOMES, 'cancelled'] as const;
export type RunStatus = (typeof RUN_STATUSES)[number];

/** Whether a run in this status is finished (it will not be taken again). */
export function isRunOver(status: RunStatus): boolean {
  return status !== 'pending' && status !== 'running';
}

/** Counts of runs by status. */
export type RunCounts = Readonly<Record<RunStatus, number>>;

/** An all-zero RunCounts. */
export function emptyRunCounts(): Record<RunStatus, number> {
  return Object.fromEntries(RUN_STATUSES.map((s) => [s, 0])) as Record<RunStatus, number>;
}

/** Progress of a sweep: totals, per-model counts and an ETA. */
export interface SweepProgress {
  readonly sweepId: number;
  readonly status: SweepStatus;
  readonly total: number;
  /** Runs over (any outcome, cancelled included). */
  readonly done: number;
  readonly counts: RunCounts;
  /** Per plan model (definition order; a model listed twice with different parameters is counted under its index). */
  readonly perModel: readonly {
    readonly modelIndex: number; readonly model: PlanModel; readonly label: string; readonly counts: RunCounts;
    /** CBS switches the spec turns off: the field name (as in the definition) beside its label for people (shared/sweeps.ts). */
    readonly switchesOff: readonly { readonly name: CbsSwitchName; readonly label: string }[];
    /** An external solver's spec (issue 16, item 4): the solver, workers that declared it lately, and why runs wait, if they do. */
    readonly external?: ExternalSpecProgress;
  }[];
  /** Estimated ms until every run is over, from the pace so far; null before the first run ends or once over. */
  readonly etaMs: number | null;
  readonly startedAt: string | null;
  readonly finishedAt: string | null;
}

/** The state of an external solver's spec in a sweep's progress. */
export interface ExternalSpecProgress {
  /** `name@version`. */
  readonly solver: string;
  /** Workers that declared the solver within WORKER_SEEN_WINDOW_MS (shared/external-solvers.ts). */
  readonly workers: number;
  /** E.g. "waiting for a worker with solver prioritised-astar@1.0.0": pending runs and no such worker; null otherwise. */
  readonly waiting: string | null;
  /**
   * Why some of its runs ended in error without running, when a worker refused the registration:
   * e.g. "2 runs refused: the worker's approved command differs from the registration of lacam@3 …"; null otherwise.
   */
  readonly refused: string | null;
}

/** One execution summary of a result (one policy). */
export interface ExecutionView {
  readonly policy: SweepPolicy;
  readonly runs: number;
  readonly successRate: number;
  readonly collisionsMean: number;
  readonly realisedMakespanMeanMs: number | null;
  readonly realisedMakespanP95Ms: number | null;
  readonly finishSpreadMeanMs: number | null;
  /**
   * 95 % intervals stored with the summary (executions.metrics.ci95, issue 12 contract C2); null for rows
   * stored before them (readers recompute the success-rate interval from successRate × runs).
   */
  readonly ci95?: {
    readonly successRate: readonly [number, number];
    readonly realisedMakespanMs: readonly [number, number] | null;
    readonly finishSpreadMs: readonly [number, number] | null;
  } | null;
}

/** One row of a sweep's results table: the run and, when it produced one, its result. */
export interface SweepResultRow {
  readonly runId: number;
  /** The stored result once the run is over (POST /api/executions {resultId} replays its plan); null before. */
  readonly resultId: number | null;
  readonly scenarioId: number;
  readonly scenarioName: string;
  readonly mapName: string;
  readonly agents: number;
  readonly modelIndex: number;
  readonly model: PlanModel;
  readonly seed: number;
  readonly status: RunStatus;
  /** In the model's own unit: steps for unit-step models, ms for weighted-split. */
  readonly soc: number | null;
  readonly makespan: number | null;
  readonly turnInclusiveSocMs: number | null;
  readonly turnInclusiveMakespanMs: number | null;
  /** The lower bound on the optimal sum-of-costs the search proved (same unit as soc). */
  readonly lowerBound: number | null;
  /** (soc − lowerBound) ÷ lowerBound of a solved run (0: proven optimal); null without both. */
  readonly gap: number | null;
  /** The suboptimality factor w the run was solved with (1 = exact search). */
  readonly suboptimality: number;
  readonly runtimeMs: number | null;
  readonly nodes: number | null;
  /** Why a run ended in error / infeasible / a limit, for people. */
  readonly reason: string | null;
  readonly executions: readonly ExecutionView[];
  /** An external solver's run (issue 16, item 4): its process's user + system CPU time, ms, and peak resident memory, kB; null otherwise. */
  readonly cpuTimeMs?: number | null;
  readonly peakMemoryKb?: number | null;
}

/** A sweep in the list. */
export interface SweepSummary {
  readonly id: number;
  readonly name: string;
  readonly owner: { readonly id: number; readonly login: string };
  readonly status: SweepStatus;
  readonly total: number;
  readonly done: number;
  readonly createdAt: string;
  readonly finishedAt: string | null;
}

/** GET /api/sweeps. */
export interface SweepListResponse {
  readonly items: readonly SweepSummary[];
}

/** GET /api/sweeps/:id (and the 201 answer of POST /api/sweeps). */
export interface SweepDetail extends SweepSummary {
  readonly definition: SweepDefinition;
  readonly progress: SweepProgress;
  /** Whether the viewer may cancel it. */
  readonly canCancel: boolean;
}

/** POST /api/sweeps/preview: the size of a definition before launch, and a refusal message when too big. */
export interface SweepPreviewResponse {
  readonly size: SweepSize;
  readonly refusal: string | null;
}

/** GET /api/sweeps/:id/results. */
export interface SweepResultsResponse {
  readonly items: readonly SweepResultRow[];
}

/**
 * Names of the SSE events of GET /api/sweeps/:id/events. `unavailable` (data `{}`) says the
 * server lost its database: figures stop until the next `progress` event.
 */
export const SWEEP_EVENT_NAMES = { progress: 'progress', result: 'result', unavailable: 'unavailable' } as const;

/** The data of an SSE event: `progress` carries SweepProgress, `result` a SweepResultRow. */
export type SweepEvent =
  | { readonly type: 'progress'; readonly progress: SweepProgress }
  | { readonly type: 'result'; readonly row: SweepResultRow };

/** Machine and build a result was computed on. */
export interface SolverBuild {
  /** package.json version. */
  readonly version: string;
  /** `git rev-parse HEAD`, or 'unknown'. */
  readonly commit: string;
  readonly node: string;
  readonly cpuModel: string;
  readonly threads: number;
}

/** The robot profile used by a result, as stored beside it. */
export type StoredRobotProfile = RobotProfile;

/** GET /api/dev/mailbox (only while the local fake SMTP server runs). */
export interface MailboxResponse {
  readonly messages: readonly {
    readonly id: number;
    readonly receivedAt: string;
    readonly from: string;
    readonly to: readonly string[];
    readonly subject: string;
    readonly text: string;
  }[];
}
