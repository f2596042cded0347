import type { RobotProfile } from '@shared/plan';
import { createRng } from '../random';
import { tinyInstance } from '../testing/tiny-instance';
import { drawDurations, resolveNoise } from './noise';
import { preparePlan } from './prepared-plan';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 700, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0.15 };
const instance = tinyInstance('..', [[[0, 0], [0, 0]]]);
const waits = (n: number) => Array.from({ length: n }, (_, i) => ({ action: 'wait' as const, from: [0, 0] as const, to: [0, 0] as const, heading: 'N' as const, start: i * 700, end: (i + 1) * 700, step: i }));

describe('drawDurations', () => {
  it('reproduces nominal integer durations exactly with zero noise', () => {
    const p = preparePlan(instance, { timeline: 'steps', schedule: [waits(50)] }, profile);
    const out = new Float64Array(p.actionCount);
    drawDurations(p, resolveNoise(profile, { jitterCv: 0 }), 1, out);
    expect(Array.from(out)).toEqual(Array(50).fill(700));
  });

  it('draws factors with mean 1 and the requested coefficient of variation', () => {
    // Log-normal moments (Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions, vol. 1):
    // with σ² = ln(1 + cv²), μ = −σ²/2 the mean is 1 and the standard deviation cv.
    const p = preparePlan(instance, { timeline: 'steps', schedule: [waits(40000)] }, profile);
    const out = new Float64Array(p.actionCount);
    drawDurations(p, resolveNoise(profile, { jitterCv: 0.4 }), 5, out);
    const f = Array.from(out, (d) => d / 700);
    const mean = f.reduce((s, v) => s + v, 0) / f.length;
    const sd = Math.sqrt(f.reduce((s, v) => s + (v - mean) ** 2, 0) / f.length);
    expect(Math.abs(mean - 1)).toBeLessThan(0.01);
    expect(Math.abs(sd - 0.4)).toBeLessThan(0.015);
    expect(Math.min(...f)).toBeGreaterThan(0);
  });

  it('adds stalls with the given probability and takes the jitter default from the profile', () => {
    const p = preparePlan(instance, { timeline: 'steps', schedule: [waits(20000)] }, profile);
    const out = new Float64Array(p.actionCount);
    const noise = resolveNoise({ ...profile, timingJitter: 0 }, { stallProbability: 0.1, stallMs: 3000 });
    drawDurations(p, noise, 8, out);
    const stalled = Array.from(out).filter((d) => d === 3700).length;
    expect(Array.from(out).every((d) => d === 700 || d === 3700)).toBe(true);
    expect(Math.abs(stalled / 20000 - 0.1)).toBeLessThan(0.01);
    expect(resolveNoise(profile).jitterCv).toBe(0.15);
    expect(() => resolveNoise(profile, { stallProbability: 2 })).toThrow('noise: field "stallProbability" must be in [0, 1], got 2');
  });
  it('draws exactly what createRng(seed) gives, in plan order: factor via normal(), then the stall test via next()', () => {
    // Reference: the draw order documented in noise.ts, written against the shared generator.
    const reference = (nominal: Float64Array, cv: number, stallP: number, stallMs: number, seed: number): number[] => {
      const rng = createRng(seed);
      const sigma2 = Math.log(1 + cv * cv);
      return Array.from(nominal, (ms) => {
        let d = cv > 0 ? ms * Math.exp(-sigma2 / 2 + Math.sqrt(sigma2) * rng.normal()) : ms;
        if (stallP > 0 && rng.next() < stallP) d += stallMs;
        return d;
      });
    };
    // An odd count, so a run ends with an unused Box–Muller spare.
    const p = preparePlan(instance, { timeline: 'steps', schedule: [waits(301)] }, profile);
    const out = new Float64Array(p.actionCount);
    const cases = [[0.1, 0.02, 2000], [0.4, 0, 0], [0, 0.3, 500], [0.25, 0.5, 1]] as const;
    for (const [jitterCv, stallProbability, stallMs] of cases) {
      for (const seed of [0, 1, 7, 0x7fffffff, 0x80000000, 0xffffffff, 123456789]) {
        drawDurations(p, { jitterCv, stallProbability, stallMs }, seed, out);
        expect(Array.from(out)).toEqual(reference(p.nominalMs, jitterCv, stallProbability, stallMs, seed));
      }
    }
  });
});

describe('preparePlan', () => {
  it('rejects a broken schedule naming agent, action and field', () => {
    const bad = [{ ...waits(2)[0] }, { ...waits(2)[1], start: 800, end: 1500 }];
    expect(() => preparePlan(instance, { timeline: 'steps', schedule: [bad] }, profile)).toThrow(
      'plan: agent 0, action 1, field "start": is 800, expected 700 (actions are back to back from 0)',
    );
    const jump = [{ action: 'forward' as const, from: [0, 0] as const, to: [0, 0] as const, heading: 'E' as const, start: 0, end: 10, step: 0 }];
    expect(() => preparePlan(instance, { timeline: 'steps', schedule: [jump] }, profile)).toThrow('field "to": a forward move goes to a 4-neighbour');
    expect(() => preparePlan(instance, { timeline: 'steps', schedule: [] }, profile)).toThrow('schedule has 0 action lists but the instance has 1 agents');
    expect(() => preparePlan(instance, { timeline: 'steps', schedule: [[]] }, { ...profile, cellPitchMm: 0 })).toThrow('robot profile: field "cellPitchMm"');
  });

  it('pads to the makespan: wait steps on the steps timeline, one wait on the ms timeline', () => {
    const two = tinyInstance('...', [[[0, 0], [0, 0]], [[2, 0], [2, 0]]]);
    const steps = preparePlan(two, { timeline: 'steps', schedule: [waits(3), []] }, profile);
    expect(Array.from(steps.isPadding)).toEqual([0, 0, 0, 1, 1, 1]);
    expect(Array.from(steps.nominalMs.slice(3))).toEqual([700, 700, 700]);
    const ms = preparePlan(two, { timeline: 'ms', schedule: [waits(3), []] }, profile);
    expect(Array.from(ms.nominalMs.slice(3))).toEqual([2100]);
  });
});
