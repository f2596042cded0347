/** The entries a viewer may see within a scope, as a sub-select for summaries and charts. */
import type { Viewer } from '../instance-sets/instance-set-access';
import { baseWhere, whereSql, type SqlQuery, type ViewScope } from './view-sql';

/** `SELECT e.* FROM leaderboard_entries e WHERE <visible and in scope>`. */
export function scopedEntries(viewer: Viewer, scope: ViewScope): SqlQuery {
  const replacements: Record<string, unknown> = {};
  const where = baseWhere(viewer, scope, replacements);
  return { sql: `SELECT e.* FROM leaderboard_entries e ${whereSql(where)}`, replacements };
}
