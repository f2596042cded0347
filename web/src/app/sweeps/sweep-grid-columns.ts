/**
 * Columns and theme of the live results grid of a sweep. Every number column carries its unit in the
 * header; steps and ms never share a column (unit-step models count steps, weighted-split plans are in
 * ms, so the step columns stay empty for weighted-split and its own lower bound has an ms column).
 * Execution figures say "execution success" (collision-free runs), never plain "success", and carry
 * their 95 % interval where the stored data gives one (sweep-grid-figures.ts).
 */
import { themeQuartz, type ColDef, type ValueFormatterParams } from 'ag-grid-community';
import { cellLink } from '../core/grid-keyboard';
import { CI95_METHOD } from '@shared/confidence-interval';
import type { ExecutionView, SweepResultRow } from '@shared/runs';
import { cbsSwitchLabel, forbidsFollowing, isBounded, SUBOPTIMALITY_HELP, suboptimalityOf, switchesOff, type ModelSpec } from '@shared/sweeps';
import { formatMs, formatRateWithInterval, realisedMakespanInterval, successRateInterval } from './sweep-grid-figures';
import { RUN_STATUS_LABEL } from './sweep-status';
import { middleEllipsisCell } from '../core/middle-ellipsis';

const num = (digits = 0) => (p: ValueFormatterParams<SweepResultRow, number | null>) =>
  p.value === null || p.value === undefined ? '' : p.value.toLocaleString('en', { maximumFractionDigits: digits });
const executionOf = (row: SweepResultRow | undefined, policy: string): ExecutionView | null =>
  row?.executions.find((x) => x.policy === policy) ?? null;
const isUnitStep = (row: SweepResultRow | undefined) => row !== undefined && row.model !== 'weighted-split';
/** A figure in the model's own unit, shown only in the column of that unit. */
const inSteps = (pick: (r: SweepResultRow) => number | null) => (p: { data?: SweepResultRow }) => (p.data && isUnitStep(p.data) ? pick(p.data) : null);
const inMs = (pick: (r: SweepResultRow) => number | null) => (p: { data?: SweepResultRow }) => (p.data && !isUnitStep(p.data) ? pick(p.data) : null);

/**
 * "classic, following forbidden" / "k-robust k=2" / "classic, w = 1.5" / "classic, without WDG heuristic": the plan model
 * with the parameters that tell the sweep's model specs apart (CBS switches by their labels).
 */
export function modelVariantLabel(spec: ModelSpec | undefined, fallback: string): string {
  if (!spec) return fallback;
  const parts: string[] = [spec.model + ('k' in spec ? ` k=${spec.k}` : '')];
  if (spec.externalSolver) parts.push(`by ${spec.externalSolver.name}@${spec.externalSolver.version}`);
  if (isBounded(spec)) parts.push(`w = ${suboptimalityOf(spec)}`);
  if (forbidsFollowing(spec)) parts.push('following forbidden');
  const off = switchesOff(spec);
  if (off.length > 0) parts.push(`without ${off.map(cbsSwitchLabel).join(', ')}`);
  return parts.join(', ');
}

/** Characters of a map or scenario name that fit their columns (150 and 190 px of 13 px text, common practice ~7.5 px a character). */
const NAME_CHARS = { map: 18, scenario: 24 } as const;
/** Column width showing that many characters of the grid's body font (≈ 7.5 px each, common practice) plus the cell padding. */
const widthFor = (chars: number): number => Math.ceil(chars * 7.5) + 36;

/** Widest plan model column, px: past it a label of many switched-off improvements wraps into its tooltip. */
export const MODEL_COLUMN_MAX_PX = 420;

/** Width of the plan model column: its longest variant label (at least "orientation-split"), at most MODEL_COLUMN_MAX_PX. */
export function modelColumnWidth(models: readonly ModelSpec[]): number {
  const longest = Math.max('orientation-split'.length, ...models.map((m) => [...modelVariantLabel(m, m.model)].length));
  return Math.min(widthFor(longest), MODEL_COLUMN_MAX_PX);
}

/**
 * The grid's columns; one execution-success and one realised-makespan column per replayed policy.
 * `models` are the sweep definition's model specs (row.modelIndex points into them).
 */
export function sweepGridColumns(policies: readonly string[], models: readonly ModelSpec[] = []): ColDef<SweepResultRow>[] {
  return [
    { field: 'runId', headerName: 'Run', width: 80, type: 'rightAligned' },
    // Long names keep their distinguishing end, with the full name on hover (issue 14, item 10).
    { field: 'mapName', headerName: 'Map', width: widthFor(NAME_CHARS.map), ...middleEllipsisCell(NAME_CHARS.map) },
    { field: 'scenarioName', headerName: 'Scenario', width: widthFor(NAME_CHARS.scenario), ...middleEllipsisCell(NAME_CHARS.scenario) },
    { field: 'agents', headerName: 'Agents', width: 90, type: 'rightAligned' },
    // As wide as the sweep's longest variant label ("classic, following forbidden" was cut), up to MODEL_COLUMN_MAX_PX; the full label on hover.
    { colId: 'model', headerName: 'Plan model', width: modelColumnWidth(models),
      valueGetter: (p) => (p.data ? modelVariantLabel(models[p.data.modelIndex], p.data.model) : ''),
      tooltipValueGetter: (p) => (typeof p.value === 'string' ? p.value : undefined) },
    { field: 'seed', headerName: 'Seed', width: 80, type: 'rightAligned' },
    { field: 'status', headerName: 'Status', width: 120, valueFormatter: (p) => (p.value ? RUN_STATUS_LABEL[p.value as SweepResultRow['status']] : ''),
      headerTooltip: '"Solved" means the solver found a plan within the limits; it says nothing about execution.' },
    { colId: 'replay', headerName: 'Plan', width: 100, sortable: false, cellRenderer: replayLink },
    { colId: 'socSteps', headerName: 'Sum-of-costs (steps)', width: 170, type: 'rightAligned', valueGetter: inSteps((r) => r.soc), valueFormatter: num(),
      headerTooltip: 'Unit-step plan models only; weighted-split plans are in ms (see the turn-inclusive columns)' },
    { colId: 'makespanSteps', headerName: 'Makespan (steps)', width: 150, type: 'rightAligned', valueGetter: inSteps((r) => r.makespan), valueFormatter: num(),
      headerTooltip: 'Unit-step plan models only' },
    { colId: 'lowerBoundSteps', headerName: 'Lower bound (steps)', width: 165, type: 'rightAligned', valueGetter: inSteps((r) => r.lowerBound), valueFormatter: num(),
      headerTooltip: 'Proven lower bound on the optimal sum-of-costs, unit-step plan models' },
    { field: 'turnInclusiveSocMs', headerName: 'Turn-incl. SOC (ms)', width: 160, type: 'rightAligned', valueFormatter: num(),
      headerTooltip: 'Sum-of-costs with turns at the profile\'s quarter-turn time; for weighted-split its own cost' },
    { field: 'turnInclusiveMakespanMs', headerName: 'Turn-incl. makespan (ms)', width: 190, type: 'rightAligned', valueFormatter: num() },
    { colId: 'lowerBoundMs', headerName: 'Lower bound (ms)', width: 150, type: 'rightAligned', valueGetter: inMs((r) => r.lowerBound), valueFormatter: num(),
      headerTooltip: 'Proven lower bound on the optimal sum-of-costs in ms, weighted-split only' },
    // A run parameter like the seed (no unit): the factor the search was asked for.
    { field: 'suboptimality', headerName: 'w', width: 80, type: 'rightAligned', valueFormatter: num(3),
      headerTooltip: `Suboptimality factor of the search: ${SUBOPTIMALITY_HELP}` },
    { field: 'gap', headerName: 'Gap (%)', width: 160, type: 'rightAligned', valueFormatter: formatGap,
      headerTooltip: '(sum-of-costs − lower bound) ÷ lower bound; 0 = proven optimal, otherwise the best known value is within that share of the optimum' },
    { field: 'runtimeMs', headerName: 'Solve time (ms)', width: 140, type: 'rightAligned', valueFormatter: num(1) },
    { field: 'nodes', headerName: 'CT nodes (count)', width: 140, type: 'rightAligned', valueFormatter: num() },
    // What an external solver's process used (issue 16, item 4); only in sweeps that run one.
    ...(models.some((m) => m.externalSolver) ? [
      { field: 'cpuTimeMs', headerName: 'CPU time (ms)', width: 130, type: 'rightAligned', valueFormatter: num(),
        headerTooltip: 'User + system CPU time of an external solver\'s process and the processes it waited for (GNU time); empty for the built-in search' },
      { colId: 'peakMemoryMb', headerName: 'Peak memory, largest process (MB)', width: 200, type: 'rightAligned', valueFormatter: num(1),
        valueGetter: (p) => (p.data?.peakMemoryKb === null || p.data?.peakMemoryKb === undefined ? null : p.data.peakMemoryKb / 1024),
        headerTooltip: 'Largest resident memory of any one process of an external solver (GNU time), not the sum over its processes; empty for the built-in search' },
    ] satisfies ColDef<SweepResultRow>[] : []),
    ...policies.flatMap((policy): ColDef<SweepResultRow>[] => [
      { colId: `success-${policy}`, headerName: `Execution success rate, ${policy} (%, 95 % CI)`, width: 280, type: 'rightAligned',
        headerTooltip: `Share of the Monte Carlo runs under ${policy} with no collision. Interval: ${CI95_METHOD.rate}.`,
        valueGetter: (p) => executionOf(p.data, policy)?.successRate ?? null,
        valueFormatter: (p) => {
          const e = executionOf(p.data, policy);
          return e ? formatRateWithInterval(e.successRate, successRateInterval(e), e.runs) : '';
        } },
      { colId: `realised-${policy}`, headerName: `Realised makespan, ${policy} (ms, mean, 95 % CI)`, width: 320, type: 'rightAligned',
        headerTooltip: `Mean over the Monte Carlo runs under ${policy}. Interval: ${CI95_METHOD.mean}; none for results stored before intervals were recorded.`,
        valueGetter: (p) => executionOf(p.data, policy)?.realisedMakespanMeanMs ?? null,
        valueFormatter: (p) => {
          const e = executionOf(p.data, policy);
          if (!e || e.realisedMakespanMeanMs === null) return '';
          const ci = realisedMakespanInterval(e);
          return ci ? `${formatMs(e.realisedMakespanMeanMs)} (${formatMs(ci[0])}–${formatMs(ci[1])})` : formatMs(e.realisedMakespanMeanMs);
        } },
    ]),
    { field: 'reason', headerName: 'Note', flex: 1, minWidth: 200 },
  ];
}

/** A gap for the grid in %: "0 (proven optimal)" or the share with 1 decimal (at least 0.1 when not 0); empty without one. */
export function formatGap(p: { value?: number | null }): string {
  if (p.value === null || p.value === undefined) return '';
  if (p.value === 0) return '0 (proven optimal)';
  return Math.max(0.1, p.value * 100).toLocaleString('en', { minimumFractionDigits: 1, maximumFractionDigits: 1 });
}

/** A link to the plan viewer replaying a solved run's stored plan; nothing for runs without a plan. */
function replayLink(p: { data?: SweepResultRow }): HTMLElement | string {
  const row = p.data;
  if (!row || row.status !== 'solved' || row.resultId === null) return '';
  // Enter on the focused cell follows it (core/grid-keyboard.ts).
  return cellLink(`/plans/view?result=${row.resultId}`, 'Replay', `Replay the plan of run ${row.runId}`);
}

/** Quartz with the Material system colours of the app theme. */
export const SWEEP_GRID_THEME = themeQuartz.withParams({
  accentColor: 'var(--mat-sys-primary)',
  backgroundColor: 'var(--mat-sys-surface)',
  foregroundColor: 'var(--mat-sys-on-surface)',
  headerBackgroundColor: 'var(--mat-sys-surface-container)',
  headerTextColor: 'var(--mat-sys-on-surface-variant)',
  borderColor: 'var(--mat-sys-outline-variant)',
  fontFamily: 'inherit',
  fontSize: 13,
  rowHeight: 32,
});
