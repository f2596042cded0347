/**
 * Builds the paged SQL of a board view: visibility first (only sets the viewer may see), then the
 * view's filters, its sort with a unique tie-break (so offset pages never repeat or skip a row),
 * and LIMIT/OFFSET from the grid's startRow/endRow. The comparison layout reads
 * `leaderboard_compare`, where entries are already pivoted into one column per plan model and
 * figure, one row per instance and robot profile (migration 0402).
 */
import { hasRole } from '@shared/auth';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { ENTRY_COLUMNS, modelColumnId, type LeaderboardView, type ViewFilter } from '@shared/leaderboards';
import type { Viewer } from '../instance-sets/instance-set-access';
import { COMPARE_TABLE_K, compareColumn, ENTRY_DEFAULT_ORDER, ENTRY_SQL, figureColumn } from './entry-sql';

/** SQL text plus its named replacements. */
export interface SqlQuery {
  readonly sql: string;
  readonly replacements: Record<string, unknown>;
}

/** Scope outside the view: a map (drill-down) or one robot profile. */
export interface ViewScope {
  readonly mapId?: number;
  readonly profileHash?: string;
}

/** The rows window [start, end) of a page. */
export interface RowWindow {
  readonly start: number;
  readonly end: number;
}

/** Escapes LIKE wildcards so user text is matched literally. */
function containsPattern(text: string): string {
  return `%${text.replace(/[\\%_]/g, (c) => `\\${c}`)}%`;
}

/** The kind of a column of either layout. */
function kindOf(column: string): 'text' | 'number' | 'enum' {
  const entry = ENTRY_COLUMNS.find((c) => c.id === column);
  if (entry) return entry.kind;
  return 'number';
}

/** Adds one filter condition on `expr`; values go to `repl` under a fresh name. */
function filterCondition(f: ViewFilter, expr: string, repl: Record<string, unknown>): string {
  const name = `f${Object.keys(repl).length}`;
  const kind = kindOf(f.column);
  switch (f.op) {
    case 'has':
      repl[name] = containsPattern(f.value);
      return `${expr}::text ILIKE :${name}`;
    case 'eq':
      repl[name] = kind === 'number' ? Number(f.value) : f.value;
      return `${expr} = :${name}`;
    case 'in':
      repl[name] = f.value.split(',');
      return `${expr} IN (:${name})`;
    case 'blank':
      return `${expr} IS NULL`;
    case 'set':
      return `${expr} IS NOT NULL`;
    default: {
      const sqlOp = { ne: '<>', lt: '<', lte: '<=', gt: '>', gte: '>=' }[f.op];
      repl[name] = Number(f.value);
      return `${expr} ${sqlOp} :${name}`;
    }
  }
}

/**
 * The rows of `alias` (entries or comparison rows) the viewer may see, on their denormalised
 * visibility columns (migration 0402). Same rule as instance-set-access.ts: public sets for
 * everyone, private ones for their owner, maintainers and admins.
 */
export function visibleRowsCondition(viewer: Viewer, alias: string, repl: Record<string, unknown>): string | null {
  if (viewer !== null && hasRole(viewer.role, 'maintainer')) return null;
  if (viewer === null) return `${alias}.is_public`;
  repl['viewerId'] = viewer.id;
  return `(${alias}.is_public OR ${alias}.owner_id = :viewerId)`;
}

/** WHERE conditions of the rows of `alias` the viewer may see within the scope. */
export function baseWhere(viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>, alias = 'e'): string[] {
  const visible = visibleRowsCondition(viewer, alias, repl);
  const where = visible === null ? [] : [visible];
  if (scope.mapId !== undefined) {
    repl['scopeMap'] = scope.mapId;
    where.push(`${alias}.map_id = :scopeMap`);
  }
  if (scope.profileHash !== undefined) {
    repl['scopeProfile'] = scope.profileHash;
    where.push(`${alias}.robot_profile_hash = :scopeProfile`);
  }
  return where;
}

/**
 * A "contains" filter on the map or scenario name as a match over the few maps or scenarios
 * (names are copied from them), so it uses the id index instead of matching every row's name.
 */
function nameFilter(f: ViewFilter, alias: string, repl: Record<string, unknown>): string | null {
  if (f.op !== 'has' || (f.column !== 'map' && f.column !== 'scenario')) return null;
  const name = `f${Object.keys(repl).length}`;
  repl[name] = containsPattern(f.value);
  return f.column === 'map'
    ? `${alias}.map_id IN (SELECT m.id FROM maps m WHERE m.name ILIKE :${name})`
    : `${alias}.scenario_id IN (SELECT s.id FROM scenarios s WHERE s.name ILIKE :${name})`;
}

/** `WHERE a AND b`, or nothing. */
export const whereSql = (conds: readonly string[]): string => (conds.length ? `WHERE ${conds.join(' AND ')}` : '');

/** The page query and the count query of `view` for `viewer`. */
export function buildViewQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  return view.layout === 'compare' ? compareQueries(view, viewer, scope, window) : entryQueries(view, viewer, scope, window);
}

function entryQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  const repl: Record<string, unknown> = {};
  const where = baseWhere(viewer, scope, repl);
  for (const f of view.filters) where.push(nameFilter(f, 'e', repl) ?? filterCondition(f, ENTRY_SQL[f.column], repl));
  // PostgreSQL's default null placement (last ascending, first descending) lets one (col, id)
  // index serve both directions; the id tie-break follows the first key's direction.
  const order = view.sort.length === 0
    ? ENTRY_DEFAULT_ORDER
    : [...view.sort.map((s) => `${ENTRY_SQL[s.column]} ${s.direction.toUpperCase()}`), `e.id ${view.sort[0].direction.toUpperCase()}`].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  // The window is found on ids first: the sort indexes hold the visibility columns, so skipped
  // rows (deep offsets) are read from the index alone, and only the page's rows are fetched.
  const page = `WITH w AS (SELECT e.id FROM leaderboard_entries e ${whereSql(where)} ORDER BY ${order} LIMIT :limit OFFSET :offset)
    SELECT e.id, e.scenario_id, e.agents, e.robot_profile_hash, e.result_id, e.robot_profile,
      ${view.columns.filter((c) => c !== 'profile').map((c) => `${ENTRY_SQL[c]} AS "${c}"`).join(', ') || 'NULL AS none'}
    FROM w JOIN leaderboard_entries e ON e.id = w.id ORDER BY ${order}`;
  const count = `SELECT count(*)::int AS n FROM leaderboard_entries e ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}

/** SQL of a comparison column on `c` (leaderboard_compare). */
function compareSql(view: LeaderboardView, column: string): string {
  const keySql: Record<string, string> = { map: 'c.map_name', scenario: 'c.scenario_name', agents: 'c.agents', profile: 'c.profile_label' };
  if (column in keySql) return keySql[column];
  const model = PLAN_MODELS.find((m) => modelColumnId(m) === column) as PlanModel;
  if (model !== 'k-robust' || view.k === COMPARE_TABLE_K) return `c.${compareColumn(model, view.metric)}`;
  // Another k: the entry of that variant, found through the entries' unique key.
  return `(SELECT x.${figureColumn(view.metric)} FROM leaderboard_entries x WHERE x.scenario_id = c.scenario_id AND x.agents = c.agents
    AND x.model = 'k-robust' AND x.variant = :kVariant AND x.robot_profile_hash = c.robot_profile_hash)`;
}

function compareQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  const repl: Record<string, unknown> = view.k === COMPARE_TABLE_K ? {} : { kVariant: `k=${view.k}` };
  const where = baseWhere(viewer, scope, repl, 'c');
  for (const f of view.filters) where.push(nameFilter(f, 'c', repl) ?? filterCondition(f, compareSql(view, f.column), repl));
  const order = [
    ...view.sort.map((s) => `${compareSql(view, s.column)} ${s.direction.toUpperCase()}`),
    'c.map_name', 'c.scenario_name', 'c.agents', 'c.scenario_id', 'c.robot_profile_hash',
  ].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  const page = `SELECT c.scenario_id, c.agents, c.robot_profile_hash, c.profile_label,
      ${view.columns.map((col) => `${compareSql(view, col)} AS "${col}"`).join(', ')}
    FROM leaderboard_compare c ${whereSql(where)} ORDER BY ${order} LIMIT :limit OFFSET :offset`;
  const count = `SELECT count(*)::int AS n FROM leaderboard_compare c ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}
