/**
 * Executable at nominal times, one unit per column, intervals on the board (issue 12, items 4, 5, 7).
 *
 * - `results.executable_at_nominal` (null = not checked: rows stored before this migration) and
 *   `results.nominal_collisions`: the plan replayed open-loop with zero noise under its own robot
 *   profile (solvers/run/nominal-check.ts), written by the sweep worker and the submission check.
 * - Best result per key: a solved result first, then one not known to collide at nominal times
 *   (true or not checked before false), then lowest sum-of-costs as before. A plan that collides
 *   even with perfect timing is never preferred to one that does not.
 * - `leaderboard_entries` copies both from its best result, and per policy the number of runs
 *   (so the execution success rate gets its Wilson interval) and the stored 95 % intervals of the
 *   mean realised makespan and mean finish spread (`metrics.ci95`, null for rows stored before it).
 * - Sum-of-costs, makespan and lower bound get a steps column and an ms column (generated from the
 *   model: weighted-split counts ms, every other model unit steps), so no column mixes units.
 *   The flag also has a generated label (yes / no / not checked), so the board filters and sorts
 *   it on an index.
 * - `leaderboard_compare` gets one executable flag per plan model column, so "best per row"
 *   can skip plans that collide at nominal times.
 * - The variant names `following forbidden` (the default `allowed` adds nothing, so existing
 *   results keep their variant).
 * - An UPDATE of results (e.g. a backfill of the flag) now refreshes the keys it touched.
 *
 * `SELECT leaderboard_rebuild()` rebuilds everything from `results` as before.
 */
import type { Migration } from '../migration';

const KEY = 'scenario_id, agents, model, variant, robot_profile_hash';

const POLICIES: readonly (readonly [string, string])[] = [
  ['open_loop', 'open-loop'],
  ['lockstep', 'lockstep'],
  ['dependency_gated', 'dependency-gated'],
];
/** Per-policy columns added here: the runs and the stored 95 % intervals of the mean realised makespan and finish spread. */
const INTERVAL_COLUMNS = (s: string): readonly (readonly [string, string])[] => [
  [`runs_${s}`, 'integer'],
  [`realised_lo_${s}`, 'double precision'], [`realised_hi_${s}`, 'double precision'],
  [`spread_lo_${s}`, 'double precision'], [`spread_hi_${s}`, 'double precision'],
];

/**
 * The function bodies are built for this migration's schema (`isNew`) or for 0402's (down), so
 * down re-installs exactly what 0402/0403 left.
 */
interface Shape {
  readonly isNew: boolean;
  /**
   * Migration 0411 (external solvers): the solver name of a sweep result comes from
   * results.solver_name when set (an external solver's), else 'Quarterturn CBS'. Absent here, so
   * this migration's own up and down install exactly what they always did.
   */
  readonly hasSolverName?: boolean;
}

/** The solver name of the best result `b` (a submission's, an external solver's with 0411, else our own search). */
const solverNameSql = (shape: Shape) => (shape.hasSolverName
  ? "coalesce(sub.solver_name, b.solver_name, 'Quarterturn CBS')"
  : "coalesce(sub.solver_name, 'Quarterturn CBS')");

/** Per-policy entry columns: 0401's figures, then (new) the runs and interval columns. */
const policyNames = ({ isNew }: Shape) => POLICIES.flatMap(([s]) => [
  `success_${s}`, `spread_${s}`, `realised_${s}`, ...(isNew ? INTERVAL_COLUMNS(s).map(([c]) => c) : []),
]);
const ci = (alias: string, figure: string, bound: 0 | 1) => `(${alias}.metrics->'ci95'->'${figure}'->>${bound})::float8`;
const policyAggregates = ({ isNew }: Shape, alias: string) => POLICIES.flatMap(([s, p]) => [
  `max(${alias}.success_rate) FILTER (WHERE ${alias}.policy = '${p}') AS success_${s}`,
  `max(${alias}.finish_spread_mean_ms) FILTER (WHERE ${alias}.policy = '${p}') AS spread_${s}`,
  `max(${alias}.realised_makespan_mean_ms) FILTER (WHERE ${alias}.policy = '${p}') AS realised_${s}`,
  ...(isNew ? [
    `max(${alias}.runs) FILTER (WHERE ${alias}.policy = '${p}') AS runs_${s}`,
    `max(${ci(alias, 'realisedMakespanMs', 0)}) FILTER (WHERE ${alias}.policy = '${p}') AS realised_lo_${s}`,
    `max(${ci(alias, 'realisedMakespanMs', 1)}) FILTER (WHERE ${alias}.policy = '${p}') AS realised_hi_${s}`,
    `max(${ci(alias, 'finishSpreadMs', 0)}) FILTER (WHERE ${alias}.policy = '${p}') AS spread_lo_${s}`,
    `max(${ci(alias, 'finishSpreadMs', 1)}) FILTER (WHERE ${alias}.policy = '${p}') AS spread_hi_${s}`,
  ] : []),
]).join(',\n        ');

const valueColumns = (shape: Shape) => [
  'instance_set_id', 'map_id', 'map_name', 'scenario_name', 'robot_profile', 'result_id', 'source', 'status',
  'soc', 'makespan', 'ti_soc_ms', 'ti_makespan_ms', 'lower_bound', 'gap', 'runtime_ms',
  'solver_name', 'solver_version', 'attempts', 'solved_count', ...policyNames(shape),
  'is_public', 'owner_id', 'profile_label', 'solver', ...(shape.isNew ? ['executable_at_nominal', 'nominal_collisions'] : []),
];

/** Comparison columns (as in 0402) plus one executable flag per model. */
const COMPARE_MODELS: readonly (readonly [string, string, string])[] = [
  ['classic', 'classic', ''],
  ['uniform_duration', 'uniform-duration', ''],
  ['orientation_split', 'orientation-split', ''],
  ['weighted_split', 'weighted-split', ''],
  ['k_robust', 'k-robust', 'k=1'],
];
const COMPARE_FIGURES = ['ti_makespan_ms', 'ti_soc_ms', 'runtime_ms',
  ...POLICIES.flatMap(([s]) => [`success_${s}`, `spread_${s}`, `realised_${s}`])];
const compareColumns = COMPARE_MODELS.flatMap(([prefix]) => COMPARE_FIGURES.map((f) => `${prefix}_${f}`));
const compareFlags = COMPARE_MODELS.map(([prefix]) => `${prefix}_executable`);
const compareAggregates = ({ isNew }: Shape) => [
  ...COMPARE_MODELS.flatMap(([, model, variant]) => COMPARE_FIGURES.map(
    (f) => `max(e.${f}) FILTER (WHERE e.model = '${model}' AND e.variant = '${variant}')`,
  )),
  ...(isNew ? COMPARE_MODELS.map(([, model, variant]) => `bool_or(e.executable_at_nominal) FILTER (WHERE e.model = '${model}' AND e.variant = '${variant}')`) : []),
].join(',\n        ');
const compareValues = ({ isNew }: Shape) => [
  'instance_set_id', 'map_id', 'is_public', 'owner_id', 'map_name', 'scenario_name', 'profile_label', ...compareColumns, ...(isNew ? compareFlags : []),
];

/** The unit-split columns: [column, source column, is ms]. */
const UNIT_COLUMNS: readonly (readonly [string, string, boolean])[] = [
  ['soc_steps', 'soc', false], ['soc_ms', 'soc', true],
  ['makespan_steps', 'makespan', false], ['makespan_ms', 'makespan', true],
  ['lower_bound_steps', 'lower_bound', false], ['lower_bound_ms', 'lower_bound', true],
];
/** New sortable entry columns; each gets a sort index like 0403's. */
const NEW_SORT_COLUMNS = [...UNIT_COLUMNS.map(([c]) => c), 'nominal_label', 'nominal_collisions'];
const SORT_INCLUDE = ['is_public', 'owner_id', 'model', 'variant', 'status', 'source', 'solver', 'robot_profile_hash'];

const PROFILE_LABEL = (alias: string) => `format('forward %s ms, quarter turn %s ms, wait %s ms, pitch %s mm, diameter %s mm, jitter %s',
  ${alias}.robot_profile->>'forwardMs', ${alias}.robot_profile->>'quarterTurnMs', ${alias}.robot_profile->>'waitMs',
  ${alias}.robot_profile->>'cellPitchMm', ${alias}.robot_profile->>'robotDiameterMm', ${alias}.robot_profile->>'timingJitter')`;

const upsertChanged = (table: string, cols: readonly string[], extra = '') =>
  `DO UPDATE SET ${cols.map((c) => `${c} = EXCLUDED.${c}`).join(', ')}${extra}
      WHERE (${cols.map((c) => `${table}.${c}`).join(', ')}) IS DISTINCT FROM (${cols.map((c) => `EXCLUDED.${c}`).join(', ')})`;

const REFRESH_KEYS = (table: string) => `PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT scenario_id, agents, model, leaderboard_variant(params) AS variant, robot_profile_hash FROM ${table}) d;`;

/** The refresh functions (compare rows, best results, execution figures) for one schema shape (0411 reuses them). */
export const functionBodies = (shape: Shape): string[] => [
  `CREATE OR REPLACE FUNCTION leaderboard_compare_refresh(k_scenario integer[], k_agents integer[], k_hash text[])
  RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(k_scenario), 0) = 0 THEN RETURN; END IF;
    WITH keys AS (
      SELECT DISTINCT scenario_id, agents, robot_profile_hash::char(16) AS robot_profile_hash
      FROM unnest(k_scenario, k_agents, k_hash) AS k(scenario_id, agents, robot_profile_hash)
    )
    INSERT INTO leaderboard_compare (scenario_id, agents, robot_profile_hash, ${compareValues(shape).join(', ')})
    SELECT e.scenario_id, e.agents, e.robot_profile_hash,
      min(e.instance_set_id), min(e.map_id), bool_or(e.is_public), min(e.owner_id), min(e.map_name), min(e.scenario_name), min(e.profile_label),
      ${compareAggregates(shape)}
    FROM keys k JOIN leaderboard_entries e
      ON e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.robot_profile_hash = k.robot_profile_hash
    GROUP BY e.scenario_id, e.agents, e.robot_profile_hash
    ON CONFLICT (scenario_id, agents, robot_profile_hash) ${upsertChanged('leaderboard_compare', compareValues(shape))};

    DELETE FROM leaderboard_compare c
    USING (SELECT DISTINCT * FROM unnest(k_scenario, k_agents, k_hash) AS k(scenario_id, agents, robot_profile_hash)) k
    WHERE c.scenario_id = k.scenario_id AND c.agents = k.agents AND c.robot_profile_hash = k.robot_profile_hash::char(16)
      AND NOT EXISTS (SELECT 1 FROM leaderboard_entries e WHERE e.scenario_id = c.scenario_id AND e.agents = c.agents
        AND e.robot_profile_hash = c.robot_profile_hash);
  END $$`,

  `CREATE OR REPLACE FUNCTION leaderboard_refresh(k_scenario integer[], k_agents integer[], k_model text[], k_variant text[], k_hash text[])
  RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(k_scenario), 0) = 0 THEN RETURN; END IF;
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
          ${shape.isNew ? '(r.executable_at_nominal IS FALSE),' : ''}
          r.soc NULLS LAST, r.turn_inclusive_makespan_ms NULLS LAST, r.runtime_ms NULLS LAST, r.id)
    )
    INSERT INTO leaderboard_entries (${KEY}, ${valueColumns(shape).join(', ')})
    SELECT b.scenario_id, b.agents, b.model, b.variant, b.robot_profile_hash,
      b.instance_set_id, b.map_id, m.name, s.name, b.robot_profile, b.id,
      CASE WHEN b.submission_id IS NULL THEN 'sweep' ELSE 'submitted' END, b.status,
      b.soc, b.makespan, b.turn_inclusive_soc_ms, b.turn_inclusive_makespan_ms, b.best_lower_bound,
      CASE WHEN b.status = 'solved' AND b.best_lower_bound > 0 THEN (b.soc - b.best_lower_bound) / b.best_lower_bound END,
      b.runtime_ms,
      ${solverNameSql(shape)}, b.solver_version, b.attempts, b.solved_count,
      ${policyNames(shape).map((c) => `ex.${c}`).join(', ')},
      st.visibility = 'public', st.owner_id, ${PROFILE_LABEL('b')},
      ${solverNameSql(shape)} || ' ' || b.solver_version
      ${shape.isNew ? ', b.executable_at_nominal, b.nominal_collisions' : ''}
    FROM ranked b
    JOIN maps m ON m.id = b.map_id
    JOIN scenarios s ON s.id = b.scenario_id
    JOIN instance_sets st ON st.id = b.instance_set_id
    LEFT JOIN submissions sub ON sub.id = b.submission_id
    LEFT JOIN LATERAL (
      SELECT ${policyAggregates(shape, 'x')}
      FROM executions x WHERE x.result_id = b.id
    ) ex ON true
    WHERE b.rank = 1
    ON CONFLICT (${KEY}) ${upsertChanged('leaderboard_entries', valueColumns(shape), ', updated_at = now()')};

    DELETE FROM leaderboard_entries e
    USING (SELECT DISTINCT * FROM unnest(k_scenario, k_agents, k_model, k_variant, k_hash) AS k(scenario_id, agents, model, variant, robot_profile_hash)) k
    WHERE e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.model = k.model
      AND e.variant = k.variant AND e.robot_profile_hash = k.robot_profile_hash
      AND NOT EXISTS (SELECT 1 FROM results r WHERE r.scenario_id = k.scenario_id AND r.agents = k.agents
        AND r.model = k.model AND r.robot_profile_hash = k.robot_profile_hash AND leaderboard_variant(r.params) = k.variant);
  END $$`,

  `CREATE OR REPLACE FUNCTION leaderboard_refresh_executions(result_ids integer[]) RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(result_ids), 0) = 0 THEN RETURN; END IF;
    UPDATE leaderboard_entries e
    SET (${policyNames(shape).join(', ')}) = (${policyNames(shape).map((c) => `ex.${c}`).join(', ')}), updated_at = now()
    FROM (
      SELECT r.id, ${policyAggregates(shape, 'x')}
      FROM (SELECT DISTINCT unnest(result_ids) AS id) r LEFT JOIN executions x ON x.result_id = r.id
      GROUP BY r.id
    ) ex
    WHERE e.result_id = ex.id
      AND (${policyNames(shape).map((c) => `e.${c}`).join(', ')}) IS DISTINCT FROM (${policyNames(shape).map((c) => `ex.${c}`).join(', ')});
  END $$`,

];

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);

  await q(`ALTER TABLE results
    ADD COLUMN executable_at_nominal boolean,
    ADD COLUMN nominal_collisions integer CHECK (nominal_collisions >= 0)`);

  // The following rule (issue 12, item 3) is part of the variant when forbidden.
  await q(`CREATE OR REPLACE FUNCTION leaderboard_variant(params jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
    SELECT concat_ws(' ',
      CASE WHEN params->'model' ? 'k' THEN 'k=' || (params->'model'->>'k') END,
      CASE WHEN coalesce(params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (params->'model'->>'startHeading') END,
      CASE WHEN params->'model'->>'following' = 'forbidden' THEN 'following forbidden' END)
  $$`);
  await q('REINDEX INDEX results_leaderboard_key');

  // Derived tables are emptied and rebuilt at the end.
  await q('TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts');
  await q(`ALTER TABLE leaderboard_entries
    ADD COLUMN executable_at_nominal boolean,
    ADD COLUMN nominal_collisions integer,
    ${POLICIES.flatMap(([s]) => INTERVAL_COLUMNS(s).map(([c, type]) => `ADD COLUMN ${c} ${type}`)).join(',\n    ')},
    ${UNIT_COLUMNS.map(([c, src, isMs]) => `ADD COLUMN ${c} double precision GENERATED ALWAYS AS (CASE WHEN model ${isMs ? '=' : '<>'} 'weighted-split' THEN ${src} END) STORED`).join(',\n    ')},
    ADD COLUMN nominal_label text GENERATED ALWAYS AS (CASE executable_at_nominal WHEN true THEN 'yes' WHEN false THEN 'no' ELSE 'not checked' END) STORED`);
  for (const col of NEW_SORT_COLUMNS) {
    await q(`CREATE INDEX leaderboard_entries_by_${col} ON leaderboard_entries (${col}, id) INCLUDE (${SORT_INCLUDE.join(', ')})`);
  }
  await q(`ALTER TABLE leaderboard_compare ${compareFlags.map((c) => `ADD COLUMN ${c} boolean`).join(', ')}`);

  for (const sql of functionBodies({ isNew: true })) await q(sql);

  // An UPDATE of results (a backfill of the nominal check, say) re-ranks the keys of the old and new rows.
  await q(`CREATE FUNCTION leaderboard_on_results_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${REFRESH_KEYS('(SELECT scenario_id, agents, model, params, robot_profile_hash FROM old_rows UNION ALL SELECT scenario_id, agents, model, params, robot_profile_hash FROM new_rows) u')} RETURN NULL; END $$`);
  await q('CREATE TRIGGER leaderboard_results_update AFTER UPDATE ON results REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_results_update()');

  await q(`CREATE OR REPLACE FUNCTION leaderboard_rebuild() RETURNS void LANGUAGE plpgsql AS $$
    BEGIN
      TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts;
      ${REFRESH_KEYS('results')}
    END $$`);
  await q('SELECT leaderboard_rebuild()');
};

/**
 * Back to 0404: this migration's columns, indexes and trigger go, 0402's function bodies and
 * 0401's variant return. The stored checks go with their column (an up again reads every
 * result as not checked).
 */
export const down: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q('DROP TRIGGER IF EXISTS leaderboard_results_update ON results');
  await q('DROP FUNCTION IF EXISTS leaderboard_on_results_update()');
  await q('TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts');
  for (const sql of functionBodies({ isNew: false })) await q(sql);
  for (const col of NEW_SORT_COLUMNS) await q(`DROP INDEX IF EXISTS leaderboard_entries_by_${col}`);
  await q(`ALTER TABLE leaderboard_compare ${compareFlags.map((c) => `DROP COLUMN ${c}`).join(', ')}`);
  await q(`ALTER TABLE leaderboard_entries
    DROP COLUMN nominal_label, DROP COLUMN executable_at_nominal, DROP COLUMN nominal_collisions,
    ${POLICIES.flatMap(([s]) => INTERVAL_COLUMNS(s).map(([c]) => `DROP COLUMN ${c}`)).join(', ')},
    ${UNIT_COLUMNS.map(([c]) => `DROP COLUMN ${c}`).join(', ')}`);
  await q(`CREATE OR REPLACE FUNCTION leaderboard_variant(params jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
    SELECT concat_ws(' ',
      CASE WHEN params->'model' ? 'k' THEN 'k=' || (params->'model'->>'k') END,
      CASE WHEN coalesce(params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (params->'model'->>'startHeading') END)
  $$`);
  await q('REINDEX INDEX results_leaderboard_key');
  await q('ALTER TABLE results DROP COLUMN executable_at_nominal, DROP COLUMN nominal_collisions');
  await q('SELECT leaderboard_rebuild()');
};
