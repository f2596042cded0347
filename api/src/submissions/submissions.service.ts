/**
 * Plan submissions: read the file, load the stored instance (404 when the viewer may not see it),
 * check the plan with its model's validator, and store an accepted plan as a result marked
 * `submitted` with its execution metrics, in one transaction (the leaderboard triggers pick it
 * up). A rejected plan answers 422 PLAN_REJECTED with its first violation and stores nothing.
 */
import { gzipSync } from 'node:zlib';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { SubmissionRequestSchema } from '@shared/plan-format';
import { profileLabel } from '@shared/leaderboards';
import type { PlanModel, RobotProfile } from '@shared/plan';
import { PLAN_REJECTED, type SubmissionListResponse, type SubmissionProfilesResponse, type SubmissionView } from '@shared/submissions';
import type { MapfInstance } from '@solvers/instance';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { loadInstance, type LoadedInstance } from '../instance-sets/load-instance';
import { parameterHash } from '../sweeps/parameter-hash';
import type { PlanVerdict } from './check-plan';
import { readPlanFile, type ReadSubmission } from './read-plan-file';
import { requesterKey } from '../workers/interactive-pool';
import { profilesOfInstance } from './instance-profiles';

/** The submissions service. */
export interface SubmissionsService {
  /** Checks and, when valid, stores a plan; answers the stored submission (throws 400/404/422 otherwise). */
  submit(uploader: Express.User, body: unknown): Promise<SubmissionView>;
  /** The uploader's accepted submissions, newest first (at most 200). */
  list(uploader: Express.User): Promise<SubmissionListResponse>;
  /** The robot profiles to offer for an instance, the default first (404 when the viewer may not see the scenario). */
  profiles(viewer: Express.User, query: unknown): Promise<SubmissionProfilesResponse>;
  /**
   * Loads the plan's instance (404 when the uploader may not see it) and checks the plan in the interactive pool:
   * the one check of single and batch submissions.
   */
  judge(uploader: Express.User, sub: ReadSubmission, signal?: AbortSignal): Promise<JudgedPlan>;
  /** Stores an accepted plan (submission, result, one execution row per policy) inside `transaction`; answers the submission id. */
  store(uploader: Express.User, sub: ReadSubmission, accepted: AcceptedPlan, transaction: Transaction): Promise<number>;
  /** Stored submissions by id, as the list shows them (ids that do not exist are left out). */
  views(ids: readonly number[]): Promise<Map<number, SubmissionView>>;
}

/** A plan's instance and the validator's verdict on it. */
export interface JudgedPlan {
  readonly loaded: LoadedInstance;
  readonly verdict: PlanVerdict;
}

/** A plan the validator accepted. */
export interface AcceptedPlan {
  readonly loaded: LoadedInstance;
  readonly verdict: Extract<PlanVerdict, { ok: true }>;
}

/** What a submitted result keeps in `params`: the model and what changes its problem (as a sweep's ModelSpec). */
function paramsOf(sub: ReadSubmission): Record<string, unknown> {
  return { model: { model: sub.model, startHeading: sub.startHeading, ...(sub.k !== undefined ? { k: sub.k } : {}) } };
}

interface ListRow {
  id: number; result_id: number; scenario_id: number; scenario_name: string; map_name: string; agents: number; model: PlanModel;
  variant: string; solver_name: string; solver_version: string; soc: number; makespan: number; ti_soc: number; ti_makespan: number;
  executions: { policy: string; successRate: number; finishSpreadMeanMs: number | null }[] | null; robot_profile: RobotProfile; created_at: Date;
}

const LIST_SQL = `SELECT sub.id, r.id AS result_id, sub.scenario_id, s.name AS scenario_name, m.name AS map_name, sub.agents, sub.model,
    leaderboard_variant(sub.params) AS variant, sub.solver_name, sub.solver_version, r.soc, r.makespan,
    r.turn_inclusive_soc_ms AS ti_soc, r.turn_inclusive_makespan_ms AS ti_makespan, r.robot_profile, sub.created_at,
    (SELECT json_agg(json_build_object('policy', e.policy, 'successRate', e.success_rate, 'finishSpreadMeanMs', e.finish_spread_mean_ms) ORDER BY e.policy)
       FROM executions e WHERE e.result_id = r.id) AS executions
  FROM submissions sub JOIN results r ON r.submission_id = sub.id
  JOIN scenarios s ON s.id = sub.scenario_id JOIN maps m ON m.id = s.map_id`;

function toView(r: ListRow): SubmissionView {
  return {
    id: r.id, resultId: r.result_id, scenarioId: r.scenario_id, scenarioName: r.scenario_name, mapName: r.map_name, agents: r.agents,
    model: r.model, variant: r.variant, solver: { name: r.solver_name, version: r.solver_version },
    soc: r.soc, makespan: r.makespan, turnInclusiveSocMs: r.ti_soc, turnInclusiveMakespanMs: r.ti_makespan,
    executions: r.executions ?? [], robotProfile: r.robot_profile, profileLabel: profileLabel(r.robot_profile),
    createdAt: new Date(r.created_at).toISOString(),
  };
}

/** What the service needs; `checkPlan` validates and replays a plan off the request thread (the app's interactive pool). */
export interface SubmissionsServiceDeps {
  readonly sequelize: Sequelize;
  readonly models: Models;
  readonly checkPlan: (instance: MapfInstance, submission: ReadSubmission, requester: string, signal?: AbortSignal) => Promise<PlanVerdict>;
}

/** The submissions service on one connection. */
export function createSubmissionsService(deps: SubmissionsServiceDeps): SubmissionsService {
  const { sequelize, models } = deps;
  const one = async (id: number): Promise<SubmissionView> => {
    const [row] = await sequelize.query<ListRow>(`${LIST_SQL} WHERE sub.id = :id`, { type: QueryTypes.SELECT, replacements: { id } });
    return toView(row);
  };
  const service: SubmissionsService = {
    async submit(uploader, body) {
      const sub = readPlanFile(validate(SubmissionRequestSchema, body));
      const judged = await service.judge(uploader, sub);
      if (!judged.verdict.ok) {
        throw new AppError(PLAN_REJECTED, 422, `The ${sub.model} validator rejected the plan: ${judged.verdict.violation.message}`, { violation: judged.verdict.violation });
      }
      const accepted = { loaded: judged.loaded, verdict: judged.verdict };
      const id = await sequelize.transaction((transaction) => service.store(uploader, sub, accepted, transaction));
      return one(id);
    },

    async judge(uploader, sub, signal) {
      const loaded = await loadInstance(models, sub.scenarioId, sub.agents, { viewer: uploader });
      return { loaded, verdict: await deps.checkPlan(loaded.instance, sub, requesterKey(uploader), signal) };
    },

    async store(uploader, sub, { loaded, verdict }, transaction) {
      const params = paramsOf(sub);
      const q = <T extends object>(sql: string, replacements: Record<string, unknown>) =>
        sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements, transaction });
      const [s] = await q<{ id: number }>(
        `INSERT INTO submissions (uploader_id, instance_set_id, scenario_id, agents, model, params, solver_name, solver_version, format)
         VALUES (:uploader, :set, :scenario, :agents, :model, :params, :name, :version, :format) RETURNING id`,
        {
          uploader: uploader.id, set: loaded.instanceSetId, scenario: loaded.scenarioId, agents: sub.agents, model: sub.model,
          params: JSON.stringify(params), name: sub.solver.name, version: sub.solver.version, format: sub.format,
        },
      );
      // A submitted plan has no lower bound, solve time or node counts: those are only ever measured by our solvers.
      const [r] = await q<{ id: number }>(
        `INSERT INTO results (submission_id, instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status,
           soc, makespan, turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, turns,
           robot_profile, robot_profile_hash, solver_version, solver_commit, node_version, cpu_model, thread_count, plan_gz,
           executable_at_nominal, nominal_collisions)
         VALUES (:sub, :set, :map, :scenario, :agents, :model, :params, :paramHash, 0, 'solved',
           :soc, :makespan, :tiSoc, :tiMakespan, NULL, NULL, :turns,
           :profile, :profileHash, :version, 'submitted', 'unknown', 'unknown', 0, :plan,
           :atNominal, :nominalCollisions) RETURNING id`,
        {
          sub: s.id, set: loaded.instanceSetId, map: loaded.mapId, scenario: loaded.scenarioId, agents: sub.agents, model: sub.model,
          params: JSON.stringify(params), paramHash: parameterHash(params), soc: verdict.soc, makespan: verdict.makespan,
          tiSoc: verdict.turnInclusiveSocMs, tiMakespan: verdict.turnInclusiveMakespanMs, turns: verdict.turns,
          profile: JSON.stringify(sub.robotProfile), profileHash: parameterHash(sub.robotProfile), version: sub.solver.version,
          plan: gzipSync(JSON.stringify(verdict.storedPlan)),
          atNominal: verdict.atNominal.isCollisionFree, nominalCollisions: verdict.atNominal.collisions,
        },
      );
      const ex = verdict.executions;
      if (ex.length > 0) {
        const replacements: Record<string, unknown> = { result: r.id };
        const values = ex.map((e, i) => {
          Object.assign(replacements, {
            [`p${i}`]: e.policy, [`n${i}`]: JSON.stringify(e.noise), [`r${i}`]: e.runs, [`s${i}`]: e.successRate,
            [`c${i}`]: e.collisions.mean, [`mm${i}`]: e.realisedMakespanMs.mean, [`mp${i}`]: e.realisedMakespanMs.p95,
            [`f${i}`]: e.finishSpreadMs.mean, [`x${i}`]: JSON.stringify(e),
          });
          return `(:result, :p${i}, :n${i}, :r${i}, :s${i}, :c${i}, :mm${i}, :mp${i}, :f${i}, :x${i})`;
        });
        // One statement, so the leaderboard trigger refreshes the row once.
        await sequelize.query(
          `INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean, realised_makespan_mean_ms,
             realised_makespan_p95_ms, finish_spread_mean_ms, metrics) VALUES ${values.join(', ')}`,
          { replacements, transaction },
        );
      }
      return s.id;
    },

    async views(ids) {
      if (ids.length === 0) return new Map();
      const rows = await sequelize.query<ListRow>(`${LIST_SQL} WHERE sub.id IN (:ids)`, { type: QueryTypes.SELECT, replacements: { ids: [...ids] } });
      return new Map(rows.map((r) => [r.id, toView(r)]));
    },

    async list(uploader) {
      const rows = await sequelize.query<ListRow>(`${LIST_SQL} WHERE sub.uploader_id = :uploader ORDER BY sub.created_at DESC, sub.id DESC LIMIT 200`, {
        type: QueryTypes.SELECT, replacements: { uploader: uploader.id },
      });
      return { items: rows.map(toView) };
    },

    async profiles(viewer, query) {
      return profilesOfInstance(sequelize, models, viewer, query);
    },
  };
  return service;
}
