/** Grid column definitions of a board view: ids equal the API's column ids, filters limited to what the API takes. */
import type { ColDef, ValueFormatterParams } from 'ag-grid-community';
import { cellLink } from '../core/grid-keyboard';
import { CI95_METHOD } from '@shared/confidence-interval';
import { INTERVAL_NOT_STORED } from '@shared/exports-table';
import { INTERVAL_NOT_STORED_REASON, type LeaderboardColumn } from '@shared/leaderboards';
import { GRID_FILTER_OPTIONS } from './grid-view';
import { middleEllipsisCell } from '../core/middle-ellipsis';

/**
 * A row as the grid holds it: the row id plus one field per column id. Comparison rows also carry
 * `__best` (comma list of the model columns holding the row's best value) and `__colliding` (model
 * columns whose plan collides at nominal times).
 */
export type GridRow = Record<string, string | number | null> & {
  readonly __id: string;
  readonly __resultId?: number;
  /** Entries rows: the query string of the row's history page (scenario, agents, model, variant, profile). */
  readonly __history?: string;
  /** Entries rows: field trial runs attached to the result (issue 17). */
  readonly __fieldRuns?: number;
  readonly __best?: string;
  readonly __colliding?: string;
  /** 'yes' when the comparison figure carries 95 % intervals, then in `<column>__lo` / `<column>__hi` (null: not stored). */
  readonly __intervals?: string;
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
 * A realised-makespan or finish-spread interval bound: INTERVAL_NOT_STORED when the row has the mean but its
 * execution was recorded before intervals were kept (issue 12, item 5).
 */
function formatIntervalBound(id: string, digits: number | undefined) {
  const mean = id.replace(/(Lo|Hi)$/, '');
  const plain = formatNumber(digits);
  return (p: ValueFormatterParams<GridRow>): string => {
    const v = p.value as number | null | undefined;
    if ((v === null || v === undefined) && typeof p.data?.[mean] === 'number') return INTERVAL_NOT_STORED;
    return plain(p);
  };
}

/** Which interval a comparison figure's model cells carry: a rate's Wilson interval or a mean's stored one. */
export type CellIntervalKind = 'rate' | 'mean';

const COLLIDING_TIP = 'This plan collides at nominal times (open-loop replay with zero noise).';

/** A number without digit grouping, so the commas of "x [lo, hi]" only separate the bounds. */
const plain = (v: number, digits: number | undefined): string =>
  digits === undefined ? String(v) : v.toLocaleString('en', { minimumFractionDigits: digits, maximumFractionDigits: digits, useGrouping: false });

/**
 * The compact text of a model cell with its 95 % interval (issue 12, item 5): a rate as whole
 * percent, "85 % [71, 93]", the bounds rounded outwards (so the text never claims a narrower
 * interval than computed); a mean as "4100 [4050, 4150]" in the header's unit; "4100 [interval
 * not stored]" (INTERVAL_NOT_STORED, as exports write it) for executions recorded before intervals
 * were kept; "–" without a value.
 */
export function cellWithInterval(kind: CellIntervalKind, value: number | null | undefined, lo: number | null | undefined, hi: number | null | undefined, digits?: number): string {
  if (value === null || value === undefined) return '–';
  const hasInterval = typeof lo === 'number' && typeof hi === 'number';
  if (kind === 'rate') {
    const pct = `${Math.round(value * 100)} %`;
    return hasInterval ? `${pct} [${Math.floor(lo * 100 + 1e-9)}, ${Math.ceil(hi * 100 - 1e-9)}]` : `${pct} ${INTERVAL_NOT_STORED}`;
  }
  return hasInterval ? `${plain(value, digits)} [${plain(lo, digits)}, ${plain(hi, digits)}]` : `${plain(value, digits)} ${INTERVAL_NOT_STORED}`;
}

/** Tooltip of a model cell: its interval with the method, and whether its plan collides at nominal times. */
function modelCellTooltip(id: string, kind: CellIntervalKind | null, digits: number | undefined) {
  return (p: { data?: GridRow }): string | undefined => {
    const parts: string[] = [];
    const lo = p.data?.[`${id}__lo`];
    const hi = p.data?.[`${id}__hi`];
    if (kind && typeof p.data?.[id] === 'number') {
      parts.push(typeof lo === 'number' && typeof hi === 'number'
        ? `95 % interval ${kind === 'rate' ? `${lo.toFixed(3)} to ${hi.toFixed(3)}` : `${plain(lo, digits)} to ${plain(hi, digits)}`}: ${kind === 'rate' ? `${CI95_METHOD.rate}, from this plan's rate × runs` : `${CI95_METHOD.mean}, as stored with the execution`}.`
        : `${INTERVAL_NOT_STORED}: ${INTERVAL_NOT_STORED_REASON}.`);
    }
    if (listed(p.data?.__colliding, id)) parts.push(COLLIDING_TIP);
    return parts.length > 0 ? parts.join(' ') : undefined;
  };
}

/** Characters of a map or scenario name shown in the board's flexible name columns (at their 120 px minimum some are clipped by the cell). */
const NAME_CHARS = 28;
/** Width that shows NAME_CHARS characters of the grid's body font (≈ 7.5 px each, common practice) plus the cell padding. */
const NAME_MIN_WIDTH_PX = Math.ceil(NAME_CHARS * 7.5) + 36;

/**
 * Widths that show the longest usual value of a text column whole ("orientation-split", "following
 * forbidden, w=1.5", "bounded (w = 1.5)"): ≈ 7.5 px a character of the grid's 13 px font plus 36 px
 * of padding and filter icon (common practice, as for the name columns); the whole text is also on hover.
 */
export const TEXT_MIN_WIDTH_PX: Readonly<Record<string, number>> = {
  model: 165, variant: 230, optimality: 170, status: 120, solver: 200, profile: 260,
};

/**
 * Column definitions for the visible columns, in order, with the view's sort applied. In the
 * comparison layout `intervalKind` says whether model cells show their 95 % interval.
 */
export function gridColumns(columns: readonly LeaderboardColumn[], sort: readonly { column: string; direction: 'asc' | 'desc' }[], intervalKind: CellIntervalKind | null = null): ColDef<GridRow>[] {
  return columns.map((c) => {
    const sortAt = sort.findIndex((s) => s.column === c.id);
    const isModel = c.id.startsWith('m_');
    const withInterval = isModel && intervalKind !== null;
    // Long map and scenario names keep their distinguishing end, with the full name on hover (issue 14, item 10).
    const name = c.id === 'map' || c.id === 'scenario' ? middleEllipsisCell(NAME_CHARS) : null;
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
      tooltipValueGetter: isModel ? modelCellTooltip(c.id, intervalKind, c.digits) : name?.tooltipValueGetter
        ?? (c.kind === 'number' ? undefined : (p: { value?: unknown }) => (typeof p.value === 'string' && p.value !== '' ? p.value : undefined)),
      filterParams: { filterOptions: [...GRID_FILTER_OPTIONS[c.kind]], maxNumConditions: 1, debounceMs: 300 },
      type: c.kind === 'number' ? 'rightAligned' : undefined,
      valueFormatter: name ? name.valueFormatter : withInterval
        ? (p: ValueFormatterParams<GridRow>) => cellWithInterval(intervalKind, p.value as number | null, p.data?.[`${c.id}__lo`] as number | null, p.data?.[`${c.id}__hi`] as number | null, c.digits)
        : /^(realised|spread).*(Lo|Hi)$/.test(c.id) ? formatIntervalBound(c.id, c.digits) : c.kind === 'number' ? formatNumber(c.digits) : undefined,
      minWidth: name ? NAME_MIN_WIDTH_PX : c.kind === 'number' ? 110 : TEXT_MIN_WIDTH_PX[c.id] ?? 120,
      flex: c.kind === 'number' ? 0 : 1,
      width: withInterval ? 190 : c.kind === 'number' ? 140 : undefined,
    };
  });
}

/**
 * A left-pinned link opening an entry's best plan in the plan viewer (`/plans/view?result=ID`),
 * which replays it for everyone: on the server for researchers and up, in the browser for visitors.
 */
export function replayColumn(): ColDef<GridRow> {
  return {
    colId: '__replay', headerName: 'Plan', width: 130, pinned: 'left', sortable: false, filter: false, resizable: false,
    cellRenderer: (p: { data?: GridRow }) => {
      const id = p.data?.__resultId;
      if (id === undefined) return '';
      // Field runs attached to the result show beside the link (its page compares them with the simulation).
      const field = p.data?.__fieldRuns ?? 0;
      const runs = `${field} field run${field === 1 ? '' : 's'}`;
      // Enter on the focused cell follows it (core/grid-keyboard.ts).
      return field > 0
        ? cellLink(`/plans/view?result=${id}`, `Replay · ${field} field`, `Replay result ${id}; ${runs}`)
        : cellLink(`/plans/view?result=${id}`, 'Replay', `Replay result ${id}`);
    },
  };
}

/**
 * A left-pinned link to a row's history (`/leaderboards/history?…`, issue 16, item 5): every
 * result and submission stored for its instance, plan model variant and robot profile. Reached
 * like the Replay link: arrow keys to the cell, Enter follows it.
 */
export function historyColumn(): ColDef<GridRow> {
  return {
    colId: '__history', headerName: 'History', width: 110, pinned: 'left', sortable: false, filter: false, resizable: false,
    headerTooltip: 'Every result and submission stored for this instance, plan model and robot profile, superseded ones included',
    cellRenderer: (p: { data?: GridRow }) => {
      const query = p.data?.__history;
      return query === undefined ? '' : cellLink(`/leaderboards/history?${query}`, 'History', 'History of this row: every stored result and submission');
    },
  };
}
