/**
 * The SQL pieces every board query shares: the row window and scope types, the viewer's
 * visibility on the denormalised columns, the view's filters (contains, equals, numbers,
 * blank/set, enums) and the WHERE of an entries view.
 */
import { hasRole } from '@shared/auth';
import { ENTRY_COLUMNS, type LeaderboardView, type ViewFilter } from '@shared/leaderboards';
import type { Viewer } from '../instance-sets/instance-set-access';
import { ENTRY_SQL } from './entry-sql';

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
export function filterCondition(f: ViewFilter, expr: string, repl: Record<string, unknown>): string {
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
export function fewValuesFilter(f: ViewFilter, table: string, alias: string, repl: Record<string, unknown>): string | null {
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

/** WHERE conditions of an entries view: visibility, scope and the view's filters. */
export function entryWhere(view: LeaderboardView, viewer: Viewer, scope: ViewScope, repl: Record<string, unknown>): string[] {
  const where = baseWhere(viewer, scope, repl);
  for (const f of view.filters) where.push(fewValuesFilter(f, 'leaderboard_entries', 'e', repl) ?? filterCondition(f, ENTRY_SQL[f.column], repl));
  return where;
}
