/** The generated sentences on hand-made figures: each branch of the "which plan model" sentence, the prediction wording and percentages. */
import type { VariantFigures } from '@shared/reports';
import { overlaps, pct, summarise } from './report-summary';

const base: VariantFigures = {
  model: 'classic', variant: '', label: 'classic', isReference: true, instances: 20, solved: 20, solvedRate: 1, solvedCi95: [0.839, 1],
  nominalChecked: 20, nominalExecutable: 20, executableRate: 1, executableCi95: [0.839, 1], executedInstances: 20, runs: 400, successfulRuns: 400,
  executionSuccessRate: 1, executionSuccessCi95: [0.99, 1], instancesWithCollisions: 0, realisedMakespanMeanMs: 30000,
  makespanVsClassic: { pairs: 20, ratio: 1, ci95: [1, 1] }, finishSpreadMs: { n: 20, mean: 2000, ci95: [1500, 2500] },
  plannedVsRealised: { n: 20, rho: 0.9, ci95: [0.76, 0.96] },
};
const v = (label: string, over: Partial<VariantFigures>): VariantFigures => ({ ...base, label, isReference: false, ...over });

const sentences = (variants: VariantFigures[]) =>
  summarise({ setName: 'Yard', profileLabel: 'P', policy: 'open-loop', instances: 20, executionSettings: ['20 runs'], variants });
const choice = (variants: VariantFigures[]) => {
  const found = sentences(variants).filter((s) => s.startsWith('Which plan model'));
  expect(found).toHaveLength(1);
  return found[0];
};

describe('report sentences', () => {
  it('names one variant only when its success interval is clear of all others', () => {
    const text = choice([
      { ...base, executionSuccessCi95: [0.7, 0.8], executionSuccessRate: 0.75 },
      v('weighted-split', { executionSuccessCi95: [0.95, 0.99], executionSuccessRate: 0.97, makespanVsClassic: { pairs: 20, ratio: 0.9, ci95: [0.85, 0.95] } }),
    ]);
    expect(text).toBe("Which plan model for these robots under open-loop: weighted-split has the highest execution success rate, its interval clear of every other variant's.");
  });

  it('lists the leading group, sets aside those colliding at nominal times, and names a fastest one only with clear intervals', () => {
    const text = choice([
      { ...base, executionSuccessCi95: [0.5, 0.6], executionSuccessRate: 0.55 },
      v('orientation-split', { executionSuccessCi95: [0.9, 0.97], executionSuccessRate: 0.94, makespanVsClassic: { pairs: 20, ratio: 0.97, ci95: [0.95, 0.99] } }),
      v('weighted-split', { executionSuccessCi95: [0.92, 0.99], executionSuccessRate: 0.96, makespanVsClassic: { pairs: 20, ratio: 0.88, ci95: [0.85, 0.91] } }),
      v('k-robust (k=1)', { executionSuccessCi95: [0.91, 0.98], executionSuccessRate: 0.95, nominalExecutable: 17 }),
    ]);
    expect(text).toBe('Which plan model for these robots under open-loop: orientation-split, weighted-split and k-robust (k=1) lead on execution success '
      + "(their intervals overlap the best one's, so no order among them; the others' lie wholly below it); of these, k-robust (k=1) collided at nominal times on some instances; "
      + "of orientation-split and weighted-split, weighted-split finished soonest, its makespan interval clear of the others'.");
  });

  it('says the makespans do not single one out when their intervals overlap', () => {
    const text = choice([
      base,
      v('orientation-split', { makespanVsClassic: { pairs: 20, ratio: 0.97, ci95: [0.95, 0.99] } }),
      v('weighted-split', { makespanVsClassic: { pairs: 20, ratio: 0.96, ci95: [0.93, 0.98] } }),
    ]);
    expect(text).toBe("Which plan model for these robots under open-loop: execution success does not rank the variants: every interval overlaps the best one's; "
      + 'none of these was seen colliding at nominal times, and their realised makespans do not single out one of them (overlapping or missing intervals).');
  });

  it('does not call unchecked plans collision-free at nominal times', () => {
    const unchecked = { nominalChecked: 0, nominalExecutable: 0, executableRate: null, executableCi95: null };
    const text = choice([
      { ...base, ...unchecked },
      v('orientation-split', { ...unchecked, makespanVsClassic: { pairs: 20, ratio: 0.97, ci95: [0.95, 1.01] } }),
    ]);
    expect(text).toBe("Which plan model for these robots under open-loop: execution success does not rank the variants: every interval overlaps the best one's; "
      + 'their realised makespans do not single out one of them (overlapping or missing intervals); none of them was checked at nominal times.');
    expect(text).not.toContain('seen colliding');
  });

  it('judges the planned cost on the interval, not on ρ alone', () => {
    const all = sentences([
      base,
      v('weighted-split', { plannedVsRealised: { n: 6, rho: 0.9, ci95: [0.3, 0.99] } }),
      v('k-robust (k=1)', { plannedVsRealised: { n: 6, rho: 0.5, ci95: [-0.4, 0.9] } }),
    ]).join(' ');
    expect(all).toContain('predicts it at least moderately for classic (ρ = 0.90 [0.76, 0.96], n = 20)');
    expect(all).toContain('is positively linked to it, though how strongly the interval leaves open for weighted-split (ρ = 0.90 [0.30, 0.99], n = 6)');
    expect(all).toContain('shows no clear link for k-robust (k=1) (ρ = 0.50 [-0.40, 0.90], n = 6, the interval includes 0)');
    // 20 executed instances each: no small-sample warning.
    expect(all).not.toContain('Small samples');
  });

  it('formats percentages and compares intervals', () => {
    expect([pct(0.123), pct(0.0456), pct(1), pct(0)]).toEqual(['12 %', '4.6 %', '100 %', '0 %']);
    expect(overlaps([0, 1], [1, 2])).toBe(true);
    expect(overlaps([0, 0.99], [1, 2])).toBe(false);
  });
});
