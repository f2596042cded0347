/**
 * What crosses into a pool thread and back: one envelope per task holding the job (a sweep run,
 * an interactive execution, an instance generation, a submitted plan's check and replays, the
 * checks of an upload, or a ping that only loads the thread) and
 * the port on which the thread says "started", so the pool's hard time limit measures the job's
 * own work and never the thread's start-up or the wait in the queue. Plain JSON-safe data.
 */
import type { MessagePort } from 'node:worker_threads';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';
import type { ExecutionTask, ExecutionTaskOutcome } from '../executions/execution-task';
import type { GenerateRequest } from '../instance-sets/generate-entries';
import type { PreparedUpload, PrepareUploadJob } from '../instance-sets/prepare-upload';
import type { MapfInstance } from '@solvers/instance';
import type { PlanReplaySettings, PlanVerdict } from '../submissions/check-plan';
import type { ReadSubmission } from '../submissions/read-plan-file';
import type { CheckTrialsJob, CheckTrialsOutcome } from '../trials/check-trials';
import type { StoredLogText } from '../trials/calibrate-trials';
import type { CalibrationResult } from '@solvers/trials/calibrate';

/** One job for a pool thread. */
export type ThreadJob =
  | { readonly kind: 'plan'; readonly task: PlanTask }
  | { readonly kind: 'execute'; readonly task: ExecutionTask }
  | { readonly kind: 'generate'; readonly request: GenerateRequest }
  /** `replay`: the sweep's replay settings for an external solver's plan (absent: a submission's). */
  | { readonly kind: 'check-plan'; readonly instance: MapfInstance; readonly submission: ReadSubmission; readonly replay?: PlanReplaySettings }
  /** `maps` answers the thread's requests for stored maps of the set (see MapRequest). */
  | { readonly kind: 'prepare-upload'; readonly upload: PrepareUploadJob; readonly maps: MessagePort }
  | { readonly kind: 'check-trials'; readonly job: CheckTrialsJob }
  | { readonly kind: 'calibrate-trials'; readonly logs: readonly StoredLogText[] }
  | { readonly kind: 'ping' };

/** A generated file as it comes back from a thread (a Buffer arrives as a plain Uint8Array). */
export interface GeneratedFile {
  readonly name: string;
  readonly bytes: Uint8Array;
}

/** What each kind of job answers. */
export interface ThreadResults {
  readonly plan: PlanTaskResult;
  readonly execute: ExecutionTaskOutcome;
  readonly generate: readonly GeneratedFile[];
  readonly 'check-plan': PlanVerdict;
  readonly 'prepare-upload': PreparedUpload;
  readonly 'check-trials': CheckTrialsOutcome;
  readonly 'calibrate-trials': CalibrationResult;
  readonly ping: 'pong';
}

/** The job kinds. */
export type ThreadJobKind = ThreadJob['kind'];

/** A prepare-upload thread asks for stored maps by name on its `maps` port; the answer is ExistingMapRows[] or `{ error }`. */
export interface MapRequest {
  readonly names: readonly string[];
}

/** What the pool posts to a thread. */
export interface ThreadEnvelope {
  readonly job: ThreadJob;
  /** The thread posts one message here when it begins the job. */
  readonly started?: MessagePort;
}

/** A refusal the job raised on purpose (an AppError in the thread): status, code and message for the client. */
export interface ThreadRefusal {
  readonly status: number;
  readonly code: string;
  readonly message: string;
  readonly details?: unknown;
}

/** What a thread answers: the job's value, or the refusal it raised. */
export type ThreadAnswer<R = unknown> = { readonly ok: true; readonly value: R } | { readonly ok: false; readonly refusal: ThreadRefusal };
