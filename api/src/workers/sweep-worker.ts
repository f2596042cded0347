/**
 * A sweep worker: takes run jobs from pg-boss and runs them on a piscina pool, one pg-boss
 * poller per thread. Embedded in the server by default (`npm start` completes sweeps alone);
 * `npm run worker` runs the same thing on any machine that reaches DATABASE_URL.
 */
import type PgBoss from 'pg-boss';
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import { solverKey, type SolverRef, type WorkerSolver } from '@shared/external-solvers';
import { defineModels } from '../db/models';
import { createSequelize } from '../db/sequelize';
import type { Mailer } from '../mail/mailer';
import { notifySweepOver } from '../mail/notify-sweep-over';
import { readSolverBuild } from './machine-info';
import { PlanPool } from './plan-pool';
import { processRun, workerName, type RunContext } from './process-run';
import { listenChannels, SWEEP_CANCEL_CHANNEL, type ChannelListener } from './sweep-channels';
import { missingProcessTools } from './external-process';
import { processExternalRun } from './process-external-run';
import { declareSolvers, type SolverDeclaration } from './solver-declarations';
import { createBoss, externalRunQueue, RUN_QUEUE, type RunJobData } from './sweep-queue';
import { withDbRetry } from './with-db-retry';

/** Options of startSweepWorker. */
export interface SweepWorkerOptions {
  readonly databaseUrl: string;
  readonly threads: number;
  readonly logger: Logger;
  /** Sends the sweep-over e-mail when this worker closes a sweep; none = no e-mail from here. */
  readonly mailer?: Mailer;
  /** Base URL for links in e-mail. */
  readonly publicUrl: string;
  /** pg-boss maintenance interval (expired jobs of dead workers come back), s. */
  readonly maintenanceSeconds?: number;
  /** pg-boss polling interval, s (≥ 0.5). */
  readonly pollingSeconds?: number;
  /** Worker file for the pool (tests). */
  readonly threadFile?: string;
  /** Heap limits whose threads are loaded before the first job and kept loaded; default WARM_MEMORY_LIMITS_MB. */
  readonly warmMemoryLimitsMb?: readonly number[];
  /**
   * Registered external solvers installed on this machine (WORKER_SOLVERS): the worker takes jobs
   * from each one's queue, one at a time per solver, beside its built-in runs (issue 16, item 4),
   * and runs a registration only when its command's SHA-256 is the one pinned here.
   */
  readonly solvers?: readonly WorkerSolver[];
}

/** The heap limit of the sweep form's default (web/src/app/sweeps/sweep-form-rules.ts), MB: warmed at start. */
export const WARM_MEMORY_LIMITS_MB: readonly number[] = [512];

/** A running worker. */
export interface SweepWorker {
  readonly threads: number;
  readonly name: string;
  /**
   * Stops taking jobs; `graceful` waits for running built-in ones (up to `timeoutMs`), else aborts
   * them (they are retried elsewhere). Running external solvers are killed when the stop begins
   * either way (one may run for an hour); their jobs come back like aborted built-in runs.
   */
  stop(options?: { readonly graceful?: boolean; readonly timeoutMs?: number }): Promise<void>;
}

/** Starts a worker (see the module comment). */
export async function startSweepWorker(options: SweepWorkerOptions): Promise<SweepWorker> {
  const { logger } = options;
  const sequelize: Sequelize = createSequelize(options.databaseUrl, { poolMax: options.threads + 2 });
  const models = defineModels(sequelize);
  const pool = new PlanPool({ threads: options.threads, filename: options.threadFile });
  const build = readSolverBuild(options.threads);
  const name = workerName();
  let isStopping = false;
  const shutdown = new AbortController();
  const cancels = new Map<number, AbortController>();
  const signalFor = (sweepId: number): AbortSignal => {
    let c = cancels.get(sweepId);
    if (!c) {
      c = new AbortController();
      cancels.set(sweepId, c);
    }
    return AbortSignal.any([c.signal, shutdown.signal]);
  };
  const listener: ChannelListener = listenChannels(options.databaseUrl, [SWEEP_CANCEL_CHANNEL], (_channel, payload) => {
    const sweepId = (payload as { sweepId?: number } | null)?.sweepId;
    if (typeof sweepId !== 'number') return;
    logger.info({ sweepId }, 'sweep cancelled: aborting its running tasks');
    signalFor(sweepId);
    cancels.get(sweepId)?.abort();
  }, { logger });

  // Load the threads before taking jobs, so the first runs' wall times (claim to result) hold
  // no thread start-up; a heap limit not warmed here starts its threads on its first run.
  try {
    for (const mb of options.warmMemoryLimitsMb ?? WARM_MEMORY_LIMITS_MB) await pool.warm(mb);
  } catch (err) {
    await listener.close();
    await pool.close();
    await sequelize.close();
    throw err;
  }

  const ctx: RunContext = { sequelize, models, pool, build, logger, workerName: name, signalFor, isStopping: () => isStopping };
  let boss: PgBoss;
  try {
    boss = await withDbRetry(() => createBoss(options.databaseUrl, { logger, maintenanceSeconds: options.maintenanceSeconds, max: 2 }));
  } catch (err) {
    await listener.close();
    await pool.close();
    await sequelize.close();
    throw err;
  }

  const handle = async (jobs: PgBoss.Job<RunJobData>[], runOne = processRun, runCtx = ctx): Promise<void> => {
    for (const job of jobs) {
      const outcome = await runOne(runCtx, job.data);
      if (outcome.kind === 'recorded') {
        logger.debug({ runId: job.data.runId, status: outcome.result.status, isWritten: outcome.record.isWritten }, 'run recorded');
        if (outcome.record.isSweepClosed) {
          logger.info({ sweepId: job.data.sweepId }, 'sweep over');
          if (options.mailer) {
            const mailer = options.mailer;
            await notifySweepOver(sequelize, mailer, job.data.sweepId, options.publicUrl, logger).catch((err: Error) =>
              logger.error({ err: err.message, sweepId: job.data.sweepId }, 'sweep e-mail failed'));
          }
        }
      }
    }
  };
  // One poller per thread: pg-boss 10 hands each poller one batch at a time. A poller whose
  // job took less than the polling interval would sleep out the rest before fetching again
  // (measured: 0.5 s per run); notifying it after a job makes it fetch the next one at once.
  const workIds: string[] = [];
  for (let i = 0; i < options.threads; i++) {
    const slot: { id?: string } = {};
    slot.id = await boss.work<RunJobData>(RUN_QUEUE, { batchSize: 1, pollingIntervalSeconds: options.pollingSeconds ?? 0.5 }, async (jobs) => {
      await handle(jobs);
      if (slot.id && !isStopping) boss.notifyWorker(slot.id);
    });
    workIds.push(slot.id);
  }
  // External solvers: one poller per declared solver. Its child process runs beside the pool's
  // threads, so a machine with N cores and one declared solver may run N + 1 busy processes;
  // declare fewer threads if that matters. The plan's check and replays take a thread of a pool
  // of their own (one thread per solver, loaded on first use): in the built-in pool they would
  // queue behind runs of up to an hour and could be given up as never started.
  const missingTools = (options.solvers ?? []).length > 0 ? missingProcessTools() : [];
  if (missingTools.length > 0) {
    // Not fatal (the embedded worker declares the example solver by default): the runs wait, and the sweep page says so.
    logger.error({ missing: missingTools, solvers: options.solvers?.map(solverKey) }, 'external solvers not declared: tools for running them are missing');
  }
  const solvers = missingTools.length > 0 ? [] : options.solvers ?? [];
  let declaration: SolverDeclaration = { stop: async () => undefined };
  const checkPool = solvers.length > 0 ? new PlanPool({ threads: solvers.length, filename: options.threadFile }) : undefined;
  // The command hash each solver's operator approved: a registration whose command differs is refused per run.
  const approved = new Map(solvers.map((x) => [solverKey(x), x.commandSha256]));
  // Aborted when the worker begins to stop: external processes are killed then (their jobs come back).
  const externalStop = new AbortController();
  const externalCtx: RunContext = {
    ...ctx, pool: checkPool ?? pool,
    signalFor: (sweepId) => AbortSignal.any([signalFor(sweepId), externalStop.signal]),
    approvedCommand: (ref: SolverRef) => approved.get(solverKey(ref)),
  };
  try {
    for (const ref of solvers) {
      const queue = externalRunQueue(ref);
      await boss.createQueue(queue);
      const slot: { id?: string } = {};
      slot.id = await boss.work<RunJobData>(queue, { batchSize: 1, pollingIntervalSeconds: options.pollingSeconds ?? 0.5 }, async (jobs) => {
        await handle(jobs, processExternalRun, externalCtx);
        if (slot.id && !isStopping) boss.notifyWorker(slot.id);
      });
      workIds.push(slot.id);
    }
    declaration = await withDbRetry(() => declareSolvers(sequelize, name, solvers, logger));
  } catch (err) {
    await boss.stop({ graceful: false, wait: true }).catch(() => undefined);
    await listener.close();
    await pool.close();
    await checkPool?.close();
    await sequelize.close();
    throw err;
  }
  logger.info({ worker: name, threads: options.threads, cpu: build.cpuModel, commit: build.commit, solvers: solvers.map(solverKey) }, 'sweep worker taking jobs');

  let stopped: Promise<void> | undefined;
  return {
    threads: options.threads,
    name,
    stop(stopOptions = {}) {
      stopped ??= (async () => {
        const graceful = stopOptions.graceful ?? true;
        for (const id of workIds) await boss.offWork({ id }).catch(() => undefined);
        isStopping = true;
        externalStop.abort();
        if (!graceful) shutdown.abort();
        await boss.stop({ graceful, wait: true, timeout: stopOptions.timeoutMs ?? 30_000 }).catch(() => undefined);
        await declaration.stop();
        await listener.close();
        await pool.close();
        await checkPool?.close();
        await sequelize.close();
      })();
      return stopped;
    },
  };
}
