/**
 * Retires the lockstep figures computed by superseded simulator rules (issue 12, items 2 and 5).
 *
 * 1. Commit e4f5ddf: lockstep on a weighted-split (ms-timeline) plan used to put a barrier between
 *    the k-th actions of all robots; it now synchronises on the plan's own timeline
 *    (solvers/execute/realise-times.ts). Those rows are wrong entirely (success rate, collisions,
 *    realised makespan, finish spread, waiting), so they are deleted: the result then shows no
 *    lockstep replay rather than a wrong one; a new sweep stores a correct one.
 * 2. Commit 0da65da: lockstep finish spread used to be forced to 0, and waiting counted the barrier
 *    holds of robots already at their goal. For lockstep rows of every other model, success rate,
 *    collisions and realised makespan are still right, so the rows stay and only those figures
 *    become "not stored": finish_spread_mean_ms = NULL and metrics.finishSpreadMs / waitingMs /
 *    waitingPerRobotMs / ci95.finishSpreadMs = null (readers show null as "not stored").
 *
 * "Stored before the change" is recognised by what the metrics lack: since e4f5ddf every
 * sweep-stored summary records its batch seed in `metrics.seed` (solvers/run/plan-task.ts). Rows
 * with a seed computed between e4f5ddf and 0da65da also carry the forced-0 spread, but they exist
 * only in databases made during that day's development (neither commit was released in between);
 * such a database should re-run its lockstep sweeps. No cleaner marker exists in stored rows.
 *
 * The leaderboard follows both statements through its own triggers: 0402's statement trigger on
 * DELETE FROM executions, and 0402's AFTER UPDATE trigger on executions (OLD/NEW tables), which
 * recompute the execution figures of the affected entries (and those feed leaderboard_compare and
 * the counts through the entries' triggers). No rebuild is needed; the spec checks the board
 * equals leaderboard_rebuild() afterwards.
 */
import type { Migration } from '../migration';

/** Lockstep rows stored before e4f5ddf (no batch seed in their metrics). */
const OLD_LOCKSTEP = `e.policy = 'lockstep' AND NOT (e.metrics ? 'seed')`;
const IS_WEIGHTED_SPLIT = `EXISTS (SELECT 1 FROM results r WHERE r.id = e.result_id AND r.model = 'weighted-split')`;

/** The rows computed with the superseded weighted-split lockstep rule (deleted). */
export const STALE_LOCKSTEP_CONDITION = `${OLD_LOCKSTEP} AND ${IS_WEIGHTED_SPLIT}`;

/** The lockstep rows of other models whose spread and waiting figures are stale (kept, figures nulled). */
export const STALE_LOCKSTEP_FIGURES_CONDITION = `${OLD_LOCKSTEP} AND NOT ${IS_WEIGHTED_SPLIT}`;

export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`DELETE FROM executions e WHERE ${STALE_LOCKSTEP_CONDITION}`);
  await qi.sequelize.query(`UPDATE executions e SET finish_spread_mean_ms = NULL,
      metrics = CASE WHEN jsonb_typeof(m.metrics -> 'ci95') = 'object'
        THEN jsonb_set(m.metrics, '{ci95,finishSpreadMs}', 'null'::jsonb) ELSE m.metrics END
    FROM (SELECT x.id, coalesce(x.metrics, '{}'::jsonb)
            || '{"finishSpreadMs": null, "waitingMs": null, "waitingPerRobotMs": null}'::jsonb AS metrics
          FROM executions x) m
    WHERE m.id = e.id AND ${STALE_LOCKSTEP_FIGURES_CONDITION}`);
};

/**
 * Cannot restore the deleted rows or the nulled figures: they are gone, and they were wrong for the
 * current simulator anyway. Down only records the step as undone; re-running the sweeps stores new replays.
 */
export const down: Migration = async () => {
  // Nothing to restore (see above).
};
