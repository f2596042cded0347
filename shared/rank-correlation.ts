/**
 * Spearman's rank correlation with average ranks for ties, and an approximate 95 % interval.
 * Pure and zod-free, so the report service, the web page and tests share one implementation.
 *
 * ρ is computed as Pearson's correlation of the ranks, which is exact with ties (the shortcut
 * 1 − 6Σd²/(n(n²−1)) is only exact without them).
 */
import { Z95, type Interval95 } from './confidence-interval';

/** Spearman's ρ with the number of pairs and an approximate 95 % interval (null when n < 4 or ρ undefined). */
export interface RankCorrelation {
  readonly n: number;
  /** Null when fewer than 2 pairs or one side has all values equal (ρ undefined). */
  readonly rho: number | null;
  readonly ci95: Interval95 | null;
}

/** Method text for pages and exports. */
export const RANK_CORRELATION_METHOD =
  "Spearman's rank correlation (average ranks for ties); 95 % interval by Fisher's z with standard error √(1.06 / (n − 3)) (Fieller, Hartley & Pearson, Biometrika 1957), shown from n = 4; at ρ = ±1 the inner end is computed at the nearest value without ties, 1 − 12/(n(n²−1)).";

/** Ranks 1..n of `values`, tied values sharing the mean of the ranks they span. */
export function averageRanks(values: readonly number[]): number[] {
  const order = values.map((v, i) => ({ v, i })).sort((a, b) => a.v - b.v);
  const ranks = new Array<number>(values.length);
  let start = 0;
  while (start < order.length) {
    let end = start;
    while (end + 1 < order.length && order[end + 1].v === order[start].v) end++;
    // Positions start..end (0-based) hold ranks start+1..end+1; their mean:
    const rank = (start + end) / 2 + 1;
    for (let j = start; j <= end; j++) ranks[order[j].i] = rank;
    start = end + 1;
  }
  return ranks;
}

/** Pearson's correlation of two equal-length series, or null when one of them has no spread. */
function pearson(x: readonly number[], y: readonly number[]): number | null {
  const n = x.length;
  const mx = x.reduce((s, v) => s + v, 0) / n;
  const my = y.reduce((s, v) => s + v, 0) / n;
  let sxy = 0;
  let sxx = 0;
  let syy = 0;
  for (let i = 0; i < n; i++) {
    sxy += (x[i] - mx) * (y[i] - my);
    sxx += (x[i] - mx) ** 2;
    syy += (y[i] - my) ** 2;
  }
  if (sxx === 0 || syy === 0) return null;
  return Math.max(-1, Math.min(1, sxy / Math.sqrt(sxx * syy)));
}


/** Spearman's ρ of paired series `x` and `y` (same length; pairs with a non-finite value are an error). */
export function spearman(x: readonly number[], y: readonly number[]): RankCorrelation {
  if (x.length !== y.length) throw new Error(`spearman: ${x.length} x values but ${y.length} y values`);
  if (![...x, ...y].every(Number.isFinite)) throw new Error('spearman: every value must be a finite number');
  const n = x.length;
  const rho = n < 2 ? null : pearson(averageRanks(x), averageRanks(y));
  if (rho === null || n < 4) return { n, rho, ci95: null };
  // Fisher's z of ρ is roughly normal with variance 1.06/(n−3) (Fieller, Hartley & Pearson 1957).
  const half = Z95 * Math.sqrt(1.06 / (n - 3));
  if (Math.abs(rho) === 1) {
    // z is infinite at |ρ| = 1, and a point interval would claim certainty from a few pairs. The
    // inner end is taken at the nearest value n pairs can give without ties, 1 − 12/(n(n²−1))
    // (two neighbouring ranks swapped: Σd² = 2), the outer end stays at ±1 (our own conservative
    // device, stated in RANK_CORRELATION_METHOD).
    const inner = Math.tanh(Math.atanh(1 - 12 / (n * (n * n - 1))) - half);
    return { n, rho, ci95: rho > 0 ? [inner, 1] : [-1, -inner] };
  }
  const z = Math.atanh(rho);
  return { n, rho, ci95: [Math.tanh(z - half), Math.tanh(z + half)] };
}
