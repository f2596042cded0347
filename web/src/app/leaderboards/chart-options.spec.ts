/** Chart options name the robot profile and policy, and carry one series per plan model with its colour. */
import type { LeaderboardCharts } from '@shared/leaderboards';
import { CHART_IDS, chartOption, legendRows, PLAN_CHARTS, plotTop } from './chart-options';
import { PLAN_MODELS } from '@shared/plan';
import { MODEL_COLOURS, MODEL_LINE_TYPES, MODEL_SYMBOLS, MODEL_VARIANT_SYMBOLS } from './model-colours';

const data: LeaderboardCharts = {
  profile: { hash: '0123456789abcdef', label: 'forward 1000 ms, quarter turn 600 ms', entries: 4 },
  policy: 'lockstep',
  successByAgents: [{ model: 'classic', variant: '', points: [[2, 1], [4, 0.5]] }, { model: 'k-robust', variant: 'k=1', points: [[2, 1]] }],
  executionSuccessByAgents: [],
  cactus: [{ model: 'classic', variant: '', points: [[0, 1], [12.5, 2]] }],
  computedVsRealised: [{ model: 'weighted-split', variant: '', points: [[4000, 4300]] }],
  spreadHistogram: [{ model: 'classic', variant: '', points: [[0, 3], [200, 1]] }],
  spreadBinMs: 200,
};

describe('chart options', () => {
  it.each(CHART_IDS.filter((id) => !PLAN_CHARTS.includes(id)))('the %s chart says which robot profile and policy produced it, and how it shows intervals', (id) => {
    const option = chartOption(id, data) as { title: { subtext: string } };
    const head = 'Robot profile: forward 1000 ms, quarter turn 600 ms · execution policy lockstep · ';
    expect(option.title.subtext.slice(0, head.length)).toBe(head);
    // Every chart of Monte Carlo figures states its 95 % interval, or why it draws none (issue 12, item 5).
    expect(option.title.subtext.slice(head.length)).toMatch(/95 % interval|carries no per-instance interval/);
  });

  it('draws a 95 % band around each execution success rate series, in the model colour, without tooltips', () => {
    const withCi: LeaderboardCharts = {
      ...data,
      executionSuccessByAgents: [
        { model: 'classic', variant: '', points: [[2, 0.9], [3, 0.55]], intervals: [null, [0.2, 0.9]] },
        { model: 'weighted-split', variant: '', points: [[3, 1]], intervals: [null] },
      ],
    };
    const option = chartOption('execution', withCi) as { title: { subtext: string }; series: { name: string; stack?: string; data: unknown[]; areaStyle?: { color: string }; tooltip?: { show: boolean } }[] };
    expect(option.title.subtext).toContain('Student t over those instances');
    // Two lines, then the low edge and the stacked width of classic's band; weighted-split has no interval, so no band.
    expect(option.series.map((s) => [s.name, s.stack ?? null])).toEqual([
      ['classic', null], ['weighted-split', null], ['classic', 'ci95 classic'], ['classic', 'ci95 classic'],
    ]);
    expect(option.series[2].data).toEqual([[2, null], [3, 0.2]]);
    const width = option.series[3].data as [number, number | null][];
    expect(width[0]).toEqual([2, null]);
    expect(width[1][1]).toBeCloseTo(0.7, 12);
    expect(option.series[3].areaStyle?.color).toBe(MODEL_COLOURS.classic);
    expect(option.series.slice(2).every((s) => s.tooltip?.show === false)).toBe(true);
  });

  it.each(PLAN_CHARTS)('the %s chart shows plan figures and names no execution policy', (id) => {
    const option = chartOption(id, data) as { title: { subtext: string } };
    expect(option.title.subtext).toBe('Robot profile: forward 1000 ms, quarter turn 600 ms · plan figures (no execution policy)');
  });

  it('never calls the solved rate a success rate, and names the execution success rate on its own chart', () => {
    const solved = chartOption('success', data) as { title: { text: string }; yAxis: { name: string } };
    const executed = chartOption('execution', data) as { title: { text: string }; yAxis: { name: string } };
    expect([solved.title.text, solved.yAxis.name]).toEqual(['Solved rate by agent count', 'solved rate']);
    expect(executed.yAxis.name).toBe('execution success rate');
    expect(executed.title.text).toContain('Execution success rate');
  });

  it('starts every plot below its wrapped subtitle, so the subtitle is never drawn over the plot (issue 14, item 10)', () => {
    let compared = 0;
    for (const id of CHART_IDS) {
      const o = chartOption(id, data) as { title: { subtext: string; subtextStyle: { width: number } }; grid: { top: number } };
      // Lines the subtitle wraps to at ~5.6 px per 11 px character, then 15 px per line under a 40 px title.
      const lines = Math.ceil((o.title.subtext.length * 5.6) / o.title.subtextStyle.width);
      expect(o.grid.top).toBeGreaterThanOrEqual(40 + 15 * lines);
      compared++;
    }
    expect(compared).toBe(CHART_IDS.length);
    expect(plotTop('x'.repeat(300))).toBeGreaterThan(plotTop('x'.repeat(50)));
  });

  it('wraps subtitle and legend to the width it is drawn at, so a phone-wide chart cuts nothing', () => {
    const narrow = chartOption('execution', data, 340) as { title: { subtextStyle: { width: number } }; grid: { top: number; bottom: number } };
    const wide = chartOption('execution', data, 900) as typeof narrow;
    expect(narrow.title.subtextStyle.width).toBeLessThanOrEqual(340 - 8);
    expect(wide.title.subtextStyle.width).toBeGreaterThan(narrow.title.subtextStyle.width);
    expect(narrow.grid.top).toBeGreaterThan(wide.grid.top);
    expect(narrow.grid.bottom).toBeGreaterThanOrEqual(wide.grid.bottom);
  });

  it('shows every plan model in a wrapping legend with room below the plot, never a pager that hides some (issue 14, item 10)', () => {
    const o = chartOption('success', data) as { legend: { type: string }; grid: { bottom: number } };
    expect(o.legend.type).toBe('plain');
    expect(legendRows(['classic'])).toBe(1);
    // Five long variant names (≈ 35 + 30 × 6.6 px each) do not fit one 540 px row.
    const long = ['classic (following forbidden)', 'uniform-duration (following forbidden)', 'orientation-split (following forbidden)', 'weighted-split', 'k-robust (k=1)'];
    expect(legendRows(long)).toBeGreaterThanOrEqual(3);
    expect(o.grid.bottom).toBeGreaterThanOrEqual(40 + 24 * legendRows((o as unknown as { series: { name: string }[] }).series.map((s) => s.name)));
  });

  it('names series by model and variant in the model colours', () => {
    const series = (chartOption('success', data) as { series: { name: string; color: string }[] }).series;
    expect(series.map((s) => [s.name, s.color])).toEqual([['classic', MODEL_COLOURS.classic], ['k-robust (k=1)', MODEL_COLOURS['k-robust']]]);
  });

  it('draws every finish spread bar right of the y-axis: at its bin middle, on an axis starting at 0 (issue 14, item 10)', () => {
    const option = chartOption('spread', data) as { xAxis: { min?: number }; series: { type: string; data: (readonly [number, number])[] }[] };
    expect(option.xAxis.min).toBe(0);
    // Bins [0, 200) and [200, 400) of the fixture hold 3 and 1 instances.
    expect(option.series.map((s) => [s.type, s.data])).toEqual([['bar', [[100, 3], [300, 1]]]]);
    // A bar spans its x ± half a bin, so its left edge is its bin's start, never below the axis at 0.
    expect(option.series[0].data.map(([x]) => x - data.spreadBinMs / 2)).toEqual([0, 200]);
  });

  it('keeps zero solve times on the log axis of the cactus plot', () => {
    const series = (chartOption('cactus', data) as { series: { data: number[][] }[] }).series;
    expect(series[0].data[0]).toEqual([0.01, 1]);
  });

  it('draws each plan model with its own marker and line dash, so the series read without colour (issue 18, item 6)', () => {
    const all = PLAN_MODELS.map((model) => ({ model, variant: '', points: [[2, 1], [4, 0.5]] as const }));
    const wide: LeaderboardCharts = { ...data, successByAgents: all, computedVsRealised: all, spreadHistogram: all };
    type S = { name: string; symbol?: string; lineStyle?: { type: unknown }; itemStyle?: { decal?: unknown } };
    const line = (chartOption('success', wide) as { series: S[] }).series;
    expect(line.map((s) => s.name)).toEqual([...PLAN_MODELS]);
    expect(new Set(line.map((s) => s.symbol)).size).toBe(PLAN_MODELS.length);
    expect(new Set(line.map((s) => JSON.stringify(s.lineStyle?.type))).size).toBe(PLAN_MODELS.length);
    line.forEach((s, i) => {
      expect(s.symbol).toBe(MODEL_SYMBOLS[PLAN_MODELS[i]]);
      expect(s.lineStyle?.type).toEqual(MODEL_LINE_TYPES[PLAN_MODELS[i]]);
    });
    const scatter = (chartOption('realised', wide) as { series: S[] }).series;
    expect(new Set(scatter.map((s) => s.symbol)).size).toBe(PLAN_MODELS.length);
    // Bars: a pattern on all but one model (plain bars are the fifth look).
    const bars = (chartOption('spread', wide) as { series: S[] }).series;
    expect(bars.filter((s) => s.itemStyle?.decal).length).toBe(PLAN_MODELS.length - 1);
    expect(new Set(bars.map((s) => JSON.stringify(s.itemStyle?.decal ?? null))).size).toBe(PLAN_MODELS.length);
  });

  it('draws a second variant of a model with the hollow marker, so "classic" and "classic (following forbidden)" differ', () => {
    const two: LeaderboardCharts = { ...data, successByAgents: [
      { model: 'classic', variant: '', points: [[2, 1]] }, { model: 'classic', variant: 'following forbidden', points: [[2, 1]] },
      { model: 'k-robust', variant: 'k=1', points: [[2, 1]] }, { model: 'k-robust', variant: 'k=2', points: [[2, 1]] },
    ] };
    const series = (chartOption('success', two) as { series: { name: string; symbol: string }[] }).series;
    expect(series.map((s) => [s.name, s.symbol])).toEqual([
      ['classic', 'circle'], ['classic (following forbidden)', 'emptyCircle'],
      ['k-robust (k=1)', MODEL_SYMBOLS['k-robust']], ['k-robust (k=2)', MODEL_VARIANT_SYMBOLS['k-robust']],
    ]);
  });
});
