/**
 * The table every export format writes: the columns and rows on screen plus the caption that
 * says where the figures come from. Zod-free, pure, shared by the API and tests.
 */
import type { Interval95 } from './confidence-interval';
import type { ExportProvenance } from './exports-provenance';
import type { BestAmong, LeaderboardColumn } from './leaderboards';

/** Export formats of GET /api/exports. */
export const EXPORT_FORMATS = ['csv', 'latex', 'markdown', 'json'] as const;
export type ExportFormat = (typeof EXPORT_FORMATS)[number];

/** A cell value: text, a number, or empty. */
export type ExportCell = string | number | null;

/** What an export holds. */
export interface ExportTable {
  /** Plan models, robot profile(s) and filters the figures come from, for the caption. */
  readonly caption: string;
  readonly columns: readonly LeaderboardColumn[];
  readonly rows: readonly (readonly ExportCell[])[];
  /**
   * Ids of the columns compared per row for the best value (the plan model columns of a
   * comparison table); the best one is set in bold where the format can.
   */
  readonly compareColumns: readonly string[];
  /**
   * Per row, the ids among `compareColumns` whose plan collides at nominal times (issue 12,
   * item 4): marked with † in Markdown and LaTeX, and never bold unless `bestAmong` is `all`.
   */
  readonly notExecutable?: readonly (readonly string[])[];
  /** Which plans the bold best value considers (default `executable`). */
  readonly bestAmong?: BestAmong;
  /**
   * Per row, the 95 % interval of each compare column that has one (a comparison of an execution
   * figure, issue 12, item 5); null = the value has no interval (not stored). Absent: no intervals.
   * CSV and JSON write them as separate low / high columns, Markdown and LaTeX as "x [lo, hi]".
   */
  readonly intervals?: readonly Readonly<Record<string, Interval95 | null>>[];
  /**
   * The caution that goes with execution figures (SAFETY_NOTE): a comment line in CSV and LaTeX,
   * a line below the table in Markdown, its own field in JSON; never part of the caption.
   */
  readonly caution?: string;
  /** Where the figures come from (issue 14, item 9): a header comment, or JSON's `meta`. */
  readonly provenance?: ExportProvenance;
}

/** Id of the robot profile column (entries and comparison layouts). */
export const PROFILE_COLUMN = 'profile';

/** Longest robot profile cell Markdown and LaTeX write before they switch to keys P1, P2, … (≈ two parameters). */
export const PROFILE_CELL_MAX_CHARS = 32;

/**
 * For the formats people read (Markdown, LaTeX): when the rows mix robot profiles, the profile
 * column keeps only the parameters that differ between them ("quarter turn 300 ms") and the caption
 * names the ones all rows share, so a row stays narrow; when that is still longer than
 * PROFILE_CELL_MAX_CHARS the cells become keys (P1, P2, … in order of first appearance) spelt out
 * in the caption. Labels are profileLabel() texts: the same
 * ", "-separated parameters in the same order. Unchanged when the rows share one profile, the
 * table has no profile column, or the labels are not of that form.
 */
export function withShortProfiles(table: ExportTable): ExportTable {
  const j = table.columns.findIndex((c) => c.id === PROFILE_COLUMN);
  if (j < 0) return table;
  const labels = [...new Set(table.rows.map((r) => r[j]).filter((v): v is string => typeof v === 'string'))];
  if (labels.length < 2) return table;
  const parts = labels.map((l) => l.split(', '));
  const key = (part: string) => part.replace(/ [^ ]+( [^ ]+)?$/, '');
  const isAligned = parts.every((p) => p.length === parts[0].length && p.every((part, i) => key(part) === key(parts[0][i])));
  if (!isAligned) return table;
  const differs = parts[0].map((_, i) => parts.some((p) => p[i] !== parts[0][i]));
  const differing = labels.map((_, n) => parts[n].filter((_, i) => differs[i]).join(', '));
  const shared = parts[0].filter((_, i) => !differs[i]);
  const sharedText = shared.length > 0 ? `; every row has ${shared.join(', ')}` : '';
  // Still too wide for a column (several parameters differ): short keys, spelt out in the caption.
  if (Math.max(...differing.map((d) => d.length)) > PROFILE_CELL_MAX_CHARS) {
    const keys = labels.map((_, n) => `P${n + 1}`);
    const legend = `Robot profiles: ${labels.map((_, n) => `${keys[n]} = ${differing[n]}`).join('; ')}${sharedText}.`;
    const keyOf = new Map(labels.map((l, n) => [l, keys[n]]));
    return {
      ...table,
      caption: table.caption === '' ? legend : `${table.caption} ${legend}`,
      rows: table.rows.map((r) => r.map((v, i) => (i === j && typeof v === 'string' ? keyOf.get(v) ?? v : v))),
    };
  }
  const short = new Map(labels.map((l, n) => [l, differing[n]]));
  const note = `Robot profile column: only the parameters that differ between rows${sharedText}.`;
  return {
    ...table,
    caption: table.caption === '' ? note : `${table.caption} ${note}`,
    rows: table.rows.map((r) => r.map((v, i) => (i === j && typeof v === 'string' ? short.get(v) ?? v : v))),
  };
}

/** What Markdown and LaTeX write after a value whose interval was not stored. */
export const INTERVAL_NOT_STORED = '[interval not stored]';

/** The ids of the low and high columns CSV and JSON add after a compare column with intervals. */
export function intervalColumnIds(id: string): readonly [lo: string, hi: string] {
  return [`${id}_lo`, `${id}_hi`];
}

/**
 * The table with each compare column that carries intervals followed by its low and high columns
 * (plain numbers, at full precision), for the formats that keep one number per cell (CSV, JSON).
 */
export function withIntervalColumns(table: ExportTable): ExportTable {
  const intervals = table.intervals;
  if (!intervals) return table;
  const carries = (id: string) => table.compareColumns.includes(id);
  const columns = table.columns.flatMap((c): LeaderboardColumn[] => {
    if (!carries(c.id)) return [c];
    const [lo, hi] = intervalColumnIds(c.id);
    const bound = (id: string, end: string): LeaderboardColumn => ({
      id, label: `${c.label}, 95 % CI ${end}`, kind: 'number', unit: c.unit, digits: c.digits !== undefined && c.digits > 0 ? c.digits + 1 : c.digits, isComputed: true,
    });
    return [c, bound(lo, 'low'), bound(hi, 'high')];
  });
  const rows = table.rows.map((row, r) => row.flatMap((v, i) => {
    const id = table.columns[i].id;
    if (!carries(id)) return [v];
    const ci = intervals[r]?.[id] ?? null;
    return [v, ci ? ci[0] : null, ci ? ci[1] : null];
  }));
  return { ...table, columns, rows, intervals: undefined };
}

/**
 * A cell for people with its interval, "x [lo, hi]" (bounds of a fractional figure such as a rate
 * with one more digit than the value, so a narrow interval does not collapse onto it; whole ms stay
 * whole), or "x [interval not stored]"; the plain cell
 * where the table has no interval for it.
 */
export function displayWithInterval(table: ExportTable, r: number, j: number): string {
  const column = table.columns[j];
  const value = table.rows[r][j];
  const text = displayCell(value, column);
  const intervals = table.intervals?.[r];
  if (value === null || !intervals || !(column.id in intervals)) return text;
  const ci = intervals[column.id];
  if (!ci) return `${text} ${INTERVAL_NOT_STORED}`;
  const bound = { ...column, digits: column.digits !== undefined && column.digits > 0 ? column.digits + 1 : column.digits };
  return `${text} [${displayCell(ci[0], bound)}, ${displayCell(ci[1], bound)}]`;
}

/** The mark after a value whose plan collides at nominal times (explained in the caption). */
export const COLLISION_MARK = '†';

/** Whether cell (row `r`, column `id`) holds a plan that collides at nominal times. */
export function isCollidingCell(table: ExportTable, r: number, id: string): boolean {
  return table.notExecutable?.[r]?.includes(id) ?? false;
}

/** A header with its unit, e.g. "Solve time (ms)". */
export function headerOf(c: LeaderboardColumn): string {
  return c.unit ? `${c.label} (${c.unit})` : c.label;
}

/** A cell as text for people: numbers with the column's digits, empty cells as an en dash. */
export function displayCell(value: ExportCell, column: LeaderboardColumn): string {
  if (value === null) return '–';
  if (typeof value === 'number') return column.digits !== undefined ? value.toFixed(column.digits) : String(value);
  return value;
}

/**
 * Per row, the indices of the best cells among `compareColumns` (ties all count; none when the
 * columns have no direction or the row has no value there), leaving out the row's `notExecutable` columns.
 */
export function bestCells(table: ExportTable): Set<number>[] {
  const idx = table.columns.map((c, i) => (table.compareColumns.includes(c.id) && c.better ? i : -1)).filter((i) => i >= 0);
  return table.rows.map((row, r) => {
    const excluded = table.bestAmong === 'all' ? [] : table.notExecutable?.[r] ?? [];
    const values = idx.filter((i) => typeof row[i] === 'number' && !excluded.includes(table.columns[i].id));
    if (values.length === 0) return new Set<number>();
    const better = table.columns[values[0]].better;
    const nums = values.map((i) => row[i] as number);
    const best = better === 'higher' ? Math.max(...nums) : Math.min(...nums);
    return new Set(values.filter((i) => row[i] === best));
  });
}
