/**
 * The history of one leaderboard row (issue 16, item 5): every stored result of an instance ×
 * plan model variant × robot profile (the key of leaderboard_entries, migration 0401), whatever
 * its status and whether or not the board shows it now. Results are looked up through the
 * index results_leaderboard_key, so a row with many results costs one index range.
 *
 * Visibility is the instance set's (instance-set-access.ts): a row of a set the viewer may not
 * see answers 404 like a row with no results, so a private set's scenario ids leak nothing.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { hasRole } from '@shared/auth';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { costUnitOf, type HistoryItem, type HistoryQuery, type HistorySource, type InstanceHistory } from '@shared/history';
import { profileLabel } from '@shared/leaderboards';
import type { RobotProfile } from '@shared/plan';
import type { ExecutionView, RunOutcome } from '@shared/runs';
import type { SweepPolicy } from '@shared/sweeps';
import { AppError } from '../errors/app-error';
import { isSetVisible, type Viewer } from '../instance-sets/instance-set-access';

/** The solver of a sweep result of Quarterturn's own search (submissions and external solvers' results name their own, migration 0411). */
export const SWEEP_SOLVER_NAME = 'Quarterturn CBS';

/** The service behind GET /api/history. */
export interface HistoryService {
  /** Throws 404 NOT_FOUND for an unknown row or one of a set the viewer may not see. */
  history(viewer: Viewer, query: HistoryQuery): Promise<InstanceHistory>;
}

interface InstanceRow {
  instance_set_id: number; set_name: string; owner_id: number; visibility: 'public' | 'private';
  map_id: number; map_name: string; scenario_name: string;
}

interface ItemRow {
  id: number; created_at: Date; status: RunOutcome; reason: string | null; run_id: number | null; sweep_id: number | null; submission_id: number | null;
  seed: string; model_params: Record<string, unknown> | null; w: number; soc: number | null; makespan: number | null; lower_bound: number | null;
  ti_soc: number | null; ti_makespan: number | null; runtime_ms: number | null; nodes: number | null; nominal: boolean | null;
  solver_version: string; solver_commit: string; node_version: string; cpu_model: string; thread_count: number; has_plan: boolean;
  sweep_name: string | null; sweep_owner: number | null; solver_name: string | null; uploader: string | null;
  profile: RobotProfile; executions: (Omit<ExecutionView, 'policy'> & { policy: string })[] | null;
}

/** The row's key as SQL conditions on `results r` (named replacements scenarioId, agents, model, profile, variant). */
const KEY_SQL = `r.scenario_id = :scenarioId AND r.agents = :agents AND r.model = :model
  AND r.robot_profile_hash = :profile AND leaderboard_variant(r.params) = :variant`;

/** Builds the service on one connection. */
export function createHistoryService(deps: { readonly sequelize: Sequelize }): HistoryService {
  const { sequelize } = deps;
  const select = <T extends object>(sql: string, replacements: Record<string, unknown>) => sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

  function sourceOf(r: ItemRow, viewer: Viewer): HistorySource {
    if (r.sweep_id !== null) {
      const isSweepVisible = viewer !== null && (viewer.id === r.sweep_owner || hasRole(viewer.role, 'maintainer'));
      // A sweep's name is as private as the sweep (sweep-access.ts): others learn only that a sweep computed it.
      return { kind: 'sweep', sweepId: r.sweep_id, sweepName: isSweepVisible ? r.sweep_name ?? '' : null, runId: r.run_id, isSweepVisible };
    }
    if (r.submission_id !== null) return { kind: 'submission', submissionId: r.submission_id, uploader: r.uploader ?? '' };
    return { kind: 'other' };
  }

  function itemOf(r: ItemRow, viewer: Viewer, bestId: number | null): HistoryItem {
    const isSubmission = r.submission_id !== null;
    return {
      resultId: r.id, createdAt: r.created_at.toISOString(), status: r.status, reason: r.reason, isBest: r.id === bestId, hasPlan: r.has_plan,
      source: sourceOf(r, viewer),
      solver: { name: r.solver_name ?? SWEEP_SOLVER_NAME, version: r.solver_version, commit: r.solver_commit },
      environment: { node: r.node_version, cpu: r.cpu_model, threads: r.thread_count },
      // Submissions store seed 0: no search of ours ran, so there is no seed to report.
      seed: isSubmission ? null : Number(r.seed),
      suboptimality: r.w, parameters: r.model_params ?? {},
      soc: r.soc, makespan: r.makespan, lowerBound: r.lower_bound,
      turnInclusiveSocMs: r.ti_soc, turnInclusiveMakespanMs: r.ti_makespan, runtimeMs: r.runtime_ms, nodes: r.nodes,
      isExecutableAtNominal: r.nominal,
      executions: (r.executions ?? []).map((e) => ({ ...e, policy: e.policy as SweepPolicy })),
    };
  }

  return {
    async history(viewer, q) {
      const notFound = () => new AppError('NOT_FOUND', 404,
        `No stored results for scenario ${q.scenarioId} with ${q.agents} agents, plan model ${q.model}${q.variant ? ` (${q.variant})` : ''} and robot profile ${q.profile}`);
      const [inst] = await select<InstanceRow>(
        `SELECT s.id AS instance_set_id, s.name AS set_name, s.owner_id, s.visibility, m.id AS map_id, m.name AS map_name, sc.name AS scenario_name
         FROM scenarios sc JOIN maps m ON m.id = sc.map_id JOIN instance_sets s ON s.id = sc.instance_set_id WHERE sc.id = :scenarioId`,
        { scenarioId: q.scenarioId },
      );
      if (!inst || !isSetVisible({ ownerId: inst.owner_id, visibility: inst.visibility }, viewer)) throw notFound();
      const key = { scenarioId: q.scenarioId, agents: q.agents, model: q.model, profile: q.profile, variant: q.variant };
      const [{ n }] = await select<{ n: number }>(`SELECT count(*)::int AS n FROM results r WHERE ${KEY_SQL}`, key);
      if (n === 0) throw notFound();
      // The board's row for the key (unique index leaderboard_entries_key): the result it shows now.
      const [best] = await select<{ result_id: number }>(
        `SELECT e.result_id FROM leaderboard_entries e WHERE e.scenario_id = :scenarioId AND e.agents = :agents AND e.model = :model
           AND e.variant = :variant AND e.robot_profile_hash = :profile`, key,
      );
      const rows = await select<ItemRow>(
        `SELECT r.id, r.created_at, r.status, r.reason, r.run_id, r.sweep_id, r.submission_id, r.seed, r.params->'model' AS model_params,
           COALESCE((r.params->'model'->>'suboptimality')::float8, 1) AS w,
           r.soc, r.makespan, r.lower_bound, r.turn_inclusive_soc_ms AS ti_soc, r.turn_inclusive_makespan_ms AS ti_makespan,
           r.runtime_ms, r.nodes, r.executable_at_nominal AS nominal, r.solver_version, r.solver_commit, r.node_version, r.cpu_model,
           r.thread_count, r.plan_gz IS NOT NULL AS has_plan, r.robot_profile AS profile,
           sw.name AS sweep_name, sw.owner_id AS sweep_owner, COALESCE(sub.solver_name, r.solver_name) AS solver_name, u.login AS uploader,
           (SELECT json_agg(json_build_object('policy', e.policy, 'runs', e.runs, 'successRate', e.success_rate, 'collisionsMean', e.collisions_mean,
              'realisedMakespanMeanMs', e.realised_makespan_mean_ms, 'realisedMakespanP95Ms', e.realised_makespan_p95_ms,
              'finishSpreadMeanMs', e.finish_spread_mean_ms, 'ci95', e.metrics->'ci95') ORDER BY e.policy)
            FROM executions e WHERE e.result_id = r.id) AS executions
         FROM results r
         LEFT JOIN sweeps sw ON sw.id = r.sweep_id
         LEFT JOIN submissions sub ON sub.id = r.submission_id
         LEFT JOIN users u ON u.id = sub.uploader_id
         WHERE ${KEY_SQL}
         ORDER BY r.created_at DESC, r.id DESC
         OFFSET :start LIMIT :limit`,
        { ...key, start: q.start, limit: q.limit },
      );
      // The profile is the same for every result of the key (its hash is part of it); read it from any.
      const profile = rows[0]?.profile ?? (await select<{ profile: RobotProfile }>(`SELECT r.robot_profile AS profile FROM results r WHERE ${KEY_SQL} LIMIT 1`, key))[0].profile;
      return {
        instance: {
          instanceSetId: inst.instance_set_id, instanceSetName: inst.set_name, mapId: inst.map_id, mapName: inst.map_name,
          scenarioId: q.scenarioId, scenarioName: inst.scenario_name, agents: q.agents,
        },
        model: q.model, variant: q.variant,
        profile: { hash: q.profile, label: profileLabel(profile), parameters: profile },
        costUnit: costUnitOf(q.model),
        total: n, start: q.start, limit: q.limit,
        items: rows.map((r) => itemOf(r, viewer, best?.result_id ?? null)),
        safetyNote: SAFETY_NOTE,
      };
    },
  };
}
