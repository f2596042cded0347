/**
 * 95 % confidence intervals for the Monte Carlo figures of an execution batch: the success rate
 * (Wilson score), means (Student t) and the 95th percentile (distribution-free order statistics).
 * Pure and zod-free, so web, api and solvers share one computation. Each run of a batch is an
 * independent draw (its own seed), which is what every method below assumes.
 */

/** A two-sided 95 % interval [lo, hi]. */
export type Interval95 = readonly [lo: number, hi: number];

/** The standard normal 0.975 quantile to 7 digits (common practice; the usual 1.96): the z of the Wilson interval and of other two-sided 95 % normal intervals. */
export const Z95 = 1.959964;
/** The same quantile to double precision (common practice), for the t expansion. */
const Z975 = 1.959963984540054;

/** One-line method texts, for the UI, exports and the README glossary. */
export const CI95_METHOD = {
  rate: 'Wilson score interval, z = 1.96 (Wilson 1927; Newcombe, Stat Med 1998)',
  mean: 'Student t interval of the mean over runs, mean ± t(0.975, n−1)·s/√n',
  quantile: 'Distribution-free order-statistic interval (binomial ranks), at least 95 % coverage; needs ≥ 72 runs for the p95',
} as const;

/**
 * Wilson score interval for `successes` of `n` (E. B. Wilson, JASA 22, 1927; method 3 of
 * R. G. Newcombe, "Two-sided confidence intervals for the single proportion", Stat Med 17, 1998):
 * centre (p̂ + z²/2n)/(1 + z²/n), half-width z·√(p̂(1−p̂)/n + z²/4n²)/(1 + z²/n). Never leaves
 * [0, 1] and never has width 0, unlike the Wald interval. n = 0 gives [0, 1] (nothing is known).
 */
export function wilsonInterval(successes: number, n: number): Interval95 {
  if (!(Number.isInteger(n) && n >= 0)) throw new RangeError(`wilsonInterval: n must be a whole number ≥ 0, got ${n}`);
  if (!(successes >= 0 && successes <= n)) throw new RangeError(`wilsonInterval: successes must be in [0, ${n}], got ${successes}`);
  if (n === 0) return [0, 1];
  const [lo, hi] = wilsonAt(successes / n, n);
  // Exact ends at the edges (the formula gives them up to rounding).
  return [successes === 0 ? 0 : lo, successes === n ? 1 : hi];
}

/**
 * Wilson interval of a stored success rate over `runs` runs, for summaries that keep only the rate
 * (older stored executions, leaderboard rows): the success count is recovered as
 * Math.round(rate × runs) — the rate was that count divided by runs, so rounding undoes the
 * floating-point error of the division. runs = 0 gives [0, 1] (nothing is known).
 */
export function wilsonFromRate(rate: number, runs: number): Interval95 {
  if (!(Number.isInteger(runs) && runs >= 0)) throw new RangeError(`wilsonFromRate: runs must be a whole number ≥ 0, got ${runs}`);
  if (!(rate >= 0 && rate <= 1)) throw new RangeError(`wilsonFromRate: rate must be in [0, 1], got ${rate}`);
  return wilsonInterval(Math.round(rate * runs), runs);
}

/** The Wilson interval at a (possibly fractional) observed rate p over n runs. */
function wilsonAt(p: number, n: number): Interval95 {
  const z2 = Z95 * Z95;
  const denominator = 1 + z2 / n;
  const centre = (p + z2 / (2 * n)) / denominator;
  const half = (Z95 * Math.sqrt((p * (1 - p)) / n + z2 / (4 * n * n))) / denominator;
  return [Math.max(0, centre - half), Math.min(1, centre + half)];
}

/**
 * Runs needed so that the Wilson interval of a rate observed at `p` (default 0.5, the widest
 * case) has half-width at most `halfWidth`: the smallest such n (the half-width falls as n grows).
 * At p = 0.5 the half-width is (z/2)/√(n + z²), so n = ⌈(z/2h)² − z²⌉.
 */
export function runsForRateHalfWidth(halfWidth: number, p = 0.5): number {
  if (!(halfWidth > 0 && halfWidth <= 0.5)) throw new RangeError(`runsForRateHalfWidth: halfWidth must be in (0, 0.5], got ${halfWidth}`);
  if (!(p >= 0 && p <= 1)) throw new RangeError(`runsForRateHalfWidth: p must be in [0, 1], got ${p}`);
  const halfAt = (n: number): number => {
    const [lo, hi] = wilsonAt(p, n);
    return (hi - lo) / 2;
  };
  let lo = 1;
  let hi = 1;
  while (halfAt(hi) > halfWidth) hi *= 2;
  // Smallest n in [lo, hi] with halfAt(n) ≤ halfWidth (bisection on a decreasing function).
  while (lo < hi) {
    const mid = Math.floor((lo + hi) / 2);
    if (halfAt(mid) <= halfWidth) hi = mid;
    else lo = mid + 1;
  }
  return lo;
}

/**
 * Student t interval of the mean: x̄ ± t(0.975, n−1)·s/√n, s the sample standard deviation
 * (divisor n − 1). Exact for normal values and close for others at the run counts used here
 * (central limit theorem; common practice). null when n < 2 (no spread to estimate).
 */
export function meanInterval(values: readonly number[]): Interval95 | null {
  const n = values.length;
  if (n < 2) return null;
  let sum = 0;
  for (const v of values) sum += v;
  const mean = sum / n;
  let squares = 0;
  for (const v of values) squares += (v - mean) * (v - mean);
  const half = (studentT975(n - 1) * Math.sqrt(squares / (n - 1))) / Math.sqrt(n);
  return [mean - half, mean + half];
}

/**
 * meanInterval for values that cannot be negative (counts, such as collisions per run): the
 * symmetric t interval cut at 0. A mean of non-negative values cannot be negative, so the cut
 * part holds no possible value and the coverage can only grow; left uncut, a few rare events
 * (counts 0, 0, 0, 1) print a lower bound of −0.55. The one place this cut is made.
 */
export function nonNegativeMeanInterval(values: readonly number[]): Interval95 | null {
  const interval = meanInterval(values);
  return interval && [Math.max(0, interval[0]), interval[1]];
}

const tCache = new Map<number, number>();

/**
 * The 0.975 quantile of Student's t with `df` degrees of freedom (whole df ≥ 1). For df ≤ 200 it
 * inverts the exact finite-sum distribution function of M. Abramowitz & I. A. Stegun, "Handbook of
 * Mathematical Functions" (1964), 26.7.3 (odd df) and 26.7.4 (even df), by bisection; above, the
 * Cornish–Fisher expansion of 26.7.5 in powers of 1/df (the two agree to 3e-8 at df = 30 and 3e-12 at df = 200, the
 * switch; error ∝ 1/df⁵; both are
 * checked against each other and against a printed t table in confidence-interval.spec.ts).
 */
export function studentT975(df: number): number {
  if (!(Number.isInteger(df) && df >= 1)) throw new RangeError(`studentT975: df must be a whole number ≥ 1, got ${df}`);
  const cached = tCache.get(df);
  if (cached !== undefined) return cached;
  const t = df <= 200 ? invertTwoSided(df, 0.95) : cornishFisherT(df, Z975);
  tCache.set(df, t);
  return t;
}

/** A(t | ν) = P(|T| ≤ t) for Student's t with whole ν (Abramowitz & Stegun 26.7.3, 26.7.4). */
export function studentTwoSidedProbability(t: number, df: number): number {
  const theta = Math.atan(t / Math.sqrt(df));
  const c2 = Math.cos(theta) ** 2;
  if (df % 2 === 0) {
    // sin θ · {1 + (1/2)c² + (1·3)/(2·4)c⁴ + … + (1·3…(ν−3))/(2·4…(ν−2))c^(ν−2)}
    let term = 1;
    let sum = 1;
    for (let k = 2; k <= df - 2; k += 2) {
      term *= ((k - 1) / k) * c2;
      sum += term;
    }
    return Math.sin(theta) * sum;
  }
  if (df === 1) return (2 / Math.PI) * theta;
  // (2/π){θ + sin θ cos θ [1 + (2/3)c² + … + (2·4…(ν−3))/(1·3…(ν−2))c^(ν−3)]}
  let term = 1;
  let sum = 1;
  for (let k = 2; k <= df - 3; k += 2) {
    term *= (k / (k + 1)) * c2;
    sum += term;
  }
  return (2 / Math.PI) * (theta + Math.sin(theta) * Math.cos(theta) * sum);
}

/** The t with A(t | df) = level, by bisection (A rises from 0 to 1 in t). */
function invertTwoSided(df: number, level: number): number {
  let lo = 0;
  let hi = 1;
  while (studentTwoSidedProbability(hi, df) < level) hi *= 2;
  for (let i = 0; i < 200 && hi - lo > 1e-12 * hi; i++) {
    const mid = (lo + hi) / 2;
    if (studentTwoSidedProbability(mid, df) < level) lo = mid;
    else hi = mid;
  }
  return (lo + hi) / 2;
}

/** Cornish–Fisher expansion of the t quantile from the normal one (Abramowitz & Stegun 26.7.5; coefficients recalled from memory, checked in the spec against the exact inversion). */
export function cornishFisherT(df: number, z: number): number {
  const z2 = z * z;
  const g1 = (z * (z2 + 1)) / 4;
  const g2 = (z * ((5 * z2 + 16) * z2 + 3)) / 96;
  const g3 = (z * (((3 * z2 + 19) * z2 + 17) * z2 - 15)) / 384;
  const g4 = (z * ((((79 * z2 + 776) * z2 + 1482) * z2 - 1920) * z2 - 945)) / 92160;
  return z + g1 / df + g2 / df ** 2 + g3 / df ** 3 + g4 / df ** 4;
}

/**
 * Distribution-free interval for the q-quantile from order statistics: [x₍l₎, x₍u₎] (1-based ranks
 * of the sorted values) with l the largest rank such that P(B ≤ l − 1) ≤ 2.5 % and u the smallest
 * with P(B ≥ u) ≤ 2.5 %, B ~ Binomial(n, q) the number of values below the true quantile, so the
 * coverage P(l ≤ B ≤ u − 1) is at least 95 % whatever the distribution (W. J. Conover, "Practical
 * Nonparametric Statistics", 3rd ed. 1999, §3.2; G. J. Hahn & W. Q. Meeker, "Statistical
 * Intervals", 1991, ch. 5). null when n is too small for such ranks to exist (for q = 0.95: n < 72,
 * since 0.95ⁿ > 2.5 % below that).
 */
export function quantileInterval(values: readonly number[], q: number): Interval95 | null {
  return quantileIntervalOfSorted([...values].sort((a, b) => a - b), q);
}

/** quantileInterval for values already sorted ascending (saves a sort in the hot summary path). */
export function quantileIntervalOfSorted(sorted: readonly number[], q: number): Interval95 | null {
  const ranks = quantileRanks(sorted.length, q);
  return ranks ? [sorted[ranks[0] - 1], sorted[ranks[1] - 1]] : null;
}

/** The 1-based ranks [l, u] of quantileInterval for n values, or null when none exist. */
export function quantileRanks(n: number, q: number): readonly [number, number] | null {
  if (!(q > 0 && q < 1)) throw new RangeError(`quantileInterval: q must be in (0, 1), got ${q}`);
  if (n < 1) return null;
  const tail = 0.025;
  // Binomial(n, q) probabilities in log space (no underflow of qⁿ for large n).
  const logQ = Math.log(q);
  const log1Q = Math.log1p(-q);
  const pmf = new Float64Array(n + 1);
  let logChoose = 0;
  for (let i = 0; i <= n; i++) {
    if (i > 0) logChoose += Math.log((n - i + 1) / i);
    pmf[i] = Math.exp(logChoose + i * logQ + (n - i) * log1Q);
  }
  // l: largest with P(B ≤ l − 1) ≤ tail.
  let lower = 0;
  let l = 0;
  while (l < n && lower + pmf[l] <= tail) {
    lower += pmf[l];
    l++;
  }
  // u: smallest with P(B ≥ u) ≤ tail.
  let upper = 0;
  let u = n + 1;
  while (u > 1 && upper + pmf[u - 1] <= tail) {
    upper += pmf[u - 1];
    u--;
  }
  if (l < 1 || u > n || l > u) return null;
  return [l, u];
}
