/**
 * External solver registrations (issue 16, item 4; migration 0411): list, register and remove.
 * Only maintainers register or remove (the router checks the role; session only, no token scope
 * opens these writes: a registered command runs on every worker that declares the solver, so a
 * leaked token must not be able to add one). Signed-in people may read the list.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import {
  ExternalSolverRequestSchema, WORKER_SEEN_WINDOW_MS, type ExternalPlanFormat, type ExternalSolverListResponse,
  type ExternalSolverView, type SolverRef,
} from '@shared/external-solvers';
import type { PlanModel } from '@shared/plan';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { commandSha256 } from './command-hash';

/** A registration as the worker and the launch need it. */
export interface ExternalSolverRow {
  readonly id: number;
  readonly name: string;
  readonly version: string;
  readonly models: readonly PlanModel[];
  readonly command: string;
  readonly planFormat: ExternalPlanFormat;
}

interface DbRow {
  id: number; name: string; version: string; models: PlanModel[]; command: string; plan_format: ExternalPlanFormat; description: string;
  registered_by: number | null; login: string | null; created_at: Date; workers: string[] | null;
}

/** The registration of `ref`, or null (used by the launch and by workers). */
export async function findExternalSolver(sequelize: Sequelize, ref: SolverRef): Promise<ExternalSolverRow | null> {
  const rows = await sequelize.query<DbRow>(
    'SELECT id, name, version, models, command, plan_format FROM external_solvers WHERE name = :name AND version = :version',
    { replacements: { name: ref.name, version: ref.version }, type: QueryTypes.SELECT },
  );
  const r = rows[0];
  return r ? { id: r.id, name: r.name, version: r.version, models: r.models, command: r.command, planFormat: r.plan_format } : null;
}

/** Workers that declared `ref` within WORKER_SEEN_WINDOW_MS. */
export async function workersWith(sequelize: Sequelize, ref: SolverRef): Promise<string[]> {
  const rows = await sequelize.query<{ worker: string }>(
    `SELECT worker FROM solver_workers WHERE name = :name AND version = :version
       AND seen_at > now() - make_interval(secs => :window / 1000.0) ORDER BY worker`,
    { replacements: { name: ref.name, version: ref.version, window: WORKER_SEEN_WINDOW_MS }, type: QueryTypes.SELECT },
  );
  return rows.map((r) => r.worker);
}

/** The service behind /api/external-solvers. */
export interface ExternalSolversService {
  list(): Promise<ExternalSolverListResponse>;
  register(viewer: Express.User, body: unknown): Promise<ExternalSolverView>;
  remove(id: number): Promise<void>;
}

/** Builds the service. */
export function createExternalSolversService(sequelize: Sequelize): ExternalSolversService {
  const select = async (where: string, replacements: Record<string, unknown>): Promise<ExternalSolverView[]> => {
    const rows = await sequelize.query<DbRow>(
      `SELECT x.id, x.name, x.version, x.models, x.command, x.plan_format, x.description, x.registered_by, u.login, x.created_at,
         (SELECT array_agg(w.worker ORDER BY w.worker) FROM solver_workers w
           WHERE w.name = x.name AND w.version = x.version AND w.seen_at > now() - make_interval(secs => :window / 1000.0)) AS workers
       FROM external_solvers x LEFT JOIN users u ON u.id = x.registered_by
       WHERE ${where} ORDER BY x.name, x.version`,
      { replacements: { ...replacements, window: WORKER_SEEN_WINDOW_MS }, type: QueryTypes.SELECT },
    );
    return rows.map((r) => ({
      id: r.id, name: r.name, version: r.version, models: r.models, command: r.command, commandSha256: commandSha256(r.command), planFormat: r.plan_format,
      description: r.description, registeredBy: r.registered_by !== null && r.login !== null ? { id: r.registered_by, login: r.login } : null,
      createdAt: r.created_at.toISOString(), workers: r.workers ?? [],
    }));
  };

  return {
    async list() {
      return { items: await select('TRUE', {}) };
    },

    async register(viewer, body) {
      const req = validate(ExternalSolverRequestSchema, body);
      // Stored results of an earlier registration of this name and version (removed since) came from a
      // command nobody can compare any more: one board variant must never mix two programs.
      const [earlier] = await sequelize.query<{ n: string }>(
        'SELECT count(*) AS n FROM results WHERE solver_name = :name AND solver_version = :version',
        { replacements: { name: req.name, version: req.version }, type: QueryTypes.SELECT },
      );
      if (Number(earlier?.n ?? 0) > 0) {
        throw new AppError('CONFLICT', 409, `${req.name}@${req.version} has ${earlier.n} stored result(s) from an earlier registration; register a new version, so its results never mix with another command's.`);
      }
      const inserted = await sequelize.query<{ id: number }>(
        `INSERT INTO external_solvers (name, version, models, command, plan_format, description, registered_by)
         VALUES (:name, :version, ARRAY[:models]::text[], :command, :planFormat, :description, :by)
         ON CONFLICT (name, version) DO NOTHING RETURNING id`,
        {
          replacements: { name: req.name, version: req.version, models: req.models, command: req.command.trim(), planFormat: req.planFormat, description: req.description, by: viewer.id },
          type: QueryTypes.SELECT,
        },
      );
      if (!inserted[0]) {
        throw new AppError('CONFLICT', 409, `A solver ${req.name}@${req.version} is already registered; register a new version or remove the old one first.`);
      }
      const [view] = await select('x.id = :id', { id: inserted[0].id });
      return view;
    },

    async remove(id) {
      if (!Number.isInteger(id)) throw new AppError('NOT_FOUND', 404, `No external solver ${id}`);
      await sequelize.transaction(async (transaction) => {
        const rows = await sequelize.query<{ name: string; version: string }>(
          'SELECT name, version FROM external_solvers WHERE id = :id FOR UPDATE', { replacements: { id }, transaction, type: QueryTypes.SELECT },
        );
        const row = rows[0];
        if (!row) throw new AppError('NOT_FOUND', 404, `No external solver ${id}`);
        // Runs still waiting for it would end in error the moment a worker took them; say so instead.
        const [open] = await sequelize.query<{ n: string }>(
          `SELECT count(*) AS n FROM runs r JOIN sweeps s ON s.id = r.sweep_id
           WHERE s.status IN ('queued', 'running') AND r.status IN ('pending', 'running')
             AND r.params->'model'->'externalSolver'->>'name' = :name AND r.params->'model'->'externalSolver'->>'version' = :version`,
          { replacements: row, transaction, type: QueryTypes.SELECT },
        );
        const n = Number(open?.n ?? 0);
        if (n > 0) throw new AppError('CONFLICT', 409, `${row.name}@${row.version} has ${n} run(s) waiting in live sweeps; cancel those sweeps first.`);
        await sequelize.query('DELETE FROM external_solvers WHERE id = :id', { replacements: { id }, transaction });
      });
    },
  };
}
