/**
 * Chart downloads. Both draw the full option, title and subtitle included (on the page those are
 * the figure's caption, outside the drawing): the PNG with the canvas renderer on a detached
 * element the size of the chart on screen, the SVG with ECharts' SVG renderer in server-side mode
 * (no DOM needed).
 */
import { init } from 'echarts/core';
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

/** `option` drawn `widthPx` × `heightPx` as a PNG data URL (twice that resolution, white background). */
export function chartPng(option: ChartOption, widthPx: number, heightPx: number): string {
  const chart = init(document.createElement('div'), null, { renderer: 'canvas', width: widthPx, height: heightPx });
  try {
    chart.setOption(option);
    return chart.getDataURL({ type: 'png', pixelRatio: 2, backgroundColor: '#ffffff' });
  } finally {
    chart.dispose();
  }
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
