/**
 * Model cells of a comparison of execution figures show their 95 % interval in a compact form
 * (issue 12, item 5), name the method in their tooltip, and keep the best / colliding rules.
 */
import { wilsonInterval } from '@shared/confidence-interval';
import { compareColumns, parseView, type LeaderboardPage } from '@shared/leaderboards';
import { gridRows } from './grid-rows';
import { cellWithInterval, gridColumns, replayColumn } from './leaderboard-columns';

describe('model cells with a 95 % interval', () => {
  it('shows a rate as whole percent with its bounds rounded outwards', () => {
    // Wilson for 7 of 10 is about [0.3968, 0.8922]: 39.68 → 39, 89.22 → 90.
    const [lo, hi] = wilsonInterval(7, 10);
    expect(cellWithInterval('rate', 0.7, lo, hi)).toBe('70 % [39, 90]');
    expect(cellWithInterval('rate', 0, ...wilsonInterval(0, 10))).toBe('0 % [0, 28]');
    expect(cellWithInterval('rate', 1, 1 - 1e-12, 1)).toBe('100 % [100, 100]');
  });

  it('shows a mean without digit grouping, and says when its interval was not stored', () => {
    expect(cellWithInterval('mean', 14100, 14000, 14250.4, 0)).toBe('14100 [14000, 14250]');
    expect(cellWithInterval('mean', 3100, null, null, 0)).toBe('3100 [interval not stored]');
    expect(cellWithInterval('mean', null, null, null, 0)).toBe('–');
  });

  it('formats grid cells from the interval fields of the rows, with the method in the tooltip', () => {
    const columns = compareColumns('successOpenLoop');
    const page: LeaderboardPage = {
      rowCount: 1, columns, profiles: {},
      rows: [{
        id: '1:3:a', scenarioId: 1, agents: 3, profileHash: 'a',
        cells: { map: 'm', scenario: 's', agents: 3, profile: 'p', m_classic: 0.7, m_uniform_duration: null, m_orientation_split: 0, m_weighted_split: 0.95, m_k_robust: null },
        isExecutableAtNominalByColumn: { m_classic: true, m_uniform_duration: null, m_orientation_split: false, m_weighted_split: true, m_k_robust: null },
        intervalsByColumn: { m_classic: wilsonInterval(7, 10), m_uniform_duration: null, m_orientation_split: wilsonInterval(0, 10), m_weighted_split: null, m_k_robust: null },
      }],
    };
    const [row] = gridRows(page, parseView({ layout: 'compare', metric: 'successOpenLoop' }));
    // Best among executable plans: weighted-split; the colliding orientation-split is never best.
    expect([row.__best, row.__colliding, row.__intervals]).toEqual(['m_weighted_split', 'm_orientation_split', 'yes']);
    const defs = gridColumns(columns, [], 'rate');
    const text = (id: string) => {
      const def = defs.find((d) => d.colId === id);
      return (def?.valueFormatter as (p: unknown) => string)({ value: row[id], data: row });
    };
    expect([text('m_classic'), text('m_orientation_split'), text('m_weighted_split'), text('m_k_robust')])
      .toEqual(['70 % [39, 90]', '0 % [0, 28]', '95 % [interval not stored]', '–']);
    const tip = (id: string) => (defs.find((d) => d.colId === id)?.tooltipValueGetter as (p: unknown) => string | undefined)({ data: row });
    const [lo, hi] = wilsonInterval(7, 10);
    expect(tip('m_classic')).toContain(`95 % interval ${lo.toFixed(3)} to ${hi.toFixed(3)}: Wilson score interval`);
    expect(tip('m_orientation_split')).toContain('collides at nominal times');
    expect(tip('m_k_robust')).toBeUndefined();
  });

  it('names a mean\'s stored interval in ms in the tooltip', () => {
    const defs = gridColumns(compareColumns('realisedOpenLoop'), [], 'mean');
    const tip = defs.find((d) => d.colId === 'm_classic')?.tooltipValueGetter as (p: unknown) => string | undefined;
    expect(tip({ data: { m_classic: 4100, m_classic__lo: 4000, m_classic__hi: 4200.4 } })).toContain('95 % interval 4000 to 4200: Student t interval of the mean');
    expect(tip({ data: { m_classic: 4100, m_classic__lo: null, m_classic__hi: null } })).toBe('[interval not stored]: executions recorded before intervals were kept.');
  });

  it('cuts long map and scenario names in the middle, keeping the end, with the full name on hover (issue 14, item 10)', () => {
    const cols = gridColumns(compareColumns('tiMakespanMs').filter((c) => c.id === 'map' || c.id === 'scenario'), []);
    expect(cols).toHaveLength(2);
    const long = 'warehouse-large-10-20-random-scen-17';
    for (const col of cols) {
      const shown = (col.valueFormatter as (p: { value: string }) => string)({ value: long });
      expect(shown).toBe('warehouse-…20-random-scen-17'); // 27 kept: 10 of the start, 17 of the end
      expect([...shown]).toHaveLength(28);
      expect((col.tooltipValueGetter as (p: { value: string }) => string | undefined)({ value: long })).toBe(long);
    }
  });

  it('leaves plan figures without intervals', () => {
    const defs = gridColumns(compareColumns('tiMakespanMs'), []);
    const classic = defs.find((d) => d.colId === 'm_classic');
    expect((classic?.valueFormatter as (p: unknown) => string)({ value: 4000.4, data: {} })).toBe('4,000');
  });
});

describe('the replay link of an entries row', () => {
  const page = (fieldRuns?: number): LeaderboardPage => ({
    rows: [{ id: '7', scenarioId: 1, agents: 4, profileHash: 'a'.repeat(16), resultId: 12, hasPlan: true, ...(fieldRuns === undefined ? {} : { fieldRuns }), cells: { model: 'classic' } }],
    rowCount: 1, profiles: {}, columns: [],
  });
  const render = (p: LeaderboardPage) => {
    const [row] = gridRows(p, parseView({ cols: 'model' }));
    return (replayColumn().cellRenderer as (q: { data?: unknown }) => HTMLAnchorElement)({ data: row });
  };

  it('counts the field runs attached to the result beside the link', () => {
    const link = render(page(3));
    expect(link.getAttribute('href')).toBe('/plans/view?result=12');
    expect(link.textContent).toBe('Replay · 3 field');
    expect(link.getAttribute('aria-label')).toBe('Replay result 12; 3 field runs');
    const plain = render(page(0));
    expect(plain.textContent).toBe('Replay');
    expect(render(page()).textContent).toBe('Replay');
  });
});
