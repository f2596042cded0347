import type { ColDef, ValueFormatterParams, ValueGetterParams } from 'ag-grid-community';
import { wilsonInterval } from '@shared/confidence-interval';
import type { ExecutionView, SweepResultRow } from '@shared/runs';
import { CBS_SWITCH_NAMES, type ModelSpec } from '@shared/sweeps';
import { MODEL_COLUMN_MAX_PX, modelColumnWidth, modelVariantLabel, sweepGridColumns } from './sweep-grid-columns';
import { formatRateWithInterval, successRateInterval } from './sweep-grid-figures';

const row = (over: Partial<SweepResultRow>): SweepResultRow => ({
  runId: 1, resultId: 10, scenarioId: 1, scenarioName: 'sc-1', mapName: 'quay', agents: 4, modelIndex: 0, model: 'classic', seed: 1,
  status: 'solved', soc: 20, makespan: 8, turnInclusiveSocMs: 26_400, turnInclusiveMakespanMs: 9_800, lowerBound: 19, gap: 1 / 19, suboptimality: 1, runtimeMs: 3.2, nodes: 5,
  reason: null, executions: [], ...over,
});
const execution = (over: Partial<ExecutionView>): ExecutionView => ({
  policy: 'open-loop', runs: 40, successRate: 0.85, collisionsMean: 0.2, realisedMakespanMeanMs: 10_250.4, realisedMakespanP95Ms: 11_000,
  finishSpreadMeanMs: 900, ...over,
});

/** What a column shows for a row: its value getter (or field), then its formatter. */
function shown(col: ColDef<SweepResultRow>, data: SweepResultRow): string {
  const value = typeof col.valueGetter === 'function'
    ? col.valueGetter({ data } as ValueGetterParams<SweepResultRow>)
    : (data as unknown as Record<string, unknown>)[col.field as string];
  if (typeof col.valueFormatter === 'function') return col.valueFormatter({ value, data } as ValueFormatterParams<SweepResultRow>);
  return value === null || value === undefined ? '' : String(value);
}
const column = (cols: ColDef<SweepResultRow>[], id: string) => {
  const c = cols.find((x) => (x.colId ?? x.field) === id);
  if (!c) throw new Error(`no column ${id}`);
  return c;
};

describe('sweep grid columns', () => {
  const cols = sweepGridColumns(['open-loop', 'dependency-gated']);

  it('puts a unit in the header of every number column and never mixes steps with ms', () => {
    // Run parameters (seed, w) carry no unit.
    const numeric = cols.filter((c) => c.type === 'rightAligned' && !['runId', 'agents', 'seed', 'suboptimality'].includes((c.colId ?? c.field) as string));
    expect(numeric.length).toBe(13); // 6 plan figures, gap, solve time, CT nodes, 2 per policy × 2
    for (const c of numeric) expect(c.headerName).toMatch(/\((steps|ms|count|%)[,)]/);
    expect(cols.some((c) => /^Sum-of-costs$|model unit/.test(c.headerName ?? ''))).toBe(false);
  });

  it('shows step figures only for unit-step models and the ms lower bound only for weighted-split', () => {
    const classic = row({});
    const weighted = row({ model: 'weighted-split', soc: 26_400, makespan: 9_800, lowerBound: 25_000 });
    expect(shown(column(cols, 'socSteps'), classic)).toBe('20');
    expect(shown(column(cols, 'socSteps'), weighted)).toBe('');
    expect(shown(column(cols, 'makespanSteps'), weighted)).toBe('');
    expect(shown(column(cols, 'lowerBoundSteps'), classic)).toBe('19');
    expect(shown(column(cols, 'lowerBoundMs'), classic)).toBe('');
    expect(shown(column(cols, 'lowerBoundMs'), weighted)).toBe('25,000');
  });

  it('labels execution figures as execution success, with the Wilson interval recomputed for rows stored without one', () => {
    const success = column(cols, 'success-open-loop');
    expect(success.headerName).toBe('Execution success rate, open-loop (%, 95 % CI)');
    // 34 of 40 collision-free: Wilson [0.709, 0.929] (checked by hand: centre 0.819, half-width 0.110).
    const [lo, hi] = wilsonInterval(34, 40);
    expect(lo).toBeCloseTo(0.709, 3);
    expect(hi).toBeCloseTo(0.929, 3);
    expect(shown(success, row({ executions: [execution({})] }))).toBe('85 % (71–93 %) of 40 runs');
    expect(shown(column(cols, 'success-dependency-gated'), row({ executions: [execution({})] }))).toBe('');
  });

  it('prefers the interval stored with the result, and shows a mean makespan without an interval when none was stored', () => {
    const stored = execution({ ci95: { successRate: [0.7, 0.95], realisedMakespanMs: [10_000, 10_500], finishSpreadMs: null } });
    expect(shown(column(cols, 'success-open-loop'), row({ executions: [stored] }))).toBe('85 % (70–95 %) of 40 runs');
    expect(shown(column(cols, 'realised-open-loop'), row({ executions: [stored] }))).toBe('10,250 (10,000–10,500)');
    expect(shown(column(cols, 'realised-open-loop'), row({ executions: [execution({ ci95: null })] }))).toBe('10,250');
    expect(column(cols, 'realised-open-loop').headerName).toBe('Realised makespan, open-loop (ms, mean, 95 % CI)');
  });

  it('names the variant of the plan model from the sweep definition', () => {
    const spec = { model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden' } as unknown as ModelSpec;
    expect(modelVariantLabel(spec, 'classic')).toBe('classic, following forbidden');
    expect(modelVariantLabel({ model: 'k-robust', k: 2, startHeading: 'free', switches: {} } as ModelSpec, 'k-robust')).toBe('k-robust k=2');
    expect(modelVariantLabel(undefined, 'classic')).toBe('classic');
  });

  it('names w of a bounded spec and shows the gap in %, 0 as proven optimal (issue 15, item 1)', () => {
    const bounded = { model: 'classic', startHeading: 'free', switches: {}, suboptimality: 1.5 } as unknown as ModelSpec;
    expect(modelVariantLabel(bounded, 'classic')).toBe('classic, w = 1.5');
    expect(modelVariantLabel({ ...bounded, suboptimality: 1 } as ModelSpec, 'classic')).toBe('classic');
    expect(shown(column(cols, 'gap'), row({ soc: 21, lowerBound: 20, gap: 0.05, suboptimality: 1.5 }))).toBe('5.0');
    expect(shown(column(cols, 'gap'), row({ soc: 20, lowerBound: 20, gap: 0 }))).toBe('0 (proven optimal)');
    expect(shown(column(cols, 'gap'), row({ status: 'timeout', soc: null, gap: null }))).toBe('');
    expect(shown(column(cols, 'suboptimality'), row({ suboptimality: 1.25 }))).toBe('1.25');
  });

  it('tells specs that differ only in CBS switches apart, by the switches\' labels (issue 14, item 11)', () => {
    const off = { model: 'classic', startHeading: 'free', switches: { wdg: false, disjointSplitting: false, bypass: true }, following: 'forbidden' } as unknown as ModelSpec;
    expect(modelVariantLabel(off, 'classic')).toBe('classic, following forbidden, without WDG heuristic, Disjoint splitting');
  });
});

describe('sweep grid figures', () => {
  it('cuts long map and scenario names in the middle, keeping the end, with the full name on hover (issue 14, item 10)', () => {
    const cols = sweepGridColumns([]);
    const scenario = cols.find((c) => c.field === 'scenarioName') as ColDef<SweepResultRow> & { valueFormatter: (p: { value: string }) => string; tooltipValueGetter: (p: { value: string }) => string | undefined };
    const long = 'warehouse-large-10-20-even-scen-25';
    const shown = scenario.valueFormatter({ value: long });
    expect(shown).toBe('warehouse…0-even-scen-25'); // 23 kept: 9 of the start, 14 of the end
    expect([...shown]).toHaveLength(24);
    expect(scenario.tooltipValueGetter({ value: long })).toBe(long);
    expect(scenario.valueFormatter({ value: 'quay-01' })).toBe('quay-01');
    const map = cols.find((c) => c.field === 'mapName') as { valueFormatter?: unknown };
    expect(typeof map.valueFormatter).toBe('function');
  });

  it('makes the plan model column wide enough for "classic, following forbidden", capped, with the label on hover', () => {
    const plain = { model: 'classic' } as ModelSpec;
    const forbidden = { model: 'classic', following: 'forbidden' } as ModelSpec;
    const label = modelVariantLabel(forbidden, 'classic');
    expect(label).toBe('classic, following forbidden');
    // ≈ 7.5 px a character of the 13 px body font plus 36 px padding (common practice), as for the name columns.
    expect(modelColumnWidth([plain, forbidden])).toBeGreaterThanOrEqual(Math.ceil(label.length * 7.5) + 36);
    expect(modelColumnWidth([plain])).toBeLessThan(modelColumnWidth([plain, forbidden]));
    const many = { model: 'classic', following: 'forbidden', switches: Object.fromEntries(CBS_SWITCH_NAMES.map((n) => [n, false])) } as unknown as ModelSpec;
    expect(modelColumnWidth([many])).toBe(MODEL_COLUMN_MAX_PX);
    const col = sweepGridColumns([], [forbidden]).find((c) => c.colId === 'model') as ColDef<SweepResultRow> & { tooltipValueGetter: (p: { value: string }) => string | undefined };
    expect(col.width).toBe(modelColumnWidth([forbidden]));
    expect(col.tooltipValueGetter({ value: label })).toBe(label);
  });

  it('keeps rates near the ends distinguishable from 0 and 100 %', () => {
    expect(formatRateWithInterval(0.998, [0.99, 1], 500)).toBe('99.8 % (99–100 %) of 500 runs');
    expect(formatRateWithInterval(0.002, null, 500)).toBe('0.2 % of 500 runs');
  });

  it('has no interval when a summary has no runs', () => {
    expect(successRateInterval({ successRate: 0, runs: 0 })).toBeNull();
    expect(successRateInterval({ successRate: 1, runs: 20 })).toEqual(wilsonInterval(20, 20));
  });
});
