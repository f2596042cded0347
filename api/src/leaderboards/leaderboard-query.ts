/**
 * Builds the paged SQL of a board view: visibility first (only sets the viewer may see), then the
 * view's filters, its sort with a unique tie-break (so offset pages never repeat or skip a row),
 * and LIMIT/OFFSET from the grid's startRow/endRow. The comparison layout pivots entries into one
 * column per plan model for one figure, grouped by instance and robot profile.
 */
import { PLAN_MODELS } from '@shared/plan';
import { ENTRY_COLUMNS, modelColumnId, type LeaderboardView, type ViewFilter } from '@shared/leaderboards';
import { visibleSetsCondition, type Viewer } from '../instance-sets/instance-set-access';
import { ENTRY_DEFAULT_ORDER, ENTRY_SQL, PROFILE_LABEL_SQL } from './entry-sql';

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

/** WHERE conditions of the entries the viewer may see within the scope. */
export function baseWhere(viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string[] {
  const visible = visibleSetsCondition(viewer);
  Object.assign(repl, visible.replacements);
  const where = visible.sql === 'TRUE' ? [] : [`e.instance_set_id IN (SELECT s.id FROM instance_sets s WHERE ${visible.sql})`];
  if (scope.mapId !== undefined) {
    repl['scopeMap'] = scope.mapId;
    where.push('e.map_id = :scopeMap');
  }
  if (scope.profileHash !== undefined) {
    repl['scopeProfile'] = scope.profileHash;
    where.push('e.robot_profile_hash = :scopeProfile');
  }
  return where;
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
  for (const f of view.filters) where.push(filterCondition(f, ENTRY_SQL[f.column], repl));
  // PostgreSQL's default null placement (last ascending, first descending) lets one (col, id)
  // index serve both directions; the id tie-break follows the first key's direction.
  const order = view.sort.length === 0
    ? ENTRY_DEFAULT_ORDER
    : [...view.sort.map((s) => `${ENTRY_SQL[s.column]} ${s.direction.toUpperCase()}`), `e.id ${view.sort[0].direction.toUpperCase()}`].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  const page = `SELECT e.id, e.scenario_id, e.agents, e.robot_profile_hash, e.result_id, e.robot_profile,
      ${view.columns.filter((c) => c !== 'profile').map((c) => `${ENTRY_SQL[c]} AS "${c}"`).join(', ') || 'NULL AS none'}
    FROM leaderboard_entries e ${whereSql(where)} ORDER BY ${order} LIMIT :limit OFFSET :offset`;
  const count = `SELECT count(*)::int AS n FROM leaderboard_entries e ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}

function compareQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  const repl: Record<string, unknown> = { kVariant: `k=${view.k}` };
  const where = baseWhere(viewer, scope, repl);
  const metric = ENTRY_SQL[view.metric];
  const modelCols = PLAN_MODELS.map((m) => {
    // A comparison column takes each model's plain variant; k-robust at the view's k.
    const variant = m === 'k-robust' ? ':kVariant' : "''";
    return `max(${metric}) FILTER (WHERE e.model = '${m}' AND e.variant = ${variant}) AS ${modelColumnId(m)}`;
  });
  // Key columns filter before grouping (cheap, index-friendly); model columns after it.
  const inner: string[] = [...where];
  const outer: string[] = [];
  const groupedSql: Record<string, string> = { map: 'c.map_name', scenario: 'c.scenario_name', agents: 'c.agents', profile: 'c.profile' };
  for (const f of view.filters) {
    if (f.column in groupedSql) inner.push(filterCondition(f, f.column === 'profile' ? PROFILE_LABEL_SQL : ENTRY_SQL[f.column], repl));
    else outer.push(filterCondition(f, `c.${f.column}`, repl));
  }
  const grouped = `SELECT e.scenario_id, e.agents, e.robot_profile_hash,
      min(e.map_name) AS map_name, min(e.scenario_name) AS scenario_name,
      min(${PROFILE_LABEL_SQL}) AS profile, ${modelCols.join(', ')}
    FROM leaderboard_entries e ${whereSql(inner)}
    GROUP BY e.scenario_id, e.agents, e.robot_profile_hash`;
  const colSql = (c: string): string => groupedSql[c] ?? `c.${c}`;
  const order = [
    ...view.sort.map((s) => `${colSql(s.column)} ${s.direction.toUpperCase()}`),
    'c.map_name', 'c.scenario_name', 'c.agents', 'c.scenario_id', 'c.robot_profile_hash',
  ].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  const page = `SELECT c.scenario_id, c.agents, c.robot_profile_hash, c.profile AS profile_label,
      ${view.columns.map((col) => `${colSql(col)} AS "${col}"`).join(', ')}
    FROM (${grouped}) c ${whereSql(outer)} ORDER BY ${order} LIMIT :limit OFFSET :offset`;
  const count = `SELECT count(*)::int AS n FROM (${grouped}) c ${whereSql(outer)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}
