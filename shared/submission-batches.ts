/** The batch submission format's constants and the responses of /api/submissions/batches (zod-free, for the web bundle). */
import type { PlanFileProblem, SubmissionView, SubmissionViolation } from './submissions';

/** The format name of a batch manifest. */
export const BATCH_MANIFEST_FORMAT = 'quarterturn-plan-batch';
/** The manifest's file name at the root of a batch zip. */
export const BATCH_MANIFEST_FILE = 'batch.json';
/** The multipart field of the zip in POST /api/submissions/batches. */
export const BATCH_UPLOAD_FIELD = 'archive';

/** Limits of one batch (common practice: bounded so one request cannot occupy the checks for long). */
export const BATCH_LIMITS = {
  /** Plans one batch may hold. */
  maxEntries: 200,
  /** Bytes of the zip as sent. */
  maxZipBytes: 32 * 1024 * 1024,
  /** Bytes of every file in the zip together, after unzipping (zip-bomb guard). */
  maxUnzippedBytes: 64 * 1024 * 1024,
  /** Characters of one plan file (the single submission's limit). */
  maxPlanChars: 900_000,
  /** Batches one person may have running at once. */
  maxRunningPerUser: 2,
} as const;

/** Whether a batch still has plans to check. */
export type SubmissionBatchStatus = 'running' | 'done';

/** Where one plan of a batch stands. */
export type BatchEntryStatus = 'pending' | 'accepted' | 'refused';

/** Why a plan of a batch was refused: its first violation, the problems reading its file, or another reason (instance not found…). */
export interface BatchEntryRefusal {
  /** PLAN_REJECTED (the validator), VALIDATION_FAILED (the file), SCENARIO_NOT_FOUND, COMPUTE_TIME_LIMIT, … */
  readonly code: string;
  readonly message: string;
  readonly violation?: SubmissionViolation;
  readonly problems?: readonly PlanFileProblem[];
}

/** One plan of a batch and its outcome. */
export interface BatchEntryView {
  /** 1-based place in the manifest. */
  readonly position: number;
  /** The plan file in the zip, or `plans[i]` for a JSON batch. */
  readonly file: string;
  /** Line of the entry in batch.json (0 for a JSON batch sent as the request body). */
  readonly line: number;
  /** What the manifest says the plan is for, as written (names or ids). */
  readonly instance: string;
  readonly status: BatchEntryStatus;
  /** The stored submission and Quarterturn's figures, when accepted (execution rates under every policy). */
  readonly accepted: SubmissionView | null;
  readonly refusal: BatchEntryRefusal | null;
}

/** A batch without its plans, as the list shows it. */
export interface SubmissionBatchSummary {
  readonly id: number;
  readonly status: SubmissionBatchStatus;
  readonly source: 'zip' | 'json';
  /** The zip's file name, or null for a JSON batch. */
  readonly fileName: string | null;
  readonly total: number;
  /** accepted + refused. */
  readonly done: number;
  readonly accepted: number;
  readonly refused: number;
  readonly createdAt: string;
  readonly finishedAt: string | null;
}

/** GET /api/submissions/batches/:id: progress and the per-plan outcome table. */
export interface SubmissionBatchView extends SubmissionBatchSummary {
  readonly entries: readonly BatchEntryView[];
}

/** GET /api/submissions/batches: the signed-in researcher's batches, newest first. */
export interface SubmissionBatchListResponse {
  readonly items: readonly SubmissionBatchSummary[];
}

/** Error code of a batch refused because the person has BATCH_LIMITS.maxRunningPerUser batches running (429). */
export const TOO_MANY_BATCHES = 'TOO_MANY_BATCHES';
