/**
 * Leaderboard speed at 1,000,000 results (issue 8).
 *
 * - `leaderboard_compare`: the comparison layout precomputed, one row per instance (scenario,
 *   agent count) × robot profile with one column per plan model × comparison figure, so a page
 *   is an index scan instead of grouping 200,000 entries per request. It is derived from
 *   `leaderboard_entries` only, by statement-level triggers on that table, so every path that
 *   changes entries (refresh, cascades, visibility) keeps it right. It has no foreign keys: a
 *   cascade may delete a scenario before its entries, and the entries trigger removes the row.
 *   Its k-robust columns hold the k=1 variant (the board's default); another k joins that
 *   variant's entries by their unique key.
 * - `leaderboard_counts`: entries per set × map × robot profile, also kept by the entries'
 *   triggers, so the row count of an unfiltered view (the board's default) is a small sum.
 * - Entries and comparison rows carry the set's visibility and owner, the profile label and the
 *   solver label, so visibility and every sort run on indexed columns of one table.
 * - Executions no longer re-rank results: they only change the figures of the entry whose best
 *   result they replay (the ranking ignores executions), so their triggers update those columns.
 *   Deleting executions, changing a set's visibility or owner, and deleting or renaming a
 *   submission now refresh what they affect.
 * - Upserts skip rows whose values did not change, so a refresh writes (and re-indexes) only
 *   real changes.
 *
 * `SELECT leaderboard_rebuild()` rebuilds all three tables from `results`.
 */
import type { Migration } from '../migration';
import * as entriesMigration from './0401-leaderboard-entries';

const KEY = 'scenario_id, agents, model, variant, robot_profile_hash';

/** [column suffix, policy name] of the per-policy figures (as in 0401). */
const POLICIES: readonly (readonly [string, string])[] = [
  ['open_loop', 'open-loop'],
  ['lockstep', 'lockstep'],
  ['dependency_gated', 'dependency-gated'],
];
const policyNames = POLICIES.flatMap(([s]) => [`success_${s}`, `spread_${s}`, `realised_${s}`]);
const policyAggregates = (alias: string) => POLICIES.flatMap(([s, p]) => [
  `max(${alias}.success_rate) FILTER (WHERE ${alias}.policy = '${p}') AS success_${s}`,
  `max(${alias}.finish_spread_mean_ms) FILTER (WHERE ${alias}.policy = '${p}') AS spread_${s}`,
  `max(${alias}.realised_makespan_mean_ms) FILTER (WHERE ${alias}.policy = '${p}') AS realised_${s}`,
]).join(',\n        ');

const VALUE_COLUMNS = [
  'instance_set_id', 'map_id', 'map_name', 'scenario_name', 'robot_profile', 'result_id', 'source', 'status',
  'soc', 'makespan', 'ti_soc_ms', 'ti_makespan_ms', 'lower_bound', 'gap', 'runtime_ms',
  'solver_name', 'solver_version', 'attempts', 'solved_count', ...policyNames,
  'is_public', 'owner_id', 'profile_label', 'solver',
];

/** Plan models of the comparison columns: [column prefix, model, variant]. k-robust at k=1. */
const COMPARE_MODELS: readonly (readonly [string, string, string])[] = [
  ['classic', 'classic', ''],
  ['uniform_duration', 'uniform-duration', ''],
  ['orientation_split', 'orientation-split', ''],
  ['weighted_split', 'weighted-split', ''],
  ['k_robust', 'k-robust', 'k=1'],
];
/** Entry columns a comparison table can show (shared/leaderboards.ts COMPARE_METRICS). */
const COMPARE_FIGURES = ['ti_makespan_ms', 'ti_soc_ms', 'runtime_ms', ...policyNames];
const compareColumns = COMPARE_MODELS.flatMap(([prefix]) => COMPARE_FIGURES.map((f) => `${prefix}_${f}`));
const compareAggregates = COMPARE_MODELS.flatMap(([prefix, model, variant]) => COMPARE_FIGURES.map(
  (f) => `max(e.${f}) FILTER (WHERE e.model = '${model}' AND e.variant = '${variant}')`,
)).join(',\n        ');
const COMPARE_VALUES = ['instance_set_id', 'map_id', 'is_public', 'owner_id', 'map_name', 'scenario_name', 'profile_label', ...compareColumns];

/** The SQL label of a robot profile (= shared/leaderboards.ts profileLabel for stored profiles). */
const PROFILE_LABEL = (alias: string) => `format('forward %s ms, quarter turn %s ms, wait %s ms, pitch %s mm, diameter %s mm, jitter %s',
  ${alias}.robot_profile->>'forwardMs', ${alias}.robot_profile->>'quarterTurnMs', ${alias}.robot_profile->>'waitMs',
  ${alias}.robot_profile->>'cellPitchMm', ${alias}.robot_profile->>'robotDiameterMm', ${alias}.robot_profile->>'timingJitter')`;

/** `SET a = EXCLUDED.a, …` plus a WHERE that skips an update changing nothing. */
const upsertChanged = (table: string, cols: readonly string[], extra = '') =>
  `DO UPDATE SET ${cols.map((c) => `${c} = EXCLUDED.${c}`).join(', ')}${extra}
      WHERE (${cols.map((c) => `${table}.${c}`).join(', ')}) IS DISTINCT FROM (${cols.map((c) => `EXCLUDED.${c}`).join(', ')})`;

/** Sort columns of the board (entries layout): each index ends in id, the page tie-break. */
const ENTRY_SORT_COLUMNS = [
  'map_name', 'scenario_name', 'agents', 'model', 'variant', 'profile_label', 'status', 'makespan', 'ti_soc_ms', 'lower_bound',
  'realised_open_loop', 'success_lockstep', 'spread_lockstep', 'realised_lockstep',
  'success_dependency_gated', 'spread_dependency_gated', 'realised_dependency_gated', 'source', 'solver',
];
/** 0401 indexed these sort columns without the visibility columns; they are rebuilt with them. */
const OLD_SORT_INDEXES = ['soc', 'ti_makespan_ms', 'runtime_ms', 'gap', 'success_open_loop', 'spread_open_loop'];

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);

  // The table is derived; it is emptied and rebuilt at the end, so new NOT NULL columns need no default.
  await q('DELETE FROM leaderboard_entries');
  await q(`ALTER TABLE leaderboard_entries
    ADD COLUMN is_public boolean NOT NULL,
    ADD COLUMN owner_id integer NOT NULL,
    ADD COLUMN profile_label text NOT NULL,
    ADD COLUMN solver text NOT NULL`);
  // Every sortable column gets a (column, id) index; INCLUDE lets visibility be checked, and deep
  // offsets skipped, from the index alone.
  for (const col of OLD_SORT_INDEXES) await q(`DROP INDEX leaderboard_entries_${col}`);
  for (const col of [...OLD_SORT_INDEXES, ...ENTRY_SORT_COLUMNS]) {
    await q(`CREATE INDEX leaderboard_entries_by_${col} ON leaderboard_entries (${col}, id) INCLUDE (is_public, owner_id)`);
  }
  // 0401's default-order and map indexes, again with the visibility columns.
  await q('DROP INDEX leaderboard_entries_default_order');
  await q('CREATE INDEX leaderboard_entries_default_order ON leaderboard_entries (map_name, scenario_name, agents, model, id) INCLUDE (is_public, owner_id)');
  await q('DROP INDEX leaderboard_entries_map');
  await q('CREATE INDEX leaderboard_entries_map ON leaderboard_entries (map_id, agents) INCLUDE (is_public, owner_id)');
  await q('CREATE INDEX leaderboard_entries_scenario ON leaderboard_entries (scenario_id) INCLUDE (is_public, owner_id)');
  await q('CREATE INDEX leaderboard_entries_visibility ON leaderboard_entries (is_public, owner_id)');
  await q('CREATE INDEX leaderboard_entries_result ON leaderboard_entries (result_id)');
  await q('CREATE INDEX results_submission ON results (submission_id) WHERE submission_id IS NOT NULL');

  await q(`CREATE TABLE leaderboard_compare (
    scenario_id integer NOT NULL,
    agents integer NOT NULL,
    robot_profile_hash char(16) NOT NULL,
    instance_set_id integer NOT NULL,
    map_id integer NOT NULL,
    is_public boolean NOT NULL,
    owner_id integer NOT NULL,
    map_name varchar(255) NOT NULL,
    scenario_name varchar(255) NOT NULL,
    profile_label text NOT NULL,
    ${compareColumns.map((c) => `${c} double precision`).join(',\n    ')},
    PRIMARY KEY (scenario_id, agents, robot_profile_hash)
  )`);
  // Key sorts carry the full tie-break (map, scenario, agents, scenario id, profile); figure
  // sorts index the figure alone and the planner sorts ties incrementally.
  const TIE = 'map_name, scenario_name, agents, scenario_id, robot_profile_hash';
  await q(`CREATE INDEX leaderboard_compare_default_order ON leaderboard_compare (${TIE}) INCLUDE (is_public, owner_id)`);
  await q(`CREATE INDEX leaderboard_compare_by_scenario ON leaderboard_compare (scenario_name, ${TIE}) INCLUDE (is_public, owner_id)`);
  await q(`CREATE INDEX leaderboard_compare_by_agents ON leaderboard_compare (agents, ${TIE}) INCLUDE (is_public, owner_id)`);
  await q(`CREATE INDEX leaderboard_compare_by_profile ON leaderboard_compare (profile_label, ${TIE}) INCLUDE (is_public, owner_id)`);
  for (const col of compareColumns) await q(`CREATE INDEX lbc_${col} ON leaderboard_compare (${col}) INCLUDE (is_public, owner_id)`);
  await q('CREATE INDEX leaderboard_compare_set ON leaderboard_compare (instance_set_id)');
  await q('CREATE INDEX leaderboard_compare_map ON leaderboard_compare (map_id)');

  // Recomputes the comparison rows of the given instance × profile keys from their entries; drops keys with none left.
  await q(`CREATE FUNCTION leaderboard_compare_refresh(k_scenario integer[], k_agents integer[], k_hash text[])
  RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(k_scenario), 0) = 0 THEN RETURN; END IF;
    WITH keys AS (
      SELECT DISTINCT scenario_id, agents, robot_profile_hash::char(16) AS robot_profile_hash
      FROM unnest(k_scenario, k_agents, k_hash) AS k(scenario_id, agents, robot_profile_hash)
    )
    INSERT INTO leaderboard_compare (scenario_id, agents, robot_profile_hash, ${COMPARE_VALUES.join(', ')})
    SELECT e.scenario_id, e.agents, e.robot_profile_hash,
      min(e.instance_set_id), min(e.map_id), bool_or(e.is_public), min(e.owner_id), min(e.map_name), min(e.scenario_name), min(e.profile_label),
      ${compareAggregates}
    FROM keys k JOIN leaderboard_entries e
      ON e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.robot_profile_hash = k.robot_profile_hash
    GROUP BY e.scenario_id, e.agents, e.robot_profile_hash
    ON CONFLICT (scenario_id, agents, robot_profile_hash) ${upsertChanged('leaderboard_compare', COMPARE_VALUES)};

    DELETE FROM leaderboard_compare c
    USING (SELECT DISTINCT * FROM unnest(k_scenario, k_agents, k_hash) AS k(scenario_id, agents, robot_profile_hash)) k
    WHERE c.scenario_id = k.scenario_id AND c.agents = k.agents AND c.robot_profile_hash = k.robot_profile_hash::char(16)
      AND NOT EXISTS (SELECT 1 FROM leaderboard_entries e WHERE e.scenario_id = c.scenario_id AND e.agents = c.agents
        AND e.robot_profile_hash = c.robot_profile_hash);
  END $$`);

  // Entry counts per set × map × robot profile: the row count of a board view without filters
  // (the default view) is a sum over a few rows instead of a count over every entry. Concurrent
  // writers to one map and profile queue on its row until they commit; keys are locked in order.
  await q(`CREATE TABLE leaderboard_counts (
    instance_set_id integer NOT NULL,
    map_id integer NOT NULL,
    robot_profile_hash char(16) NOT NULL,
    entries integer NOT NULL,
    PRIMARY KEY (instance_set_id, map_id, robot_profile_hash)
  )`);
  await q(`CREATE FUNCTION leaderboard_counts_add(k_set integer[], k_map integer[], k_hash text[], k_n integer[]) RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(k_set), 0) = 0 THEN RETURN; END IF;
    INSERT INTO leaderboard_counts AS k (instance_set_id, map_id, robot_profile_hash, entries)
    SELECT d.s, d.m, d.h, sum(d.n) FROM unnest(k_set, k_map, k_hash, k_n) AS d(s, m, h, n)
    GROUP BY d.s, d.m, d.h HAVING sum(d.n) <> 0 ORDER BY d.s, d.m, d.h
    ON CONFLICT (instance_set_id, map_id, robot_profile_hash) DO UPDATE SET entries = k.entries + EXCLUDED.entries;
    DELETE FROM leaderboard_counts k USING unnest(k_set, k_map, k_hash) AS d(s, m, h)
    WHERE k.instance_set_id = d.s AND k.map_id = d.m AND k.robot_profile_hash = d.h::char(16) AND k.entries = 0;
  END $$`);

  // Statement triggers on the entries: refresh the comparison rows of the instances touched and move the counts.
  const compareFrom = (table: string) => `PERFORM leaderboard_compare_refresh(array_agg(scenario_id), array_agg(agents), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT scenario_id, agents, robot_profile_hash FROM ${table}) d;`;
  const countsFrom = (signed: string) => `PERFORM leaderboard_counts_add(array_agg(s), array_agg(m), array_agg(h::text), array_agg(n::integer))
      FROM (SELECT instance_set_id AS s, map_id AS m, robot_profile_hash AS h, sum(n) AS n FROM (${signed}) u GROUP BY 1, 2, 3 HAVING sum(n) <> 0) d;`;
  const signedRows = (table: string, sign: number) => `SELECT instance_set_id, map_id, robot_profile_hash, ${sign} AS n FROM ${table}`;
  await q(`CREATE FUNCTION leaderboard_entries_on_insert() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${compareFrom('new_rows')} ${countsFrom(signedRows('new_rows', 1))} RETURN NULL; END $$`);
  await q(`CREATE FUNCTION leaderboard_entries_on_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      ${compareFrom('(SELECT scenario_id, agents, robot_profile_hash FROM old_rows UNION SELECT scenario_id, agents, robot_profile_hash FROM new_rows) u')}
      ${countsFrom(`${signedRows('new_rows', 1)} UNION ALL ${signedRows('old_rows', -1)}`)}
      RETURN NULL;
    END $$`);
  await q(`CREATE FUNCTION leaderboard_entries_on_delete() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${compareFrom('old_rows')} ${countsFrom(signedRows('old_rows', -1))} RETURN NULL; END $$`);
  await q('CREATE TRIGGER leaderboard_entries_insert AFTER INSERT ON leaderboard_entries REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_entries_on_insert()');
  await q('CREATE TRIGGER leaderboard_entries_update AFTER UPDATE ON leaderboard_entries REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_entries_on_update()');
  await q('CREATE TRIGGER leaderboard_entries_delete AFTER DELETE ON leaderboard_entries REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_entries_on_delete()');

  // The best-result refresh of 0401, now also writing the visibility and label columns and
  // skipping unchanged rows. Same signature, so the results triggers of 0401 call it unchanged.
  await q(`CREATE OR REPLACE FUNCTION leaderboard_refresh(k_scenario integer[], k_agents integer[], k_model text[], k_variant text[], k_hash text[])
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
          r.soc NULLS LAST, r.turn_inclusive_makespan_ms NULLS LAST, r.runtime_ms NULLS LAST, r.id)
    )
    INSERT INTO leaderboard_entries (${KEY}, ${VALUE_COLUMNS.join(', ')})
    SELECT b.scenario_id, b.agents, b.model, b.variant, b.robot_profile_hash,
      b.instance_set_id, b.map_id, m.name, s.name, b.robot_profile, b.id,
      CASE WHEN b.submission_id IS NULL THEN 'sweep' ELSE 'submitted' END, b.status,
      b.soc, b.makespan, b.turn_inclusive_soc_ms, b.turn_inclusive_makespan_ms, b.best_lower_bound,
      CASE WHEN b.status = 'solved' AND b.best_lower_bound > 0 THEN (b.soc - b.best_lower_bound) / b.best_lower_bound END,
      b.runtime_ms,
      coalesce(sub.solver_name, 'Quarterturn CBS'), b.solver_version, b.attempts, b.solved_count,
      ${policyNames.map((c) => `ex.${c}`).join(', ')},
      st.visibility = 'public', st.owner_id, ${PROFILE_LABEL('b')},
      coalesce(sub.solver_name, 'Quarterturn CBS') || ' ' || b.solver_version
    FROM ranked b
    JOIN maps m ON m.id = b.map_id
    JOIN scenarios s ON s.id = b.scenario_id
    JOIN instance_sets st ON st.id = b.instance_set_id
    LEFT JOIN submissions sub ON sub.id = b.submission_id
    LEFT JOIN LATERAL (
      SELECT ${policyAggregates('x')}
      FROM executions x WHERE x.result_id = b.id
    ) ex ON true
    WHERE b.rank = 1
    ON CONFLICT (${KEY}) ${upsertChanged('leaderboard_entries', VALUE_COLUMNS, ', updated_at = now()')};

    DELETE FROM leaderboard_entries e
    USING (SELECT DISTINCT * FROM unnest(k_scenario, k_agents, k_model, k_variant, k_hash) AS k(scenario_id, agents, model, variant, robot_profile_hash)) k
    WHERE e.scenario_id = k.scenario_id AND e.agents = k.agents AND e.model = k.model
      AND e.variant = k.variant AND e.robot_profile_hash = k.robot_profile_hash
      AND NOT EXISTS (SELECT 1 FROM results r WHERE r.scenario_id = k.scenario_id AND r.agents = k.agents
        AND r.model = k.model AND r.robot_profile_hash = k.robot_profile_hash AND leaderboard_variant(r.params) = k.variant);
  END $$`);

  // Executions only feed the policy figures of the entry whose best result they replay.
  await q(`CREATE FUNCTION leaderboard_refresh_executions(result_ids integer[]) RETURNS void LANGUAGE plpgsql AS $$
  BEGIN
    IF coalesce(cardinality(result_ids), 0) = 0 THEN RETURN; END IF;
    UPDATE leaderboard_entries e
    SET (${policyNames.join(', ')}) = (${policyNames.map((c) => `ex.${c}`).join(', ')}), updated_at = now()
    FROM (
      SELECT r.id, ${policyAggregates('x')}
      FROM (SELECT DISTINCT unnest(result_ids) AS id) r LEFT JOIN executions x ON x.result_id = r.id
      GROUP BY r.id
    ) ex
    WHERE e.result_id = ex.id
      AND (${policyNames.map((c) => `e.${c}`).join(', ')}) IS DISTINCT FROM (${policyNames.map((c) => `ex.${c}`).join(', ')});
  END $$`);
  await q(`CREATE OR REPLACE FUNCTION leaderboard_on_executions_insert() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN PERFORM leaderboard_refresh_executions(ARRAY(SELECT result_id FROM new_rows)); RETURN NULL; END $$`);
  await q(`CREATE OR REPLACE FUNCTION leaderboard_on_executions_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN PERFORM leaderboard_refresh_executions(ARRAY(SELECT result_id FROM new_rows UNION SELECT result_id FROM old_rows)); RETURN NULL; END $$`);
  await q(`CREATE FUNCTION leaderboard_on_executions_delete() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN PERFORM leaderboard_refresh_executions(ARRAY(SELECT result_id FROM old_rows)); RETURN NULL; END $$`);
  await q('DROP TRIGGER leaderboard_executions_update ON executions');
  await q('CREATE TRIGGER leaderboard_executions_update AFTER UPDATE ON executions REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_executions_update()');
  await q('CREATE TRIGGER leaderboard_executions_delete AFTER DELETE ON executions REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_executions_delete()');

  // A set's visibility or owner decides who sees its rows.
  await q(`CREATE FUNCTION leaderboard_on_sets_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      UPDATE leaderboard_entries e SET is_public = (s.visibility = 'public'), owner_id = s.owner_id, updated_at = now()
      FROM new_rows s
      WHERE e.instance_set_id = s.id AND (e.is_public, e.owner_id) IS DISTINCT FROM (s.visibility = 'public', s.owner_id);
      RETURN NULL;
    END $$`);
  await q('CREATE TRIGGER leaderboard_sets_update AFTER UPDATE ON instance_sets REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_sets_update()');

  // A submission names the solver of its results' entries.
  const fromSubmissions = (table: string) => `PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT r.scenario_id, r.agents, r.model, leaderboard_variant(r.params) AS variant, r.robot_profile_hash
            FROM results r WHERE r.submission_id IN (SELECT id FROM ${table})) d;`;
  await q(`CREATE FUNCTION leaderboard_on_submissions_update() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromSubmissions('new_rows')} RETURN NULL; END $$`);
  await q(`CREATE FUNCTION leaderboard_on_submissions_delete() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN ${fromSubmissions('old_rows')} RETURN NULL; END $$`);
  await q('CREATE TRIGGER leaderboard_submissions_update AFTER UPDATE ON submissions REFERENCING NEW TABLE AS new_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_submissions_update()');
  await q('CREATE TRIGGER leaderboard_submissions_delete AFTER DELETE ON submissions REFERENCING OLD TABLE AS old_rows FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_on_submissions_delete()');

  // Full rebuild of both derived tables, for bulk loads and repairs. TRUNCATE (not DELETE) leaves
  // compact tables and indexes behind; it locks readers out until the rebuild commits.
  await q(`CREATE OR REPLACE FUNCTION leaderboard_rebuild() RETURNS void LANGUAGE plpgsql AS $$
    BEGIN
      TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts;
      PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT scenario_id, agents, model, leaderboard_variant(params) AS variant, robot_profile_hash FROM results) d;
    END $$`);
  await q('SELECT leaderboard_rebuild()');
};

/** Back to the 0401 schema: drop everything above, then 0401 down and up again (it rebuilds from results). */
export const down: Migration = async (params) => {
  const q = (sql: string) => params.context.sequelize.query(sql);
  await q('DROP TRIGGER IF EXISTS leaderboard_sets_update ON instance_sets');
  for (const t of ['leaderboard_submissions_update', 'leaderboard_submissions_delete']) await q(`DROP TRIGGER IF EXISTS ${t} ON submissions`);
  await q('DROP TRIGGER IF EXISTS leaderboard_executions_delete ON executions');
  for (const f of ['leaderboard_on_sets_update', 'leaderboard_on_submissions_update', 'leaderboard_on_submissions_delete', 'leaderboard_on_executions_delete',
    'leaderboard_entries_on_insert', 'leaderboard_entries_on_update', 'leaderboard_entries_on_delete']) {
    await q(`DROP FUNCTION IF EXISTS ${f}() CASCADE`);
  }
  await q('DROP FUNCTION IF EXISTS leaderboard_refresh_executions(integer[])');
  await q('DROP FUNCTION IF EXISTS leaderboard_compare_refresh(integer[], integer[], text[])');
  await q('DROP FUNCTION IF EXISTS leaderboard_counts_add(integer[], integer[], text[], integer[])');
  await q('DROP TABLE IF EXISTS leaderboard_compare');
  await q('DROP TABLE IF EXISTS leaderboard_counts');
  await q('DROP INDEX IF EXISTS results_submission');
  await entriesMigration.down(params);
  await entriesMigration.up(params);
  await q('SELECT leaderboard_rebuild()');
};
