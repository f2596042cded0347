/**
 * 95 % intervals where the board compares plan models and summarises them (issue 12, item 5), on
 * a real PostgreSQL: each model cell of an execution figure in the comparison layout carries its
 * interval (Wilson from that plan's rate × runs; the stored interval of a mean, or none), on the
 * rows and in every export format; the per-model summary and the execution success chart give
 * the mean execution success rate a Student t interval over instances. Expected intervals are
 * computed here by shared/confidence-interval.ts from the seeded figures, not copied from output.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { meanInterval, wilsonInterval, type Interval95 } from '@shared/confidence-interval';
import type { ExportJson } from '@shared/exports-json';
import type { LeaderboardCharts, LeaderboardPage, LeaderboardSummary } from '@shared/leaderboards';
import { parseView } from '@shared/leaderboards';
import { compareQueries } from '../../api/src/leaderboards/compare-query';
import { insertResults, startBoardWorld, type BoardWorld, type SeedResult } from './leaderboard-support';

const hasPdflatex = spawnSync('pdflatex', ['--version']).status === 0;

/** The t interval of a mean of rates, cut to [0, 1] as the board cuts it. */
const rateMean = (values: number[]): Interval95 => {
  const ci = meanInterval(values) as Interval95;
  return [Math.max(0, ci[0]), Math.min(1, ci[1])];
};

describe('95 % intervals in the comparison layout, the per-model summary and the charts', () => {
  let world: BoardWorld;

  beforeAll(async () => {
    world = await startBoardWorld();
    const [a, b] = world.scenarios;
    const base = { agents: 3, profile: 0, status: 'solved', soc: 6, lowerBound: 4, runtimeMs: 5, executableAtNominal: true } as const;
    const results: SeedResult[] = [
      { ...base, scenarioId: a, model: 'classic', tiMakespanMs: 4000, seed: 1, openLoop: { success: 0.7, runs: 10, realised: 4100, spread: 100, realisedCi95: [4000, 4200], spreadCi95: [80, 120] } },
      // Collides at nominal times; its execution was stored before intervals were kept.
      { ...base, scenarioId: a, model: 'orientation-split', tiMakespanMs: 3000, seed: 2, executableAtNominal: false, openLoop: { success: 0, runs: 10, realised: 3100, spread: 90 } },
      { ...base, scenarioId: a, model: 'weighted-split', soc: 5200, tiMakespanMs: 3600, lowerBound: 5000, seed: 3, openLoop: { success: 0.95, runs: 40, realised: 3700, spread: 60, realisedCi95: [3650, 3750], spreadCi95: [50, 70] } },
      { ...base, scenarioId: a, model: 'k-robust', k: 1, tiMakespanMs: 4400, seed: 4, openLoop: { success: 1, runs: 20, realised: 4500, spread: 40 } },
      { ...base, scenarioId: a, model: 'k-robust', k: 2, tiMakespanMs: 4800, seed: 5, openLoop: { success: 0.5, runs: 4, realised: 4900, spread: 30, realisedCi95: [4700, 5100] } },
      // Never replayed: a value-less cell has no interval.
      { ...base, scenarioId: a, model: 'uniform-duration', tiMakespanMs: 3500, seed: 6 },
      { ...base, scenarioId: b, model: 'classic', tiMakespanMs: 4000, seed: 7, openLoop: { success: 0.4, runs: 5, realised: 4300, spread: 150 } },
      { ...base, scenarioId: b, agents: 2, model: 'classic', tiMakespanMs: 3000, seed: 8, openLoop: { success: 0.9, runs: 10, realised: 3200, spread: 70 } },
    ];
    await insertResults(world.lib, results);
  }, 60_000);
  afterAll(() => world?.lib.close());

  const get = async <T>(path: string): Promise<T> => {
    const res = await world.visitor.request(path);
    expect(res.status).toBe(200);
    return (await res.json()) as T;
  };
  const exported = async (q: string): Promise<string> => {
    const res = await world.visitor.request(`/api/exports?${q}`);
    expect(res.status).toBe(200);
    return res.text();
  };
  const rowOfA = (page: LeaderboardPage) => page.rows.find((r) => r.scenarioId === world.scenarios[0] && r.agents === 3);

  it('gives each model cell of an execution success rate its Wilson interval from that plan\'s rate × runs', async () => {
    const page = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=successOpenLoop');
    expect(rowOfA(page)?.intervalsByColumn).toEqual({
      m_classic: wilsonInterval(7, 10), m_uniform_duration: null, m_orientation_split: wilsonInterval(0, 10),
      m_weighted_split: wilsonInterval(38, 40), m_k_robust: wilsonInterval(20, 20),
    });
    // Another k reads that variant's entry.
    const k2 = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=successOpenLoop&k=2');
    expect(rowOfA(k2)?.intervalsByColumn?.['m_k_robust']).toEqual(wilsonInterval(2, 4));
    // Only the shown model columns get one.
    const two = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=successOpenLoop&cols=scenario,m_classic');
    expect(rowOfA(two)?.intervalsByColumn).toEqual({ m_classic: wilsonInterval(7, 10) });
  });

  it('looks the interval sources up for the page\'s rows only, never while finding the window or counting', () => {
    const { page, count } = compareQueries(parseView({ layout: 'compare', metric: 'successOpenLoop' }), null, {}, { start: 0, end: 100 });
    const windowEnd = page.sql.indexOf('FROM w JOIN');
    // The five model entries are joined after the window (at most `end − start` rows), by the entries' unique key.
    expect(page.sql.slice(windowEnd).match(/LEFT JOIN leaderboard_entries i_m_/g)).toHaveLength(5);
    expect(page.sql.slice(0, windowEnd)).not.toContain('leaderboard_entries');
    expect(count.sql).not.toContain('leaderboard_entries');
    const plan = compareQueries(parseView({ layout: 'compare', metric: 'tiMakespanMs' }), null, {}, { start: 0, end: 100 });
    expect(plan.page.sql).not.toContain('leaderboard_entries');
  });

  it('gives a mean its stored interval, none when not stored, and plan figures none at all', async () => {
    const realised = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=realisedOpenLoop');
    expect(rowOfA(realised)?.intervalsByColumn).toEqual({
      m_classic: [4000, 4200], m_uniform_duration: null, m_orientation_split: null, m_weighted_split: [3650, 3750], m_k_robust: null,
    });
    const spread = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=spreadOpenLoop');
    expect(rowOfA(spread)?.intervalsByColumn?.['m_weighted_split']).toEqual([50, 70]);
    const plan = await get<LeaderboardPage>('/api/leaderboards/rows?layout=compare&metric=tiMakespanMs');
    expect(plan.rows.length).toBeGreaterThan(0);
    expect(plan.rows.every((r) => r.intervalsByColumn === undefined)).toBe(true);
  });

  it('exports the intervals: CSV and JSON in low / high columns, Markdown and LaTeX as "x [lo, hi]", the method in the caption', async () => {
    const q = 'layout=compare&metric=successOpenLoop&scenario.has=tiny-a&agents.eq=3';
    const [lo, hi] = wilsonInterval(7, 10);
    const doc = JSON.parse(await exported(`format=json&${q}`)) as ExportJson;
    expect(doc.rows).toHaveLength(1);
    expect(doc.rows[0]).toMatchObject({ m_classic: 0.7, m_classic_lo: lo, m_classic_hi: hi, m_uniform_duration: null, m_uniform_duration_lo: null });
    expect(doc.caption).toContain('Wilson score interval');

    // Without the `#` comment lines (provenance, caption, caution; issue 14, item 9).
    const csv = (await exported(`format=csv&${q}`)).split('\r\n').filter((l) => !l.startsWith('#'));
    expect(csv[0]).toContain('classic,"classic, 95 % CI low","classic, 95 % CI high",uniform-duration');
    expect(csv[1]).toContain(`,0.7,${lo},${hi},`);

    const md = (await exported(`format=markdown&${q}`)).replace(/^<!--[\s\S]*?-->\n\n/, '').split('\n');
    const line = md.find((l) => l.startsWith('| ') && l.includes('tiny-a'));
    const w = (x: number, y: number) => wilsonInterval(x, y).map((v) => v.toFixed(3)).join(', ');
    // Columns: map, scenario, agents, profile, then the five models; k-robust (all 20 runs) is the best executable value.
    expect(line?.split(' | ').slice(4)).toEqual([
      `0.70 \\[${w(7, 10)}\\]`, '–', `0.00 \\[${w(0, 10)}\\] †`, `0.95 \\[${w(38, 40)}\\]`, `**1.00 \\[${w(20, 20)}\\]** |`,
    ]);
    expect(md[0]).toContain('Markdown and LaTeX: value [low, high]'.replace(/\[/g, '\\[').replace(/\]/g, '\\]'));

    const tex = await exported(`format=latex&${q}`);
    expect(tex).toContain(`0.70 {[}${w(7, 10)}{]}`);
    expect(tex).toContain(`\\textbf{1.00 {[}${w(20, 20)}{]}}`);

    const realisedMd = await exported('format=markdown&layout=compare&metric=realisedOpenLoop&scenario.has=tiny-a&agents.eq=3');
    expect(realisedMd).toContain('4100 \\[4000, 4200\\]');
    expect(realisedMd).toContain('3100 \\[interval not stored\\] †');
    expect(realisedMd.replace(/^<!--[\s\S]*?-->\n\n/, '').split('\n')[0]).toContain('Student t interval of the mean');
  });

  // Both captions name the t method (mean ± t(0.975, n−1)·s/√n), whose − and √ pdflatex's utf8 input does not know unescaped.
  (hasPdflatex ? it.each : it.skip.each)([
    ['the comparison table with its intervals', 'layout=compare&metric=realisedOpenLoop', '{[}interval not stored{]}'],
    ['the entries table with interval columns', 'cols=model,successOpenLoop,successOpenLoopLo,successOpenLoopHi,realisedOpenLoop,realisedOpenLoopLo,realisedOpenLoopHi', 'Student t interval'],
  ])(`compiles %s${hasPdflatex ? '' : ' (skipped: pdflatex is not installed)'}`, async (_name, q, expected) => {
    const tex = await exported(`format=latex&${q}`);
    expect(tex).toContain(expected);
    const dir = mkdtempSync(join(tmpdir(), 'qt-latex-intervals-'));
    try {
      writeFileSync(join(dir, 'table.tex'), `\\documentclass{article}\n\\usepackage[T1]{fontenc}\n\\usepackage[utf8]{inputenc}\n\\usepackage{booktabs,longtable,array,graphicx}\n\\usepackage[margin=5mm,landscape]{geometry}\n\\begin{document}\n\\tiny\n${tex}\\end{document}\n`);
      const run = spawnSync('pdflatex', ['-interaction=nonstopmode', '-halt-on-error', 'table.tex'], { cwd: dir, encoding: 'utf8', timeout: 60_000 });
      expect({ status: run.status, log: run.status === 0 ? '' : run.stdout.slice(-1500) }).toEqual({ status: 0, log: '' });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 90_000);

  it('gives the per-model mean execution success rate a t interval over its solved instances', async () => {
    const summary = await get<LeaderboardSummary>('/api/leaderboards/summary?bestAmong=all');
    const classic = summary.models.find((m) => m.model === 'classic');
    expect(classic?.meanSuccess['open-loop']).toBeCloseTo((0.7 + 0.4 + 0.9) / 3, 12);
    expect(classic?.meanSuccessInstances['open-loop']).toBe(3);
    const [lo, hi] = classic?.meanSuccessCi95['open-loop'] ?? [NaN, NaN];
    const expected = rateMean([0.7, 0.4, 0.9]);
    expect(lo).toBeCloseTo(expected[0], 9);
    expect(hi).toBeCloseTo(expected[1], 9);
    // One replayed instance: a mean, but no interval; none replayed: neither.
    const weighted = summary.models.find((m) => m.model === 'weighted-split');
    expect([weighted?.meanSuccess['open-loop'], weighted?.meanSuccessCi95['open-loop'], weighted?.meanSuccessInstances['open-loop']]).toEqual([0.95, null, 1]);
    const uniform = summary.models.find((m) => m.model === 'uniform-duration');
    expect([uniform?.meanSuccess['open-loop'], uniform?.meanSuccessCi95['open-loop'], uniform?.meanSuccessInstances['open-loop']]).toEqual([null, null, 0]);
    expect(classic?.meanSuccessCi95['lockstep']).toBeNull();
  });

  it('gives each point of the execution success chart the t interval of its mean', async () => {
    const charts = await get<LeaderboardCharts>('/api/leaderboards/charts?policy=open-loop');
    const classic = charts.executionSuccessByAgents.find((s) => s.model === 'classic');
    expect(classic?.points).toEqual([[2, 0.9], [3, (0.7 + 0.4) / 2]]);
    expect(classic?.intervals?.[0]).toBeNull();
    const expected = rateMean([0.7, 0.4]);
    expect(classic?.intervals?.[1]?.[0]).toBeCloseTo(expected[0], 9);
    expect(classic?.intervals?.[1]?.[1]).toBeCloseTo(expected[1], 9);
    expect(charts.executionSuccessByAgents.every((s) => s.intervals?.length === s.points.length)).toBe(true);
  });
});
