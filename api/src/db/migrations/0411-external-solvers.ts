/**
 * External solvers in sweeps (issue 16, item 4).
 *
 * - `external_solvers`: what a maintainer registered (name, version, plan models, command
 *   template, plan format); one row per name and version. A sweep names a solver by name and
 *   version in its model spec (shared/sweeps.ts `externalSolver`); the worker reads the command
 *   from here when it runs a job, so removing a registration makes its waiting runs end in
 *   `error` rather than run a command nobody vouches for any more.
 * - `solver_workers`: which worker declared which solver, refreshed every 30 s while it runs
 *   (api/src/workers/solver-declarations.ts), so the sweep page can say that runs wait for a
 *   worker with the solver instead of leaving them silently pending.
 * - `results.solver_name` (null for Quarterturn's own search), `cpu_time_ms` and `peak_memory_kb`
 *   (measured for external processes; null otherwise). An external result's `solver_version`
 *   is the solver's version; `solver_commit` stays the worker's build, which validated and
 *   replayed the plan.
 * - The leaderboard variant names `solver=name@version` (absent for built-in runs, so their
 *   variants stay), and a board entry's solver is the external solver's name (0405's refresh
 *   bodies with `hasSolverName`).
 */
import type { Migration } from '../migration';
import { functionBodies } from './0405-executable-at-nominal';

/** The variant as 0407 made it, plus `solver=name@version` for an external solver when `withSolver`. */
const variantFunction = (withSolver: boolean) => `CREATE OR REPLACE FUNCTION leaderboard_variant(params jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
    SELECT concat_ws(' ',
      CASE WHEN params->'model' ? 'k' THEN 'k=' || (params->'model'->>'k') END,
      CASE WHEN coalesce(params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (params->'model'->>'startHeading') END,
      CASE WHEN params->'model'->>'following' = 'forbidden' THEN 'following forbidden' END,
      CASE WHEN jsonb_typeof(params->'model'->'suboptimality') = 'number' AND (params->'model'->>'suboptimality')::float8 > 1
        THEN 'w=' || (params->'model'->>'suboptimality') END${withSolver ? `,
      CASE WHEN jsonb_typeof(params->'model'->'externalSolver') = 'object'
        THEN 'solver=' || (params->'model'->'externalSolver'->>'name') || '@' || (params->'model'->'externalSolver'->>'version') END` : ''})
  $$`;

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE TABLE external_solvers (
    id serial PRIMARY KEY,
    name varchar(24) NOT NULL,
    version varchar(16) NOT NULL,
    models text[] NOT NULL CHECK (cardinality(models) > 0),
    command text NOT NULL,
    plan_format varchar(8) NOT NULL CHECK (plan_format IN ('text', 'json')),
    description text NOT NULL DEFAULT '',
    registered_by integer REFERENCES users(id) ON DELETE SET NULL,
    created_at timestamptz NOT NULL DEFAULT now(),
    UNIQUE (name, version)
  )`);
  await q(`CREATE TABLE solver_workers (
    worker varchar(255) NOT NULL,
    name varchar(24) NOT NULL,
    version varchar(16) NOT NULL,
    seen_at timestamptz NOT NULL DEFAULT now(),
    PRIMARY KEY (worker, name, version)
  )`);
  await q('CREATE INDEX solver_workers_solver ON solver_workers (name, version, seen_at)');
  await q(`ALTER TABLE results
    ADD COLUMN solver_name varchar(120),
    ADD COLUMN cpu_time_ms double precision CHECK (cpu_time_ms >= 0),
    ADD COLUMN peak_memory_kb bigint CHECK (peak_memory_kb >= 0)`);

  await q(variantFunction(true));
  await q('REINDEX INDEX results_leaderboard_key');
  for (const sql of functionBodies({ isNew: true, hasSolverName: true })) await q(sql);
  await q('SELECT leaderboard_rebuild()');
};

/** Back to 0410: the tables and columns go (external results then show as Quarterturn's variant-less rows until deleted). */
export const down: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const sql of functionBodies({ isNew: true })) await q(sql);
  await q(variantFunction(false));
  await q('REINDEX INDEX results_leaderboard_key');
  await q('ALTER TABLE results DROP COLUMN peak_memory_kb, DROP COLUMN cpu_time_ms, DROP COLUMN solver_name');
  await q('DROP TABLE IF EXISTS solver_workers');
  await q('DROP TABLE IF EXISTS external_solvers');
  await q('SELECT leaderboard_rebuild()');
};
