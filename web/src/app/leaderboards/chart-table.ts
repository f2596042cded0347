/**
 * The data of one leaderboard chart as a table (the chart's "Show as table" alternative, issue 18,
 * item 5): one row per point of every series, the plan model (with variant) as the row header,
 * units in the column headers, and the 95 % interval where the chart draws a band. Pure.
 */
import type { ChartSeries, LeaderboardCharts } from '@shared/leaderboards';
import { seriesName, type ChartId } from './chart-options';

/** A chart's data as rows of text. */
export interface ChartTable {
  /** Column headers; the first is the row header's (plan model). */
  readonly columns: readonly string[];
  readonly rows: readonly { readonly series: string; readonly cells: readonly string[] }[];
}

const rate = (v: number): string => String(+v.toFixed(3));
const ms = (v: number): string => String(+v.toFixed(1));
const count = (v: number): string => String(v);

/** Rows of `series`: the row header and the two coordinates formatted by `fx` and `fy`. */
function rowsOf(series: readonly ChartSeries[], fx: (x: number) => string, fy: (y: number) => string, interval = false): ChartTable['rows'] {
  return series.flatMap((s) => s.points.map(([x, y], i) => {
    const cells = [fx(x), fy(y)];
    if (interval) {
      const ci = s.intervals?.[i] ?? null;
      cells.push(ci ? `${rate(ci[0])} to ${rate(ci[1])}` : 'none (fewer than 2 instances)');
    }
    return { series: seriesName(s), cells };
  }));
}

/** The table of chart `id`. */
export function chartTable(id: ChartId, data: LeaderboardCharts): ChartTable {
  switch (id) {
    case 'success':
      return { columns: ['Plan model', 'Agents', 'Solved rate (share of instances, 0–1)'], rows: rowsOf(data.successByAgents, count, rate) };
    case 'execution':
      return {
        columns: ['Plan model', 'Agents', 'Execution success rate (mean over solved instances, 0–1)', '95 % interval of the mean (0–1)'],
        rows: rowsOf(data.executionSuccessByAgents, count, rate, true),
      };
    case 'cactus':
      return { columns: ['Plan model', 'Solve time (ms)', 'Instances solved within it'], rows: rowsOf(data.cactus, ms, count) };
    case 'realised':
      return {
        columns: ['Plan model', 'Planned makespan, turn-inclusive (ms)', 'Realised makespan, mean over runs (ms)'],
        rows: rowsOf(data.computedVsRealised, ms, ms),
      };
    case 'spread':
      return {
        columns: ['Plan model', 'Finish spread, mean over runs (ms bin)', 'Instances'],
        rows: rowsOf(data.spreadHistogram, (start) => `${ms(start)} to ${ms(start + data.spreadBinMs)}`, count),
      };
  }
}
