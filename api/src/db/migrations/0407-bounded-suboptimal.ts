/**
 * Bounded-suboptimal search on the board (issue 15, item 1).
 *
 * - The suboptimality factor w travels in the run params (`params.model.suboptimality`, present
 *   only when w > 1; shared/sweeps.ts `modelParameters`), so exact results keep their params.
 * - `results.gap`: (sum-of-costs − lower bound) ÷ lower bound of a solved result, 0 when the two
 *   are equal (proven optimal), generated from the stored figures so it never disagrees with them.
 * - The variant names `w=…` when w > 1 (w = 1 adds nothing, so existing results keep their
 *   variant): results at different w are never pooled or ranked as one.
 * - `leaderboard_entries.suboptimality` (read back from the variant, 1 for exact search) and
 *   `optimality`: `proven optimal` when the best result's sum-of-costs equals the best proven lower
 *   bound, `bounded` when it comes from a search with w > 1 and is not proven optimal (the best
 *   known value, within w × the lower bound), `unproven` otherwise (a submitted plan, or no lower
 *   bound reaches it); null when nothing was solved. Both are generated, so the refresh functions,
 *   the triggers and `leaderboard_rebuild()` stay as 0405 made them, and both get a sort index
 *   like 0405's.
 */
import type { Migration } from '../migration';

const SORT_INCLUDE = ['is_public', 'owner_id', 'model', 'variant', 'status', 'source', 'solver', 'robot_profile_hash'];

/** The variant as 0405 made it, plus `w=…` for w > 1 when `withW`. */
const variantFunction = (withW: boolean) => `CREATE OR REPLACE FUNCTION leaderboard_variant(params jsonb) RETURNS text LANGUAGE sql IMMUTABLE AS $$
    SELECT concat_ws(' ',
      CASE WHEN params->'model' ? 'k' THEN 'k=' || (params->'model'->>'k') END,
      CASE WHEN coalesce(params->'model'->>'startHeading', 'free') <> 'free' THEN 'start ' || (params->'model'->>'startHeading') END,
      CASE WHEN params->'model'->>'following' = 'forbidden' THEN 'following forbidden' END${withW ? `,
      CASE WHEN jsonb_typeof(params->'model'->'suboptimality') = 'number' AND (params->'model'->>'suboptimality')::float8 > 1
        THEN 'w=' || (params->'model'->>'suboptimality') END` : ''})
  $$`;

export const up: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q(`ALTER TABLE results ADD COLUMN gap double precision GENERATED ALWAYS AS (
    CASE WHEN status = 'solved' AND soc IS NOT NULL AND lower_bound IS NOT NULL THEN
      CASE WHEN soc <= lower_bound THEN 0 WHEN lower_bound > 0 THEN (soc - lower_bound) / lower_bound END
    END) STORED`);

  await q(variantFunction(true));
  await q('REINDEX INDEX results_leaderboard_key');

  await q('TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts');
  await q(`ALTER TABLE leaderboard_entries
    ADD COLUMN suboptimality double precision GENERATED ALWAYS AS (coalesce(substring(variant from '(?:^| )w=([0-9.]+)')::float8, 1)) STORED,
    ADD COLUMN optimality text GENERATED ALWAYS AS (
      CASE WHEN status <> 'solved' THEN NULL
        WHEN soc <= lower_bound THEN 'proven optimal'
        WHEN variant ~ '(^| )w=' THEN 'bounded'
        ELSE 'unproven' END) STORED`);
  for (const col of ['suboptimality', 'optimality']) {
    await q(`CREATE INDEX leaderboard_entries_by_${col} ON leaderboard_entries (${col}, id) INCLUDE (${SORT_INCLUDE.join(', ')})`);
  }
  await q('SELECT leaderboard_rebuild()');
};

/** Back to 0406: the columns go and the variant forgets w (results solved with w > 1 then share the exact variant). */
export const down: Migration = async ({ context: qi }) => {
  const q = (sql: string) => qi.sequelize.query(sql);
  await q('TRUNCATE leaderboard_entries, leaderboard_compare, leaderboard_counts, leaderboard_group_counts');
  for (const col of ['suboptimality', 'optimality']) await q(`DROP INDEX IF EXISTS leaderboard_entries_by_${col}`);
  await q('ALTER TABLE leaderboard_entries DROP COLUMN optimality, DROP COLUMN suboptimality');
  await q(variantFunction(false));
  await q('REINDEX INDEX results_leaderboard_key');
  await q('ALTER TABLE results DROP COLUMN gap');
  await q('SELECT leaderboard_rebuild()');
};
