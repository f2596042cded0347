/** Columns and theme of the live results grid of a sweep. */
import { themeQuartz, type ColDef, type ValueFormatterParams } from 'ag-grid-community';
import type { SweepResultRow } from '@shared/runs';
import { RUN_STATUS_LABEL } from './sweep-status';

const num = (digits = 0) => (p: ValueFormatterParams<SweepResultRow, number | null>) =>
  p.value === null || p.value === undefined ? '' : p.value.toLocaleString('en', { maximumFractionDigits: digits });
const policyValue = (policy: string, pick: (e: SweepResultRow['executions'][number]) => number | null) =>
  (p: { data?: SweepResultRow }) => {
    const e = p.data?.executions.find((x) => x.policy === policy);
    return e ? pick(e) : null;
  };

/** The grid's columns; one success-rate and realised-makespan pair per replayed policy. */
export function sweepGridColumns(policies: readonly string[]): ColDef<SweepResultRow>[] {
  return [
    { field: 'runId', headerName: 'Run', width: 80, type: 'rightAligned' },
    { field: 'mapName', headerName: 'Map', width: 150 },
    { field: 'scenarioName', headerName: 'Scenario', width: 190 },
    { field: 'agents', headerName: 'Agents', width: 90, type: 'rightAligned' },
    { field: 'model', headerName: 'Plan model', width: 150 },
    { field: 'seed', headerName: 'Seed', width: 80, type: 'rightAligned' },
    { field: 'status', headerName: 'Status', width: 120, valueFormatter: (p) => (p.value ? RUN_STATUS_LABEL[p.value as SweepResultRow['status']] : '') },
    { colId: 'replay', headerName: 'Plan', width: 100, sortable: false, cellRenderer: replayLink },
    { field: 'soc', headerName: 'Sum-of-costs', width: 130, type: 'rightAligned', valueFormatter: num(), headerTooltip: 'Steps for unit-step models, ms for weighted-split' },
    { field: 'makespan', headerName: 'Makespan', width: 110, type: 'rightAligned', valueFormatter: num() },
    { field: 'turnInclusiveSocMs', headerName: 'Turn-incl. SOC (ms)', width: 160, type: 'rightAligned', valueFormatter: num() },
    { field: 'turnInclusiveMakespanMs', headerName: 'Turn-incl. makespan (ms)', width: 190, type: 'rightAligned', valueFormatter: num() },
    { field: 'lowerBound', headerName: 'Lower bound', width: 120, type: 'rightAligned', valueFormatter: num() },
    { field: 'runtimeMs', headerName: 'Solve time (ms)', width: 140, type: 'rightAligned', valueFormatter: num(1) },
    { field: 'nodes', headerName: 'CT nodes', width: 110, type: 'rightAligned', valueFormatter: num() },
    ...policies.flatMap((policy): ColDef<SweepResultRow>[] => [
      { colId: `success-${policy}`, headerName: `Success rate, ${policy}`, width: 170, valueGetter: policyValue(policy, (e) => e.successRate),
        type: 'rightAligned', valueFormatter: (p) => (p.value === null || p.value === undefined ? '' : `${Math.round(p.value * 100)} %`) },
      { colId: `realised-${policy}`, headerName: `Realised makespan, ${policy} (ms)`, width: 230, valueGetter: policyValue(policy, (e) => e.realisedMakespanMeanMs), type: 'rightAligned', valueFormatter: num() },
    ]),
    { field: 'reason', headerName: 'Note', flex: 1, minWidth: 200 },
  ];
}

/** A link to the plan viewer replaying a solved run's stored plan; nothing for runs without a plan. */
function replayLink(p: { data?: SweepResultRow }): HTMLElement | string {
  const row = p.data;
  if (!row || row.status !== 'solved' || row.resultId === null) return '';
  const a = document.createElement('a');
  a.href = `/plans/view?result=${row.resultId}`;
  a.textContent = 'Replay';
  a.setAttribute('aria-label', `Replay the plan of run ${row.runId}`);
  return a;
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
