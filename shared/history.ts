/**
 * The history of one leaderboard row (issue 16, item 5): every result and submission ever stored
 * for an instance (scenario × agent count) × plan model variant × robot profile, superseded and
 * failed ones included, newest first. GET /api/history takes the row's key as query parameters.
 */
import { z } from 'zod';
import { PLAN_MODELS, type PlanModel, type RobotProfile } from './plan';
import type { ExecutionView, RunOutcome } from './runs';

/** Most items one request returns; `total` counts them all. */
export const HISTORY_MAX_LIMIT = 200;
/** Items when the request names no limit. */
export const HISTORY_DEFAULT_LIMIT = 50;

/** Query of GET /api/history: a board row's key plus the window. */
export const HistoryQuery = z.object({
  scenarioId: z.coerce.number().int().positive().max(2_147_483_647).meta({ description: 'Scenario of the row.', example: 12 }),
  agents: z.coerce.number().int().positive().max(100_000).meta({ description: 'Agent count (the first k rows of the scenario).', example: 8 }),
  model: z.enum(PLAN_MODELS).meta({ description: 'Plan model.', example: 'classic' }),
  variant: z.string().max(64).default('').meta({ description: 'Variant as the board shows it (`k=2`, `w=1.5`, `start N`); empty for the plain model.', example: '' }),
  profile: z.string().regex(/^[0-9a-f]{16}$/, 'profile must be a robot profile hash of 16 hex digits').meta({ description: 'Robot profile hash (16 hex digits).', example: '3f9a0c1d2e4b5a69' }),
  start: z.coerce.number().int().min(0).max(1_000_000).default(0).meta({ description: 'Items to skip (newest first).' }),
  limit: z.coerce.number().int().min(1).max(HISTORY_MAX_LIMIT).default(HISTORY_DEFAULT_LIMIT).meta({ description: `Items to return, at most ${HISTORY_MAX_LIMIT}.` }),
}).strict();
export type HistoryQuery = z.output<typeof HistoryQuery>;

/** Where a stored result came from: a sweep's run, or a plan submitted from elsewhere. */
export type HistorySource =
  | {
    readonly kind: 'sweep'; readonly sweepId: number;
    /** The sweep's name, only for viewers who may open the sweep (its owner, maintainers and admins); null for others. */
    readonly sweepName: string | null;
    readonly runId: number | null;
    /** Whether the viewer may open the sweep's page (its owner, maintainers and admins). */
    readonly isSweepVisible: boolean;
  }
  | { readonly kind: 'submission'; readonly submissionId: number; readonly uploader: string }
  /** A result written without a sweep or submission (seeded demo data, older imports). */
  | { readonly kind: 'other' };

/** One stored result of the row. */
export interface HistoryItem {
  readonly resultId: number;
  /** When it was stored, ISO 8601. */
  readonly createdAt: string;
  readonly status: RunOutcome;
  readonly reason: string | null;
  /** Whether the board row shows this result now (the others are superseded or failed). */
  readonly isBest: boolean;
  /** Whether it holds a plan (solved) to replay or download. */
  readonly hasPlan: boolean;
  readonly source: HistorySource;
  readonly solver: { readonly name: string; readonly version: string; readonly commit: string };
  /** Node.js and CPU of the machine that solved it (a submission: the hub that checked it). */
  readonly environment: { readonly node: string; readonly cpu: string; readonly threads: number };
  /** Solver seed; null for a submission (no search of ours ran). */
  readonly seed: number | null;
  /** Suboptimality factor w of the search (1 = exact). */
  readonly suboptimality: number;
  /** The model parameters of the run (`params.model` as stored: k, start heading, switches, w…). */
  readonly parameters: Readonly<Record<string, unknown>>;
  /** In `costUnit`: steps for unit-step models, ms for weighted-split. */
  readonly soc: number | null;
  readonly makespan: number | null;
  readonly lowerBound: number | null;
  readonly turnInclusiveSocMs: number | null;
  readonly turnInclusiveMakespanMs: number | null;
  readonly runtimeMs: number | null;
  readonly nodes: number | null;
  /** Collision-free when replayed open-loop with zero noise (null: not checked). */
  readonly isExecutableAtNominal: boolean | null;
  /** One per replayed execution policy. */
  readonly executions: readonly ExecutionView[];
}

/** GET /api/history. */
export interface InstanceHistory {
  readonly instance: {
    readonly instanceSetId: number; readonly instanceSetName: string;
    readonly mapId: number; readonly mapName: string;
    readonly scenarioId: number; readonly scenarioName: string;
    readonly agents: number;
  };
  readonly model: PlanModel;
  readonly variant: string;
  readonly profile: { readonly hash: string; readonly label: string; readonly parameters: RobotProfile };
  /** Unit of soc, makespan and lower bound. */
  readonly costUnit: 'steps' | 'ms';
  /** Every stored result of the row; `items` is the window [start, start + limit). */
  readonly total: number;
  readonly start: number;
  readonly limit: number;
  readonly items: readonly HistoryItem[];
  /** The safety sentence that goes with execution figures (SAFETY_NOTE). */
  readonly safetyNote: string;
}

/** The unit of a model's sum-of-costs, makespan and lower bound. */
export function costUnitOf(model: PlanModel): 'steps' | 'ms' {
  return model === 'weighted-split' ? 'ms' : 'steps';
}
