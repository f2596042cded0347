/**
 * How each plan model is drawn in every chart, so a model looks the same everywhere and never by
 * colour alone: its own colour, marker, line dash and bar pattern. Charts draw to canvas and SVG
 * files, which cannot read CSS custom properties, hence literal values.
 *
 * The colours are Quarterturn's own, picked for these charts: with normal vision every pair is at
 * least 20 CIEDE2000 apart, under simulated protanopia, deuteranopia and tritanopia at least 12,
 * and each has 3:1 contrast or more against the white chart background (WCAG 2.1 non-text
 * contrast). They span light to dark on purpose; greyscale print still tells the series apart by
 * marker and dash. model-colours.spec.ts checks all of this.
 */
import type { PlanModel } from '@shared/plan';

/** Series colour of each plan model. */
export const MODEL_COLOURS: Readonly<Record<PlanModel, string>> = {
  'classic': '#2f7fe0',
  'uniform-duration': '#6b2a00',
  'orientation-split': '#5f8a00',
  'weighted-split': '#4b1a8a',
  'k-robust': '#e0607e',
};

/** A plus sign (ECharts draws a `path://` symbol scaled into the symbol's box). */
const PLUS = 'path://M3,0H5V3H8V5H5V8H3V5H0V3H3Z';

/** ECharts marker of each plan model's points (built-in names, or a path). */
export const MODEL_SYMBOLS: Readonly<Record<PlanModel, string>> = {
  'classic': 'circle',
  'uniform-duration': 'rect',
  'orientation-split': 'triangle',
  'weighted-split': 'diamond',
  'k-robust': PLUS,
};

/**
 * Marker of a second (or later) variant of a model in one chart, e.g. "following forbidden" or
 * k = 2 beside k = 1: the same shape hollow (the plus turns into a cross).
 */
export const MODEL_VARIANT_SYMBOLS: Readonly<Record<PlanModel, string>> = {
  'classic': 'emptyCircle',
  'uniform-duration': 'emptyRect',
  'orientation-split': 'emptyTriangle',
  'weighted-split': 'emptyDiamond',
  'k-robust': 'path://M1,0L4,3L7,0L8,1L5,4L8,7L7,8L4,5L1,8L0,7L3,4L0,1Z',
};

/** Line dash of each plan model: ECharts' lineStyle.type, 'solid' or dash and gap lengths in px. */
export const MODEL_LINE_TYPES: Readonly<Record<PlanModel, 'solid' | readonly number[]>> = {
  'classic': 'solid',
  'uniform-duration': [9, 4],
  'orientation-split': [2, 3],
  'weighted-split': [10, 3, 2, 3],
  'k-robust': [4, 2, 4, 2, 1, 2],
};

/**
 * Pattern over each plan model's bars (ECharts' itemStyle.decal: white marks on the bar colour).
 * Classic bars stay plain; the others get stripes, dots or checks.
 */
export const MODEL_DECALS: Readonly<Record<PlanModel, Readonly<Record<string, unknown>> | null>> = {
  'classic': null,
  'uniform-duration': { symbol: 'rect', color: 'rgba(255, 255, 255, 0.7)', dashArrayX: [1, 0], dashArrayY: [3, 3], rotation: Math.PI / 4 },
  'orientation-split': { symbol: 'circle', color: 'rgba(255, 255, 255, 0.8)', symbolSize: 0.7, dashArrayX: [[4, 4], [0, 4, 4, 0]], dashArrayY: [4, 2] },
  'weighted-split': { symbol: 'rect', color: 'rgba(255, 255, 255, 0.7)', dashArrayX: [1, 0], dashArrayY: [2, 4], rotation: -Math.PI / 4 },
  'k-robust': { symbol: 'rect', color: 'rgba(255, 255, 255, 0.7)', dashArrayX: [[5, 5], [0, 5, 5, 0]], dashArrayY: [5, 0] },
};
