/** Progress labels name switched-off CBS techniques by their labels, never by the API field names (issue 14, item 11). */
import { CBS_SWITCH_NAMES, CBS_SWITCH_TEXT, ModelSpecSchema } from '@shared/sweeps';
import type { Sequelize } from 'sequelize';
import { modelLabel, readProgress } from './sweep-progress';

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

describe('readProgress per model', () => {
  it('puts the field names of the switches turned off beside their labels', async () => {
    const models = [
      ModelSpecSchema.parse({ model: 'classic', switches: { wdg: false, bypass: true } }),
      ModelSpecSchema.parse({ model: 'weighted-split' }),
    ];
    // The two queries readProgress makes: the sweep row, then run counts per model and status.
    const answers = [[{ status: 'running', definition: { models }, started_at: null, finished_at: null, run_count: 4 }], [{ model_index: 0, status: 'solved', n: '1' }]];
    const sequelize = { query: jest.fn(async () => answers.shift()) } as unknown as Sequelize;
    const progress = await readProgress(sequelize, 5);
    expect(progress?.perModel.map((m) => [m.label, m.switchesOff])).toEqual([
      ['classic without WDG heuristic', [{ name: 'wdg', label: 'WDG heuristic' }]],
      ['weighted-split', []],
    ]);
    expect(progress?.perModel[0].counts.solved).toBe(1);
  });
});
