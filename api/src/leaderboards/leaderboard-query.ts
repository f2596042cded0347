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
import { visibleSetsCondition, type Viewer } from '../instance-sets/instance-set-access';
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

/** Columns of few distinct values whose "contains" filter matches the distinct values first (each has an index leading on it). */
const FEW_VALUES: Readonly<Record<string, string>> = { variant: 'variant', profile: 'profile_label', solver: 'solver' };

/**
 * A "contains" filter matched against the few distinct names instead of every row: map and
 * scenario names against `maps`/`scenarios` (entries copy their names) and then by id; variant,
 * profile and solver against their distinct values, walked through their index one value at a
 * time. The matches become an array (computed once), so the rows are then found, and counted,
 * through an index condition without reading the table. Null for any other filter.
 */
function fewValuesFilter(f: ViewFilter, table: string, alias: string, repl: Record<string, unknown>): string | null {
  if (f.op !== 'has') return null;
  const name = `f${Object.keys(repl).length}`;
  if (f.column === 'map') {
    repl[name] = containsPattern(f.value);
    return `${alias}.map_id = ANY(ARRAY(SELECT m.id FROM maps m WHERE m.name ILIKE :${name}))`;
  }
  if (f.column === 'scenario') {
    repl[name] = containsPattern(f.value);
    return `${alias}.scenario_id = ANY(ARRAY(SELECT s.id FROM scenarios s WHERE s.name ILIKE :${name}))`;
  }
  const col = FEW_VALUES[f.column];
  if (col === undefined || (table === 'leaderboard_compare' && col !== 'profile_label')) return null;
  repl[name] = containsPattern(f.value);
  return `${alias}.${col} = ANY(ARRAY(WITH RECURSIVE d(v) AS (
      SELECT min(${col}) FROM ${table}
      UNION ALL SELECT (SELECT min(${col}) FROM ${table} WHERE ${col} > d.v) FROM d WHERE d.v IS NOT NULL
    ) SELECT v FROM d WHERE v ILIKE :${name}))`;
}

/** `WHERE a AND b`, or nothing. */
export const whereSql = (conds: readonly string[]): string => (conds.length ? `WHERE ${conds.join(' AND ')}` : '');

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

/** WHERE conditions of an entries view: visibility, scope and the view's filters. */
function entryWhere(view: LeaderboardView, viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string[] {
  const where = baseWhere(viewer, scope, repl);
  for (const f of view.filters) where.push(fewValuesFilter(f, 'leaderboard_entries', 'e', repl) ?? filterCondition(f, ENTRY_SQL[f.column], repl));
  return where;
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
    SELECT e.id, e.scenario_id, e.agents, e.robot_profile_hash, e.result_id, e.robot_profile,
      ${view.columns.filter((c) => c !== 'profile').map((c) => `${ENTRY_SQL[c]} AS "${c}"`).join(', ') || 'NULL AS none'}
    FROM w JOIN leaderboard_entries e ON e.id = w.id ORDER BY ${order}`;
  const count = view.filters.length === 0 ? countsQuery(viewer, scope, repl)
    : groupedCountQuery(view, viewer, scope, repl) ?? `SELECT count(*)::int AS n FROM leaderboard_entries e ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}

/** Entry columns of few values that may lead a sort of several keys (each has a (column, id) index). */
const GROUPABLE: Readonly<Record<string, string>> = { model: 'model', variant: 'variant', status: 'status', source: 'source', profile: 'profile_label', solver: 'solver' };

/** Windows ending past this row, and first keys with more values than this, use one plain sort. */
export const GROUPED_MAX_END = 500;
export const GROUPED_MAX_VALUES = 20;

/**
 * For a sort of several keys led by a column of few values (shown near the top), the query of
 * that column's distinct values in sort order, walked through its index; null otherwise.
 * PostgreSQL would sort the whole first group (a fifth of the board for `model`) to answer one
 * page; with the values known, each group's first rows come from an index on the next key.
 */
export function sortGroupsQuery(view: LeaderboardView, window: RowWindow): SqlQuery | null {
  const [first, ...rest] = view.sort;
  const col = view.layout === 'entries' && rest.length > 0 && window.end <= GROUPED_MAX_END ? GROUPABLE[first.column] : undefined;
  if (col === undefined) return null;
  const [pick, step] = first.direction === 'asc' ? ['min', '>'] : ['max', '<'];
  return {
    sql: `WITH RECURSIVE d(v, i) AS (
        SELECT ${pick}(${col}), 1 FROM leaderboard_entries
        UNION ALL SELECT (SELECT ${pick}(${col}) FROM leaderboard_entries WHERE ${col} ${step} d.v), d.i + 1 FROM d WHERE d.v IS NOT NULL AND d.i <= ${GROUPED_MAX_VALUES}
      ) SELECT v FROM d WHERE v IS NOT NULL ORDER BY i`,
    replacements: {},
  };
}

/**
 * The window's ids as one branch per value of the first sort key (values from sortGroupsQuery,
 * passed as literals so the planner estimates each group from its statistics: a rare status
 * sorts its few rows, a common one walks the next key's index), merged and cut.
 */
function groupedWindow(view: LeaderboardView, values: readonly string[], where: readonly string[], repl: Record<string, unknown>): string {
  const [first, ...rest] = view.sort;
  const col = GROUPABLE[first.column];
  repl['groupTop'] = (repl['limit'] as number) + (repl['offset'] as number);
  const idDir = first.direction.toUpperCase();
  const keys = rest.map((s, n) => ({ expr: ENTRY_SQL[s.column], alias: `k${n}`, dir: s.direction.toUpperCase() }));
  const branches = values.map((v, i) => {
    repl[`g${i}`] = v;
    return `(SELECT ${i} AS g, e.id, ${keys.map((k) => `${k.expr} AS ${k.alias}`).join(', ')} FROM leaderboard_entries e
      ${whereSql([...where, `e.${col} = :g${i}`])} ORDER BY ${keys.map((k) => `${k.expr} ${k.dir}`).join(', ')}, e.id ${idDir} LIMIT :groupTop)`;
  });
  return `SELECT t.id FROM (${branches.join(' UNION ALL ')}) t
    ORDER BY t.g, ${keys.map((k) => `t.${k.alias} ${k.dir}`).join(', ')}, t.id ${idDir} LIMIT :limit OFFSET :offset`;
}

/** Visible rows of one combination of values of a sort's few-valued leading columns; with the profile among them, one row per robot profile hash. */
export interface GroupCount {
  readonly v: readonly string[];
  readonly h: string | null;
  readonly n: number;
}

/** The sort's leading keys of few values (each in GROUPABLE). */
const leadingGroups = (view: LeaderboardView) => {
  const n = view.sort.findIndex((s) => GROUPABLE[s.column] === undefined);
  return view.sort.slice(0, n === -1 ? view.sort.length : n);
};

/**
 * For a deep window (past GROUPED_MAX_END) of a sort of several keys led by a column of few
 * values, the query of the visible rows per combination of values of its leading few-valued
 * columns (all of them, so that ties of a second few-valued key sorted against the id's
 * direction are never sorted at length), in sort order; null otherwise. Without filters it sums
 * `leaderboard_group_counts` (kept by the entries' triggers, migration 0403); with filters it
 * groups the matching entries. `fromRow` (tests only) lowers the depth.
 */
export function groupCountsQuery(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow, fromRow = GROUPED_MAX_END): SqlQuery | null {
  const lead = leadingGroups(view);
  if (view.layout !== 'entries' || view.sort.length < 2 || lead.length === 0 || window.end <= fromRow) return null;
  const repl: Record<string, unknown> = {};
  const isCounted = view.filters.length === 0;
  const alias = isCounted ? 'g' : 'e';
  const where = isCounted ? baseWhere(viewer, scope, repl, 'g') : entryWhere(view, viewer, scope, repl);
  const cols = lead.map((s) => `${alias}.${GROUPABLE[s.column]}`);
  // A profile group is found by its hashes, which the sort indexes carry (the label they do not).
  const hash = lead.some((s) => s.column === 'profile') ? `${alias}.robot_profile_hash` : 'NULL::text';
  const n = isCounted ? 'sum(g.entries)' : 'count(*)';
  return {
    sql: `SELECT ARRAY[${cols.map((c) => `${c}::text`).join(', ')}] AS v, ${hash} AS h, ${n}::int AS n
      FROM ${isCounted ? 'leaderboard_group_counts g' : 'leaderboard_entries e'} ${whereSql(where)}
      GROUP BY ${[...cols, hash].join(', ')} ORDER BY ${lead.map((s, i) => `${cols[i]} ${s.direction.toUpperCase()}`).join(', ')}, ${hash}`,
    replacements: repl,
  };
}

/**
 * The window's ids group by group: the counts place the window's first and last row in their
 * groups, and each group it covers pages its own rows on the next key's index (which carries the
 * few-valued columns, so skipped rows are read from the index alone), counted off from the
 * group's nearer end. Null when a profile hash has two labels (then the hashes cannot stand for the label).
 */
function groupWindow(view: LeaderboardView, counts: readonly GroupCount[], where: readonly string[], repl: Record<string, unknown>, rows: RowWindow): string | null {
  const lead = leadingGroups(view);
  const rest = view.sort.slice(lead.length);
  const first = view.sort[0];
  const profileAt = lead.findIndex((s) => s.column === 'profile');
  const groups = new Map<string, { v: readonly string[]; n: number; hashes: string[] }>();
  const labels = new Map<string, string>();
  for (const c of counts) {
    const key = c.v.join('\u0000');
    const g = groups.get(key) ?? { v: c.v, n: 0, hashes: [] };
    groups.set(key, { v: c.v, n: g.n + c.n, hashes: c.h === null ? g.hashes : [...g.hashes, c.h] });
    if (c.h !== null) {
      if ((labels.get(c.h) ?? c.v[profileAt]) !== c.v[profileAt]) return null;
      labels.set(c.h, c.v[profileAt]);
    }
  }
  const flip = (d: 'asc' | 'desc') => (d === 'asc' ? 'DESC' : 'ASC');
  const forward = [...rest.map((s) => `${ENTRY_SQL[s.column]} ${s.direction.toUpperCase()}`), `e.id ${first.direction.toUpperCase()}`].join(', ');
  const backward = [...rest.map((s) => `${ENTRY_SQL[s.column]} ${flip(s.direction)}`), `e.id ${flip(first.direction)}`].join(', ');
  const branches: string[] = [];
  let from = 0;
  for (const g of groups.values()) {
    const lo = Math.max(rows.start, from);
    const hi = Math.min(rows.end, from + g.n);
    if (lo < hi) {
      const i = branches.length;
      const skip = lo - from;
      const after = from + g.n - hi;
      const conds = lead.map((s, j) => {
        const name = `g${i}_${j}`;
        repl[name] = j === profileAt ? g.hashes : g.v[j];
        return j === profileAt ? `e.robot_profile_hash IN (:${name})` : `e.${GROUPABLE[s.column]} = :${name}`;
      });
      repl[`gl${i}`] = hi - lo;
      repl[`go${i}`] = Math.min(skip, after);
      branches.push(`(SELECT e.id FROM leaderboard_entries e ${whereSql([...where, ...conds])}
        ORDER BY ${after < skip ? backward : forward} LIMIT :gl${i} OFFSET :go${i})`);
    }
    from += g.n;
  }
  return branches.length > 0 ? branches.join(' UNION ALL ') : 'SELECT e.id FROM leaderboard_entries e WHERE FALSE';
}

/**
 * The row count of a view whose filters are all on few-valued columns, summed from
 * `leaderboard_group_counts` (migration 0403) instead of counting up to every entry; null otherwise.
 */
function groupedCountQuery(view: LeaderboardView, viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string | null {
  if (!view.filters.every((f) => GROUPABLE[f.column] !== undefined)) return null;
  const where = baseWhere(viewer, scope, repl, 'g');
  for (const f of view.filters) {
    where.push(fewValuesFilter(f, 'leaderboard_group_counts', 'g', repl) ?? filterCondition(f, `g.${GROUPABLE[f.column]}`, repl));
  }
  return `SELECT coalesce(sum(g.entries), 0)::int AS n FROM leaderboard_group_counts g ${whereSql(where)}`;
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

/** SQL of a comparison column on `c` (leaderboard_compare), or `x` (the k-robust entry) for another k. */
function compareSql(view: LeaderboardView, column: string): string {
  const keySql: Record<string, string> = { map: 'c.map_name', scenario: 'c.scenario_name', agents: 'c.agents', profile: 'c.profile_label' };
  if (column in keySql) return keySql[column];
  const model = PLAN_MODELS.find((m) => modelColumnId(m) === column) as PlanModel;
  return model === 'k-robust' && view.k !== COMPARE_TABLE_K ? `x.${figureColumn(view.metric)}` : `c.${compareColumn(model, view.metric)}`;
}

function compareQueries(view: LeaderboardView, viewer: Viewer, scope: ViewScope, window: RowWindow): { page: SqlQuery; count: SqlQuery } {
  const repl: Record<string, unknown> = {};
  // The table holds k-robust at one k; another k joins that variant's entry by the entries' unique key.
  let from = 'leaderboard_compare c';
  if (view.k !== COMPARE_TABLE_K) {
    repl['kVariant'] = `k=${view.k}`;
    from += ` LEFT JOIN leaderboard_entries x ON x.scenario_id = c.scenario_id AND x.agents = c.agents
      AND x.model = 'k-robust' AND x.variant = :kVariant AND x.robot_profile_hash = c.robot_profile_hash`;
  }
  const where = baseWhere(viewer, scope, repl, 'c');
  for (const f of view.filters) where.push(fewValuesFilter(f, 'leaderboard_compare', 'c', repl) ?? filterCondition(f, compareSql(view, f.column), repl));
  const order = [
    ...view.sort.map((s) => `${compareSql(view, s.column)} ${s.direction.toUpperCase()}`),
    'c.map_name', 'c.scenario_name', 'c.agents', 'c.scenario_id', 'c.robot_profile_hash',
  ].join(', ');
  repl['limit'] = window.end - window.start;
  repl['offset'] = window.start;
  // As in the entries layout: the window is found on keys first (index-only for deep offsets), then its rows are read.
  const page = `WITH w AS (SELECT c.scenario_id, c.agents, c.robot_profile_hash FROM ${from} ${whereSql(where)} ORDER BY ${order} LIMIT :limit OFFSET :offset)
    SELECT c.scenario_id, c.agents, c.robot_profile_hash, c.profile_label,
      ${view.columns.map((col) => `${compareSql(view, col)} AS "${col}"`).join(', ')}
    FROM w JOIN ${from.replace('leaderboard_compare c', 'leaderboard_compare c ON c.scenario_id = w.scenario_id AND c.agents = w.agents AND c.robot_profile_hash = w.robot_profile_hash')}
    ORDER BY ${order}`;
  const count = `SELECT count(*)::int AS n FROM ${from} ${whereSql(where)}`;
  return { page: { sql: page, replacements: repl }, count: { sql: count, replacements: repl } };
}
