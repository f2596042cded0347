/**
 * Field trials on stored results (issue 17, items 2 and 3). An upload is checked in a thread of the
 * interactive pool (check-trials.ts) and then stored in one transaction: the upload row and every
 * run, or nothing. Who may see a result's trials: whoever may see the result (visitors for results
 * of public sets); who may attach: researchers and above who see the result.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { hasRole } from '@shared/auth';
import { SAFETY_NOTE } from '@shared/executions-constants';
import {
  TRIAL_SIMULATION_RUNS, TrialUploadFields, type FieldTrialRun, type FieldTrialsView, type FieldTrialUpload, type TrialSimulation,
} from '@shared/field-trials';
import { formatTrialLogError } from '@shared/trial-log';
import type { TrialRunFigures } from '@solvers/trials/compare-to-plan';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { loadResultPlan } from '../executions/result-plan';
import { resultPlanView } from '../executions/result-plan-view';
import { loadStoredExecutions } from '../executions/stored-executions';
import type { Viewer } from '../instance-sets/instance-set-access';
import type { CheckedRun, CheckTrialsJob, CheckTrialsOutcome, TrialFile, TrialSimulationSettings } from './check-trials';

/** Runs a check job for `requester` (the interactive pool's checkTrials; tests may pass their own). */
export type TrialChecker = (job: CheckTrialsJob, requester: string, signal?: AbortSignal) => Promise<CheckTrialsOutcome>;

/** The operations behind /api/trials/results/:resultId. */
export interface TrialsService {
  list(viewer: Viewer, resultId: number): Promise<FieldTrialsView>;
  upload(viewer: Express.User, resultId: number, fields: unknown, files: readonly TrialFile[], signal?: AbortSignal): Promise<FieldTrialsView>;
  /** Deletes an upload (its owner, maintainers and admins). */
  remove(viewer: Express.User, uploadId: number): Promise<void>;
}

interface UploadRow { id: number; policy: FieldTrialUpload['policy']; notes: string; login: string; created_at: Date; simulation: TrialSimulation }
interface RunRow { id: number; upload_id: number; file_name: string; format: 'csv' | 'json'; row_count: number; figures: StoredRunFigures }
/** What trial_runs.figures holds: the comparison's figures plus the measured durations and the flags. */
type StoredRunFigures = TrialRunFigures & Pick<FieldTrialRun, 'actionDurations' | 'outside'>;

/** Builds the service over the database and the checker. */
export function createTrialsService(deps: { models: Models; sequelize: Sequelize; check: TrialChecker }): TrialsService {
  const { models, sequelize, check } = deps;

  async function uploadsOf(resultId: number, onlyUpload?: number): Promise<FieldTrialUpload[]> {
    const uploads = await sequelize.query<UploadRow>(
      `SELECT u.id, u.policy, u.notes, a.login, u.created_at, u.simulation
         FROM trial_uploads u JOIN users a ON a.id = u.owner_id
        WHERE u.result_id = :resultId ${onlyUpload ? 'AND u.id = :onlyUpload' : ''} ORDER BY u.id`,
      { type: QueryTypes.SELECT, replacements: { resultId, onlyUpload: onlyUpload ?? null } },
    );
    if (uploads.length === 0) return [];
    const runs = await sequelize.query<RunRow>(
      `SELECT id, upload_id, file_name, format, row_count, figures FROM trial_runs
        WHERE upload_id IN (:ids) ORDER BY upload_id, id`,
      { type: QueryTypes.SELECT, replacements: { ids: uploads.map((u) => u.id) } },
    );
    return uploads.map((u) => ({
      id: u.id, policy: u.policy, notes: u.notes, uploadedBy: u.login, uploadedAt: new Date(u.created_at).toISOString(),
      simulation: u.simulation,
      runs: runs.filter((r) => r.upload_id === u.id).map(runView),
    }));
  }

  return {
    async list(viewer, resultId) {
      // Visibility as for the result's plan (404 for results the viewer may not see).
      await loadStoredExecutions(models, viewer, resultId);
      return { resultId, uploads: await uploadsOf(resultId), canAttach: viewer !== null && hasRole(viewer.role, 'researcher'), safetyNote: SAFETY_NOTE };
    },

    async upload(viewer, resultId, rawFields, files, signal) {
      const fields = validate(TrialUploadFields, rawFields);
      if (files.length === 0) throw new AppError('VALIDATION_FAILED', 400, 'Attach at least one trial log (.csv or .json) or a .zip of logs in the "files" field.');
      const stored = await loadResultPlan(models, viewer, resultId);
      const view = resultPlanView(stored);
      const inst = stored.loaded.instance;
      let cells = '';
      for (const v of inst.grid.passable) cells += v === 1 ? '1' : '0';
      const simulation = await simulationSettings(models, viewer, resultId, fields.policy, stored.profile.timingJitter);
      const outcome = await check({
        instance: { width: inst.grid.width, height: inst.grid.height, cells, agents: inst.agents },
        plan: { timeline: view.plan.timeline, schedule: view.plan.schedule },
        profile: stored.profile,
        files,
        simulation,
      }, String(viewer.id), signal);
      if (outcome.kind === 'invalid') {
        const first = outcome.errors[0];
        const what = outcome.code === 'TRIAL_DIVERGES' ? 'departs from the plan' : 'is not a valid trial log';
        throw new AppError(outcome.code, outcome.code === 'TRIAL_DIVERGES' ? 422 : 400,
          `${first ? formatTrialLogError(first) : 'the upload'} — the log ${what}; nothing was stored.`, { errors: outcome.errors });
      }
      const uploadId = await storeUpload(sequelize, { resultId, ownerId: viewer.id, policy: fields.policy, notes: fields.notes ?? '' }, outcome);
      return { resultId, uploads: await uploadsOf(resultId, uploadId), canAttach: true, safetyNote: SAFETY_NOTE };
    },

    async remove(viewer, uploadId) {
      const [row] = await sequelize.query<{ owner_id: number; result_id: number }>(
        'SELECT owner_id, result_id FROM trial_uploads WHERE id = :uploadId', { type: QueryTypes.SELECT, replacements: { uploadId } },
      );
      const notFound = () => new AppError('NOT_FOUND', 404, `No trial upload ${uploadId}`);
      if (!row) throw notFound();
      // One who may not see the result does not learn the upload exists.
      await loadStoredExecutions(models, viewer, row.result_id).catch(() => { throw notFound(); });
      if (row.owner_id !== viewer.id && !hasRole(viewer.role, 'maintainer')) {
        throw new AppError('FORBIDDEN', 403, 'Only whoever attached the trials, maintainers and admins may delete them.');
      }
      await sequelize.query('DELETE FROM trial_uploads WHERE id = :uploadId', { replacements: { uploadId } });
    },
  };
}

/**
 * The simulation a field upload under `policy` is compared with: the settings of the replay the
 * sweep stored with the result for that policy (at least TRIAL_SIMULATION_RUNS runs), else the
 * profile's jitter, no stalls, seed 1.
 */
export async function simulationSettings(
  models: Models, viewer: Viewer, resultId: number, policy: FieldTrialUpload['policy'], jitter: number,
): Promise<TrialSimulationSettings> {
  const stored = await loadStoredExecutions(models, viewer, resultId);
  const row = stored.executions.find((e) => e.settings.policy === policy && e.error === null);
  if (row) {
    const s = row.settings;
    return { policy, runs: Math.max(s.runs, TRIAL_SIMULATION_RUNS), seed: s.seed, noise: s.noise, onCollision: s.onCollision, settingsFrom: 'stored' };
  }
  return { policy, runs: TRIAL_SIMULATION_RUNS, seed: 1, noise: { jitterCv: jitter, stallProbability: 0, stallMs: 0 }, onCollision: 'count', settingsFrom: 'default' };
}

/** Stores a checked upload and every run in one transaction (all or nothing); answers the upload's id. */
export async function storeUpload(
  sequelize: Sequelize, upload: { resultId: number; ownerId: number; policy: FieldTrialUpload['policy']; notes: string },
  outcome: Extract<CheckTrialsOutcome, { kind: 'checked' }>,
): Promise<number> {
  return sequelize.transaction(async (transaction) => {
    const [row] = await sequelize.query<{ id: number }>(
      `INSERT INTO trial_uploads (result_id, owner_id, policy, notes, simulation)
       VALUES (:resultId, :ownerId, :policy, :notes, :simulation) RETURNING id`,
      { type: QueryTypes.SELECT, transaction, replacements: { ...upload, simulation: JSON.stringify(outcome.simulation) } },
    );
    for (const run of outcome.runs) await insertRun(sequelize, transaction, row.id, upload.resultId, run);
    return row.id;
  });
}

async function insertRun(sequelize: Sequelize, transaction: Transaction, uploadId: number, resultId: number, run: CheckedRun): Promise<void> {
  const figures: StoredRunFigures = { ...run.figures, actionDurations: run.actionDurations, outside: run.outside };
  await sequelize.query(
    `INSERT INTO trial_runs (upload_id, result_id, file_name, format, row_count, is_success, collisions, realised_makespan_ms, figures, log_gz)
     VALUES (:uploadId, :resultId, :fileName, :format, :rows, :isSuccess, :collisions, :makespan, :figures, :logGz)`,
    { transaction, replacements: {
      uploadId, resultId, fileName: run.fileName, format: run.format, rows: run.rows, isSuccess: run.figures.isSuccess,
      collisions: run.figures.collisions, makespan: run.figures.realisedMakespanMs, figures: JSON.stringify(figures),
      logGz: Buffer.from(run.logGz.buffer, run.logGz.byteOffset, run.logGz.byteLength),
    } },
  );
}

function runView(r: RunRow): FieldTrialRun {
  const f = r.figures;
  return {
    id: r.id, uploadId: r.upload_id, fileName: r.file_name, format: r.format, rows: r.row_count,
    isSuccess: f.isSuccess, isAborted: f.isAborted, collisions: f.collisions,
    realisedMakespanMs: f.realisedMakespanMs, realisedSocMs: f.realisedSocMs, finishSpreadMs: f.finishSpreadMs, waitingMs: f.waitingMs,
    perRobot: f.perRobot, actionDurations: f.actionDurations, outside: f.outside,
  };
}
