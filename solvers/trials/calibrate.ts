/**
 * Robot profile calibration from field trial logs: the maximum-likelihood fit of the simulator's
 * own noise model (solvers/execute/noise.ts) to the logged action durations.
 *
 * The model, as the simulator draws it: an action of kind k (forward, quarter turn, wait) with
 * nominal time m_k lasts d = m_k·F, then with probability p a stall of fixed length s is added:
 * d = m_k·F + s. F is log-normal with mean 1 and coefficient of variation cv (σ² = ln(1 + cv²),
 * μ = −σ²/2), one cv for all kinds (a profile has one timing jitter). So, with ν_k = ln m_k − σ²/2
 * (the log of the median duration of kind k), ln d ~ N(ν_k, σ²) without a stall and
 * ln(d − s) ~ N(ν_k, σ²) with one; the likelihood of a duration is the two-part mixture
 *   L(d) = (1 − p)·f(d; ν_k, σ) + p·f(d − s; ν_k, σ)·[d > s],   f = log-normal density.
 *
 * How stalls are identified: by the mixture itself, not by a cut-off. A fixed threshold ("slower
 * than 3× nominal is a stall") would misclassify the stalls shorter than the jitter spread and
 * count long jitter as stalls, biasing both p and cv; the mixture weighs every action by its
 * posterior probability of holding a stall (EM, Dempster, Laird & Rubin, JRSS B 39, 1977). For a
 * given s the EM steps are closed-form (weighted normal means and pooled variance of the log
 * durations); s itself is found by maximising the profile likelihood over s (a grid over the
 * range the outliers span, then golden-section refinement). An outlier screen only seeds that
 * range: log durations more than 3 robust standard deviations (1.4826 · MAD, common practice)
 * above their kind's median; when there are no more of them than a normal tail gives (and none
 * beyond 5.5), the data show no stalls and no search is made. Stalls shorter than about 3 jitter
 * SDs of the log duration cannot be told from jitter and end up in the fitted jitter and times.
 * Whether the data hold stalls at all is decided by BIC (G. Schwarz,
 * "Estimating the dimension of a model", Ann. Statist. 6(2), 1978): the stall model (two more
 * parameters, p and s) is kept only when 2·Δ log L > 2·ln n. Without stalls the MLE is closed-form.
 *
 * Reported: m_k = exp(ν_k + σ²/2) (forwardMs, quarterTurnMs, waitMs), cv = √(exp(σ²) − 1)
 * (timingJitter), p and s; by invariance these are the MLEs of the profile's own parameters. 95 %
 * intervals are asymptotic normal (Wald) from the observed Fisher information: the numerical
 * Hessian of log L in exactly those parameters at the maximum, inverted. Without stalls p = 0 lies
 * on the boundary, where Wald does not apply: its interval is the exact one-sided Clopper–Pearson
 * bound for 0 events in n, [0, 1 − 0.025^(1/n)] (Clopper & Pearson, Biometrika 26, 1934).
 *
 * What is fitted: every logged action that ended normally (rows marked `abort` are cut short and
 * are left out; `collision` rows are kept). Turns are quarter turns (turn-left and turn-right, one
 * kind). Waits are taken as one nominal length (plans of weighted-split wait for any length; fit
 * their waits and you get an average wait length, not a profile's waitMs).
 * Pure and deterministic: no randomness, no I/O.
 */
import type { Interval95 } from '@shared/confidence-interval';
import { Z95 } from '@shared/confidence-interval';
import type { RobotProfile } from '@shared/plan';
import type { TrialLog, TrialLogError } from '@shared/trial-log';

/** The duration kinds of a profile: forward moves, quarter turns (left and right), waits. */
export const CALIBRATION_KINDS = ['forward', 'turn', 'wait'] as const;
export type CalibrationKind = (typeof CALIBRATION_KINDS)[number];

/** One point of the goodness-of-fit (normal QQ) plot of standardised log durations. */
export interface QqPoint {
  /** Standard normal quantile at the point's plotting position (i − ½)/n. */
  readonly theoretical: number;
  /** The standardised log duration of that rank (stall removed from actions more likely stalled than not). */
  readonly observed: number;
}

/** The fit and everything needed to show and store it. */
export interface ProfileFit {
  /** Nominal times (mean duration without stalls), ms; null for a kind no log has. */
  readonly forwardMs: number | null;
  readonly quarterTurnMs: number | null;
  readonly waitMs: number | null;
  /** Log-normal coefficient of variation of durations (the profile's timingJitter). */
  readonly timingJitter: number;
  /** Probability that an action holds a stall (0 when the data show none). */
  readonly stallProbability: number;
  /** Length of one stall, ms (0 when the data show none). */
  readonly stallMs: number;
  /** Actions fitted per kind. */
  readonly actions: { readonly forward: number; readonly turn: number; readonly wait: number };
  /** 95 % intervals of each reported value (null for an absent kind; stallMs null without stalls). */
  readonly ci95: {
    readonly forwardMs: Interval95 | null;
    readonly quarterTurnMs: Interval95 | null;
    readonly waitMs: Interval95 | null;
    readonly timingJitter: Interval95 | null;
    readonly stallProbability: Interval95 | null;
    readonly stallMs: Interval95 | null;
  };
  /** Whether BIC kept the stall model. */
  readonly hasStalls: boolean;
  /** Maximised log-likelihood (durations in ms). */
  readonly logLikelihood: number;
  /** Expected number of stalled actions (sum of the posterior stall probabilities). */
  readonly stalledActions: number;
  readonly goodnessOfFit: {
    /** Up to QQ_POINTS points, evenly spread over the ranks (first and last included). */
    readonly qq: readonly QqPoint[];
    /** Kolmogorov–Smirnov distance of the standardised log durations from N(0, 1). */
    readonly ksDistance: number;
  };
  /** Provenance: per log, the rows fitted and the rows left out (aborted). */
  readonly sources: readonly { readonly file: string; readonly fitted: number; readonly excluded: number }[];
}

/** The outcome: a fit, or the rows that cannot be fitted (each naming file, line and field). */
export type CalibrationResult =
  | { readonly kind: 'fitted'; readonly fit: ProfileFit }
  | { readonly kind: 'invalid'; readonly errors: readonly TrialLogError[] };

/** Most QQ points returned for a plot. */
export const QQ_POINTS = 200;

const KIND_OF = { forward: 0, 'turn-left': 1, 'turn-right': 1, wait: 2 } as const;
const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** Fits the noise model to every normally ended action of `logs` (any number of runs of any plans). */
export function calibrateProfile(logs: readonly TrialLog[]): CalibrationResult {
  const errors: TrialLogError[] = [];
  const d: number[] = [];
  const kinds: number[] = [];
  const sources = logs.map((log) => {
    let fitted = 0;
    let excluded = 0;
    for (const row of log.rows) {
      if (row.event === 'abort') {
        excluded++;
        continue;
      }
      const duration = row.endMs - row.startMs;
      if (!(duration > 0)) {
        if (errors.length < 20) errors.push({ file: log.file, line: row.line, column: null, field: 'end_ms', message: 'the action lasts 0 ms; a duration to fit must be positive (mark a cut-short action as abort)' });
        continue;
      }
      d.push(duration);
      kinds.push(KIND_OF[row.action]);
      fitted++;
    }
    return { file: log.file, fitted, excluded };
  });
  if (errors.length > 0) return { kind: 'invalid', errors };
  if (d.length < 2) {
    return { kind: 'invalid', errors: [{ file: logs.map((l) => l.file).join(', ') || '(no log)', line: null, column: null, field: null, message: `calibration needs at least 2 timed actions, the logs hold ${d.length}` }] };
  }
  const data: Durations = { d: Float64Array.from(d), logD: Float64Array.from(d, Math.log), kind: Uint8Array.from(kinds), count: [0, 0, 0] };
  for (const k of data.kind) data.count[k]++;
  return { kind: 'fitted', fit: fitProfile(data, sources) };
}

/** The fit's contract keys, as `npm run -s calibrate -- --json` prints them (and an API may return them). */
export type CalibrationSummary = Pick<ProfileFit, 'forwardMs' | 'quarterTurnMs' | 'waitMs' | 'timingJitter' | 'stallProbability' | 'stallMs' | 'actions' | 'ci95'>;

/** The contract keys of a fit, in the documented order, and nothing else. */
export function calibrationSummary(fit: ProfileFit): CalibrationSummary {
  const { forwardMs, quarterTurnMs, waitMs, timingJitter, stallProbability, stallMs, actions, ci95 } = fit;
  return { forwardMs, quarterTurnMs, waitMs, timingJitter, stallProbability, stallMs, actions, ci95 };
}

/**
 * A profile from a fit: the fitted times rounded to whole ms (profiles hold whole ms), the kinds
 * no log had and the geometry taken from `base`; the stalls go with it as noise settings.
 */
export function profileFromFit(fit: ProfileFit, base: RobotProfile): { profile: RobotProfile; stallProbability: number; stallMs: number } {
  const ms = (v: number | null, fallback: number): number => (v === null ? fallback : Math.max(1, Math.round(v)));
  return {
    profile: {
      ...base,
      forwardMs: ms(fit.forwardMs, base.forwardMs),
      quarterTurnMs: ms(fit.quarterTurnMs, base.quarterTurnMs),
      waitMs: ms(fit.waitMs, base.waitMs),
      timingJitter: fit.timingJitter,
    },
    stallProbability: fit.stallProbability,
    stallMs: Math.round(fit.stallMs),
  };
}

// ---------------------------------------------------------------------------------------------

interface Durations {
  readonly d: Float64Array;
  readonly logD: Float64Array;
  readonly kind: Uint8Array;
  readonly count: [number, number, number];
}

/** Parameters on the fitting scale: log-medians ν per kind, log-scale σ, stall probability p and length s. */
interface MixtureParams {
  readonly nu: readonly [number, number, number];
  readonly sigma: number;
  readonly p: number;
  readonly s: number;
}

function fitProfile(data: Durations, sources: ProfileFit['sources']): ProfileFit {
  const n = data.d.length;
  const plain = fitWithoutStalls(data);
  const plainLl = logLikelihood(data, plain);
  const seeded = stallSeed(data);
  let best = plain;
  let bestLl = plainLl;
  if (seeded) {
    const stalled = fitStallLength(data, seeded.lo, seeded.hi);
    // BIC: two more parameters (p, s) must buy more than ln n each in log-likelihood terms.
    if (2 * (stalled.ll - plainLl) > 2 * Math.log(n)) {
      best = stalled.params;
      bestLl = stalled.ll;
    }
  }
  const hasStalls = best.p > 0;
  const sigma2 = best.sigma * best.sigma;
  const nominal = (k: number): number | null => (data.count[k] > 0 ? Math.exp(best.nu[k] + sigma2 / 2) : null);
  const cv = Math.sqrt(Math.expm1(sigma2));
  const ci = waldIntervals(data, best, hasStalls);
  const posterior = stallPosteriors(data, best);
  return {
    forwardMs: nominal(0),
    quarterTurnMs: nominal(1),
    waitMs: nominal(2),
    timingJitter: cv,
    stallProbability: best.p,
    stallMs: hasStalls ? best.s : 0,
    actions: { forward: data.count[0], turn: data.count[1], wait: data.count[2] },
    ci95: {
      forwardMs: ci.nominal[0],
      quarterTurnMs: ci.nominal[1],
      waitMs: ci.nominal[2],
      timingJitter: ci.cv,
      stallProbability: hasStalls ? ci.p : [0, 1 - Math.pow(0.025, 1 / n)],
      stallMs: hasStalls ? ci.s : null,
    },
    hasStalls,
    logLikelihood: bestLl,
    stalledActions: posterior.reduce((sum, r) => sum + r, 0),
    goodnessOfFit: goodnessOfFit(data, best, posterior),
    sources,
  };
}

/** Closed-form MLE without stalls: per-kind means and the pooled (divisor n) variance of log durations. */
function fitWithoutStalls(data: Durations): MixtureParams {
  const sum = [0, 0, 0];
  for (let i = 0; i < data.d.length; i++) sum[data.kind[i]] += data.logD[i];
  const nu: [number, number, number] = [0, 1, 2].map((k) => (data.count[k] > 0 ? sum[k] / data.count[k] : 0)) as [number, number, number];
  let ss = 0;
  for (let i = 0; i < data.d.length; i++) ss += (data.logD[i] - nu[data.kind[i]]) ** 2;
  return { nu, sigma: Math.sqrt(Math.max(ss / data.d.length, 1e-12)), p: 0, s: 0 };
}

/** The range of stall lengths the outliers suggest, or null when no log duration stands out. */
function stallSeed(data: Durations): { lo: number; hi: number } | null {
  const median = (xs: number[]): number => {
    const sorted = [...xs].sort((a, b) => a - b);
    const m = sorted.length >> 1;
    return sorted.length % 2 === 1 ? sorted[m] : (sorted[m - 1] + sorted[m]) / 2;
  };
  const byKind: number[][] = [[], [], []];
  for (let i = 0; i < data.d.length; i++) byKind[data.kind[i]].push(data.logD[i]);
  const centre = byKind.map((xs) => (xs.length > 0 ? median(xs) : 0));
  const residual = Array.from(data.logD, (y, i) => y - centre[data.kind[i]]);
  // Floored: durations logged with few distinct values (most equal to their kind's median) have MAD 0.
  const robustSd = Math.max(1.4826 * median(residual.map(Math.abs)), 1e-6);
  const excess: number[] = [];
  let isFar = false;
  residual.forEach((e, i) => {
    if (e > 3 * robustSd) excess.push(data.d[i] - Math.exp(centre[data.kind[i]]));
    if (e > 5.5 * robustSd) isFar = true;
  });
  // Search for stalls only when the upper tail shows them: more log durations beyond 3 robust SDs
  // than a normal tail gives (P(Z > 3) = 0.00135, common practice) by 3 binomial SDs, or one beyond
  // 5.5 (P ≈ 2e-8: not expected in a million actions). Without that evidence the mixture would
  // only chase the normal tail, slowly (EM creeps as p → 0), and BIC would refuse it anyway.
  const expected = data.d.length * 0.0013499;
  if (!isFar && excess.length <= expected + 3 * Math.sqrt(expected) + 1) return null;
  let maxD = 0;
  let minExcess = Infinity;
  let maxExcess = 0;
  for (const x of data.d) maxD = Math.max(maxD, x);
  for (const x of excess) {
    minExcess = Math.min(minExcess, x);
    maxExcess = Math.max(maxExcess, x);
  }
  return { lo: 0.5 * minExcess, hi: Math.min(1.5 * maxExcess, maxD) };
}

/** Every `stride`-th duration: the grid stage's sample when there are many (it only brackets the maximum). */
function strideSample(data: Durations, stride: number): Durations {
  const pick = Array.from({ length: Math.ceil(data.d.length / stride) }, (_, j) => j * stride);
  const sample: Durations = {
    d: Float64Array.from(pick, (i) => data.d[i]), logD: Float64Array.from(pick, (i) => data.logD[i]),
    kind: Uint8Array.from(pick, (i) => data.kind[i]), count: [0, 0, 0],
  };
  for (const k of sample.kind) sample.count[k]++;
  return sample;
}

/** The stall length maximising the profile likelihood on [lo, hi]: a 24-point geometric grid, then golden section around the best. */
function fitStallLength(data: Durations, lo: number, hi: number): { params: MixtureParams; ll: number } {
  // Each EM starts from the fit at the previous stall length (the profile likelihood is continuous in s).
  // The grid only brackets the maximum, so its EM runs stop after 30 steps; the refinement runs to convergence.
  // Above 20,000 durations the grid runs on an evenly strided sample (a kind absent from it keeps its start).
  let warm: MixtureParams | undefined;
  let maxSteps = 30;
  let fitted = data.d.length > 20_000 ? strideSample(data, Math.ceil(data.d.length / 20_000)) : data;
  const at = (s: number): { params: MixtureParams; ll: number } => {
    const result = emAtStall(fitted, s, warm, maxSteps);
    warm = result.params;
    return result;
  };
  const GRID = 24;
  const grid = Array.from({ length: GRID }, (_, j) => lo * Math.pow(hi / lo, j / (GRID - 1)));
  let bestJ = 0;
  let best = at(grid[0]);
  for (let j = 1; j < GRID; j++) {
    const here = at(grid[j]);
    if (here.ll > best.ll) {
      best = here;
      bestJ = j;
    }
  }
  maxSteps = 200;
  fitted = data;
  warm = best.params;
  best = at(grid[bestJ]);
  let a = grid[Math.max(0, bestJ - 1)];
  let b = grid[Math.min(GRID - 1, bestJ + 1)];
  const phi = (Math.sqrt(5) - 1) / 2;
  let x1 = b - phi * (b - a);
  let x2 = a + phi * (b - a);
  let f1 = at(x1);
  let f2 = at(x2);
  for (let it = 0; it < 40 && b - a > 1e-4 * b; it++) {
    if (f1.ll >= f2.ll) {
      b = x2;
      x2 = x1;
      f2 = f1;
      x1 = b - phi * (b - a);
      f1 = at(x1);
    } else {
      a = x1;
      x1 = x2;
      f1 = f2;
      x2 = a + phi * (b - a);
      f2 = at(x2);
    }
  }
  for (const f of [f1, f2]) if (f.ll > best.ll) best = f;
  return best;
}

/**
 * EM for ν, σ and p with the stall length fixed at s, from `start` (else the fit without stalls
 * and p = 5 %), until log L gains less than 1e-9 per action (at most maxSteps steps); returns the
 * parameters and log L.
 */
function emAtStall(data: Durations, s: number, start: MixtureParams | undefined, maxSteps: number): { params: MixtureParams; ll: number } {
  const n = data.d.length;
  let params: MixtureParams = start ? { ...start, p: Math.max(start.p, 0.01), s } : { ...fitWithoutStalls(data), p: 0.05, s };
  const r = new Float64Array(n);
  const logShift = Float64Array.from(data.d, (x) => (x > s ? Math.log(x - s) : NaN));
  let ll = posteriors(data, params, r, logShift);
  // EM creeps when the stall part fades (p → 0 at a poor s); 200 steps settle every s worth keeping.
  for (let it = 0; it < maxSteps; it++) {
    const sum = [0, 0, 0];
    let stalls = 0;
    for (let i = 0; i < n; i++) {
      const ri = r[i];
      stalls += ri;
      sum[data.kind[i]] += (1 - ri) * data.logD[i] + (ri > 0 ? ri * logShift[i] : 0);
    }
    const nu = [0, 1, 2].map((k) => (data.count[k] > 0 ? sum[k] / data.count[k] : 0)) as [number, number, number];
    let ss = 0;
    for (let i = 0; i < n; i++) {
      const ri = r[i];
      const m = nu[data.kind[i]];
      ss += (1 - ri) * (data.logD[i] - m) ** 2 + (ri > 0 ? ri * (logShift[i] - m) ** 2 : 0);
    }
    params = { nu, sigma: Math.sqrt(Math.max(ss / n, 1e-12)), p: Math.min(Math.max(stalls / n, 1e-12), 1 - 1e-12), s };
    const next = posteriors(data, params, r, logShift);
    const gain = next - ll;
    ll = next;
    if (gain < 1e-9 * n) break;
  }
  return { params, ll };
}

/** Log-normal log-density at x > 0 (given as ln x) with log-mean ν and log-sd σ. */
function logDensity(logX: number, nu: number, sigma: number): number {
  const z = (logX - nu) / sigma;
  return -logX - Math.log(sigma) - LOG_SQRT_2PI - 0.5 * z * z;
}

/** Fills r with each action's posterior stall probability and returns log L (logShift[i] = ln(d_i − s), when given). */
function posteriors(data: Durations, q: MixtureParams, r: Float64Array, logShift?: Float64Array): number {
  let ll = 0;
  const lp = Math.log(q.p);
  const l1p = Math.log1p(-q.p);
  for (let i = 0; i < data.d.length; i++) {
    const nu = q.nu[data.kind[i]];
    const a = l1p + logDensity(data.logD[i], nu, q.sigma);
    const x = data.d[i] - q.s;
    if (q.p > 0 && x > 0) {
      const b = lp + logDensity(logShift ? logShift[i] : Math.log(x), nu, q.sigma);
      const m = Math.max(a, b);
      const total = m + Math.log(Math.exp(a - m) + Math.exp(b - m));
      r[i] = Math.exp(b - total);
      ll += total;
    } else {
      r[i] = 0;
      ll += a;
    }
  }
  return ll;
}

function logLikelihood(data: Durations, q: MixtureParams): number {
  return posteriors(data, q, new Float64Array(data.d.length));
}

function stallPosteriors(data: Durations, q: MixtureParams): Float64Array {
  const r = new Float64Array(data.d.length);
  if (q.p > 0) posteriors(data, q, r);
  return r;
}

/**
 * Wald 95 % intervals from the observed information in the reported parameters (m_k of the
 * kinds present, cv, and p, s with stalls): central-difference Hessian of log L, inverted.
 */
function waldIntervals(data: Durations, q: MixtureParams, hasStalls: boolean) {
  const kinds = [0, 1, 2].filter((k) => data.count[k] > 0);
  const sigma2 = q.sigma * q.sigma;
  const theta = [...kinds.map((k) => Math.exp(q.nu[k] + sigma2 / 2)), Math.sqrt(Math.expm1(sigma2)), ...(hasStalls ? [q.p, q.s] : [])];
  const toParams = (t: readonly number[]): MixtureParams | null => {
    const cv = t[kinds.length];
    if (!(cv > 0) || t.slice(0, kinds.length).some((m) => !(m > 0))) return null;
    const s2 = Math.log1p(cv * cv);
    const nu: [number, number, number] = [0, 0, 0];
    kinds.forEach((k, j) => {
      nu[k] = Math.log(t[j]) - s2 / 2;
    });
    const p = hasStalls ? t[kinds.length + 1] : 0;
    if (hasStalls && !(p > 0 && p < 1)) return null;
    return { nu, sigma: Math.sqrt(s2), p, s: hasStalls ? t[kinds.length + 2] : 0 };
  };
  const ll = (t: readonly number[]): number => {
    const params = toParams(t);
    return params ? logLikelihood(data, params) : NaN;
  };
  const dim = theta.length;
  const h = theta.map((v) => 1e-4 * Math.abs(v));
  const f0 = ll(theta);
  const shifted = (i: number, di: number, j = -1, dj = 0): number => {
    const t = [...theta];
    t[i] += di * h[i];
    if (j >= 0) t[j] += dj * h[j];
    return ll(t);
  };
  const info: number[][] = Array.from({ length: dim }, () => new Array<number>(dim).fill(0));
  for (let i = 0; i < dim; i++) {
    info[i][i] = -(shifted(i, 1) - 2 * f0 + shifted(i, -1)) / (h[i] * h[i]);
    for (let j = 0; j < i; j++) {
      const v = -(shifted(i, 1, j, 1) - shifted(i, 1, j, -1) - shifted(i, -1, j, 1) + shifted(i, -1, j, -1)) / (4 * h[i] * h[j]);
      info[i][j] = v;
      info[j][i] = v;
    }
  }
  const cov = invert(info);
  const interval = (j: number, lo = 0, hi = Infinity): Interval95 | null => {
    const variance = cov?.[j][j];
    if (variance === undefined || !(variance > 0) || !Number.isFinite(variance)) return null;
    const half = Z95 * Math.sqrt(variance);
    return [Math.max(lo, theta[j] - half), Math.min(hi, theta[j] + half)];
  };
  const nominal: (Interval95 | null)[] = [null, null, null];
  kinds.forEach((k, j) => {
    nominal[k] = interval(j);
  });
  return {
    nominal,
    cv: interval(kinds.length),
    p: hasStalls ? interval(kinds.length + 1, 0, 1) : null,
    s: hasStalls ? interval(kinds.length + 2) : null,
  };
}

/** Gauss–Jordan inverse with partial pivoting; null when singular. */
function invert(m: readonly (readonly number[])[]): number[][] | null {
  const n = m.length;
  const a = m.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let pivot = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(a[r][c]) > Math.abs(a[pivot][c])) pivot = r;
    if (!(Math.abs(a[pivot][c]) > 0) || !Number.isFinite(a[pivot][c])) return null;
    [a[c], a[pivot]] = [a[pivot], a[c]];
    const div = a[c][c];
    for (let j = 0; j < 2 * n; j++) a[c][j] /= div;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = a[r][c];
      if (f !== 0) for (let j = 0; j < 2 * n; j++) a[r][j] -= f * a[c][j];
    }
  }
  return a.map((row) => row.slice(n));
}

/**
 * QQ points and KS distance of the standardised log durations z = (ln d − ν_k)/σ, with the stall
 * taken off (ln(d − s)) for actions whose posterior stall probability exceeds ½.
 */
function goodnessOfFit(data: Durations, q: MixtureParams, posterior: Float64Array): ProfileFit['goodnessOfFit'] {
  const n = data.d.length;
  const z = Array.from(data.d, (x, i) => {
    const y = posterior[i] > 0.5 ? Math.log(x - q.s) : data.logD[i];
    return (y - q.nu[data.kind[i]]) / q.sigma;
  }).sort((a, b) => a - b);
  let ks = 0;
  for (let i = 0; i < n; i++) {
    const F = normalCdf(z[i]);
    ks = Math.max(ks, F - i / n, (i + 1) / n - F);
  }
  const points = Math.min(n, QQ_POINTS);
  const qq = Array.from({ length: points }, (_, j) => {
    const i = points === 1 ? 0 : Math.round((j * (n - 1)) / (points - 1));
    return { theoretical: normalQuantile((i + 0.5) / n), observed: z[i] };
  });
  return { qq, ksDistance: ks };
}

/**
 * Standard normal CDF via the complementary error function of W. H. Press et al., "Numerical
 * Recipes", 2nd ed., §6.2 (erfcc, Chebyshev fit, fractional error below 1.2e-7; coefficients
 * recalled from memory, checked in calibrate.spec.ts against jstat).
 */
export function normalCdf(x: number): number {
  const y = Math.abs(x) / Math.SQRT2;
  const t = 1 / (1 + 0.5 * y);
  const erfc = t * Math.exp(-y * y - 1.26551223 + t * (1.00002368 + t * (0.37409196 + t * (0.09678418 + t * (-0.18628806
    + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))));
  return x >= 0 ? 1 - erfc / 2 : erfc / 2;
}

/** Standard normal quantile: Newton's method on normalCdf from a logistic start (enough for plotting positions). */
export function normalQuantile(p: number): number {
  if (!(p > 0 && p < 1)) throw new RangeError(`normalQuantile: p must be in (0, 1), got ${p}`);
  let x = Math.log(p / (1 - p)) / 1.702;
  for (let it = 0; it < 50; it++) {
    const density = Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
    const step = (normalCdf(x) - p) / density;
    x -= Math.max(-1, Math.min(1, step));
    if (Math.abs(step) < 1e-12) break;
  }
  return x;
}
