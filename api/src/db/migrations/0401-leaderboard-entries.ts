/**
 * The leaderboard's best-result table, one row per instance (scenario, agent count) × plan model
 * variant × robot profile, kept up to date by statement-level triggers on `results` and
 * `executions`. Live aggregation (DISTINCT ON over every result per page) cannot meet the
 * 150 ms page target at 1,000,000 results (see benchmarks/leaderboard.bench.ts), so pages read
 * this table; it is maintained on insert and delete and can be rebuilt with
 * `SELECT leaderboard_rebuild()`.
 *
 * Best = a solved result first, then lowest sum-of-costs, then lowest turn-inclusive makespan,
 * then fastest solve, then oldest. The lower bound is the largest one any computed result proved
 * (submitted plans never contribute one). The variant separates parameters that change the
 * problem (k of k-robust, a fixed start heading); CBS switches do not, so they share a row.
 */
import type { Migration } from '../migration';

const KEY = 'scenario_id, agents, model, variant, robot_profile_hash';

/** Per-policy figures kept from the best result's executions: [column suffix, policy name]. */
const POLICIES: readonly (readonly [string, string])[] = [
  ['open_loop', 'open-loop'],
  ['lockstep', 'lockstep'],
  ['dependency_gated', 'dependency-gated'],
];

const policyColumns = POLICIES.flatMap(([s]) => [
  `success_${s} double precision`, `spread_${s} double precision`, `realised_${s} double precision`,
]).join(',\n    ');

const policyNames = POLICIES.flatMap(([s]) => [`success_${s}`, `spread_${s}`, `realised_${s}`]);

const policyAggregates = POLICIES.flatMap(([s, p]) => [
  `max(e.success_rate) FILTER (WHERE e.policy = '${p}') AS success_${s}`,
  `max(e.finish_spread_mean_ms) FILTER (WHERE e.policy = '${p}') AS spread_${s}`,
  `max(e.realised_makespan_mean_ms) FILTER (WHERE e.policy = '${p}') AS realised_${s}`,
]).join(',\n      ');

const VALUE_COLUMNS = [
  'instance_set_id', 'map_id', 'map_name', 'scenario_name', 'robot_profile', 'result_id', 'source', 'status',
  'soc', 'makespan', 'ti_soc_ms', 'ti_makespan_ms', 'lower_bound', 'gap', 'runtime_ms',
  'solver_name', 'solver_version', 'attempts', 'solved_count', ...policyNames,
];

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`CREATE FUNCTION leaderboard_variant(params jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
    SELECT concat_ws(' ',
      CASE WHEN params->'model' ? 'k' THEN 'k=' || (params->'model'->>'k') END,
      CASE WHEN coalesce(params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (params->'model'->>'startHeading') END)
  $$`);

  await q(`CREATE TABLE leaderboard_entries (
    id serial PRIMARY KEY,
    scenario_id integer NOT NULL REFERENCES scenarios(id) ON DELETE CASCADE,
    agents integer NOT NULL,
    model varchar(32) NOT NULL,
    variant varchar(64) NOT NULL,
    robot_profile_hash char(16) NOT NULL,
    instance_set_id integer NOT NULL REFERENCES instance_sets(id) ON DELETE CASCADE,
    map_id integer NOT NULL REFERENCES maps(id) ON DELETE CASCADE,
    map_name varchar(255) NOT NULL,
    scenario_name varchar(255) NOT NULL,
    robot_profile jsonb NOT NULL,
    result_id integer NOT NULL,
    source varchar(16) NOT NULL CHECK (source IN ('sweep', 'submitted')),
    status varchar(16) NOT NULL,
    soc double precision,
    makespan double precision,
    ti_soc_ms double precision,
    ti_makespan_ms double precision,
    lower_bound double precision,
    gap double precision,
    runtime_ms double precision,
    solver_name varchar(120) NOT NULL,
    solver_version varchar(64) NOT NULL,
    attempts integer NOT NULL,
    solved_count integer NOT NULL,
    ${policyColumns},
    updated_at timestamptz NOT NULL DEFAULT now()
  )`);
  await q(`CREATE UNIQUE INDEX leaderboard_entries_key ON leaderboard_entries (${KEY})`);
  // Sort orders of the board, each with id as the tie-break so offset pages are stable.
  await q('CREATE INDEX leaderboard_entries_default_order ON leaderboard_entries (map_name, scenario_name, agents, model, id)');
  await q('CREATE INDEX leaderboard_entries_model_agents ON leaderboard_entries (model, agents, id)');
  for (const col of ['soc', 'ti_makespan_ms', 'runtime_ms', 'gap', 'success_open_loop', 'spread_open_loop']) {
    await q(`CREATE INDEX leaderboard_entries_${col} ON leaderboard_entries (${col}, id)`);
  }
  await q('CREATE INDEX leaderboard_entries_set ON leaderboard_entries (instance_set_id)');
  await q('CREATE INDEX leaderboard_entries_map ON leaderboard_entries (map_id, agents)');
  // The refresh looks results up by key; the variant is an expression over params.
  await q(`CREATE INDEX results_leaderboard_key ON results (scenario_id, agents, model, robot_profile_hash, (leaderboard_variant(params)))`);

  // Recomputes the given keys from results (and the best result's executions); drops keys left with no result.
  // One pass with window functions ranks the candidates and totals each key, so no CTE is ever
  // joined to another CTE (the planner cannot estimate those and may pick a quadratic loop).
  await q(`CREATE FUNCTION leaderboard_refresh(k_scenario integer[], k_agents integer[], k_model text[], k_variant text[], k_hash text[])
  RETURNS void LANGUAGE sql AS $$
    WITH keys AS (
      SELECT DISTINCT * FROM unnest(k_scenario, k_agents, k_model, k_variant, k_hash) AS k(scenario_id, agents, model, variant, robot_profile_hash)
    ),
    ranked AS (
      SELECT r.*, k.variant,
        row_number() OVER key_order AS rank,
        max(r.lower_bound) FILTER (WHERE r.submission_id IS NULL) OVER key_all AS best_lower_bound,
        (count(*) OVER key_all)::integer AS attempts,
        (count(*) FILTER (WHERE r.status = 'solved') OVER key_all)::integer AS solved_count
      FROM keys k JOIN results r
        ON r.scenario_id = k.scenario_id AND r.agents = k.agents AND r.model = k.model
       AND r.robot_profile_hash = k.robot_profile_hash AND leaderboard_variant(r.params) = k.variant
      WINDOW key_all AS (PARTITION BY r.scenario_id, r.agents, r.model, k.variant, r.robot_profile_hash),
        key_order AS (PARTITION BY r.scenario_id, r.agents, r.model, k.variant, r.robot_profile_hash ORDER BY
          CASE r.status WHEN 'solved' THEN 0 WHEN 'infeasible' THEN 1 WHEN 'timeout' THEN 2 WHEN 'memory' THEN 3 ELSE 4 END,
          r.soc NULLS LAST, r.turn_inclusive_makespan_ms NULLS LAST, r.runtime_ms NULLS LAST, r.id)
    ),
    -- A data-modifying CTE runs whether or not the outer statement reads it.
    written AS (
      INSERT INTO leaderboard_entries (${KEY}, ${VALUE_COLUMNS.join(', ')})
      SELECT b.scenario_id, b.agents, b.model, b.variant, b.robot_profile_hash,
        b.instance_set_id, b.map_id, m.name, s.name, b.robot_profile, b.id,
        CASE WHEN b.submission_id IS NULL THEN 'sweep' ELSE 'submitted' END, b.status,
        b.soc, b.makespan, b.turn_inclusive_soc_ms, b.turn_inclusive_makespan_ms, b.best_lower_bound,
        CASE WHEN b.status = 'solved' AND b.best_lower_bound > 0 THEN (b.soc - b.best_lower_bound) / b.best_lower_bound END,
        b.runtime_ms,
        coalesce(sub.solver_name, 'Quarterturn CBS'), b.solver_version, b.attempts, b.solved_count,
        ${policyNames.map((c) => `ex.${c}`).join(', ')}
      FROM ranked b
      JOIN maps m ON m.id = b.map_id
      JOIN scenarios s ON s.id = b.scenario_id
      LEFT JOIN submissions sub ON sub.id = b.submission_id
      LEFT JOIN LATERAL (
        SELECT ${policyAggregates}
        FROM executions e WHERE e.result_id = b.id
      ) ex ON true
      WHERE b.rank = 1
      ON CONFLICT (${KEY}) DO UPDATE SET
        ${[...VALUE_COLUMNS, 'updated_at'].map((c) => (c === 'updated_at' ? 'updated_at = now()' : `${c} = EXCLUDED.${c}`)).join(',\n        ')}
      RETURNING 1
    )
    DELETE FROM leaderboard_entries e USING keys k
    WHERE e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.model = k.model
      AND e.variant = k.variant AND e.robot_profile_hash = k.robot_profile_hash
      AND NOT EXISTS (SELECT 1 FROM results r WHERE r.scenario_id = k.scenario_id AND r.agents = k.agents
        AND r.model = k.model AND r.robot_profile_hash = k.robot_profile_hash AND leaderboard_variant(r.params) = k.variant)
  $$`);

  // Trigger functions: collect the keys a statement touched and refresh them once, set-based.
  const fromResults = (table: string) => `PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT scenario_id, agents, model, leaderboard_variant(params) AS variant, robot_profile_hash FROM ${table}) d;`;
  await q(`CREATE FUNCTION leaderboard_on_results_insert() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromResults('new_rows')} RETURN NULL; END $$`);
  await q(`CREATE FUNCTION leaderboard_on_results_delete() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromResults('old_rows')} RETURN NULL; END $$`);
  const fromExecutions = (table: string) => `PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT r.scenario_id, r.agents, r.model, leaderboard_variant(r.params) AS variant, r.robot_profile_hash
            FROM results r WHERE r.id IN (SELECT result_id FROM ${table})) d;`;
  await q(`CREATE FUNCTION leaderboard_on_executions_insert() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromExecutions('new_rows')} RETURN NULL; END $$`);
  await q(`CREATE FUNCTION leaderboard_on_executions_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromExecutions('new_rows')} RETURN NULL; END $$`);
  // Transition tables allow one event per trigger, hence one trigger per event.
  await q('CREATE TRIGGER leaderboard_results_insert AFTER INSERT ON results REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_results_insert()');
  await q('CREATE TRIGGER leaderboard_results_delete AFTER DELETE ON results REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_results_delete()');
  await q('CREATE TRIGGER leaderboard_executions_insert AFTER INSERT ON executions REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_executions_insert()');
  await q('CREATE TRIGGER leaderboard_executions_update AFTER UPDATE ON executions REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_executions_update()');

  // Full rebuild, for bulk loads and repairs.
  await q(`CREATE FUNCTION leaderboard_rebuild() RETURNS void LANGUAGE plpgsql AS $$
    BEGIN
      DELETE FROM leaderboard_entries;
      ${fromResults('results')}
    END $$`);
};

export const down: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const t of ['leaderboard_results_insert', 'leaderboard_results_delete']) await q(`DROP TRIGGER IF EXISTS ${t} ON results`);
  for (const t of ['leaderboard_executions_insert', 'leaderboard_executions_update']) await q(`DROP TRIGGER IF EXISTS ${t} ON executions`);
  for (const f of ['leaderboard_on_results_insert', 'leaderboard_on_results_delete', 'leaderboard_on_executions_insert', 'leaderboard_on_executions_update', 'leaderboard_rebuild']) {
    await q(`DROP FUNCTION IF EXISTS ${f}()`);
  }
  await q('DROP FUNCTION IF EXISTS leaderboard_refresh(integer[], integer[], text[], text[], text[])');
  await q('DROP INDEX IF EXISTS results_leaderboard_key');
  await q('DROP TABLE IF EXISTS leaderboard_entries');
  await q('DROP FUNCTION IF EXISTS leaderboard_variant(jsonb)');
};
