/**
 * The drawing width of one chart card from the width of the chart grid, mirroring
 * leaderboard-charts.scss: columns of at least 520 px (or the whole grid when narrower), 16 px
 * gaps, and 8 px padding plus a 1 px border on each side of a card.
 */

/** The grid's sizes, px, as leaderboard-charts.scss sets them. */
export const CHART_CARD = { minWidth: 520, gap: 16, inset: 2 * (8 + 1) } as const;

/** Width of a chart's drawing in a grid `gridWidth` px wide. */
export function chartCardWidth(gridWidth: number): number {
  const columns = Math.max(1, Math.floor((gridWidth + CHART_CARD.gap) / (CHART_CARD.minWidth + CHART_CARD.gap)));
  return Math.floor((gridWidth - CHART_CARD.gap * (columns - 1)) / columns) - CHART_CARD.inset;
}
