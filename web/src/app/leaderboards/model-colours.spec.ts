/**
 * The plan models' chart colours stay apart with normal vision and under simulated protanopia,
 * deuteranopia and tritanopia, and each has 3:1 contrast with the chart background (issue 18, item 6).
 */
import { PLAN_MODELS } from '@shared/plan';
import { closestPairs, contrastRatio, DICHROMACIES, MIN_DISTANCE_NORMAL, MIN_DISTANCE_SIMULATED, MIN_NON_TEXT_CONTRAST } from '../core/colour-vision';
import { MODEL_COLOURS, MODEL_DECALS, MODEL_LINE_TYPES, MODEL_SYMBOLS } from './model-colours';

describe('plan model colours, markers and dashes', () => {
  const colours = PLAN_MODELS.map((m) => MODEL_COLOURS[m]);

  it('keeps every pair of model colours apart with normal vision and each simulated dichromacy', () => {
    const worst = closestPairs(colours);
    expect(worst.normal.distance).toBeGreaterThanOrEqual(MIN_DISTANCE_NORMAL);
    for (const kind of DICHROMACIES) expect({ kind, ok: worst[kind].distance >= MIN_DISTANCE_SIMULATED, worst: worst[kind] }).toMatchObject({ kind, ok: true });
  });

  it('gives every model colour 3:1 contrast with the white chart background (WCAG 2.1, 1.4.11)', () => {
    let compared = 0;
    for (const c of colours) {
      expect({ c, ok: contrastRatio(c, '#ffffff') >= MIN_NON_TEXT_CONTRAST }).toEqual({ c, ok: true });
      compared++;
    }
    expect(compared).toBe(5);
  });

  it('rejects the colours it replaced, which the issue found nearly the same (so the check can fail)', () => {
    const before = closestPairs(['#036971', '#7a5c00', '#8c3d5a', '#3d5fa8', '#4f7a28']);
    expect(Math.min(...DICHROMACIES.map((k) => before[k].distance))).toBeLessThan(MIN_DISTANCE_SIMULATED);
  });

  it('gives every model its own marker, line dash and bar pattern', () => {
    expect(new Set(PLAN_MODELS.map((m) => MODEL_SYMBOLS[m])).size).toBe(PLAN_MODELS.length);
    expect(new Set(PLAN_MODELS.map((m) => JSON.stringify(MODEL_LINE_TYPES[m]))).size).toBe(PLAN_MODELS.length);
    expect(new Set(PLAN_MODELS.map((m) => JSON.stringify(MODEL_DECALS[m]))).size).toBe(PLAN_MODELS.length);
  });
});
