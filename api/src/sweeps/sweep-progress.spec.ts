/** Progress labels name switched-off CBS techniques by their labels, never by the API field names (issue 14, item 11). */
import { CBS_SWITCH_NAMES, CBS_SWITCH_TEXT, ModelSpecSchema } from '@shared/sweeps';
import { modelLabel } from './sweep-progress';

describe('modelLabel', () => {
  it('names switched-off techniques by label, in the order of CBS_SWITCH_NAMES, and leaves switches set to true out', () => {
    const spec = ModelSpecSchema.parse({ model: 'classic', switches: { wdg: false, bypass: false, targetReasoning: true } });
    expect(modelLabel(spec)).toBe('classic without Bypass, WDG heuristic');
  });

  it('keeps k and the following rule beside the switches', () => {
    const spec = ModelSpecSchema.parse({ model: 'k-robust', k: 2, switches: { rectangleReasoning: false } });
    expect(modelLabel(spec)).toBe('k-robust k=2 without Rectangle reasoning');
    const following = ModelSpecSchema.parse({ model: 'orientation-split', following: 'forbidden', switches: { corridorReasoning: false } });
    expect(modelLabel(following)).toBe('orientation-split following forbidden without Corridor reasoning');
  });

  it('shows no field name when every switch is off', () => {
    const spec = ModelSpecSchema.parse({ model: 'uniform-duration', switches: Object.fromEntries(CBS_SWITCH_NAMES.map((n) => [n, false])) });
    const label = modelLabel(spec);
    expect(label).toBe(`uniform-duration without ${CBS_SWITCH_NAMES.map((n) => CBS_SWITCH_TEXT[n].label).join(', ')}`);
    for (const n of ['prioritizeConflicts', 'disjointSplitting', 'wdg', 'targetReasoning']) expect(label).not.toContain(n);
  });
});
