/**
 * Writes the outcome of one run, exactly once, and closes the sweep when it was the last run.
 *
 * One transaction: lock the sweep row (serialises the finishing writes of one sweep, so the
 * last two runs finishing at once cannot both miss that the sweep is over), skip when the run
 * is already over (a retried job whose first attempt did commit) or cancelled, insert the
 * result with ON CONFLICT DO NOTHING on its unique key, its executions, the run's status, and
 * NOTIFY the event (delivered at commit).
 */
import { gzipSync } from 'node:zlib';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import type { RunStatus, SolverBuild } from '@shared/runs';
import type { PlanTaskResult } from '@solvers/run/plan-task';
import { parameterHash } from '../sweeps/parameter-hash';
import { SWEEP_EVENTS_CHANNEL, type SweepEventNotice } from './sweep-channels';

/** The run row fields the writer needs. */
export interface ClaimedRun {
  readonly id: number;
  readonly sweepId: number;
  readonly instanceSetId: number;
  readonly mapId: number;
  readonly scenarioId: number;
  readonly agents: number;
  readonly model: string;
  readonly modelIndex: number;
  readonly params: Record<string, unknown>;
  readonly paramHash: string;
  readonly seed: number;
}

/** What recordRunResult did. */
export interface RecordOutcome {
  /** Whether this call wrote the result (false: an earlier attempt did, or the run was cancelled). */
  readonly isWritten: boolean;
  /** Whether this call closed the sweep (it was the last open run). */
  readonly isSweepClosed: boolean;
}

/**
 * What an external solver's run adds (issue 16, item 4; migration 0411): the solver's name and
 * version (stored as the result's solver_name and solver_version) and what its process used.
 */
export interface ExternalRunFacts {
  readonly solverName: string;
  readonly solverVersion: string;
  readonly cpuTimeMs: number | null;
  readonly peakMemoryKb: number | null;
}

/** Records `result` for `run` (see the module comment); `external` for an external solver's run. */
export async function recordRunResult(
  sequelize: Sequelize,
  run: ClaimedRun,
  result: PlanTaskResult,
  build: SolverBuild,
  elapsedMs: number,
  external?: ExternalRunFacts,
): Promise<RecordOutcome> {
  return sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
      sequelize.query<T>(sql, { replacements, transaction, type: QueryTypes.SELECT });
    await q('SELECT id FROM sweeps WHERE id = :id FOR UPDATE', { id: run.sweepId });
    const [row] = await q<{ status: RunStatus }>('SELECT status FROM runs WHERE id = :id FOR UPDATE', { id: run.id });
    if (!row || (row.status !== 'pending' && row.status !== 'running')) return { isWritten: false, isSweepClosed: false };

    const profile = (run.params as { robotProfile: unknown }).robotProfile;
    const inserted = await q<{ id: number }>(
      `INSERT INTO results (run_id, sweep_id, instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed,
         status, reason, soc, makespan, turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms,
         nodes, nodes_expanded, turns, robot_profile, robot_profile_hash, solver_version, solver_commit, node_version,
         cpu_model, thread_count, plan_gz, executable_at_nominal, nominal_collisions, solver_name, cpu_time_ms, peak_memory_kb)
       VALUES (:runId, :sweepId, :instanceSetId, :mapId, :scenarioId, :agents, :model, :params, :paramHash, :seed,
         :status, :reason, :soc, :makespan, :tiSoc, :tiMakespan, :lowerBound, :runtimeMs,
         :nodes, :nodesExpanded, :turns, :profile, :profileHash, :version, :commit, :node,
         :cpu, :threads, :plan, :atNominal, :nominalCollisions, :solverName, :cpuTimeMs, :peakMemoryKb)
       ON CONFLICT DO NOTHING RETURNING id`,
      {
        runId: run.id, sweepId: run.sweepId, instanceSetId: run.instanceSetId, mapId: run.mapId, scenarioId: run.scenarioId,
        agents: run.agents, model: run.model, params: JSON.stringify(run.params), paramHash: run.paramHash, seed: run.seed,
        status: result.status, reason: result.reason ?? null, soc: result.soc, makespan: result.makespan,
        tiSoc: result.turnInclusiveSocMs, tiMakespan: result.turnInclusiveMakespanMs, lowerBound: result.lowerBound,
        runtimeMs: result.runtimeMs, // An external solver's search effort is never measured: null (shown as "–"), not 0.
        nodes: external ? null : result.nodesGenerated, nodesExpanded: external ? null : result.nodesExpanded, turns: result.turns,
        profile: JSON.stringify(profile), profileHash: parameterHash(profile),
        version: external?.solverVersion ?? build.version, commit: build.commit, node: build.node, cpu: build.cpuModel, threads: build.threads,
        plan: result.plan ? gzipSync(JSON.stringify(result.plan)) : null,
        // Executable at nominal times (migration 0405); null when the run was not solved or not checked.
        atNominal: result.atNominal?.isCollisionFree ?? null, nominalCollisions: result.atNominal?.collisions ?? null,
        // External solvers (migration 0411); null for Quarterturn's own search.
        solverName: external?.solverName ?? null, cpuTimeMs: external?.cpuTimeMs ?? null, peakMemoryKb: external?.peakMemoryKb ?? null,
      },
    );
    const resultId = inserted[0]?.id;
    if (resultId !== undefined) await insertExecutions(sequelize, transaction, resultId, result);
    await sequelize.query(
      'UPDATE runs SET status = :status, reason = :reason, finished_at = now(), elapsed_ms = :elapsed WHERE id = :id',
      { replacements: { id: run.id, status: result.status, reason: result.reason ?? null, elapsed: elapsedMs }, transaction },
    );
    const isSweepClosed = await closeSweepIfDone(sequelize, transaction, run.sweepId);
    const notice: SweepEventNotice = { sweepId: run.sweepId, runId: run.id, isSweepOver: isSweepClosed };
    await sequelize.query('SELECT pg_notify(:channel, :payload)', { replacements: { channel: SWEEP_EVENTS_CHANNEL, payload: JSON.stringify(notice) }, transaction });
    return { isWritten: resultId !== undefined, isSweepClosed };
  });
}

async function insertExecutions(sequelize: Sequelize, transaction: Transaction, resultId: number, result: PlanTaskResult): Promise<void> {
  for (const e of result.executions) {
    await sequelize.query(
      `INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean, realised_makespan_mean_ms,
         realised_makespan_p95_ms, finish_spread_mean_ms, metrics)
       VALUES (:resultId, :policy, :noise, :runs, :successRate, :collisions, :mkMean, :mkP95, :spread, :metrics)
       ON CONFLICT DO NOTHING`,
      {
        replacements: {
          resultId, policy: e.policy, noise: JSON.stringify(e.noise), runs: e.runs, successRate: e.successRate,
          collisions: e.collisions.mean, mkMean: e.realisedMakespanMs.mean, mkP95: e.realisedMakespanMs.p95,
          spread: e.finishSpreadMs.mean, metrics: JSON.stringify(e),
        },
        transaction,
      },
    );
  }
}

/**
 * Marks the sweep over when no run is pending or running: `failed` when some run ended in
 * error, else `finished`; stores the final counts. Caller holds the sweep row lock.
 */
export async function closeSweepIfDone(sequelize: Sequelize, transaction: Transaction, sweepId: number): Promise<boolean> {
  const rows = await sequelize.query<{ status: RunStatus; n: string }>(
    'SELECT status, count(*) AS n FROM runs WHERE sweep_id = :sweepId GROUP BY status',
    { replacements: { sweepId }, transaction, type: QueryTypes.SELECT },
  );
  const counts: Record<string, number> = {};
  for (const r of rows) counts[r.status] = Number(r.n);
  if ((counts.pending ?? 0) + (counts.running ?? 0) > 0) return false;
  const status = (counts.error ?? 0) > 0 ? 'failed' : 'finished';
  const closed = await sequelize.query(
    `UPDATE sweeps SET status = :status, finished_at = now(), updated_at = now(), counts = :counts
     WHERE id = :sweepId AND status IN ('queued', 'running') RETURNING id`,
    { replacements: { status, sweepId, counts: JSON.stringify(counts) }, transaction, type: QueryTypes.SELECT },
  );
  return closed.length > 0;
}
