/**
 * The pg-boss queue of sweep runs, in the app's own PostgreSQL database (schema `pgboss`):
 * one job per run carrying only ids. Exactly-once results do not rely on the queue (a job may
 * run twice after a worker dies); they rest on the runs/results unique keys.
 */
import { createHash, randomUUID } from 'node:crypto';
import PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import { solverKey, type SolverRef } from '@shared/external-solvers';

/** Name of the queue of sweep runs. */
export const RUN_QUEUE = 'qt-sweep-runs';

/**
 * The queue of an external solver's runs (issue 16, item 4): one per name and version, which
 * only workers declaring that solver (WORKER_SOLVERS) take jobs from, so a run never lands on a
 * machine without the program. Built-in runs stay on RUN_QUEUE. The name holds only letters,
 * digits, `_` and `-` (what pg-boss documents for queue names): the name, the version with its
 * `.` and `+` written as `_`, and the first 8 hex digits of the SHA-1 of `name@version`, so two
 * keys that read alike once written this way (1.0 and 1+0, or a-1@2 and a@1-2) stay apart.
 * Every place that names the queue (launch, cancel, workers) calls this one function.
 */
export function externalRunQueue(ref: SolverRef): string {
  const key = solverKey(ref);
  const digest = createHash('sha1').update(key, 'utf8').digest('hex').slice(0, 8);
  return `qt-external-runs-${ref.name}-${ref.version.replace(/[.+]/g, '_')}-${digest}`;
}

/**
 * The limit of an external run's plan check and replays in a pool thread, ms, counted from the
 * check's own start after the process ended (process-external-run.ts). The run's job expires
 * after the process's time limit plus this plus the margin (externalJobLimitMs, sweeps.service.ts),
 * so a long check is never mistaken for a dead worker and run a second time.
 */
export const EXTERNAL_CHECK_LIMIT_MS = 60_000;

/** The time an external run's job may take before it expires (without the margin), ms: the process's limit, then the check's. */
export function externalJobLimitMs(timeLimitMs: number): number {
  return timeLimitMs + EXTERNAL_CHECK_LIMIT_MS;
}

/** The data of one job. */
export interface RunJobData {
  readonly runId: number;
  readonly sweepId: number;
}

/** Options of createBoss. */
export interface BossOptions {
  /** How often expired jobs (their worker died) are put back for retry, s (≥ 1). */
  readonly maintenanceSeconds?: number;
  /** Whether this instance runs maintenance (expiry, archiving). */
  readonly isSupervisor?: boolean;
  readonly logger: Logger;
  /** Connection pool size of pg-boss. */
  readonly max?: number;
}

/** Starts pg-boss on `databaseUrl` (installing its schema on first use) and makes sure the run queue exists. */
export async function createBoss(databaseUrl: string, options: BossOptions): Promise<PgBoss> {
  const boss = new PgBoss({
    connectionString: databaseUrl,
    max: options.max ?? 4,
    supervise: options.isSupervisor ?? true,
    maintenanceIntervalSeconds: options.maintenanceSeconds ?? 10,
    // Job history is not needed once a run's row says how it ended.
    archiveCompletedAfterSeconds: 3600,
    deleteAfterDays: 7,
    schedule: false,
  });
  // pg-boss reports lost connections (e.g. a PostgreSQL restart) as events and keeps polling;
  // without a listener an 'error' event would end the process.
  boss.on('error', (err) => options.logger.warn({ err: err.message }, 'job queue: database error (will retry)'));
  await boss.start();
  await boss.createQueue(RUN_QUEUE);
  return boss;
}

/** Job options of a run: expiry = the run's time limit plus a margin, so a dead worker's job comes back. */
export function runJobExpirySeconds(timeLimitMs: number, marginSeconds: number): number {
  return Math.ceil(timeLimitMs / 1000) + Math.max(1, marginSeconds);
}

/** A run's job, with an id chosen here so the run row can name it (for cancel). */
export function runJob(data: RunJobData, timeLimitMs: number, marginSeconds: number, queue = RUN_QUEUE): PgBoss.JobInsert<RunJobData> & { readonly id: string; readonly data: RunJobData } {
  return {
    id: randomUUID(),
    name: queue,
    data,
    expireInSeconds: runJobExpirySeconds(timeLimitMs, marginSeconds),
    // Retries cover workers that died mid-run; a run's own failures are recorded, not retried.
    retryLimit: 10,
    retryDelay: 1,
  };
}

/** Inserts jobs in chunks (one statement each); with `db`, inside the caller's transaction. */
export async function sendRunJobs(boss: PgBoss, jobs: readonly PgBoss.JobInsert<RunJobData>[], db?: PgBoss.Db): Promise<void> {
  for (let i = 0; i < jobs.length; i += 500) await boss.insert(jobs.slice(i, i + 500) as PgBoss.JobInsert[], db ? { db } : {});
}
