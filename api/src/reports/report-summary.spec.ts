/** The generated sentences on hand-made figures: each branch of the "which plan model" sentence, the per-variant clauses, the prediction wording and percentages. */
import type { CommonInstanceComparison, CommonInstanceFigures, VariantFigures } from '@shared/reports';
import { MIXED_SETTINGS_NOTE, reportTableRows } from '@shared/reports';
import { clearlyBelow, overlaps, pct, summarise } from './report-summary';

const base: VariantFigures = {
  model: 'classic', variant: '', label: 'classic', isReference: true, instances: 20, solved: 20, solvedRate: 1, solvedCi95: [0.839, 1],
  nominalChecked: 20, nominalExecutable: 20, executableRate: 1, executableCi95: [0.839, 1], executedInstances: 20, runs: 400, successfulRuns: 400,
  executionSuccessRate: 1, executionSuccessCi95: [1, 1], instancesWithCollisions: 0, instancesWithFailuresWithoutCollision: 0, realisedMakespanMeanMs: 30000,
  makespanVsClassic: { pairs: 20, ratio: 1, ci95: [1, 1] }, finishSpreadMs: { n: 20, mean: 2000, ci95: [1500, 2500] },
  plannedVsRealised: { n: 20, rho: 0.9, ci95: [0.76, 0.96] },
};
const v = (label: string, over: Partial<VariantFigures> = {}): VariantFigures => ({ ...base, label, isReference: false, ...over });

/** One variant on the common instances: success mean and interval, makespan ratio interval (classic: exactly 1). */
const c = (label: string, success: number, successCi95: [number, number], ratioCi: [number, number] | null = [1, 1]): CommonInstanceFigures => ({
  label, success, successCi95, makespanRatio: ratioCi ? (ratioCi[0] + ratioCi[1]) / 2 : null, makespanRatioCi95: ratioCi,
});

const sentences = (variants: VariantFigures[], comparison: CommonInstanceComparison | null, settings = ['20 runs']) =>
  summarise({ setName: 'Yard', profileLabel: 'P', policy: 'open-loop', instances: 20, executionSettings: settings, variants, comparison });
const choice = (variants: VariantFigures[], comparison: CommonInstanceComparison | null, settings?: string[]) => {
  const found = sentences(variants, comparison, settings).filter((s) => s.startsWith('Which plan model') || s.startsWith('No variant'));
  expect(found).toHaveLength(1);
  return found[0];
};
const HEAD = 'Which plan model for these robots under open-loop: ';

describe('report sentences', () => {
  it('names one variant only when its success interval on the common instances is clear of all others', () => {
    const text = choice([base, v('weighted-split')], {
      instances: 20,
      variants: [c('classic', 0.75, [0.7, 0.8]), c('weighted-split', 0.97, [0.95, 0.99], [0.85, 0.95])],
    });
    expect(text).toBe(`${HEAD}on the 20 instances every executed variant solved and replayed, weighted-split (97 % [95 %, 99 %]) has the highest mean execution success rate, `
      + "its interval clear of every other variant's (classic (75 % [70 %, 80 %])).");
  });

  it('lists the leading group, sets aside those colliding at nominal times, and names a fastest one only with clear intervals', () => {
    const text = choice([base, v('orientation-split'), v('weighted-split'), v('k-robust (k=1)', { nominalExecutable: 17 })], {
      instances: 12,
      variants: [
        c('classic', 0.55, [0.5, 0.6]),
        c('orientation-split', 0.94, [0.9, 0.97], [0.95, 0.99]),
        c('weighted-split', 0.96, [0.92, 0.99], [0.85, 0.91]),
        c('k-robust (k=1)', 0.95, [0.91, 0.98], [0.8, 0.9]),
      ],
    });
    expect(text).toBe(`${HEAD}on the 12 instances every executed variant solved and replayed, orientation-split (94 % [90 %, 97 %]), weighted-split (96 % [92 %, 99 %]) `
      + "and k-robust (k=1) (95 % [91 %, 98 %]) lead on mean execution success (their intervals overlap the best one's, so no order among them; the others' lie wholly below it: classic (55 % [50 %, 60 %])); "
      + 'of these, k-robust (k=1) collided at nominal times on some instances; '
      + "of orientation-split and weighted-split, weighted-split finished soonest on these instances, its makespan interval (relative to classic) clear of the others'.");
  });

  it('says the makespans do not single one out when their intervals overlap', () => {
    const text = choice([base, v('orientation-split'), v('weighted-split')], {
      instances: 20,
      variants: [c('classic', 0.9, [0.8, 1]), c('orientation-split', 0.9, [0.85, 0.95], [0.95, 0.99]), c('weighted-split', 0.92, [0.87, 0.97], [0.93, 0.98])],
    });
    expect(text).toBe(`${HEAD}on the 20 instances every executed variant solved and replayed, execution success does not rank the variants: no interval lies clearly below the best one's `
      + '(classic (90 % [80 %, 100 %]); orientation-split (90 % [85 %, 95 %]); weighted-split (92 % [87 %, 97 %])); '
      + 'none of these was seen colliding at nominal times, and their realised makespans on these instances do not single out one of them (overlapping, constant or missing intervals).');
  });

  it('does not call unchecked plans collision-free at nominal times', () => {
    const unchecked = { nominalChecked: 0, nominalExecutable: 0, executableRate: null, executableCi95: null };
    const text = choice([{ ...base, ...unchecked }, v('orientation-split', unchecked)], {
      instances: 20, variants: [c('classic', 0.9, [0.8, 1]), c('orientation-split', 0.9, [0.85, 0.95], [0.95, 1.01])],
    });
    expect(text).toBe(`${HEAD}on the 20 instances every executed variant solved and replayed, execution success does not rank the variants: no interval lies clearly below the best one's `
      + '(classic (90 % [80 %, 100 %]); orientation-split (90 % [85 %, 95 %])); '
      + 'their realised makespans on these instances do not single out one of them (overlapping, constant or missing intervals); none of them was checked at nominal times.');
    expect(text).not.toContain('seen colliding');
  });

  it('says there are too few instances to tell below 5 common instances, naming the variant that limits them', () => {
    const text = choice([base, v('weighted-split', { executedInstances: 3 })], {
      instances: 3, variants: [c('classic', 0.5, [0.4, 0.6]), c('weighted-split', 1, [0.99, 1], [0.8, 0.85])],
    });
    expect(text).toBe(`${HEAD}too few instances to tell the variants apart: only 3 instances were solved and replayed by every executed variant (weighted-split on 3), and an order needs at least 5.`);
  });

  it('claims no order from two zero-width intervals (constant rates), even far apart', () => {
    // meanInterval gives [x, x] for constant values: 1 on every instance against 0.9 on every instance.
    const text = choice([base, v('weighted-split')], { instances: 8, variants: [c('classic', 0.9, [0.9, 0.9]), c('weighted-split', 1, [1, 1], [0.9, 0.9])] });
    expect(text).toContain("execution success does not rank the variants: no interval lies clearly below the best one's");
    expect(text).not.toContain('highest');
    expect(clearlyBelow([0.9, 0.9], [1, 1])).toBe(false);
    expect(clearlyBelow([0.8, 0.9], [1, 1])).toBe(true);
    expect(clearlyBelow([0.8, 1], [1, 1])).toBe(false);
  });

  it('refuses to rank replays made with different settings, and says so', () => {
    const text = choice([base, v('weighted-split')], null, ['20 runs, timing jitter CV 0.1, no stalls', '50 runs, timing jitter CV 0.2, no stalls']);
    expect(text).toBe(`${HEAD}not ranked. ${MIXED_SETTINGS_NOTE}`);
  });

  it('has nothing to compare with one executed variant, and says when none was executed', () => {
    expect(choice([base], { instances: 20, variants: [c('classic', 1, [1, 1])] }))
      .toBe(`${HEAD}only classic was executed under this policy, so there is nothing to compare it with.`);
    expect(choice([base], null)).toBe('No variant was executed under open-loop, so the report cannot say which plan model suits these robots.');
  });

  it('words collisions, failed runs without collision and the executable-at-nominal rate per variant', () => {
    const all = sentences([base, v('orientation-split', {
      nominalChecked: 8, nominalExecutable: 7, executableRate: 7 / 8, executableCi95: [0.529, 0.978], executedInstances: 8, runs: 160,
      executionSuccessRate: 0.9, executionSuccessCi95: [0.8, 0.99], instancesWithCollisions: 2, instancesWithFailuresWithoutCollision: 1,
      makespanVsClassic: { pairs: 4, ratio: 0.9, ci95: [0.85, 0.95] },
    })], null);
    expect(all).toContain('Orientation-split: solved 20 of 20 instances (100 % [84 %, 100 %]); collided at nominal times in 1 of 8 checked solved instances (executable-at-nominal rate 88 % [53 %, 98 %]); '
      + 'execution success 90 % [80 %, 99 %] (mean over 8 executed instances, 160 runs), collisions in 2 of 8 executed instances, failed runs without collision (deadlocks) in 1 of 8 executed instances; '
      + "realised makespan 0.900 times classic's on 4 paired instances, too few to tell whether it is sooner or later (an order needs at least 5 paired instances and a spread between them).");
    expect(all).toContain('Classic: solved 20 of 20 instances (100 % [84 %, 100 %]); executable at nominal times in all 20 checked solved instances (executable-at-nominal rate 100 % [84 %, 100 %]); '
      + 'execution success 100 % on each of the 20 executed instances (400 runs; no spread between instances, so no interval); reference for realised makespan.');
  });

  it('judges the planned cost on the interval, not on ρ alone', () => {
    const all = sentences([
      base,
      v('weighted-split', { plannedVsRealised: { n: 6, rho: 0.9, ci95: [0.3, 0.99] } }),
      v('k-robust (k=1)', { plannedVsRealised: { n: 6, rho: 0.5, ci95: [-0.4, 0.9] } }),
    ], null).join(' ');
    expect(all).toContain('predicts it at least moderately for classic (ρ = 0.90 [0.76, 0.96], n = 20)');
    expect(all).toContain('is positively linked to it, though how strongly the interval leaves open for weighted-split (ρ = 0.90 [0.30, 0.99], n = 6)');
    expect(all).toContain('shows no clear link for k-robust (k=1) (ρ = 0.50 [-0.40, 0.90], n = 6, the interval includes 0)');
    // 20 executed instances each: no small-sample warning.
    expect(all).not.toContain('Small samples');
  });

  it('shows no interval in the table for a rate constant over instances, and the executable-at-nominal rate with its Wilson interval', () => {
    const [classic, orientation] = reportTableRows({ variants: [base, v('orientation-split', {
      nominalChecked: 8, nominalExecutable: 7, executableRate: 7 / 8, executableCi95: [0.529, 0.978], executionSuccessRate: 0.9, executionSuccessCi95: [0.8, 0.99] })] });
    expect(classic[3]).toBe('100.0 % on each instance (20 instances, 400 runs)');
    expect(orientation[2]).toBe('87.5 % [52.9 %, 97.8 %] (7 of 8)');
    expect(orientation[3]).toBe('90.0 % [80.0 %, 99.0 %] (20 instances, 400 runs)');
  });

  it('formats percentages and compares intervals', () => {
    expect([pct(0.123), pct(0.0456), pct(1), pct(0)]).toEqual(['12 %', '4.6 %', '100 %', '0 %']);
    expect(overlaps([0, 1], [1, 2])).toBe(true);
    expect(overlaps([0, 0.99], [1, 2])).toBe(false);
  });
});
