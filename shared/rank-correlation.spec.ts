/** Spearman's ρ against outside values, ties by average ranks, and the interval's shape. */
import { averageRanks, spearman } from './rank-correlation';

describe('averageRanks', () => {
  it('gives tied values the mean of the ranks they span', () => {
    // Outside check: scipy.stats.rankdata (SciPy 1.17.1, method='average') gives
    // [1, 2.5, 2.5, 4, 6, 6, 6, 8] for this series.
    expect(averageRanks([1, 2, 2, 3, 5, 5, 5, 8])).toEqual([1, 2.5, 2.5, 4, 6, 6, 6, 8]);
    // Order of input does not matter, only values.
    expect(averageRanks([30, 10, 20])).toEqual([3, 1, 2]);
  });
});

describe('spearman', () => {
  it('matches the worked IQ / hours-of-television example (no ties)', () => {
    // Worked example of the Wikipedia article "Spearman's rank correlation coefficient" (recalled
    // from memory: ρ = −29/165 ≈ −0.1758); scipy.stats.spearmanr (SciPy 1.17.1) gives
    // −0.17575757575757575 on the same pairs.
    const iq = [106, 100, 86, 101, 99, 103, 97, 113, 112, 110];
    const tv = [7, 27, 2, 50, 28, 29, 20, 12, 6, 17];
    const r = spearman(iq, tv);
    expect(r.n).toBe(10);
    expect(r.rho).toBeCloseTo(-29 / 165, 12);
  });

  it('matches SciPy on a series with ties on both sides', () => {
    // scipy.stats.spearmanr (SciPy 1.17.1, average ranks) gives −0.9375732507716866.
    const r = spearman([1, 2, 2, 3, 5, 5, 5, 8], [10, 9, 9, 7, 7, 4, 3, 3]);
    expect(r.rho).toBeCloseTo(-0.9375732507716866, 12);
  });

  it('is 1 for any increasing transform and −1 for a reversal', () => {
    const x = [3, 1, 4, 1.5, 9, 2.6];
    expect(spearman(x, x.map((v) => v ** 3 + 7)).rho).toBeCloseTo(1, 12);
    expect(spearman(x, x.map((v) => -Math.exp(v))).rho).toBeCloseTo(-1, 12);
  });

  it('has no ρ when a side has no spread or too few pairs, and no interval below n = 4', () => {
    expect(spearman([1, 2, 3], [5, 5, 5]).rho).toBeNull();
    expect(spearman([1], [2]).rho).toBeNull();
    const three = spearman([1, 2, 3], [1, 3, 2]);
    expect(three.rho).toBeCloseTo(0.5, 12);
    expect(three.ci95).toBeNull();
  });

  it('gives an interval around ρ, inside [−1, 1], narrower with more pairs', () => {
    const x = Array.from({ length: 40 }, (_, i) => i);
    const y = x.map((v) => v + ((v * 7919) % 13) * 3); // deterministic scatter
    const small = spearman(x.slice(0, 10), y.slice(0, 10));
    const large = spearman(x, y);
    for (const r of [small, large]) {
      if (r.rho === null || r.ci95 === null) throw new Error('expected ρ and an interval');
      expect(r.ci95[0]).toBeLessThanOrEqual(r.rho);
      expect(r.ci95[1]).toBeGreaterThanOrEqual(r.rho);
      expect(r.ci95[0]).toBeGreaterThanOrEqual(-1);
      expect(r.ci95[1]).toBeLessThanOrEqual(1);
    }
    expect(large.ci95![1] - large.ci95![0]).toBeLessThan(small.ci95![1] - small.ci95![0]);
  });

  it('does not claim certainty from a perfect ρ on few pairs', () => {
    const r = spearman([1, 2, 3, 4, 5, 6], [2, 4, 8, 16, 32, 64]);
    expect(r.rho).toBe(1);
    // Inner end at the nearest tie-free value 1 − 12/(n(n²−1)) = 1 − 12/210, then Fisher's z.
    expect(r.ci95![0]).toBeCloseTo(Math.tanh(Math.atanh(1 - 12 / 210) - 1.959964 * Math.sqrt(1.06 / 3)), 12);
    expect(r.ci95![0]).toBeLessThan(0.6);
    expect(r.ci95![1]).toBe(1);
    const reversed = spearman([1, 2, 3, 4, 5, 6], [6, 5, 4, 3, 2, 1]);
    expect(reversed.ci95).toEqual([-1, -r.ci95![0]]);
  });

  it('refuses series of different length or non-finite values', () => {
    expect(() => spearman([1, 2], [1])).toThrow(/2 x values but 1 y values/);
    expect(() => spearman([1, NaN], [1, 2])).toThrow(/finite/);
  });
});
