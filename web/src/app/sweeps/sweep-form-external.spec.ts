/** External solvers in the sweep form (issue 16, item 4): picker choices and the specs they add. */
import { definitionFromForm, externalChoices, externalSpecOf, SWEEP_FORM_DEFAULTS } from './sweep-form-rules';

const SOLVER = { name: 'prioritised-astar', version: '1.0.0', models: ['classic', 'k-robust'] as const, workers: ['host:1'] };

describe('external solvers in the sweep form', () => {
  it('offers one choice per solver and plan model, and says when no worker has the solver', () => {
    expect(externalChoices([{ ...SOLVER, models: [...SOLVER.models] }])).toEqual([
      { key: 'prioritised-astar@1.0.0:classic', label: 'prioritised-astar 1.0.0: classic' },
      { key: 'prioritised-astar@1.0.0:k-robust', label: 'prioritised-astar 1.0.0: k-robust' },
    ]);
    expect(externalChoices([{ ...SOLVER, models: ['classic'], workers: [] }])[0].label).toBe('prioritised-astar 1.0.0: classic (no worker has it now: its runs would wait)');
  });

  it('adds the external specs after the built-in ones, with start heading and k but no w, following rule or switches', () => {
    const out = definitionFromForm({
      ...SWEEP_FORM_DEFAULTS, name: 'mixed', instanceSetId: 2, models: ['classic'], k: 2, startHeading: 'E', suboptimality: '1, 1.5', switchesOff: ['wdg'],
      following: 'both', externalSolvers: ['prioritised-astar@1.0.0:classic', 'prioritised-astar@1.0.0:k-robust'],
    });
    if (!('definition' in out)) throw new Error(out.problem);
    const external = out.definition.models.filter((m) => m.externalSolver);
    expect(out.definition.models).toHaveLength(4 + 2);
    expect(external).toEqual([
      { model: 'classic', startHeading: 'E', switches: {}, externalSolver: { name: 'prioritised-astar', version: '1.0.0' } },
      { model: 'k-robust', k: 2, startHeading: 'E', switches: {}, externalSolver: { name: 'prioritised-astar', version: '1.0.0' } },
    ]);
  });

  it('reads only well-formed keys', () => {
    expect(externalSpecOf('x@1:nonsense', SWEEP_FORM_DEFAULTS)).toBeNull();
    expect(externalSpecOf('no-at:classic', SWEEP_FORM_DEFAULTS)).toBeNull();
    expect(externalSpecOf('x@1:weighted-split', SWEEP_FORM_DEFAULTS)).toEqual({ model: 'weighted-split', startHeading: 'free', externalSolver: { name: 'x', version: '1' } });
  });
});

describe('external solvers in the results grid', () => {
  it('names the solver in the plan model column and adds CPU time and peak memory only when a spec is external', async () => {
    const { modelVariantLabel, sweepGridColumns } = await import('./sweep-grid-columns');
    const external = { model: 'classic' as const, startHeading: 'free' as const, switches: {}, externalSolver: { name: 'prioritised-astar', version: '1.0.0' } };
    expect(modelVariantLabel(external, 'classic')).toBe('classic, by prioritised-astar@1.0.0');
    const ids = (cols: ReturnType<typeof sweepGridColumns>) => cols.map((c) => c.colId ?? c.field);
    expect(ids(sweepGridColumns([], [{ model: 'classic', startHeading: 'free', switches: {} }]))).not.toContain('cpuTimeMs');
    const cols = sweepGridColumns([], [external]);
    expect(ids(cols)).toEqual(expect.arrayContaining(['cpuTimeMs', 'peakMemoryMb']));
    const peak = cols.find((c) => c.colId === 'peakMemoryMb');
    const getter = peak?.valueGetter as (p: { data?: { peakMemoryKb: number | null } }) => number | null;
    expect(getter({ data: { peakMemoryKb: 2048 } })).toBe(2);
    expect(getter({ data: { peakMemoryKb: null } })).toBeNull();
  });
});
