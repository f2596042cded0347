/**
 * Deep pages of a board sorted by a few-valued column and then another key (issue 8).
 *
 * The order (A, B, id) with A few-valued is answered group by group: the rows per A value come
 * from a small counts table, so a page knows which group its offset falls in and how deep, and
 * then walks the (B, id) index of that group only. For that walk to stay in the index, every sort
 * index also carries the few-valued columns (the profile as its hash, 17 bytes instead of a
 * ~90-character label; a hash has one label). One wider index per sort column instead of one per
 * pair of columns.
 *
 * - `leaderboard_group_counts`: entries per map × robot profile × visibility × model × variant ×
 *   status × source × solver, kept by statement triggers on `leaderboard_entries` (beside 0402's),
 *   so the rows per value of any few-valued column, for any viewer and scope, are a sum over a
 *   few thousand rows.
 * - `leaderboard_rebuild()` also empties it (TRUNCATE fires no delete trigger); the entries'
 *   insert trigger fills it again.
 */
import type { Migration } from '../migration';

/** The grouping columns, in key order (types as in leaderboard_entries, so values sort alike). */
const GROUP_COLUMNS: readonly (readonly [string, string])[] = [
  ['map_id', 'integer'], ['robot_profile_hash', 'char(16)'], ['is_public', 'boolean'], ['owner_id', 'integer'],
  ['model', 'varchar(32)'], ['variant', 'varchar(64)'], ['status', 'varchar(16)'], ['source', 'varchar(16)'],
  ['solver', 'text'], ['profile_label', 'text'],
];
const KEY = GROUP_COLUMNS.map(([c]) => c).join(', ');

/** The sort indexes of 0402 (all but the default order): one per sortable column. */
const SORT_COLUMNS = [
  'soc', 'ti_makespan_ms', 'runtime_ms', 'gap', 'success_open_loop', 'spread_open_loop',
  'map_name', 'scenario_name', 'agents', 'model', 'variant', 'profile_label', 'status', 'makespan', 'ti_soc_ms', 'lower_bound',
  'realised_open_loop', 'success_lockstep', 'spread_lockstep', 'realised_lockstep',
  'success_dependency_gated', 'spread_dependency_gated', 'realised_dependency_gated', 'source', 'solver',
];
/** Few-valued columns carried by every sort index besides the visibility columns. */
const GROUP_INCLUDE = ['model', 'variant', 'status', 'source', 'solver', 'robot_profile_hash'];

const sortIndex = (col: string, include: readonly string[]) =>
  `CREATE INDEX leaderboard_entries_by_${col} ON leaderboard_entries (${col}, id) INCLUDE (${include.filter((c) => c !== col).join(', ')})`;

/** 0402's rebuild without or with the new table. */
const rebuild = (tables: string) => `CREATE OR REPLACE FUNCTION leaderboard_rebuild() RETURNS void LANGUAGE plpgsql AS $$
    BEGIN
      TRUNCATE ${tables};
      PERFORM leaderboard_refresh(array_agg(scenario_id), array_agg(agents), array_agg(model::text), array_agg(variant), array_agg(robot_profile_hash::text))
      FROM (SELECT DISTINCT scenario_id, agents, model, leaderboard_variant(params) AS variant, robot_profile_hash FROM results) d;
    END $$`;

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const col of SORT_COLUMNS) {
    await q(`DROP INDEX leaderboard_entries_by_${col}`);
    await q(sortIndex(col, ['is_public', 'owner_id', ...GROUP_INCLUDE]));
  }

  await q(`CREATE TABLE leaderboard_group_counts (
    ${GROUP_COLUMNS.map(([c, t]) => `${c} ${t} NOT NULL`).join(',\n    ')},
    entries integer NOT NULL,
    PRIMARY KEY (${KEY})
  )`);

  // Signed rows of a statement (+1 new, −1 old) summed per key; keys are written in key order so
  // concurrent writers lock them alike, and keys left at zero are removed.
  const signed = (table: string, sign: number) => `SELECT ${KEY}, ${sign} AS n FROM ${table}`;
  const apply = (rows: string) => `
    INSERT INTO leaderboard_group_counts AS k (${KEY}, entries)
    SELECT ${KEY}, sum(n) FROM (${rows}) d GROUP BY ${KEY} HAVING sum(n) <> 0 ORDER BY ${KEY}
    ON CONFLICT (${KEY}) DO UPDATE SET entries = k.entries + EXCLUDED.entries;
    DELETE FROM leaderboard_group_counts WHERE entries = 0;`;
  const triggers = [
    ['insert', 'INSERT', 'REFERENCING NEW TABLE AS new_rows', signed('new_rows', 1)],
    ['update', 'UPDATE', 'REFERENCING OLD TABLE AS old_rows NEW TABLE AS new_rows', `${signed('new_rows', 1)} UNION ALL ${signed('old_rows', -1)}`],
    ['delete', 'DELETE', 'REFERENCING OLD TABLE AS old_rows', signed('old_rows', -1)],
  ] as const;
  for (const [name, event, referencing, rows] of triggers) {
    await q(`CREATE FUNCTION leaderboard_group_counts_on_${name}() RETURNS trigger LANGUAGE plpgsql AS $$
      BEGIN ${apply(rows)} RETURN NULL; END $$`);
    await q(`CREATE TRIGGER leaderboard_group_counts_${name} AFTER ${event} ON leaderboard_entries ${referencing}
      FOR EACH STATEMENT EXECUTE FUNCTION leaderboard_group_counts_on_${name}()`);
  }

  await q(rebuild('leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts'));
  await q(`INSERT INTO leaderboard_group_counts (${KEY}, entries) SELECT ${KEY}, count(*) FROM leaderboard_entries GROUP BY ${KEY}`);
};

/** Back to 0402: its rebuild and its narrower sort indexes. */
export const down: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  for (const t of ['insert', 'update', 'delete']) {
    await q(`DROP TRIGGER IF EXISTS leaderboard_group_counts_${t} ON leaderboard_entries`);
    await q(`DROP FUNCTION IF EXISTS leaderboard_group_counts_on_${t}()`);
  }
  await q('DROP TABLE IF EXISTS leaderboard_group_counts');
  await q(rebuild('leaderboard_entries, leaderboard_compare, leaderboard_counts'));
  for (const col of SORT_COLUMNS) {
    await q(`DROP INDEX leaderboard_entries_by_${col}`);
    await q(sortIndex(col, ['is_public', 'owner_id']));
  }
};
