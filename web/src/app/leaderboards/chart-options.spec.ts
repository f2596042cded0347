/** Chart options name the robot profile and policy, and carry one series per plan model with its colour. */
import type { LeaderboardCharts } from '@shared/leaderboards';
import { CHART_IDS, chartOption, PLAN_CHARTS } from './chart-options';
import { MODEL_COLOURS } from './model-colours';

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
  it.each(CHART_IDS.filter((id) => !PLAN_CHARTS.includes(id)))('the %s chart says which robot profile and policy produced it', (id) => {
    const option = chartOption(id, data) as { title: { subtext: string } };
    expect(option.title.subtext).toBe('Robot profile: forward 1000 ms, quarter turn 600 ms · execution policy lockstep');
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

  it('names series by model and variant in the model colours', () => {
    const series = (chartOption('success', data) as { series: { name: string; color: string }[] }).series;
    expect(series.map((s) => [s.name, s.color])).toEqual([['classic', MODEL_COLOURS.classic], ['k-robust (k=1)', MODEL_COLOURS['k-robust']]]);
  });

  it('keeps zero solve times on the log axis of the cactus plot', () => {
    const series = (chartOption('cactus', data) as { series: { data: number[][] }[] }).series;
    expect(series[0].data[0]).toEqual([0.01, 1]);
  });
});
