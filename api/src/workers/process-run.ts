/**
 * One job of the run queue, start to end: claim the run, build its task from the stored
 * instance and the sweep definition, run it in the pool under its limits, and record the
 * outcome exactly once (record-run-result.ts).
 */
import { hostname } from 'node:os';
import { QueryTypes, type Sequelize } from 'sequelize';
import type { Logger } from 'pino';
import type { SolverRef } from '@shared/external-solvers';
import type { SolverBuild } from '@shared/runs';
import type { SweepDefinition } from '@shared/sweeps';
import type { PlanTask, PlanTaskResult } from '@solvers/run/plan-task';
import { bareResult } from '@solvers/run/run-plan-task';
import { taskLowerBound } from '@solvers/run/task-lower-bound';
import { toTaskInstance } from '@solvers/run/task-instance';
import type { Models } from '../db/models';
import { loadInstance } from '../instance-sets/load-instance';
import type { PlanPool } from './plan-pool';
import { recordRunResult, type ClaimedRun, type RecordOutcome } from './record-run-result';
import type { RunJobData } from './sweep-queue';
import { withDbRetry } from './with-db-retry';

/**
 * How long after the solver's own time limit the thread is terminated, ms ("stopped within a
 * second of the limit"); both count from the moment the thread begins the run (plan-pool.ts).
 */
export const HARD_LIMIT_GRACE_MS = 750;

/** What process-run needs from its worker. */
export interface RunContext {
  readonly sequelize: Sequelize;
  readonly models: Models;
  readonly pool: PlanPool;
  readonly build: SolverBuild;
  readonly logger: Logger;
  /** Identifies this worker process in run rows. */
  readonly workerName: string;
  /** Signal of the sweep's cancel (and of a forced shutdown). */
  signalFor(sweepId: number): AbortSignal;
  /** Whether the worker is stopping (no more DB retries then). */
  isStopping(): boolean;
  /** The command hash this worker's operator approved for an external solver (WORKER_SOLVERS), or undefined. */
  approvedCommand?(ref: SolverRef): string | undefined;
}

/** The worker name of this process. */
export function workerName(): string {
  return `${hostname()}:${process.pid}`;
}

/** What became of a job. */
export type JobOutcome = { readonly kind: 'skipped' } | { readonly kind: 'recorded'; readonly record: RecordOutcome; readonly result: PlanTaskResult };

/** Processes one job (see the module comment); throws only when the database stays unreachable. */
export async function processRun(ctx: RunContext, job: RunJobData): Promise<JobOutcome> {
  const retry = <T>(fn: () => Promise<T>) => withDbRetry(fn, 60_000, ctx.isStopping);
  const claimed = await retry(() => claimRun(ctx.sequelize, job, ctx.workerName));
  if (!claimed) return { kind: 'skipped' };
  const { run, definition } = claimed;
  const started = performance.now();
  if (definition.models[run.modelIndex]?.externalSolver) {
    // Never solve an external solver's run with our own search (its results would carry the solver's variant).
    const result = bareResult('error', "this run belongs to an external solver's queue, not to the built-in one");
    return { kind: 'recorded', result, record: await retry(() => recordRunResult(ctx.sequelize, run, result, ctx.build, 0)) };
  }
  let task: PlanTask;
  try {
    const loaded = await retry(() => loadInstance(ctx.models, run.scenarioId, run.agents));
    const model = definition.models[run.modelIndex];
    task = {
      model,
      instance: toTaskInstance(loaded.instance),
      profile: definition.robotProfile,
      timeLimitMs: definition.timeLimitMs,
      memoryLimitMb: definition.memoryLimitMb,
      seed: run.seed,
      execution: definition.execution,
    };
  } catch (err) {
    const result = bareResult('error', `could not build the instance: ${(err as Error).message}`);
    return { kind: 'recorded', result, record: await retry(() => recordRunResult(ctx.sequelize, run, result, ctx.build, performance.now() - started)) };
  }

  const signal = ctx.signalFor(run.sweepId);
  const outcome = await ctx.pool.run(task, { hardLimitMs: definition.timeLimitMs + HARD_LIMIT_GRACE_MS, memoryLimitMb: definition.memoryLimitMb, signal });
  const elapsed = performance.now() - started;
  let result: PlanTaskResult;
  switch (outcome.kind) {
    case 'done':
      result = outcome.result;
      break;
    case 'hard-timeout':
      result = bareResult('timeout', 'time limit reached: the solver did not stop by itself and its thread was terminated', taskLowerBound(task), elapsed);
      break;
    case 'memory':
      result = bareResult('memory', `memory limit of ${definition.memoryLimitMb} MB reached: the thread was terminated`, taskLowerBound(task), elapsed);
      break;
    case 'aborted':
      // Cancelled sweep (its runs are already marked) or a forced shutdown (the job comes back).
      if (ctx.isStopping()) throw new Error(`run ${run.id} interrupted by worker shutdown`);
      return { kind: 'skipped' };
    case 'crashed':
      result = bareResult('error', `the worker thread failed: ${outcome.message}`);
      break;
    case 'refused':
      result = bareResult('error', `the worker thread refused the run: ${outcome.refusal.message}`);
      break;
    case 'not-started':
      result = bareResult('error', 'no worker thread began the run: the pool could not load a thread');
      break;
  }
  const record = await retry(() => recordRunResult(ctx.sequelize, run, result, ctx.build, elapsed));
  return { kind: 'recorded', record, result };
}

interface ClaimedRow {
  id: number; sweep_id: number; instance_set_id: number; map_id: number; scenario_id: number; agents: number;
  model: string; model_index: number; params: Record<string, unknown>; param_hash: string; seed: string; definition: SweepDefinition;
}

/** Marks the run running (a run already over, or of a sweep no longer live, is not claimed: null). Also used for external solvers' runs. */
export async function claimRun(sequelize: Sequelize, job: RunJobData, worker: string): Promise<{ run: ClaimedRun; definition: SweepDefinition } | null> {
  await sequelize.query(
    "UPDATE sweeps SET status = 'running', started_at = COALESCE(started_at, now()), updated_at = now() WHERE id = :id AND status = 'queued'",
    { replacements: { id: job.sweepId } },
  );
  const rows = await sequelize.query<ClaimedRow>(
    `UPDATE runs r SET status = 'running', attempts = r.attempts + 1, started_at = now(), worker = :worker
     FROM sweeps s
     WHERE r.id = :runId AND s.id = r.sweep_id AND s.status IN ('queued', 'running') AND r.status IN ('pending', 'running')
     RETURNING r.id, r.sweep_id, r.instance_set_id, r.map_id, r.scenario_id, r.agents, r.model, r.model_index, r.params,
       r.param_hash, r.seed, s.definition`,
    { replacements: { runId: job.runId, worker }, type: QueryTypes.SELECT },
  );
  const r = rows[0];
  if (!r) return null;
  return {
    definition: r.definition,
    run: {
      id: r.id, sweepId: r.sweep_id, instanceSetId: r.instance_set_id, mapId: r.map_id, scenarioId: r.scenario_id, agents: r.agents,
      model: r.model, modelIndex: r.model_index, params: r.params, paramHash: r.param_hash, seed: Number(r.seed),
    },
  };
}
