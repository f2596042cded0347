/**
 * Field trials attached to a stored result (issue 17, items 2 and 3): runs of the result's plan on
 * real robots, each one trial log (shared/trial-log.ts) checked against the plan, stored with the
 * same per-run figures the simulator reports, and shown beside the simulated figures.
 * The request fields are zod (api checks them); the rest is types the web imports.
 */
import { z } from 'zod';
import { EXECUTION_POLICY_NAMES, type ExecutionPolicyName } from './executions-constants';
import { multiLineText, singleLineText } from './text-field';
import type { RobotProfile } from './plan';
import type { Interval95 } from './confidence-interval';
import type { TrialLogError } from './trial-log';

/** The multipart field that carries the log files (or zips of them). */
export const TRIAL_UPLOAD_FIELD = 'files';
/** Limits of one upload: files in the request, runs after unzipping, bytes in all. */
export const TRIAL_UPLOAD_LIMITS = { maxFiles: 50, maxRuns: 200, maxTotalBytes: 64 * 1024 * 1024 } as const;
/** How the notes of the demo seed's invented runs start (api/src/demo/seed-demo-trials.ts); the page marks such uploads as invented. */
export const INVENTED_TRIALS_MARK = 'Invented demo data';
/** Longest notes text. */
export const MAX_TRIAL_NOTES = 4000;
/** Simulated runs behind the 95 % ranges a field run is flagged against (when the result stored no replay of the policy). */
export const TRIAL_SIMULATION_RUNS = 200;

/** The text fields of POST /api/trials/results/:resultId (multipart, beside the files). */
export const TrialUploadFields = z.strictObject({
  policy: z.enum(EXECUTION_POLICY_NAMES).meta({ description: 'The execution policy the fleet ran the plan with.' }),
  notes: multiLineText().max(MAX_TRIAL_NOTES).optional().meta({ description: 'Free text: floor, robot type, date.' }),
});
export type TrialUploadFields = z.infer<typeof TrialUploadFields>;

/** The central 95 % of simulated runs of one figure (nearest-rank 2.5th and 97.5th percentiles), and their mean. */
export interface SimulatedRange {
  readonly mean: number | null;
  readonly low: number | null;
  readonly high: number | null;
  /** Simulated runs that had the figure (a run that never finishes has no makespan). */
  readonly count: number;
}

/** The simulated side of an upload: the policy's settings and the ranges of the figures. */
export interface TrialSimulation {
  readonly policy: ExecutionPolicyName;
  readonly runs: number;
  readonly seed: number;
  readonly noise: { readonly jitterCv: number; readonly stallProbability: number; readonly stallMs: number };
  /** 'stored': the settings of the replay the sweep stored with the result; 'default': the profile's jitter, no stalls. */
  readonly settingsFrom: 'stored' | 'default';
  readonly successRate: number;
  readonly realisedMakespanMs: SimulatedRange;
  readonly realisedSocMs: SimulatedRange;
  readonly finishSpreadMs: SimulatedRange;
  readonly waitingMs: SimulatedRange;
  /** Per planned action kind: nominal duration and the simulated durations' range. */
  readonly actionDurations: readonly ActionDurationFigures[];
}

/** Durations of one action kind: planned (nominal), simulated range, measured in the field (mean and range over all runs' rows). */
export interface ActionDurationFigures {
  readonly action: 'forward' | 'turn' | 'wait';
  readonly plannedMs: number;
  readonly simulated: SimulatedRange;
}

/**
 * The figures a field run is flagged on. Finish spread is shown but not flagged: a simulated run's
 * robots finish their padded lists at the plan's makespan, a logged robot at its last action
 * (solvers/trials/compare-to-plan.ts), so the two spreads measure different things.
 */
export const COMPARED_FIGURES = ['realisedMakespanMs', 'realisedSocMs', 'waitingMs'] as const;
export type ComparedFigure = (typeof COMPARED_FIGURES)[number];

/** One robot's figures in a run (solvers/trials/compare-to-plan.ts TrialRobotFigures). */
export interface FieldRobotFigures {
  readonly robot: number;
  readonly actionsLogged: number;
  readonly actionsPlanned: number;
  readonly plannedArrivalMs: number;
  readonly realisedArrivalMs: number | null;
  readonly arrivalDelayMs: number | null;
  readonly lastEndMs: number;
  readonly waitedMs: number;
}

/** One stored field run. */
export interface FieldTrialRun {
  readonly id: number;
  readonly uploadId: number;
  readonly fileName: string;
  readonly format: 'csv' | 'json';
  readonly rows: number;
  readonly isSuccess: boolean;
  readonly isAborted: boolean;
  readonly collisions: number;
  readonly realisedMakespanMs: number | null;
  readonly realisedSocMs: number | null;
  readonly finishSpreadMs: number | null;
  readonly waitingMs: number;
  readonly perRobot: readonly FieldRobotFigures[];
  /** Measured durations per action kind in this run: mean ms and count. */
  readonly actionDurations: readonly { readonly action: 'forward' | 'turn' | 'wait'; readonly meanMs: number; readonly count: number }[];
  /** The compared figures that lie outside the simulation's central 95 % of runs. */
  readonly outside: readonly ComparedFigure[];
}

/** One upload: the runs attached together, with their policy and notes. */
export interface FieldTrialUpload {
  readonly id: number;
  readonly policy: ExecutionPolicyName;
  readonly notes: string;
  readonly uploadedBy: string;
  readonly uploadedAt: string;
  readonly simulation: TrialSimulation;
  readonly runs: readonly FieldTrialRun[];
}

/** 200 of GET /api/trials/results/:resultId, 201 of the POST (then only the new upload). */
export interface FieldTrialsView {
  readonly resultId: number;
  readonly uploads: readonly FieldTrialUpload[];
  /** Whether the viewer may attach trials (a researcher or above who sees the result). */
  readonly canAttach: boolean;
  readonly safetyNote: string;
}

/** details of 400 INVALID_TRIAL_LOG and 422 TRIAL_DIVERGES: every problem, each naming file, line and column. */
export interface TrialLogErrorDetails {
  readonly errors: readonly TrialLogError[];
}

/** Where a fitted profile came from: the result and the stored runs whose logs were fitted. */
export interface ProfileProvenance {
  readonly kind: 'trial-fit';
  readonly resultId: number;
  readonly runs: readonly { readonly id: number; readonly fileName: string }[];
  /** The stalls the fit found (a profile holds no stalls: give them to a sweep as its noise settings). */
  readonly stallProbability: number;
  readonly stallMs: number;
  readonly fittedAt: string;
}

/**
 * 200 of POST /api/trials/results/:resultId/calibration: the fit (values, 95 % intervals, QQ
 * points, KS distance; solvers/trials/calibrate.ts ProfileFit), the profile it gives (times and
 * jitter fitted, geometry from the result's profile) and its provenance.
 */
export interface TrialCalibrationView {
  readonly fit: {
    readonly forwardMs: number | null;
    readonly quarterTurnMs: number | null;
    readonly waitMs: number | null;
    readonly timingJitter: number;
    readonly stallProbability: number;
    readonly stallMs: number;
    readonly actions: { readonly forward: number; readonly turn: number; readonly wait: number };
    readonly ci95: Readonly<Record<'forwardMs' | 'quarterTurnMs' | 'waitMs' | 'timingJitter' | 'stallProbability' | 'stallMs', Interval95 | null>>;
    readonly goodnessOfFit: { readonly qq: readonly { readonly theoretical: number; readonly observed: number }[]; readonly ksDistance: number };
  };
  readonly profile: RobotProfile;
  readonly provenance: ProfileProvenance;
}

/** POST /api/robot-profiles: a fitted profile saved under a name (the server rebuilds the provenance from `runIds`). */
export const SaveRobotProfileRequest = z.strictObject({
  name: singleLineText().min(1).max(100),
  resultId: z.number().int().positive(),
  runIds: z.array(z.number().int().positive()).min(1).max(TRIAL_UPLOAD_LIMITS.maxRuns * 10),
});
export type SaveRobotProfileRequest = z.infer<typeof SaveRobotProfileRequest>;

/** A named robot profile (GET /api/robot-profiles, 201 of the POST). */
export interface NamedRobotProfile {
  readonly id: number;
  readonly name: string;
  readonly owner: string;
  readonly profile: RobotProfile;
  readonly provenance: ProfileProvenance;
  readonly createdAt: string;
}
