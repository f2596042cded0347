/**
 * Chart downloads: PNG from the on-screen canvas chart, SVG by rendering the same option once
 * more with ECharts' SVG renderer in server-side mode (no DOM needed) and saving its markup.
 */
import { init, type ECharts } from 'echarts/core';
import type { ChartOption } from './chart-options';

/** Size of a downloaded SVG, px. */
export const SVG_SIZE = { width: 900, height: 520 } as const;

/** Saves `href` as `fileName` through a temporary link. */
export function saveHref(href: string, fileName: string): void {
  const a = document.createElement('a');
  a.href = href;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
}

/** The chart as a PNG data URL (twice the screen resolution, white background). */
export function chartPng(chart: ECharts): string {
  return chart.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor: '#ffffff' });
}

/** The option drawn as an SVG document. */
export function chartSvg(option: ChartOption): string {
  const chart = init(null, null, { renderer: 'svg', ssr: true, ...SVG_SIZE });
  try {
    chart.setOption(option);
    return chart.renderToSVGString();
  } finally {
    chart.dispose();
  }
}

/** Downloads the option as an SVG file. */
export function downloadSvg(option: ChartOption, fileName: string): void {
  const url = URL.createObjectURL(new Blob([chartSvg(option)], { type: 'image/svg+xml' }));
  saveHref(url, fileName);
  setTimeout(() => URL.revokeObjectURL(url), 10_000);
}
