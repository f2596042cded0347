/**
 * One fixed colour per plan model for every chart, so a model looks the same everywhere. Charts
 * draw to canvas and SVG files, which cannot read CSS custom properties, hence literal values;
 * they are taken from the product palette (web/src/styles/_palette.scss) and its complements.
 */
import type { PlanModel } from '@shared/plan';

/** Series colour of each plan model. */
export const MODEL_COLOURS: Readonly<Record<PlanModel, string>> = {
  'classic': '#036971',
  'uniform-duration': '#7a5c00',
  'orientation-split': '#8c3d5a',
  'weighted-split': '#3d5fa8',
  'k-robust': '#4f7a28',
};
