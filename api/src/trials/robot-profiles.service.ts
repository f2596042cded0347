/**
 * Fitting a robot profile to a result's field runs and keeping it under a name (issue 17, item 4).
 * The fit runs in the interactive pool; a saved profile is fitted again on the server from the
 * runs named, so its values and provenance always match stored logs. Who sees named profiles:
 * their owner, and maintainers and admins (who launch sweeps); the sweep editor offers them.
 */
import { promisify } from 'node:util';
import { gunzip } from 'node:zlib';
import { QueryTypes, UniqueConstraintError, type Sequelize } from 'sequelize';
import { hasRole } from '@shared/auth';
import {
  SaveRobotProfileRequest, type NamedRobotProfile, type ProfileProvenance, type TrialCalibrationView,
} from '@shared/field-trials';
import type { RobotProfile } from '@shared/plan';
import { formatTrialLogError } from '@shared/trial-log';
import { profileFromFit, type CalibrationResult } from '@solvers/trials/calibrate';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { loadStoredExecutions } from '../executions/stored-executions';
import type { StoredLogText } from './calibrate-trials';

const unzip = promisify(gunzip);

/** Runs a fit for `requester` (the interactive pool's calibrateTrials). */
export type TrialFitter = (logs: readonly StoredLogText[], requester: string, signal?: AbortSignal) => Promise<CalibrationResult>;

/** The operations behind POST /api/trials/results/:id/calibration and /api/robot-profiles. */
export interface RobotProfilesService {
  calibrate(viewer: Express.User, resultId: number, runIds: readonly number[] | null, signal?: AbortSignal): Promise<TrialCalibrationView>;
  save(viewer: Express.User, body: unknown, signal?: AbortSignal): Promise<NamedRobotProfile>;
  list(viewer: Express.User): Promise<NamedRobotProfile[]>;
}

interface ProfileRow { id: number; name: string; login: string; profile: RobotProfile; provenance: ProfileProvenance; created_at: Date }

/** Builds the service. */
export function createRobotProfilesService(deps: { models: Models; sequelize: Sequelize; fit: TrialFitter }): RobotProfilesService {
  const { models, sequelize, fit } = deps;

  async function fitRuns(viewer: Express.User, resultId: number, runIds: readonly number[] | null, signal?: AbortSignal): Promise<TrialCalibrationView> {
    const stored = await loadStoredExecutions(models, viewer, resultId);
    const rows = await sequelize.query<{ id: number; file_name: string; log_gz: Buffer }>(
      `SELECT id, file_name, log_gz FROM trial_runs WHERE result_id = :resultId ${runIds ? 'AND id IN (:runIds)' : ''} ORDER BY id`,
      { type: QueryTypes.SELECT, replacements: { resultId, runIds: runIds ?? [] } },
    );
    if (runIds && rows.length !== new Set(runIds).size) {
      const found = new Set(rows.map((r) => r.id));
      throw new AppError('VALIDATION_FAILED', 400, `runIds: run ${runIds.find((id) => !found.has(id))} is no field run of result ${resultId}`);
    }
    if (rows.length === 0) throw new AppError('CONFLICT', 409, `Result ${resultId} has no field runs to fit a profile to; attach trial logs first.`);
    const logs = await Promise.all(rows.map(async (r) => ({ name: r.file_name, text: (await unzip(r.log_gz)).toString('utf8') })));
    const result = await fit(logs, String(viewer.id), signal);
    if (result.kind === 'invalid') {
      throw new AppError('INVALID_TRIAL_LOG', 400, `${formatTrialLogError(result.errors[0])} — the runs cannot be fitted.`, { errors: result.errors });
    }
    const f = result.fit;
    const made = profileFromFit(f, stored.profile);
    return {
      fit: {
        forwardMs: f.forwardMs, quarterTurnMs: f.quarterTurnMs, waitMs: f.waitMs, timingJitter: f.timingJitter,
        stallProbability: f.stallProbability, stallMs: f.stallMs, actions: f.actions, ci95: f.ci95, goodnessOfFit: f.goodnessOfFit,
      },
      profile: made.profile,
      provenance: {
        kind: 'trial-fit', resultId, runs: rows.map((r) => ({ id: r.id, fileName: r.file_name })),
        stallProbability: made.stallProbability, stallMs: made.stallMs, fittedAt: new Date().toISOString(),
      },
    };
  }

  const view = (r: ProfileRow): NamedRobotProfile => ({
    id: r.id, name: r.name, owner: r.login, profile: r.profile, provenance: r.provenance, createdAt: new Date(r.created_at).toISOString(),
  });

  return {
    calibrate: fitRuns,

    async save(viewer, body, signal) {
      const req = validate(SaveRobotProfileRequest, body);
      const fitted = await fitRuns(viewer, req.resultId, req.runIds, signal);
      try {
        const [row] = await sequelize.query<{ id: number }>(
          `INSERT INTO robot_profiles (owner_id, name, profile, provenance) VALUES (:ownerId, :name, :profile, :provenance) RETURNING id`,
          { type: QueryTypes.SELECT, replacements: {
            ownerId: viewer.id, name: req.name, profile: JSON.stringify(fitted.profile), provenance: JSON.stringify(fitted.provenance),
          } },
        );
        return { id: row.id, name: req.name, owner: viewer.login, profile: fitted.profile, provenance: fitted.provenance, createdAt: fitted.provenance.fittedAt };
      } catch (err) {
        if (err instanceof UniqueConstraintError) throw new AppError('CONFLICT', 409, `name: you already have a robot profile named "${req.name}"; choose another name.`);
        throw err;
      }
    },

    async list(viewer) {
      const all = hasRole(viewer.role, 'maintainer');
      const rows = await sequelize.query<ProfileRow>(
        `SELECT p.id, p.name, u.login, p.profile, p.provenance, p.created_at FROM robot_profiles p JOIN users u ON u.id = p.owner_id
          ${all ? '' : 'WHERE p.owner_id = :ownerId'} ORDER BY p.name, p.id`,
        { type: QueryTypes.SELECT, replacements: { ownerId: viewer.id } },
      );
      return rows.map(view);
    },
  };
}

