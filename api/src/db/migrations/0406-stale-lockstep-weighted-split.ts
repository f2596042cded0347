/**
 * Removes the lockstep replays of weighted-split results stored before commit e4f5ddf (issue 12,
 * item 2).
 *
 * Until then lockstep on a weighted-split (ms-timeline) plan put a barrier between the k-th actions
 * of all robots; it now synchronises on the plan's own timeline (solvers/execute/realise-times.ts).
 * Rows computed with the old rule carry figures (execution success rate, realised makespan, finish
 * spread, waiting) from a rule the simulator no longer uses, yet the leaderboard, the model
 * comparison report and GET /api/executions/stored/:id kept serving them as if current, and the
 * plan viewer could never reproduce them. Without the row the result simply shows no lockstep
 * replay, rather than a wrong one; a new sweep stores a correct one.
 *
 * Those rows are recognised by what they lack: since e4f5ddf every sweep-stored summary records its
 * batch seed in `metrics.seed` (solvers/run/plan-task.ts), so a lockstep row of a weighted-split
 * result whose metrics have no "seed" key was computed by the superseded rule. Other policies and
 * models were not affected by the change and stay.
 *
 * The leaderboard stays consistent through 0402's statement trigger on DELETE FROM executions,
 * which recomputes the execution figures of the entries whose best result lost a replay (and those
 * feed leaderboard_compare and the counts through the entries' triggers).
 */
import type { Migration } from '../migration';

/** The rows computed with the superseded lockstep rule. */
export const STALE_LOCKSTEP_CONDITION = `e.policy = 'lockstep' AND NOT (e.metrics ? 'seed')
  AND EXISTS (SELECT 1 FROM results r WHERE r.id = e.result_id AND r.model = 'weighted-split')`;

export const up: Migration = async ({ context: qi }) => {
  await qi.sequelize.query(`DELETE FROM executions e WHERE ${STALE_LOCKSTEP_CONDITION}`);
};

/**
 * Cannot restore the deleted rows: their figures are gone, and they were wrong for the current
 * simulator anyway. Down only records the step as undone; re-running the sweeps stores new replays.
 */
export const down: Migration = async () => {
  // Nothing to restore (see above).
};
