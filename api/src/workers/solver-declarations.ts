/**
 * A worker's declaration of the external solvers it runs (WORKER_SOLVERS; issue 16, item 4),
 * kept in `solver_workers` (migration 0411): written at start and every DECLARE_INTERVAL_MS, gone
 * when the worker stops. A worker that died leaves its rows, which count only while fresher than
 * WORKER_SEEN_WINDOW_MS, so the sweep page soon says again that no worker has the solver.
 */
import type { Logger } from 'pino';
import type { Sequelize } from 'sequelize';
import type { SolverRef } from '@shared/external-solvers';

/** How often a worker renews its declaration, ms. */
export const DECLARE_INTERVAL_MS = 30_000;

/** A running declaration. */
export interface SolverDeclaration {
  /** Stops renewing and removes this worker's rows. */
  stop(): Promise<void>;
}

/** Declares `solvers` for `worker` now and every DECLARE_INTERVAL_MS (failures are logged and retried at the next beat). */
export async function declareSolvers(sequelize: Sequelize, worker: string, solvers: readonly SolverRef[], logger: Logger): Promise<SolverDeclaration> {
  if (solvers.length === 0) return { stop: async () => undefined };
  const beat = () => sequelize.query(
    `INSERT INTO solver_workers (worker, name, version, seen_at)
     SELECT :worker, x.name, x.version, now() FROM json_to_recordset(:solvers) AS x(name text, version text)
     ON CONFLICT (worker, name, version) DO UPDATE SET seen_at = now()`,
    { replacements: { worker, solvers: JSON.stringify(solvers.map((s) => ({ name: s.name, version: s.version }))) } },
  );
  await beat();
  const timer = setInterval(() => {
    beat().catch((err: Error) => logger.warn({ err: err.message }, 'could not renew the declared external solvers (will retry)'));
  }, DECLARE_INTERVAL_MS);
  timer.unref();
  return {
    async stop() {
      clearInterval(timer);
      await sequelize.query('DELETE FROM solver_workers WHERE worker = :worker', { replacements: { worker } }).catch(() => undefined);
    },
  };
}
