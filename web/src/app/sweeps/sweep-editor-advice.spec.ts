import { wilsonInterval } from '@shared/confidence-interval';
import { SWEEP_LIMITS } from '@shared/sweeps';
import { currentPrecisionText, followingWarning, percentText, runsNeededText, worstCaseHalfWidth } from './sweep-editor-advice';
import { SWEEP_FORM_DEFAULTS, type SweepFormValue } from './sweep-form-rules';

const form = (over: Partial<SweepFormValue>): SweepFormValue => ({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, ...over });

describe('following warning of the sweep form', () => {
  const wide = { cellPitchMm: 500, robotDiameterMm: 400 };

  it('warns for 400 mm robots on a 500 mm pitch with classic plans that allow following, with the derivation', () => {
    const w = followingWarning(form({ ...wide, models: ['classic', 'weighted-split'], following: 'allowed' }));
    expect(w).not.toBeNull();
    expect(w?.exposedModels).toEqual(['classic (following allowed)']);
    expect(w?.message).toContain('following forbidden');
    expect(w?.derivation).toContain('p/√2 = 353.6 mm');
  });

  it('is silent when every chosen model forbids following, or the robots are narrow enough', () => {
    expect(followingWarning(form({ ...wide, models: ['classic', 'orientation-split'], following: 'forbidden' }))).toBeNull();
    expect(followingWarning(form({ ...wide, models: ['k-robust'], k: 1 }))).toBeNull();
    expect(followingWarning(form({ ...wide, models: ['weighted-split'] }))).toBeNull();
    // 350 mm < 500/√2 ≈ 353.6 mm: right-angle following keeps them apart.
    expect(followingWarning(form({ cellPitchMm: 500, robotDiameterMm: 350, models: ['classic'], following: 'allowed' }))).toBeNull();
  });

  it('warns when both rules are compared (the allowed half may follow), naming each model once', () => {
    expect(followingWarning(form({ ...wide, models: ['classic', 'orientation-split'], following: 'both' }))?.exposedModels)
      .toEqual(['classic (following allowed)', 'orientation-split (following allowed)']);
  });

  it('counts k-robust with k = 0 as following allowed (it is the classic rule)', () => {
    expect(followingWarning(form({ ...wide, models: ['k-robust'], k: 0 }))?.exposedModels).toEqual(['k-robust (k = 0 is the classic rule)']);
  });

  it('gives no warning for a profile still being typed (empty or zero fields)', () => {
    expect(followingWarning(form({ cellPitchMm: 0, robotDiameterMm: 400, models: ['classic'] }))).toBeNull();
  });
});

describe('Monte Carlo run precision', () => {
  it('finds the smallest run count whose worst-case Wilson half-width meets the wanted one', () => {
    let compared = 0;
    for (const h of [0.02, 0.03, 0.05, 0.1, 0.15]) {
      const { runs } = runsNeededText(h);
      expect(worstCaseHalfWidth(runs)).toBeLessThanOrEqual(h);
      expect(worstCaseHalfWidth(runs - 1)).toBeGreaterThan(h);
      compared++;
    }
    expect(compared).toBe(5);
  });

  it('states ±5 % in runs, as the usual n ≈ (1.96/2h)² minus the Wilson correction z² says', () => {
    // (1.96 / 0.1)² − 1.96² = 384.2 − 3.8 = 380.3, so 381 runs (Wilson at p = 0.5; common practice sample-size rule).
    expect(runsNeededText(0.05)).toEqual({ runs: 381, isAllowed: true, text: '±5 % on the execution success rate needs ≥ 381 Monte Carlo runs.' });
  });

  it('says when a width needs more runs than a sweep allows', () => {
    const r = runsNeededText(0.02);
    expect(r.runs).toBeGreaterThan(SWEEP_LIMITS.maxMonteCarloRuns);
    expect(r.isAllowed).toBe(false);
    expect(r.text).toContain(`at most ${SWEEP_LIMITS.maxMonteCarloRuns}`);
  });

  it('gives the half-width of the current run count from the Wilson interval of 10 of 20', () => {
    const [lo, hi] = wilsonInterval(10, 20);
    expect(worstCaseHalfWidth(20)).toBeCloseTo((hi - lo) / 2, 12);
    expect(currentPrecisionText(20)).toBe(`With 20 Monte Carlo runs per plan and policy, an execution success rate is known to within ${percentText((hi - lo) / 2)} at worst (95 % Wilson interval, rate near 50 %).`);
    // By hand: at p = ½ the Wilson half-width is (z/2)/√(n + z²) = 0.98/√23.84 = 0.2007.
    expect(percentText((hi - lo) / 2)).toBe('±20.1 %');
    expect(currentPrecisionText(0)).toBeNull();
  });
});
