import {
  CI95_METHOD, cornishFisherT, meanInterval, quantileInterval, quantileRanks, runsForRateHalfWidth, studentT975, studentTwoSidedProbability,
  nonNegativeMeanInterval, wilsonFromRate, wilsonInterval,
} from './confidence-interval';

describe('wilsonInterval', () => {
  it('gives the worked Wilson score intervals of Newcombe (Stat Med 17, 1998, Table I, method 3) to 4 decimals', () => {
    // Values recalled from memory of Newcombe's Table I (no continuity correction); the 0/20 and
    // 29/29 ends are also hand-derivable: z²/(n + z²) = 3.8415/23.8415 = 0.1611 and n/(n + z²) = 29/32.8415 = 0.8830.
    const table: [number, number, number, number][] = [
      [81, 263, 0.2553, 0.3662],
      [15, 148, 0.0624, 0.1605],
      [0, 20, 0, 0.1611],
      [1, 29, 0.0061, 0.1718],
      [29, 29, 0.883, 1],
    ];
    for (const [k, n, lo, hi] of table) {
      const [gotLo, gotHi] = wilsonInterval(k, n);
      expect([k, n, Number(gotLo.toFixed(4)), Number(gotHi.toFixed(4))]).toEqual([k, n, lo, hi]);
    }
    expect(table).toHaveLength(5);
  });

  it('is [0, 1] with no runs, stays inside [0, 1] and contains the observed rate', () => {
    expect(wilsonInterval(0, 0)).toEqual([0, 1]);
    let checked = 0;
    for (const n of [1, 2, 5, 20, 400]) {
      for (let k = 0; k <= n; k += Math.max(1, Math.floor(n / 10))) {
        const [lo, hi] = wilsonInterval(k, n);
        expect(lo).toBeGreaterThanOrEqual(0);
        expect(hi).toBeLessThanOrEqual(1);
        expect(lo).toBeLessThanOrEqual(k / n);
        expect(hi).toBeGreaterThanOrEqual(k / n);
        expect(hi - lo).toBeGreaterThan(0);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(30);
  });

  it('refuses impossible counts', () => {
    expect(() => wilsonInterval(3, 2)).toThrow(/successes/);
    expect(() => wilsonInterval(-1, 2)).toThrow(/successes/);
    expect(() => wilsonInterval(0, 1.5)).toThrow(/n must/);
  });
});

describe('wilsonFromRate', () => {
  it('recovers the success count from a stored rate (k/n as a double) and gives its Wilson interval', () => {
    let checked = 0;
    for (const n of [1, 3, 7, 25, 49, 100, 333]) {
      for (let k = 0; k <= n; k++) {
        // k / n is what a summary stores; 7/49 etc. are not exact in binary, so the count must be rounded back.
        expect(wilsonFromRate(k / n, n)).toEqual(wilsonInterval(k, n));
        checked++;
      }
    }
    expect(checked).toBe(2 + 4 + 8 + 26 + 50 + 101 + 334);
  });

  it('rounds a rate stored with fewer digits to the nearest count (0.333 of 3 runs is 1 success)', () => {
    expect(wilsonFromRate(0.333, 3)).toEqual(wilsonInterval(1, 3));
    expect(wilsonFromRate(0.667, 3)).toEqual(wilsonInterval(2, 3));
    // Recalled from memory of Newcombe's Table I (Stat Med 17, 1998), as above: 15/148 → [0.0624, 0.1605].
    const [lo, hi] = wilsonFromRate(15 / 148, 148);
    expect([Number(lo.toFixed(4)), Number(hi.toFixed(4))]).toEqual([0.0624, 0.1605]);
  });

  it('is [0, 1] with no runs and refuses a rate outside [0, 1] or a fractional run count', () => {
    expect(wilsonFromRate(0, 0)).toEqual([0, 1]);
    expect(() => wilsonFromRate(1.2, 10)).toThrow(/rate must/);
    expect(() => wilsonFromRate(Number.NaN, 10)).toThrow(/rate must/);
    expect(() => wilsonFromRate(0.5, 2.5)).toThrow(/runs must/);
    expect(() => wilsonFromRate(0.5, -1)).toThrow(/runs must/);
  });
});

describe('runsForRateHalfWidth', () => {
  it('at p = 0.5 is ⌈(z/2h)² − z²⌉, the closed form of the Wilson half-width (z/2)/√(n + z²)', () => {
    const z = 1.959964;
    for (const h of [0.2, 0.1, 0.05, 0.02, 0.01]) {
      expect(runsForRateHalfWidth(h)).toBe(Math.ceil((z / (2 * h)) ** 2 - z * z));
    }
    // Worked: h = 0.05 → 384.15 − 3.84 = 380.3 → 381 runs (a Wald-based rule would say 385).
    expect(runsForRateHalfWidth(0.05)).toBe(381);
  });

  it('gives the smallest run count whose Wilson interval is that narrow', () => {
    let checked = 0;
    for (const p of [0.5, 0.8, 0.95, 1]) {
      for (const h of [0.1, 0.05, 0.025]) {
        const n = runsForRateHalfWidth(h, p);
        const halfAt = (m: number): number => {
          // Integer successes only where p·m is whole; compare with the formula at p directly otherwise.
          const [lo, hi] = wilsonInterval(Math.round(p * m), m);
          return (hi - lo) / 2;
        };
        if (Number.isInteger(p * n) && Number.isInteger(p * (n - 1))) {
          expect(halfAt(n)).toBeLessThanOrEqual(h + 1e-12);
          expect(halfAt(n - 1)).toBeGreaterThan(h);
          checked++;
        }
        // Skewed rates need fewer runs than the worst case.
        expect(n).toBeLessThanOrEqual(runsForRateHalfWidth(h));
      }
    }
    expect(checked).toBeGreaterThanOrEqual(3); // p = 0.5 at even n, p = 1 always
  });

  it('refuses a width outside (0, 0.5] and a rate outside [0, 1]', () => {
    expect(() => runsForRateHalfWidth(0)).toThrow(/halfWidth/);
    expect(() => runsForRateHalfWidth(0.6)).toThrow(/halfWidth/);
    expect(() => runsForRateHalfWidth(0.1, 1.2)).toThrow(/p must/);
  });
});

describe('Student t', () => {
  it('gives the 0.975 quantiles of a printed t table to 3 decimals', () => {
    // Two-sided 5 % critical values as printed in every t table (e.g. R. A. Fisher & F. Yates,
    // "Statistical Tables", Table III); recalled from memory, to 3 decimals.
    const table: [number, number][] = [[1, 12.706], [2, 4.303], [3, 3.182], [4, 2.776], [5, 2.571], [10, 2.228], [20, 2.086], [30, 2.042], [60, 2.0], [120, 1.98]];
    for (const [df, t] of table) expect([df, Number(studentT975(df).toFixed(3))]).toEqual([df, t]);
    expect(Number(studentT975(100_000).toFixed(3))).toBe(1.96);
  });

  it('df = 1 and 2 match their closed forms: tan(0.95·π/2) and 0.95·√(2/(1 − 0.95²))', () => {
    // Cauchy (df 1) and df 2 quantiles in closed form (Abramowitz & Stegun 26.7.3/26.7.4 with one term).
    expect(studentT975(1)).toBeCloseTo(Math.tan(0.95 * Math.PI / 2), 9);
    expect(studentT975(2)).toBeCloseTo(0.95 * Math.sqrt(2 / (1 - 0.95 * 0.95)), 9);
  });

  it('the exact inversion and the Cornish–Fisher expansion agree where they meet', () => {
    let checked = 0;
    // The expansion's first omitted term falls as 1/df⁵: 1e-7 at 30, 1e-11 at 200 where the code switches.
    for (const [df, tolerance] of [[30, 1e-7], [50, 1e-8], [100, 1e-10], [150, 3e-11], [200, 1e-11]]) {
      const exact = studentT975(df);
      expect(studentTwoSidedProbability(exact, df)).toBeCloseTo(0.95, 12);
      expect(Math.abs(cornishFisherT(df, 1.959963984540054) - exact)).toBeLessThan(tolerance);
      checked++;
    }
    expect(checked).toBe(5);
    // Continuous across the switch at 200.
    expect(studentT975(200) - studentT975(201)).toBeGreaterThan(0);
    expect(studentT975(200) - studentT975(201)).toBeLessThan(1e-4);
  });
});

describe('meanInterval', () => {
  it('is x̄ ± t·s/√n (worked: 1…5 gives 3 ± 2.7764·1.5811/2.2361)', () => {
    const [lo, hi] = meanInterval([1, 2, 3, 4, 5]) as [number, number];
    const half = 2.776445 * Math.sqrt(2.5) / Math.sqrt(5);
    expect(lo).toBeCloseTo(3 - half, 5);
    expect(hi).toBeCloseTo(3 + half, 5);
  });

  it('is null below two values and a point for constant values', () => {
    expect(meanInterval([])).toBeNull();
    expect(meanInterval([4])).toBeNull();
    expect(meanInterval([7, 7, 7])).toEqual([7, 7]);
  });

  it('covers the true mean about 95 % of the time (seeded simulation of normal samples)', () => {
    // Independent check of the whole method: 4000 samples of 8 normal values (Box–Muller over a
    // seeded LCG), true mean 10.
    let s = 12345;
    const uniform = (): number => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
      return (s + 0.5) / 4294967296;
    };
    const normal = (): number => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform());
    let covered = 0;
    const trials = 4000;
    for (let i = 0; i < trials; i++) {
      const [lo, hi] = meanInterval(Array.from({ length: 8 }, () => 10 + 3 * normal())) as [number, number];
      if (lo <= 10 && 10 <= hi) covered++;
    }
    // Binomial sd at 95 %: √(0.95·0.05/4000) = 0.34 %; ±1.5 % is over 4 sd.
    expect(covered / trials).toBeGreaterThan(0.935);
    expect(covered / trials).toBeLessThan(0.965);
  });
});

describe('nonNegativeMeanInterval', () => {
  it('cuts the t interval of counts at 0: counts 0, 0, 0, 1 give [0, 1.0456], not [−0.5456, 1.0456]', () => {
    // Hand-worked: mean 0.25, s = 0.5, t(0.975, 3) = 3.182446 (printed t tables; recalled from memory),
    // half-width 3.182446 · 0.5 / 2 = 0.795612; so [−0.545612, 1.045612] uncut.
    const [lo, hi] = meanInterval([0, 0, 0, 1])!;
    expect([lo, hi].map((v) => Number(v.toFixed(4)))).toEqual([-0.5456, 1.0456]);
    expect(nonNegativeMeanInterval([0, 0, 0, 1])).toEqual([0, hi]);
  });

  it('leaves an interval above 0 as it is, and is null below two values like meanInterval', () => {
    expect(nonNegativeMeanInterval([3, 4, 5, 4])).toEqual(meanInterval([3, 4, 5, 4]));
    expect(meanInterval([3, 4, 5, 4])![0]).toBeGreaterThan(0);
    expect(nonNegativeMeanInterval([2])).toBeNull();
    expect(nonNegativeMeanInterval([0, 0])).toEqual([0, 0]);
  });
});

describe('quantileInterval', () => {
  it('median of 10 values: ranks 2 and 9 (hand-worked: P(B ≤ 1) = 11/1024 = 1.07 %, P(B ≤ 2) = 56/1024 = 5.5 %)', () => {
    expect(quantileRanks(10, 0.5)).toEqual([2, 9]);
    expect(quantileInterval([10, 9, 8, 7, 6, 5, 4, 3, 2, 1], 0.5)).toEqual([2, 9]);
  });

  it('p95 needs 72 values: 0.95⁷¹ = 2.6 % > 2.5 % ≥ 0.95⁷² = 2.5 %', () => {
    expect(0.95 ** 71).toBeGreaterThan(0.025);
    expect(0.95 ** 72).toBeLessThanOrEqual(0.025);
    expect(quantileRanks(71, 0.95)).toBeNull();
    expect(quantileRanks(72, 0.95)?.[1]).toBe(72);
    expect(quantileInterval([1, 2, 3], 0.95)).toBeNull();
  });

  it('has at least 95 % binomial coverage and each tail at most 2.5 %, with the tightest ranks', () => {
    let checked = 0;
    for (const n of [20, 72, 100, 400, 2000]) {
      for (const q of [0.5, 0.9, 0.95]) {
        const ranks = quantileRanks(n, q);
        if (!ranks) continue;
        const [l, u] = ranks;
        // Binomial CDF by direct summation in log space, independent of the implementation's loop.
        const cumulative: number[] = [];
        let running = 0;
        for (let i = 0; i <= n; i++) {
          running += Math.exp(lnChoose(n, i) + i * Math.log(q) + (n - i) * Math.log(1 - q));
          cumulative.push(running);
        }
        const cdf = (k: number): number => (k < 0 ? 0 : cumulative[k]);
        expect(cdf(l - 1)).toBeLessThanOrEqual(0.025);
        expect(cdf(l)).toBeGreaterThan(0.025);
        expect(1 - cdf(u - 1)).toBeLessThanOrEqual(0.025 + 1e-12);
        expect(1 - cdf(u - 2)).toBeGreaterThan(0.025);
        expect(cdf(u - 1) - cdf(l - 1)).toBeGreaterThanOrEqual(0.95 - 1e-12);
        checked++;
      }
    }
    expect(checked).toBeGreaterThanOrEqual(12);
  });

  it('states its methods', () => {
    expect(CI95_METHOD.rate).toMatch(/Wilson/);
    expect(CI95_METHOD.mean).toMatch(/Student t/);
    expect(CI95_METHOD.quantile).toMatch(/order-statistic/);
  });
});

function lnChoose(n: number, k: number): number {
  let t = 0;
  for (let i = 1; i <= k; i++) t += Math.log((n - k + i) / i);
  return t;
}
