/**
 * Builds the paged SQL of a board view: visibility first (only sets the viewer may see), then the
 * view's filters, its sort with a unique tie-break (so offset pages never repeat or skip a row),
 * and LIMIT/OFFSET from the grid's startRow/endRow. Shared pieces are in view-sql.ts, the
 * comparison layout in compare-query.ts, sorts led by a few-valued column in grouped-sort.ts.
 */
import { SUCCESS_INTERVAL_COLUMNS, type LeaderboardView } from '@shared/leaderboards';
import { visibleSetsCondition, type Viewer } from '../instance-sets/instance-set-access';
import { compareQueries } from './compare-query';
import { ENTRY_CELL_SQL, ENTRY_DEFAULT_ORDER, ENTRY_SQL } from './entry-sql';
import { GROUPED_MAX_VALUES, groupedCountQuery, groupedWindow, groupWindow, type GroupCount } from './grouped-sort';
import { baseWhere, entryWhere, whereSql, type RowWindow, type SqlQuery, type ViewScope } from './view-sql';

/** What the service looked up before building a page's queries. */
export interface PageHints {
  /** The rows of sortGroupsQuery(view, window), when it returned a query. */
  readonly groupValues?: readonly string[];
  /** The rows of groupCountsQuery(view, viewer, scope, window), when it returned a query. */
  readonly groupCounts?: readonly GroupCount[];
  /** The view's row count, when known (from unfilteredCountQuery). */
  readonly total?: number;
  /** Pages starting at least this deep may be read from the far end (default REVERSE_FROM_ROW). */
  readonly reverseFromRow?: number;
}

/** Pages starting this deep into an unfiltered view of known size are read from its far end when nearer to that. */
export const REVERSE_FROM_ROW = 10_000;

/** The page query and the count query of `view` for `viewer`. */
export function buildViewQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow, hints: PageHints = {}): { page: SqlQuery; count: SqlQuery } {
  return view.layout === 'compare' ? compareQueries(view, viewer, scope, window) : entryQueries(view, viewer, scope, window, hints);
}

/** The cheap row count of an entries view without filters (see countsQuery), or null for any other view. */
export function unfilteredCountQuery(view: LeaderboardView, viewer: Viewer, scope: ViewScope): SqlQuery | null {
  if (view.layout !== 'entries' || view.filters.length > 0) return null;
  const repl: Record<string, unknown> = {};
  baseWhere(viewer, scope, repl);
  return { sql: countsQuery(viewer, scope, repl), replacements: repl };
}

function entryQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, rows: RowWindow, hints: PageHints): { page: SqlQuery; count: SqlQuery } {
  const { groupValues, groupCounts, total, reverseFromRow = REVERSE_FROM_ROW } = hints;
  const repl: Record<string, unknown> = {};
  const where = entryWhere(view, viewer, scope, repl);
  // PostgreSQL's default null placement (last ascending, first descending) lets one (col, id)
  // index serve both directions; the id tie-break follows the first key's direction.
  const order = view.sort.length === 0
    ? ENTRY_DEFAULT_ORDER
    : [...view.sort.map((s) => `${ENTRY_SQL[s.column]} ${s.direction.toUpperCase()}`), `e.id ${view.sort[0].direction.toUpperCase()}`].join(', ');
  repl['limit'] = rows.end - rows.start;
  repl['offset'] = rows.start;
  // Near the far end of a view of known size, the same rows are counted off from that end in the
  // opposite order (PostgreSQL's null placement flips with the direction, so it is the exact mirror).
  const isReversed = total !== undefined && view.filters.length === 0 && rows.start >= reverseFromRow && rows.start > total - rows.end;
  if (isReversed) {
    repl['limit'] = Math.max(0, Math.min(rows.end, total) - rows.start);
    repl['offset'] = Math.max(0, total - rows.end);
  }
  const reversed = view.sort.length === 0
    ? ENTRY_DEFAULT_ORDER.split(', ').map((k) => `${k} DESC`).join(', ')
    : [...view.sort.map((s) => `${ENTRY_SQL[s.column]} ${s.direction === 'asc' ? 'DESC' : 'ASC'}`), `e.id ${view.sort[0].direction === 'asc' ? 'DESC' : 'ASC'}`].join(', ');
  // The window is found on ids first: the sort indexes hold the visibility columns, so skipped
  // rows (deep offsets) are read from the index alone, and only the page's rows are fetched.
  const deep = groupCounts === undefined ? null : groupWindow(view, groupCounts, where, repl, rows);
  const ids = deep !== null ? deep : !isReversed && groupValues !== undefined && groupValues.length > 0 && groupValues.length <= GROUPED_MAX_VALUES
    ? groupedWindow(view, groupValues, where, repl)
    : `SELECT e.id FROM leaderboard_entries e ${whereSql(where)} ORDER BY ${isReversed ? reversed : order} LIMIT :limit OFFSET :offset`;
  const page = `WITH w AS (${ids})
    SELECT e.id, e.scenario_id, e.agents, e.robot_profile_hash, e.result_id, e.robot_profile, e.executable_at_nominal AS "__nominal", e.status AS "__status",
      e.model AS "__model", e.variant AS "__variant",
      (SELECT count(*)::int FROM trial_runs t WHERE t.result_id = e.result_id) AS "__field_runs",
      ${SUCCESS_INTERVAL_COLUMNS.map(([, , , s]) => `e.success_${s} AS "__success_${s}", e.runs_${s} AS "__runs_${s}"`).join(', ')},
      ${view.columns.filter((c) => c !== 'profile').map((c) => `${ENTRY_CELL_SQL[c] ?? ENTRY_SQL[c]} AS "${c}"`).join(', ') || 'NULL AS none'}
    FROM w JOIN leaderboard_entries e ON e.id = w.id ORDER BY ${order}`;
  const count = view.filters.length === 0 ? countsQuery(viewer, scope, repl)
    : groupedCountQuery(view, viewer, scope, repl) ?? `SELECT count(*)::int AS n FROM leaderboard_entries e ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}

/** The row count of an unfiltered entries view from `leaderboard_counts` (kept by the entries' triggers, migration 0402). */
function countsQuery(viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string {
  const visible = visibleSetsCondition(viewer);
  Object.assign(repl, visible.replacements);
  const where = [visible.sql];
  if (scope.mapId !== undefined) where.push('k.map_id = :scopeMap');
  if (scope.profileHash !== undefined) where.push('k.robot_profile_hash = :scopeProfile');
  return `SELECT coalesce(sum(k.entries), 0)::int AS n FROM leaderboard_counts k JOIN instance_sets s ON s.id = k.instance_set_id ${whereSql(where)}`;
}
