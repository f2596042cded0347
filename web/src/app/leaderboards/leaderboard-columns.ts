/** Grid column definitions of a board view: ids equal the API's column ids, filters limited to what the API takes. */
import type { ColDef, ValueFormatterParams } from 'ag-grid-community';
import type { LeaderboardColumn } from '@shared/leaderboards';
import { GRID_FILTER_OPTIONS } from './grid-view';

/**
 * A row as the grid holds it: the row id plus one field per column id. Comparison rows also carry
 * `__best` (comma list of the model columns holding the row's best value) and `__colliding` (model
 * columns whose plan collides at nominal times).
 */
export type GridRow = Record<string, string | number | null> & {
  readonly __id: string;
  readonly __resultId?: number;
  readonly __best?: string;
  readonly __colliding?: string;
};

const listed = (list: string | undefined, id: string): boolean => (list ?? '').split(',').includes(id);

/** Header tooltip: the description, or the values of an enum column. */
function tooltipOf(c: LeaderboardColumn): string | undefined {
  if (c.description) return c.values ? `${c.description} Values: ${c.values.join(', ')}.` : c.description;
  return c.values ? `${c.label}: ${c.values.join(', ')}` : undefined;
}

function formatNumber(digits: number | undefined) {
  return (p: ValueFormatterParams<GridRow>): string => {
    const v = p.value as number | null | undefined;
    if (v === null || v === undefined) return '–';
    return digits === undefined ? String(v) : v.toLocaleString('en', { minimumFractionDigits: digits, maximumFractionDigits: digits });
  };
}

/**
 * A realised-makespan or finish-spread interval bound: "interval not stored" when the row has the mean but its
 * execution was recorded before intervals were kept (issue 12, item 5).
 */
function formatIntervalBound(id: string, digits: number | undefined) {
  const mean = id.replace(/(Lo|Hi)$/, '');
  const plain = formatNumber(digits);
  return (p: ValueFormatterParams<GridRow>): string => {
    const v = p.value as number | null | undefined;
    if ((v === null || v === undefined) && typeof p.data?.[mean] === 'number') return 'interval not stored';
    return plain(p);
  };
}

/** Column definitions for the visible columns, in order, with the view's sort applied. */
export function gridColumns(columns: readonly LeaderboardColumn[], sort: readonly { column: string; direction: 'asc' | 'desc' }[]): ColDef<GridRow>[] {
  return columns.map((c) => {
    const sortAt = sort.findIndex((s) => s.column === c.id);
    return {
      colId: c.id,
      field: c.id,
      headerName: c.unit ? `${c.label} (${c.unit})` : c.label,
      headerTooltip: tooltipOf(c),
      // Interval columns are computed per page (Wilson from rate × runs): shown, not sorted or filtered.
      sortable: !c.isComputed,
      sort: sortAt >= 0 ? sort[sortAt].direction : null,
      sortIndex: sortAt >= 0 ? sortAt : null,
      filter: c.isComputed ? false : c.kind === 'number' ? 'agNumberColumnFilter' : 'agTextColumnFilter',
      // Comparison layout: the row's best value in bold; a plan that collides at nominal times is marked and never best.
      cellClassRules: c.id.startsWith('m_') ? {
        'best-cell': (p: { data?: GridRow }) => listed(p.data?.__best, c.id),
        'colliding-cell': (p: { data?: GridRow }) => listed(p.data?.__colliding, c.id),
      } : undefined,
      tooltipValueGetter: c.id.startsWith('m_')
        ? (p: { data?: GridRow }) => (listed(p.data?.__colliding, c.id) ? 'This plan collides at nominal times (open-loop replay with zero noise).' : undefined)
        : undefined,
      filterParams: { filterOptions: [...GRID_FILTER_OPTIONS[c.kind]], maxNumConditions: 1, debounceMs: 300 },
      type: c.kind === 'number' ? 'rightAligned' : undefined,
      valueFormatter: /^(realised|spread).*(Lo|Hi)$/.test(c.id) ? formatIntervalBound(c.id, c.digits) : c.kind === 'number' ? formatNumber(c.digits) : undefined,
      minWidth: c.kind === 'number' ? 110 : 120,
      flex: c.kind === 'number' ? 0 : 1,
      width: c.kind === 'number' ? 140 : undefined,
    };
  });
}

/**
 * A left-pinned link opening an entry's best plan in the plan viewer (`/plans/view?result=ID`),
 * which replays it on the server; only for researchers and up, who may run executions.
 */
export function replayColumn(): ColDef<GridRow> {
  return {
    colId: '__replay', headerName: 'Plan', width: 90, pinned: 'left', sortable: false, filter: false, resizable: false,
    cellRenderer: (p: { data?: GridRow }) => {
      const id = p.data?.__resultId;
      if (id === undefined) return '';
      const a = document.createElement('a');
      a.href = `/plans/view?result=${id}`;
      a.textContent = 'Replay';
      a.setAttribute('aria-label', `Replay result ${id}`);
      return a;
    },
  };
}
