/** Comparison rows mark the best plan model value the way exports bold it: never a plan that collides at nominal times, unless asked. */
import { compareColumns, parseView, type LeaderboardPage } from '@shared/leaderboards';
import { gridRows } from './grid-rows';
import { historyColumn, replayColumn, type GridRow } from './leaderboard-columns';

const columns = compareColumns('tiMakespanMs');
const page: LeaderboardPage = {
  rowCount: 2,
  columns,
  profiles: {},
  rows: [
    {
      id: '1:3:a', scenarioId: 1, agents: 3, profileHash: 'a',
      cells: { map: 'm', scenario: 's', agents: 3, profile: 'p', m_classic: 4000, m_uniform_duration: 3500, m_orientation_split: 3000, m_weighted_split: 3600, m_k_robust: null },
      isExecutableAtNominalByColumn: { m_classic: true, m_uniform_duration: null, m_orientation_split: false, m_weighted_split: true, m_k_robust: null },
    },
    {
      id: '2:3:a', scenarioId: 2, agents: 3, profileHash: 'a',
      cells: { map: 'm', scenario: 't', agents: 3, profile: 'p', m_classic: 4000, m_uniform_duration: 4000, m_orientation_split: null, m_weighted_split: 4100, m_k_robust: 5000 },
      isExecutableAtNominalByColumn: { m_classic: true, m_uniform_duration: true, m_orientation_split: null, m_weighted_split: true, m_k_robust: true },
    },
  ],
};

describe('grid rows of a comparison page', () => {
  it('marks the best executable value and the colliding plans', () => {
    const rows = gridRows(page, parseView({ layout: 'compare' }));
    expect(rows.map((r) => [r.__best, r.__colliding])).toEqual([['m_uniform_duration', 'm_orientation_split'], ['m_classic,m_uniform_duration', '']]);
  });

  it('marks the best of all plans when the view asks for all', () => {
    const rows = gridRows(page, parseView({ layout: 'compare', bestAmong: 'all' }));
    expect(rows.map((r) => r.__best)).toEqual(['m_orientation_split', 'm_classic,m_uniform_duration']);
  });

  it('keeps entry rows as they are, with their result id', () => {
    const entries: LeaderboardPage = { ...page, rows: [{ id: '9', scenarioId: 1, agents: 3, profileHash: 'a', resultId: 42, cells: { model: 'classic' }, isExecutableAtNominal: false }] };
    expect(gridRows(entries, parseView({}))).toEqual([{ model: 'classic', __id: '9', __resultId: 42 }]);
  });

  it('offers Replay only on rows with a plan: a time-limit row gets no link (issue 14, item 10)', () => {
    const row = { scenarioId: 1, agents: 3, profileHash: 'a', isExecutableAtNominal: null };
    const entries: LeaderboardPage = { ...page, rows: [
      { ...row, id: '9', resultId: 42, hasPlan: true, cells: { status: 'solved' } },
      { ...row, id: '10', resultId: 43, hasPlan: false, cells: { status: 'timeout' } },
    ] };
    const rows = gridRows(entries, parseView({}));
    const render = replayColumn().cellRenderer as (p: { data?: GridRow }) => HTMLElement | string;

    expect(rows).toHaveLength(2);
    expect((render({ data: rows[0] }) as HTMLAnchorElement).getAttribute('href')).toBe('/plans/view?result=42');
    expect(render({ data: rows[1] })).toBe('');
  });

  it('links every entry row to its history by the row key, a time-limit row too (issue 16, item 5)', () => {
    const row = { scenarioId: 7, agents: 12, profileHash: '3f9a0c1d2e4b5a69', isExecutableAtNominal: null, model: 'k-robust' as const, variant: 'k=2 w=1.5' };
    const entries: LeaderboardPage = { ...page, rows: [{ ...row, id: '10', resultId: 43, hasPlan: false, cells: { status: 'timeout' } }] };
    const [gridRow] = gridRows(entries, parseView({}));
    const link = (historyColumn().cellRenderer as (p: { data?: GridRow }) => HTMLAnchorElement)({ data: gridRow });
    const url = new URL(link.getAttribute('href') as string, 'http://x');

    expect(url.pathname).toBe('/leaderboards/history');
    expect(Object.fromEntries(url.searchParams)).toEqual({ scenarioId: '7', agents: '12', model: 'k-robust', variant: 'k=2 w=1.5', profile: '3f9a0c1d2e4b5a69' });
    expect(link.tabIndex).toBe(-1);
  });
});
