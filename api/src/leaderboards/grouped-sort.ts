/**
 * Sorts of several keys led by a column of few values (model, variant, status, source, profile,
 * solver). PostgreSQL would sort a whole group to answer one page, so near the top each group's
 * first rows come from the next key's index (sortGroupsQuery, groupedWindow), and deep pages are
 * placed group by group from per-group row counts (groupCountsQuery, groupWindow; migration 0403).
 */
import type { LeaderboardView } from '@shared/leaderboards';
import type { Viewer } from '../instance-sets/instance-set-access';
import { ENTRY_SQL } from './entry-sql';
import { baseWhere, entryWhere, fewValuesFilter, filterCondition, whereSql, type RowWindow, type SqlQuery, type ViewScope } from './view-sql';

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
export function groupedWindow(view: LeaderboardView, values: readonly string[], where: readonly string[], repl: Record<string, unknown>): string {
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
export function groupWindow(view: LeaderboardView, counts: readonly GroupCount[], where: readonly string[], repl: Record<string, unknown>, rows: RowWindow): string | null {
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
export function groupedCountQuery(view: LeaderboardView, viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string | null {
  if (!view.filters.every((f) => GROUPABLE[f.column] !== undefined)) return null;
  const where = baseWhere(viewer, scope, repl, 'g');
  for (const f of view.filters) {
    where.push(fewValuesFilter(f, 'leaderboard_group_counts', 'g', repl) ?? filterCondition(f, `g.${GROUPABLE[f.column]}`, repl));
  }
  return `SELECT coalesce(sum(g.entries), 0)::int AS n FROM leaderboard_group_counts g ${whereSql(where)}`;
}
