/**
 * The table every export format writes: the columns and rows on screen plus the caption that
 * says where the figures come from. Zod-free, pure, shared by the API and tests.
 */
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
