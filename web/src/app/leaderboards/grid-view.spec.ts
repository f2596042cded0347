/** The grid's sort and filter models map onto a board view and back, and the URL round-trips the view. */
import { ENTRY_COLUMNS, parseView, viewToParams } from '@shared/leaderboards';
import { filtersFromGrid, filtersToGrid, withGridState } from './grid-view';

describe('grid view mapping', () => {
  it('turns grid filters into API filters, dropping what the API cannot take', () => {
    const filters = filtersFromGrid({
      agents: { filterType: 'number', type: 'greaterThanOrEqual', filter: 10 },
      map: { filterType: 'text', type: 'contains', filter: 'depot' },
      model: { filterType: 'text', type: 'equals', filter: 'k-robust' },
      status: { filterType: 'text', type: 'equals', filter: 'nonsense' },
      gap: { filterType: 'number', type: 'blank' },
      soc: { filterType: 'number', type: 'inRange', filter: 1 },
    }, ENTRY_COLUMNS);
    expect(filters).toEqual([
      { column: 'agents', op: 'gte', value: '10' },
      { column: 'gap', op: 'blank', value: '' },
      { column: 'map', op: 'has', value: 'depot' },
      { column: 'model', op: 'in', value: 'k-robust' },
    ]);
  });

  it('gives back the same grid filters it read', () => {
    const grid = {
      agents: { filterType: 'number', type: 'lessThan', filter: 5 },
      solver: { filterType: 'text', type: 'equals', filter: 'Quarterturn CBS 0.1.0' },
    };
    expect(filtersToGrid(filtersFromGrid(grid, ENTRY_COLUMNS), ENTRY_COLUMNS)).toEqual(grid);
  });

  it('keeps sort and filters through the URL parameters of a shared link', () => {
    const view = withGridState(parseView({ cols: 'map,agents,socSteps' }), [{ colId: 'socSteps', sort: 'desc' }, { colId: 'agents', sort: 'asc' }],
      { agents: { filterType: 'number', type: 'greaterThan', filter: 3 } }, ENTRY_COLUMNS);
    const params = viewToParams(view);
    expect(params).toEqual({ cols: 'map,agents,socSteps', sort: '-socSteps,agents', 'agents.gt': '3' });
    expect(parseView(params)).toEqual(view);
  });
});
