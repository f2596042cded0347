/**
 * ECharts options of the four leaderboard charts, built from the API's chart data. Every chart
 * names the robot profile and execution policy its figures come from in its subtitle, and
 * series are named by plan model (with the variant, e.g. k = 1). Pure functions.
 */
import { MEAN_SUCCESS_METHOD, type ChartSeries, type LeaderboardCharts } from '@shared/leaderboards';
import { MODEL_COLOURS, MODEL_DECALS, MODEL_LINE_TYPES, MODEL_SYMBOLS, MODEL_VARIANT_SYMBOLS } from './model-colours';

/** Names of the charts (also their ids in the page). */
export const CHART_IDS = ['success', 'execution', 'cactus', 'realised', 'spread'] as const;

/** Charts of plan figures only (solving), whose subtitle names no execution policy. */
export const PLAN_CHARTS: readonly ChartId[] = ['success', 'cactus'];
export type ChartId = (typeof CHART_IDS)[number];

/** An option object (ECharts' option shape, kept loose here). */
export type ChartOption = Record<string, unknown>;

/** The label of a series: model plus variant. */
export function seriesName(s: Pick<ChartSeries, 'model' | 'variant'>): string {
  return s.variant ? `${s.model} (${s.variant})` : s.model;
}

/** Chart width assumed when none is given, px: a card of two side by side on a 1280 px screen. */
export const DEFAULT_CHART_WIDTH_PX = 560;
/** Text lines (subtitle, legend) wrap this far inside the chart's width: 8 px title inset plus a margin. */
const TEXT_INSET_PX = 24;
/** The width subtitle and legend wrap at in a chart `widthPx` wide (at least 200 px). */
const textWidth = (widthPx: number): number => Math.max(200, Math.floor(widthPx) - TEXT_INSET_PX);
/** Mean advance of one 11 px Fira Sans character, to estimate how many lines the subtitle wraps to (common practice: ≈ 0.5 em). */
const SUBTITLE_CHAR_PX = 5.6;

/** Space above the plot: the title plus as many subtitle lines as the text wraps to, so the plot never runs under it. */
export function plotTop(subtitle: string, widthPx = DEFAULT_CHART_WIDTH_PX): number {
  const lines = Math.max(1, Math.ceil((subtitle.length * SUBTITLE_CHAR_PX) / textWidth(widthPx)));
  return 40 + 15 * lines;
}

/** Mean advance of one 12 px legend character plus each item's symbol and gap, px (common practice: ≈ 0.55 em; ECharts' default 25 px symbol + 10 px gap). */
const LEGEND_CHAR_PX = 6.6;
const LEGEND_ITEM_PX = 35;
/** Height of one legend row, px (ECharts' default item height 14 + gap 10). */
const LEGEND_ROW_PX = 24;

/**
 * Rows the legend wraps to in a chart `widthPx` wide. The legend is a plain,
 * wrapping one: a scrolling legend hid the last plan models behind a "1/2" pager, also in the
 * downloaded PNG and SVG, where nobody can page it.
 */
export function legendRows(names: readonly string[], widthPx = DEFAULT_CHART_WIDTH_PX): number {
  let rows = 1;
  let used = 0;
  for (const n of new Set(names)) {
    const w = LEGEND_ITEM_PX + n.length * LEGEND_CHAR_PX;
    if (used > 0 && used + w > textWidth(widthPx)) { rows += 1; used = 0; }
    used += w;
  }
  return rows;
}

function frame(widthPx: number, title: string, data: LeaderboardCharts, xName: string, yName: string, extra: ChartOption = {}, isExecution = true, note = ''): ChartOption {
  const profile = data.profile ? `Robot profile: ${data.profile.label}` : 'No robot profile';
  const subtext = (isExecution ? `${profile} · execution policy ${data.policy}` : `${profile} · plan figures (no execution policy)`) + note;
  return {
    animation: false,
    backgroundColor: '#ffffff',
    textStyle: { fontFamily: 'Fira Sans, system-ui, sans-serif' },
    title: { text: title, subtext, left: 8, top: 4, textStyle: { fontSize: 15 }, subtextStyle: { fontSize: 11, lineHeight: 15, width: textWidth(widthPx), overflow: 'break' } },
    legend: { bottom: 0, type: 'plain' },
    tooltip: { trigger: 'item' },
    // Room below the plot for the axis name (≈ 40 px) and every legend row.
    grid: { left: 64, right: 24, top: plotTop(subtext, widthPx), bottom: 40 + LEGEND_ROW_PX * legendRows(seriesNamesOf(extra), widthPx) },
    xAxis: { type: 'value', name: xName, nameLocation: 'middle', nameGap: 28 },
    yAxis: { type: 'value', name: yName, nameLocation: 'middle', nameGap: 46 },
    ...extra,
  };
}

/**
 * One series per plan model and variant: the model's colour plus its own marker, dash (lines) and
 * pattern (bars), so the series stay apart in greyscale and for colour-vision deficiencies (issue
 * 18, item 6). A model's second and later variants in a chart get the hollow marker, a thinner
 * line and paler bars; the legend names each.
 */
function lines(series: readonly ChartSeries[], kind: 'line' | 'scatter' | 'bar', step?: 'end'): ChartOption[] {
  const seen = new Set<string>();
  return series.map((s) => {
    const isLaterVariant = seen.has(s.model);
    seen.add(s.model);
    const symbol = isLaterVariant ? MODEL_VARIANT_SYMBOLS[s.model] : MODEL_SYMBOLS[s.model];
    const decal = MODEL_DECALS[s.model];
    return {
      name: seriesName(s), type: kind, data: s.points, color: MODEL_COLOURS[s.model],
      ...(kind === 'line' ? { showSymbol: true, symbol, symbolSize: 7, lineStyle: { width: isLaterVariant ? 1.25 : 2, type: MODEL_LINE_TYPES[s.model] }, ...(step ? { step } : {}) } : {}),
      ...(kind === 'scatter' ? { symbol, symbolSize: 8 } : {}),
      ...(kind === 'bar' ? { barGap: '0%', itemStyle: { ...(decal ? { decal } : {}), ...(isLaterVariant ? { opacity: 0.55, borderColor: MODEL_COLOURS[s.model], borderWidth: 1 } : {}) } } : {}),
    };
  });
}

/**
 * The 95 % band of each series with intervals (issue 12, item 5): a transparent line at the low
 * ends and, stacked on it, the width (high − low) as a shaded area in the model's colour. Band
 * series share their model's name, so the legend shows and hides them together; they take no
 * tooltip or hover. Points without an interval (fewer than 2 instances) leave a gap.
 */
export function intervalBands(series: readonly ChartSeries[]): ChartOption[] {
  return series.filter((s) => s.intervals?.some((ci) => ci !== null)).flatMap((s) => {
    const stack = `ci95 ${seriesName(s)}`;
    const at = (f: (ci: readonly [number, number]) => number) => s.points.map(([x], i) => {
      const ci = s.intervals?.[i] ?? null;
      return [x, ci ? f(ci) : null];
    });
    const common = { name: seriesName(s), type: 'line', stack, silent: true, symbol: 'none', connectNulls: false, tooltip: { show: false }, z: 1 };
    return [
      { ...common, data: at(([lo]) => lo), lineStyle: { opacity: 0 }, color: MODEL_COLOURS[s.model] },
      { ...common, data: at(([lo, hi]) => hi - lo), lineStyle: { opacity: 0 }, areaStyle: { opacity: 0.15, color: MODEL_COLOURS[s.model] }, color: MODEL_COLOURS[s.model] },
    ];
  });
}

/** The names of an option's series (the legend's entries; band series repeat their model's name). */
function seriesNamesOf(extra: ChartOption): string[] {
  const series = (extra['series'] ?? []) as readonly { name?: string }[];
  return series.map((s) => s.name ?? '').filter((n) => n !== '');
}

/** The option of one chart drawn `widthPx` wide (subtitle and legend wrap to it). */
export function chartOption(id: ChartId, data: LeaderboardCharts, widthPx = DEFAULT_CHART_WIDTH_PX): ChartOption {
  switch (id) {
    case 'success':
      // The share of instances solved: the solved rate, never called success (that word belongs to execution).
      return frame(widthPx, 'Solved rate by agent count', data, 'agents', 'solved rate', {
        yAxis: { type: 'value', name: 'solved rate', nameLocation: 'middle', nameGap: 46, min: 0, max: 1 },
        series: lines(data.successByAgents, 'line'),
      }, false);
    case 'execution':
      // Collision-free share of simulated runs, averaged over the solved instances of each agent count.
      return frame(widthPx, 'Execution success rate by agent count (mean over solved instances)', data, 'agents', 'execution success rate', {
        yAxis: { type: 'value', name: 'execution success rate', nameLocation: 'middle', nameGap: 46, min: 0, max: 1 },
        series: [...lines(data.executionSuccessByAgents, 'line'), ...intervalBands(data.executionSuccessByAgents)],
      }, true, ` · shaded band: ${MEAN_SUCCESS_METHOD}`);
    case 'cactus':
      return frame(widthPx, 'Instances solved within a solve time', data, 'solve time (ms, log scale)', 'instances solved', {
        xAxis: { type: 'log', name: 'solve time (ms, log scale)', nameLocation: 'middle', nameGap: 28 },
        series: lines(data.cactus.map((s) => ({ ...s, points: s.points.map(([t, n]) => [Math.max(t, 0.01), n] as const) })), 'line', 'end'),
      }, false);
    case 'realised':
      return frame(widthPx, 'Planned against realised makespan', data, 'turn-inclusive makespan, planned (ms)', 'realised makespan, mean over runs (ms)', {
        series: lines(data.computedVsRealised, 'scatter'),
      }, true, ' · each point a mean over runs; its 95 % interval is in the board\'s realised-makespan columns (not drawn: bars on every point of the cloud would hide it)');
    case 'spread':
      return frame(widthPx, `Finish spread distribution (bins of ${data.spreadBinMs} ms)`, data, 'finish spread, mean over runs (ms)', 'instances', {
        // A bar on a value axis is centred on its x, so a bar drawn at its bin's start hangs half a bin
        // left of the y-axis: each bar stands at its bin's middle and the axis starts at 0 (spreads are never negative).
        xAxis: { type: 'value', name: 'finish spread, mean over runs (ms)', nameLocation: 'middle', nameGap: 28, min: 0 },
        series: lines(data.spreadHistogram.map((s) => ({ ...s, points: s.points.map(([start, n]) => [start + data.spreadBinMs / 2, n] as const) })), 'bar'),
      }, true, ' · counts instances by their mean finish spread; a histogram carries no per-instance interval (see the board\'s finish-spread columns)');
  }
}

/** The title and subtitle a chart draws (the figure's caption on the page shows the same text). */
export function chartTitles(id: ChartId, data: LeaderboardCharts): { title: string; subtitle: string } {
  const t = chartOption(id, data)['title'] as { text: string; subtext: string };
  return { title: t.text, subtitle: t.subtext };
}

/**
 * The option drawn on the page: the title and subtitle are the figure's HTML caption there (so
 * they are text, not only pixels), so the drawing leaves them out and the plot moves up. Downloads
 * keep them: a PNG or SVG file travels without the page.
 */
export function onScreenOption(option: ChartOption): ChartOption {
  const grid = option['grid'] as Record<string, unknown>;
  return { ...option, title: { ...(option['title'] as object), show: false }, grid: { ...grid, top: 16 } };
}
