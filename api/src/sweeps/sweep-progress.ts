/** Progress and result rows of a sweep, read with SQL aggregates (shared by the routes and the SSE stream). */
import { QueryTypes, type Sequelize } from 'sequelize';
import { emptyRunCounts, isSweepOver, type ExecutionView, type RunStatus, type SweepProgress, type SweepResultRow, type SweepStatus } from '@shared/runs';
import { cbsSwitchLabel, forbidsFollowing, isBounded, suboptimalityOf, switchesOff, type ModelSpec, type SweepDefinition, type SweepPolicy } from '@shared/sweeps';
import { EXTERNAL_FAILURE_PREFIX, solverKey } from '@shared/external-solvers';
import type { PlanModel } from '@shared/plan';
import { workersWith } from '../external-solvers/external-solvers.service';

/**
 * A short label of a model with its parameters, e.g. `k-robust k=2`, `classic following forbidden`, `classic w=1.5`,
 * `classic without Bypass, WDG heuristic` (switches by their labels in shared/sweeps.ts; the
 * definition in the same response keeps the field names).
 */
export function modelLabel(m: ModelSpec): string {
  const off = switchesOff(m).map(cbsSwitchLabel);
  return [
    m.model, m.model === 'k-robust' ? `k=${m.k}` : '', m.externalSolver ? `by ${solverKey(m.externalSolver)}` : '', isBounded(m) ? `w=${suboptimalityOf(m)}` : '', forbidsFollowing(m) ? 'following forbidden' : '', off.length ? `without ${off.join(', ')}` : '',
  ].filter(Boolean).join(' ');
}

/** The progress of sweep `sweepId`, or null when there is none. */
export async function readProgress(sequelize: Sequelize, sweepId: number, nowMs = Date.now()): Promise<SweepProgress | null> {
  const [sweep] = await sequelize.query<{ status: SweepStatus; definition: SweepDefinition; started_at: Date | null; finished_at: Date | null; run_count: number }>(
    'SELECT status, definition, started_at, finished_at, run_count FROM sweeps WHERE id = :sweepId',
    { replacements: { sweepId }, type: QueryTypes.SELECT },
  );
  if (!sweep) return null;
  const rows = await sequelize.query<{ model_index: number; status: RunStatus; n: string }>(
    'SELECT model_index, status, count(*) AS n FROM runs WHERE sweep_id = :sweepId GROUP BY model_index, status',
    { replacements: { sweepId }, type: QueryTypes.SELECT },
  );
  const counts = emptyRunCounts();
  const perModel = sweep.definition.models.map((m, modelIndex) => ({
    modelIndex, model: m.model as PlanModel, label: modelLabel(m), counts: emptyRunCounts(),
    switchesOff: switchesOff(m).map((name) => ({ name, label: cbsSwitchLabel(name) })),
  }));
  for (const r of rows) {
    counts[r.status] += Number(r.n);
    const pm = perModel[r.model_index];
    if (pm) pm.counts[r.status] += Number(r.n);
  }
  // External solvers' specs say whether some worker has the solver; runs no worker can take wait visibly.
  const withExternal = await Promise.all(perModel.map(async (pm) => {
    const ref = sweep.definition.models[pm.modelIndex].externalSolver;
    if (!ref) return pm;
    const workers = (await workersWith(sequelize, ref)).length;
    const key = solverKey(ref);
    const waiting = pm.counts.pending > 0 && workers === 0 && !isSweepOver(sweep.status) ? `waiting for a worker with solver ${key}` : null;
    // Runs a worker refused because the registered command is not the one its operator approved (process-external-run.ts).
    const [unapproved] = pm.counts.error === 0 ? [{ n: '0' }] : await sequelize.query<{ n: string }>(
      `SELECT count(*) AS n FROM runs WHERE sweep_id = :sweepId AND model_index = :modelIndex AND status = 'error' AND starts_with(reason, :prefix)`,
      { replacements: { sweepId, modelIndex: pm.modelIndex, prefix: EXTERNAL_FAILURE_PREFIX.unapproved }, type: QueryTypes.SELECT },
    );
    const n = Number(unapproved?.n ?? 0);
    const refused = n > 0
      ? `${n} run${n === 1 ? '' : 's'} refused: the worker's approved command differs from the registration of ${key} (the worker's operator pins the registered command's hash in WORKER_SOLVERS)`
      : null;
    return { ...pm, external: { solver: key, workers, waiting, refused } };
  }));
  const total = sweep.run_count;
  const done = total - counts.pending - counts.running;
  let etaMs: number | null = null;
  if (!isSweepOver(sweep.status) && sweep.started_at && done > 0 && done < total) {
    const elapsed = nowMs - sweep.started_at.getTime();
    etaMs = Math.round((elapsed / done) * (total - done));
  }
  return {
    sweepId, status: sweep.status, total, done, counts, perModel: withExternal, etaMs,
    startedAt: sweep.started_at?.toISOString() ?? null, finishedAt: sweep.finished_at?.toISOString() ?? null,
  };
}

interface ResultSqlRow {
  run_id: number; result_id: number | null; scenario_id: number; scenario_name: string; map_name: string; agents: number; model_index: number; model: PlanModel;
  seed: string; status: RunStatus; soc: number | null; makespan: number | null; ti_soc: number | null; ti_makespan: number | null;
  lower_bound: number | null; gap: number | null; w: number; runtime_ms: number | null; nodes: number | null; reason: string | null; executions: ExecutionView[] | null;
  cpu_time_ms: number | null; peak_memory_kb: string | null;
}

/** Result rows of a sweep (every run, with its result when there is one), optionally one run only or only runs that are over. */
export async function readResultRows(sequelize: Sequelize, sweepId: number, options: { readonly runId?: number } = {}): Promise<SweepResultRow[]> {
  const rows = await sequelize.query<ResultSqlRow>(
    `SELECT r.id AS run_id, res.id AS result_id, r.scenario_id, sc.name AS scenario_name, m.name AS map_name, r.agents, r.model_index, r.model, r.seed, r.status,
       res.soc, res.makespan, res.turn_inclusive_soc_ms AS ti_soc, res.turn_inclusive_makespan_ms AS ti_makespan,
       res.lower_bound, res.gap, COALESCE((r.params->'model'->>'suboptimality')::float8, 1) AS w, res.runtime_ms, res.nodes, COALESCE(res.reason, r.reason) AS reason,
       res.cpu_time_ms, res.peak_memory_kb,
       (SELECT json_agg(json_build_object('policy', e.policy, 'runs', e.runs, 'successRate', e.success_rate, 'collisionsMean', e.collisions_mean,
          'realisedMakespanMeanMs', e.realised_makespan_mean_ms, 'realisedMakespanP95Ms', e.realised_makespan_p95_ms,
          'finishSpreadMeanMs', e.finish_spread_mean_ms, 'ci95', e.metrics->'ci95') ORDER BY e.policy) FROM executions e WHERE e.result_id = res.id) AS executions
     FROM runs r
     JOIN scenarios sc ON sc.id = r.scenario_id
     JOIN maps m ON m.id = r.map_id
     LEFT JOIN results res ON res.run_id = r.id
     WHERE r.sweep_id = :sweepId ${options.runId !== undefined ? 'AND r.id = :runId' : ''}
     ORDER BY r.id`,
    { replacements: { sweepId, runId: options.runId ?? null }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({
    runId: r.run_id, resultId: r.result_id, scenarioId: r.scenario_id, scenarioName: r.scenario_name, mapName: r.map_name, agents: r.agents,
    modelIndex: r.model_index, model: r.model, seed: Number(r.seed), status: r.status,
    soc: r.soc, makespan: r.makespan, turnInclusiveSocMs: r.ti_soc, turnInclusiveMakespanMs: r.ti_makespan,
    lowerBound: r.lower_bound, gap: r.gap, suboptimality: r.w, runtimeMs: r.runtime_ms, nodes: r.nodes, reason: r.reason,
    executions: (r.executions ?? []).map((e) => ({ ...e, policy: e.policy as SweepPolicy })),
    cpuTimeMs: r.cpu_time_ms, peakMemoryKb: r.peak_memory_kb === null ? null : Number(r.peak_memory_kb),
  }));
}
