/**
 * The server's pool for work a request waits on (executions, instance generation, the checks of
 * uploaded files, and the check and execution replays of submitted plans): a small PlanPool
 * (plan-pool.ts, the same threads and limits as sweeps) with one heap limit, a per-job time limit
 * enforced by AbortSignal (the thread is terminated when a job ignores it) and a FairGate (fair-gate.ts) in front of it, so one user
 * cannot hold every thread while others wait and a request handler never computes on the event loop. Every
 * failure becomes an AppError the error middleware answers.
 */
import { MessageChannel } from 'node:worker_threads';
import type { ExecutionTask, ExecutionTaskOutcome } from '../executions/execution-task';
import { AppError } from '../errors/app-error';
import type { GenerateRequest } from '../instance-sets/generate-entries';
import { transferableJob, type LoadMaps, type PreparedUpload, type PrepareUploadJob } from '../instance-sets/prepare-upload';
import type { UploadEntry } from '../instance-sets/upload-entry';
import type { MapfInstance } from '@solvers/instance';
import type { PlanVerdict } from '../submissions/check-plan';
import type { ReadSubmission } from '../submissions/read-plan-file';
import type { SolverBuild } from '@shared/runs';
import { FairGate } from './fair-gate';
import { readSolverBuild } from './machine-info';
import { PlanPool, type PoolOutcome, type PoolRunOptions } from './plan-pool';
import type { MapRequest, ThreadJob, ThreadResults } from './thread-job';
import type { CheckTrialsJob, CheckTrialsOutcome } from '../trials/check-trials';
import type { StoredLogText } from '../trials/calibrate-trials';
import type { CalibrationResult } from '@solvers/trials/calibrate';

/** Error codes of the interactive pool (HTTP 503: the request may be retried later). */
export const INTERACTIVE_ERROR_CODES = {
  /** A job ran past its time limit and its thread was terminated. */
  timeLimit: 'COMPUTE_TIME_LIMIT',
  /** Too many jobs wait already, or none began within the wait limit. */
  busy: 'COMPUTE_BUSY',
  /** A job outgrew the thread's heap limit. */
  memory: 'COMPUTE_MEMORY_LIMIT',
} as const;

/** Options of the interactive pool. */
export interface InteractivePoolOptions {
  /** Threads (INTERACTIVE_THREADS, default 1). */
  readonly threads: number;
  /** Hard limit of one job from the moment its thread begins it, ms (INTERACTIVE_TIME_LIMIT_MS). */
  readonly timeLimitMs: number;
  /** Heap limit of a thread, MB; default INTERACTIVE_MEMORY_MB. */
  readonly memoryLimitMb?: number;
  /** Jobs that may wait for a thread beyond the running ones; more are refused at once (503). */
  readonly maxQueued?: number;
  /** Threads one requester may hold at once (INTERACTIVE_PER_USER_RUNNING, default 1). */
  readonly perRequesterRunning?: number;
  /** Jobs one requester may have waiting (INTERACTIVE_PER_USER_QUEUED, default 2). */
  readonly perRequesterQueued?: number;
  /** How long a job may wait for a thread, ms. */
  readonly startLimitMs?: number;
  /** Worker file (tests pass a slowed or misbehaving one). */
  readonly filename?: string;
}

/** Thread heap limit of interactive jobs, MB: the solver's own guard in execute-task.ts is 512 MB, plus the simulation's room. */
export const INTERACTIVE_MEMORY_MB = 1024;

/** Default number of jobs that may wait. */
export const INTERACTIVE_MAX_QUEUED = 8;

/** Default wait for a thread, ms. */
export const INTERACTIVE_START_LIMIT_MS = 30_000;

/** Default jobs one requester may have waiting. */
export const INTERACTIVE_PER_REQUESTER_QUEUED = 2;

/** Who asks for a computation, for turn-taking: one key per signed-in account (every computation needs one). */
export function requesterKey(account: { readonly id: number } | null): string {
  return account ? `user:${account.id}` : 'visitor';
}

/** The pool of interactive jobs (see the module comment). */
export class InteractivePool {
  private readonly pool: PlanPool;
  private readonly gate: FairGate;
  private warming: Promise<void> | undefined;
  private solverBuild: SolverBuild | undefined;

  constructor(private readonly options: InteractivePoolOptions) {
    this.pool = new PlanPool({ threads: options.threads, filename: options.filename });
    this.gate = new FairGate({
      slots: options.threads,
      perRequesterRunning: options.perRequesterRunning ?? 1,
      perRequesterQueued: options.perRequesterQueued ?? INTERACTIVE_PER_REQUESTER_QUEUED,
      maxQueued: options.maxQueued ?? INTERACTIVE_MAX_QUEUED,
      startLimitMs: options.startLimitMs ?? INTERACTIVE_START_LIMIT_MS,
    });
  }

  /** Jobs finished by the threads so far (tests prove a request went through the pool with it). */
  get completed(): number {
    return this.pool.completed;
  }

  /** Solver version, commit, Node, CPU and threads of this pool's jobs, read once. */
  get build(): SolverBuild {
    this.solverBuild ??= readSolverBuild(this.options.threads);
    return this.solverBuild;
  }

  /** The per-job time limit, ms. */
  get timeLimitMs(): number {
    return this.options.timeLimitMs;
  }

  /** Loads the threads now instead of on the first job; from then on they stay loaded (a killed one is replaced at once). */
  warm(): Promise<void> {
    this.warming ??= this.pool.warm(this.memoryLimitMb);
    return this.warming;
  }

  /** Simulates (and, without a plan, solves) one execution task in a thread. */
  execute(task: ExecutionTask, requester: string, signal?: AbortSignal): Promise<ExecutionTaskOutcome> {
    return this.run({ kind: 'execute', task }, 'the execution', requester, signal);
  }

  /** Runs the seeded generators of one generate request in a thread; throws the generator's refusal as its AppError. */
  async generate(request: GenerateRequest, requester: string, signal?: AbortSignal): Promise<UploadEntry[]> {
    const files = await this.run({ kind: 'generate', request }, 'the generation', requester, signal);
    return files.map((f) => ({ name: f.name, label: f.name, bytes: Buffer.from(f.bytes.buffer, f.bytes.byteOffset, f.bytes.byteLength) }));
  }

  /** Validates a submitted plan with its model's validator and, when it passes, replays it under every policy, in a thread. */
  checkPlan(instance: MapfInstance, submission: ReadSubmission, requester: string, signal?: AbortSignal): Promise<PlanVerdict> {
    return this.run({ kind: 'check-plan', instance, submission }, 'the plan check', requester, signal);
  }

  /**
   * Opens, parses and checks the files of one upload in a thread (issue 13: on the event loop a maximal upload
   * stalled every request for seconds). The file bytes move to the thread and the prepared bytes move back
   * (transferred, not copied); the thread asks for stored maps of the set through `loadMaps` on a MessagePort.
   */
  async prepareUpload(upload: PrepareUploadJob, loadMaps: LoadMaps, requester: string, signal?: AbortSignal): Promise<PreparedUpload> {
    const { port1, port2 } = new MessageChannel();
    port1.on('message', (request: MapRequest) => {
      loadMaps(request.names).then(
        (maps) => port1.postMessage(maps),
        (err: unknown) => port1.postMessage({ error: err instanceof Error ? err.message : String(err) }),
      );
    });
    try {
      const moved = transferableJob(upload);
      return await this.run({ kind: 'prepare-upload', upload: moved.job, maps: port2 }, 'the upload check', requester, signal, [port2, ...moved.transferList]);
    } finally {
      port1.close();
    }
  }

  /** Parses field trial logs (and zips of them), checks each against its plan and simulates the plan for comparison, in a thread. */
  checkTrials(job: CheckTrialsJob, requester: string, signal?: AbortSignal): Promise<CheckTrialsOutcome> {
    return this.run({ kind: 'check-trials', job }, 'the trial check', requester, signal);
  }

  /** Fits a robot profile to stored trial logs, in a thread. */
  calibrateTrials(logs: readonly StoredLogText[], requester: string, signal?: AbortSignal): Promise<CalibrationResult> {
    return this.run({ kind: 'calibrate-trials', logs }, 'the profile fit', requester, signal);
  }

  /** Terminates the threads; later jobs fail. */
  close(): Promise<void> {
    return this.pool.close();
  }

  private get memoryLimitMb(): number {
    return this.options.memoryLimitMb ?? INTERACTIVE_MEMORY_MB;
  }

  private async run<J extends ThreadJob>(
    job: J, what: string, requester: string, signal?: AbortSignal, transferList?: PoolRunOptions['transferList'],
  ): Promise<ThreadResults[J['kind']]> {
    const leave = await this.gate.enter(requester, what, signal);
    let outcome: PoolOutcome<ThreadResults[J['kind']]>;
    try {
      // The first job loads the threads; a thread that cannot load fails the job itself below.
      await this.warm().catch(() => undefined);
      outcome = await this.pool.runJob(job, {
        hardLimitMs: this.options.timeLimitMs,
        memoryLimitMb: this.memoryLimitMb,
        startLimitMs: this.options.startLimitMs ?? INTERACTIVE_START_LIMIT_MS,
        signal,
        transferList,
      });
    } finally {
      leave();
    }
    return resultOf(outcome, what, this.options.timeLimitMs, this.memoryLimitMb);
  }
}

/** The job's result, or the AppError its outcome answers. */
function resultOf<R>(outcome: PoolOutcome<R>, what: string, timeLimitMs: number, memoryLimitMb: number): R {
  switch (outcome.kind) {
    case 'done': return outcome.result;
    case 'refused': throw new AppError(outcome.refusal.code, outcome.refusal.status, outcome.refusal.message, outcome.refusal.details);
    case 'hard-timeout':
      throw new AppError(INTERACTIVE_ERROR_CODES.timeLimit, 503, `${capitalised(what)} did not finish within ${timeLimitMs} ms and was stopped; ask for less work (fewer runs or agents), or run a sweep.`);
    case 'not-started':
      throw new AppError(INTERACTIVE_ERROR_CODES.busy, 503, `The server was too busy to begin ${what}; try again in a moment.`);
    case 'memory':
      throw new AppError(INTERACTIVE_ERROR_CODES.memory, 503, `${capitalised(what)} needed more than ${memoryLimitMb} MB and was stopped; ask for less work, or run a sweep.`);
    case 'aborted':
      throw new AppError(INTERACTIVE_ERROR_CODES.busy, 503, `${capitalised(what)} was cancelled.`);
    case 'crashed':
      throw new Error(`${what} failed in its worker thread: ${outcome.message}`);
  }
}

function capitalised(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Loads the pool's threads in the background so the first replay a visitor asks for does not wait for them; logs the outcome. */
export function warmInteractivePool(pool: InteractivePool, logger: { info(o: object, msg: string): void; warn(o: object, msg: string): void }): void {
  const started = performance.now();
  pool.warm().then(
    () => logger.info({ ms: Math.round(performance.now() - started) }, 'interactive pool threads loaded'),
    (err: Error) => logger.warn({ err: err.message }, 'interactive pool threads did not load at start; each job loads its thread itself'),
  );
}
