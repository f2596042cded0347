/**
 * Converts between the grid's sort and filter models and a board view (shared/leaderboards.ts),
 * so what the grid shows, the page URL and the API request are one and the same view.
 * Only the conditions the API understands are offered: one condition per column.
 */
import type { LeaderboardColumn, LeaderboardView, ViewFilter, ViewSort } from '@shared/leaderboards';

/** The grid's filter model of one column (text or number filter, one condition). */
export interface GridFilter {
  readonly filterType?: string;
  readonly type?: string;
  readonly filter?: string | number | null;
}

/** The grid's sort model entry. */
export interface GridSort {
  readonly colId: string;
  readonly sort: 'asc' | 'desc';
}

const NUMBER_OPS: Readonly<Record<string, ViewFilter['op']>> = {
  equals: 'eq', notEqual: 'ne', lessThan: 'lt', lessThanOrEqual: 'lte', greaterThan: 'gt', greaterThanOrEqual: 'gte', blank: 'blank', notBlank: 'set',
};
const TEXT_OPS: Readonly<Record<string, ViewFilter['op']>> = { contains: 'has', equals: 'eq' };

/** Grid filter options per column kind (the API's operators, in the grid's names). */
export const GRID_FILTER_OPTIONS = {
  number: Object.keys(NUMBER_OPS),
  text: Object.keys(TEXT_OPS),
  enum: ['equals'],
} as const;

/** The view's filters from the grid's filter model; conditions the API cannot take are dropped. */
export function filtersFromGrid(model: Readonly<Record<string, GridFilter>>, columns: readonly LeaderboardColumn[]): ViewFilter[] {
  const out: ViewFilter[] = [];
  for (const [id, f] of Object.entries(model)) {
    const col = columns.find((c) => c.id === id);
    if (!col || !f.type) continue;
    const value = f.filter === undefined || f.filter === null ? '' : String(f.filter);
    if (col.kind === 'enum') {
      if (f.type === 'equals' && (col.values ?? []).includes(value)) out.push({ column: id, op: 'in', value });
    } else if (col.kind === 'number') {
      const op = NUMBER_OPS[f.type];
      if (op && (op === 'blank' || op === 'set' || value !== '')) out.push({ column: id, op, value: op === 'blank' || op === 'set' ? '' : value });
    } else {
      const op = TEXT_OPS[f.type];
      if (op && value !== '') out.push({ column: id, op, value });
    }
  }
  return out.sort((a, b) => (a.column + a.op < b.column + b.op ? -1 : 1));
}

/** The grid's filter model of the view's filters (the inverse of filtersFromGrid). */
export function filtersToGrid(filters: readonly ViewFilter[], columns: readonly LeaderboardColumn[]): Record<string, GridFilter> {
  const out: Record<string, GridFilter> = {};
  for (const f of filters) {
    const col = columns.find((c) => c.id === f.column);
    if (!col) continue;
    if (col.kind === 'number') {
      const type = Object.entries(NUMBER_OPS).find(([, op]) => op === f.op)?.[0];
      if (type) out[f.column] = { filterType: 'number', type, ...(f.op === 'blank' || f.op === 'set' ? {} : { filter: Number(f.value) }) };
    } else if (col.kind === 'enum') {
      out[f.column] = { filterType: 'text', type: 'equals', filter: f.value.split(',')[0] };
    } else {
      const type = Object.entries(TEXT_OPS).find(([, op]) => op === f.op)?.[0];
      if (type) out[f.column] = { filterType: 'text', type, filter: f.value };
    }
  }
  return out;
}

/** The view's sort from the grid's sort model. */
export function sortFromGrid(model: readonly GridSort[]): ViewSort[] {
  return model.map((s) => ({ column: s.colId, direction: s.sort }));
}

/** A view with new sort and filters from the grid. */
export function withGridState(view: LeaderboardView, sort: readonly GridSort[], filter: Readonly<Record<string, GridFilter>>, columns: readonly LeaderboardColumn[]): LeaderboardView {
  return { ...view, sort: sortFromGrid(sort), filters: filtersFromGrid(filter, columns) };
}
