/**
 * Reads of the model comparison report: the sets and robot profiles a viewer may pick (from the
 * leaderboard's best-result table, which is small and indexed for visibility) and, for one set ×
 * profile × policy, one outcome per instance × variant from `results` and `executions`.
 * Visibility follows the leaderboard and instance set rule (instance-set-access.ts).
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { RobotProfile } from '@shared/plan';
import { profileLabel } from '@shared/leaderboards';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { REPORT_POLICIES, variantLabel, type ModelComparisonReport, type ReportChoices, type ReportFieldTrialRow, type ReportSetChoice } from '@shared/reports';
import type { TrialSimulation } from '@shared/field-trials';
import type { SweepPolicy } from '@shared/sweeps';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { isSetVisible, type Viewer } from '../instance-sets/instance-set-access';
import { visibleRowsCondition } from '../leaderboards/view-sql';
import { compareOnCommonInstances, compareVariants, executionSettingsText, instanceCount, REPORT_METHODS, type InstanceOutcome } from './model-comparison';
import { summarise } from './report-summary';

/** What a report is asked for. */
export interface ReportRequest {
  readonly setId: number;
  /** Absent: the profile with most leaderboard rows on the set. */
  readonly profileHash?: string;
  readonly policy: SweepPolicy;
}

/** The report read service. */
export interface ReportsService {
  choices(viewer: Viewer): Promise<ReportChoices>;
  modelComparison(viewer: Viewer, request: ReportRequest): Promise<ModelComparisonReport>;
  /** The report and the ids of the stored results it reads (for the provenance of its exports). */
  modelComparisonWithResults(viewer: Viewer, request: ReportRequest): Promise<{ readonly report: ModelComparisonReport; readonly resultIds: readonly number[] }>;
}

/**
 * The variant of a result's parameters: the parameters that change the problem (k, a fixed start
 * heading, the following rule when forbidden), as the leaderboard names them (migration 0401),
 * plus "following forbidden" (issue 12, item 3), "w=…" for bounded-suboptimal search (issue 15,
 * item 1; migration 0407) and "solver=name@version" for an external solver's results (issue 16,
 * item 4; migration 0411), so they are a variant of their own beside the built-in ones. Params
 * text never becomes SQL.
 */
const VARIANT_SQL = `concat_ws(' ',
    CASE WHEN (r.params->'model'->>'k') IS NOT NULL THEN 'k=' || (r.params->'model'->>'k') END,
    CASE WHEN coalesce(r.params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (r.params->'model'->>'startHeading') END,
    CASE WHEN r.params->'model'->>'following' = 'forbidden' THEN 'following forbidden' END,
    CASE WHEN jsonb_typeof(r.params->'model'->'suboptimality') = 'number' AND (r.params->'model'->>'suboptimality')::float8 > 1
      THEN 'w=' || (r.params->'model'->>'suboptimality') END,
    CASE WHEN jsonb_typeof(r.params->'model'->'externalSolver') = 'object'
      THEN 'solver=' || (r.params->'model'->'externalSolver'->>'name') || '@' || (r.params->'model'->'externalSolver'->>'version') END)`;

/**
 * Newest computed result per instance × variant (a solved one and one replayed under the policy
 * first), with its newest replay under the policy. `executable_at_nominal` (migration 0405) is
 * null when the plan was not checked.
 */
const OUTCOMES_SQL = `
  SELECT DISTINCT ON (r.scenario_id, r.agents, r.model, ${VARIANT_SQL})
    r.id AS result_id, r.scenario_id, r.agents, r.model, ${VARIANT_SQL} AS variant, r.status,
    r.turn_inclusive_makespan_ms AS ti_makespan_ms, r.robot_profile,
    r.executable_at_nominal,
    x.runs, x.success_rate, x.collisions_mean, x.realised_makespan_mean_ms, x.finish_spread_mean_ms, x.noise
  FROM results r
  LEFT JOIN LATERAL (
    SELECT * FROM executions ex WHERE ex.result_id = r.id AND ex.policy = :policy ORDER BY ex.id DESC LIMIT 1
  ) x ON TRUE
  WHERE r.scenario_id IN (SELECT sc.id FROM scenarios sc WHERE sc.instance_set_id = :setId)
    AND r.robot_profile_hash = :profileHash AND r.submission_id IS NULL
  ORDER BY r.scenario_id, r.agents, r.model, ${VARIANT_SQL}, (r.status = 'solved') DESC, (x.id IS NOT NULL) DESC, r.id DESC`;

interface OutcomeRow {
  result_id: number;
  scenario_id: number;
  agents: number;
  model: string;
  variant: string;
  status: string;
  ti_makespan_ms: number | null;
  robot_profile: RobotProfile;
  executable_at_nominal: boolean | null;
  runs: number | null;
  success_rate: number | null;
  collisions_mean: number | null;
  realised_makespan_mean_ms: number | null;
  finish_spread_mean_ms: number | null;
  noise: { jitterCv?: number; stallProbability?: number; stallMs?: number } | null;
}

/** Per result of the report with field runs under `policy`: field figures beside its newest upload's simulation. */
async function fieldTrialRows(
  select: <T extends object>(sql: string, replacements: Record<string, unknown>) => Promise<T[]>, rows: readonly OutcomeRow[], policy: string,
): Promise<ReportFieldTrialRow[]> {
  const runs = await select<{ result_id: number; upload_id: number; scenario: string; simulation: TrialSimulation; is_success: boolean; makespan: number | null; outside: number }>(
    `SELECT u.result_id, u.id AS upload_id, sc.name AS scenario, u.simulation, t.is_success, t.realised_makespan_ms AS makespan,
            jsonb_array_length(coalesce(t.figures -> 'outside', '[]'::jsonb)) AS outside
       FROM trial_uploads u JOIN trial_runs t ON t.upload_id = u.id
       JOIN results r ON r.id = u.result_id JOIN scenarios sc ON sc.id = r.scenario_id
      WHERE u.result_id IN (:ids) AND u.policy = :policy ORDER BY u.result_id, u.id, t.id`,
    { ids: rows.map((r) => r.result_id), policy },
  );
  const byResult = new Map<number, typeof runs>();
  for (const r of runs) byResult.set(r.result_id, [...(byResult.get(r.result_id) ?? []), r]);
  return rows.filter((o) => byResult.has(o.result_id)).map((o) => {
    const list = byResult.get(o.result_id)!;
    const finished = list.map((r) => r.makespan).filter((m): m is number => m !== null);
    const sim = list[list.length - 1].simulation;
    return {
      resultId: o.result_id, variant: variantLabel(o.model, o.variant), scenario: list[0].scenario, agents: o.agents,
      runs: list.length, successfulRuns: list.filter((r) => r.is_success).length,
      fieldMakespanMeanMs: finished.length > 0 ? finished.reduce((a, b) => a + b, 0) / finished.length : null,
      simulatedMakespan: { mean: sim.realisedMakespanMs.mean, low: sim.realisedMakespanMs.low, high: sim.realisedMakespanMs.high },
      simulatedSuccessRate: sim.successRate,
      runsOutside: list.filter((r) => Number(r.outside) > 0).length,
    };
  });
}

/** The report service on one connection. */
export function createReportsService(deps: { readonly sequelize: Sequelize; readonly models: Pick<Models, 'InstanceSet'> }): ReportsService {
  const { sequelize } = deps;
  const select = <T extends object>(sql: string, replacements: Record<string, unknown>): Promise<T[]> =>
    sequelize.query<T>(sql, { type: QueryTypes.SELECT, replacements });

  async function choices(viewer: Viewer): Promise<ReportChoices> {
    const repl: Record<string, unknown> = {};
    const visible = visibleRowsCondition(viewer, 'e', repl);
    const rows = await select<{ set_id: number; name: string; visibility: string; hash: string; label: string; entries: number }>(
      `SELECT e.instance_set_id AS set_id, s.name, s.visibility, e.robot_profile_hash AS hash, min(e.profile_label) AS label, count(*)::int AS entries
       FROM leaderboard_entries e JOIN instance_sets s ON s.id = e.instance_set_id
       WHERE e.source = 'sweep'${visible ? ` AND ${visible}` : ''}
       GROUP BY e.instance_set_id, s.name, s.visibility, e.robot_profile_hash
       ORDER BY s.name, e.instance_set_id, entries DESC, hash`,
      repl,
    );
    const sets = new Map<number, ReportSetChoice & { profiles: ReportSetChoice['profiles'][number][] }>();
    for (const r of rows) {
      let s = sets.get(r.set_id);
      if (!s) {
        s = { id: r.set_id, name: r.name, isPublic: r.visibility === 'public', profiles: [] };
        sets.set(r.set_id, s);
      }
      s.profiles.push({ hash: r.hash, label: r.label, entries: r.entries });
    }
    return { sets: [...sets.values()], policies: REPORT_POLICIES };
  }

  const service: ReportsService = {
    choices,
    async modelComparison(viewer, request) {
      return (await service.modelComparisonWithResults(viewer, request)).report;
    },
    async modelComparisonWithResults(viewer, request) {
      const set = await deps.models.InstanceSet.findByPk(request.setId);
      // A set the viewer may not see does not exist for him (same 404 as the instance library).
      if (!set || !isSetVisible(set, viewer)) {
        throw new AppError('INSTANCE_SET_NOT_FOUND', 404, `Instance set ${request.setId} was not found`, [{ param: 'set' }]);
      }
      let profileHash = request.profileHash;
      if (profileHash === undefined) {
        const choice = (await choices(viewer)).sets.find((s) => s.id === set.id);
        profileHash = choice?.profiles[0]?.hash;
        if (profileHash === undefined) throw new AppError('NOT_FOUND', 404, `Instance set "${set.name}" has no computed results yet; run a sweep on it first`, [{ param: 'set' }]);
      }
      const rows = await select<OutcomeRow>(OUTCOMES_SQL, { setId: set.id, profileHash, policy: request.policy });
      if (rows.length === 0) {
        throw new AppError('NOT_FOUND', 404, `Instance set "${set.name}" has no computed results for robot profile ${profileHash}`, [{ param: 'profile' }]);
      }
      const settings = new Set<string>();
      const outcomes: InstanceOutcome[] = rows.map((r) => {
        const executed = r.runs !== null && r.success_rate !== null;
        if (executed) settings.add(executionSettingsText(r.runs!, r.noise ?? {}));
        return {
          scenarioId: r.scenario_id,
          agents: r.agents,
          model: r.model as InstanceOutcome['model'],
          variant: r.variant,
          status: r.status,
          tiMakespanMs: r.ti_makespan_ms,
          executableAtNominal: r.executable_at_nominal,
          execution: executed
            ? { runs: r.runs!, successRate: r.success_rate!, collisionsMean: r.collisions_mean ?? 0, realisedMakespanMeanMs: r.realised_makespan_mean_ms, finishSpreadMeanMs: r.finish_spread_mean_ms }
            : null,
        };
      });
      const profile = rows[0].robot_profile;
      const variants = compareVariants(outcomes);
      const instances = instanceCount(outcomes);
      const executionSettings = [...settings].sort();
      // Replays with different runs, jitter or stalls are not comparable: no ranking then (the summary and the page say so).
      const comparison = executionSettings.length > 1 ? null : compareOnCommonInstances(outcomes);
      const label = profileLabel(profile);
      const report: ModelComparisonReport = {
        set: { id: set.id, name: set.name },
        profile: { hash: profileHash, label, value: profile },
        policy: request.policy,
        instances,
        executionSettings,
        variants,
        comparison,
        summary: summarise({ setName: set.name, profileLabel: label, policy: request.policy, instances, executionSettings, variants, comparison }),
        methods: REPORT_METHODS,
        safetyNote: SAFETY_NOTE,
      };
      const fieldTrials = await fieldTrialRows(select, rows, request.policy);
      if (fieldTrials.length > 0) Object.assign(report, { fieldTrials });
      return { report, resultIds: rows.map((r) => r.result_id) };
    },
  };
  return service;
}
