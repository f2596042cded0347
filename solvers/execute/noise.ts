/**
 * Seeded timing noise: a log-normal factor with mean 1 per action, plus optional stalls.
 * Draws happen in a fixed order (actions in plan order, padding included; per action the
 * factor, then the stall test), so a seed always gives the same durations.
 */
import type { RobotProfile } from '@shared/plan';
import type { NoiseModel } from './execution-types';
import type { PreparedPlan } from './prepared-plan';

/** The noise model with defaults filled in (jitter from the profile, no stalls); throws on bad values. */
export function resolveNoise(profile: RobotProfile, noise: Partial<NoiseModel> = {}): NoiseModel {
  const resolved: NoiseModel = {
    jitterCv: noise.jitterCv ?? profile.timingJitter ?? 0,
    stallProbability: noise.stallProbability ?? 0,
    stallMs: noise.stallMs ?? 0,
  };
  if (!(resolved.jitterCv >= 0 && Number.isFinite(resolved.jitterCv))) throw new Error(`noise: field "jitterCv" must be ≥ 0, got ${resolved.jitterCv}`);
  if (!(resolved.stallProbability >= 0 && resolved.stallProbability <= 1)) {
    throw new Error(`noise: field "stallProbability" must be in [0, 1], got ${resolved.stallProbability}`);
  }
  if (!(resolved.stallMs >= 0 && Number.isFinite(resolved.stallMs))) throw new Error(`noise: field "stallMs" must be ≥ 0, got ${resolved.stallMs}`);
  return resolved;
}

/** The seed of run `run` of a batch seeded with `seed` (createRng mixes it through splitmix32). */
export function runSeed(seed: number, run: number): number {
  return (seed + Math.imul(run, 0x9e3779b9)) >>> 0;
}

/**
 * Fills `out` with the realised durations of the run seeded `seed`: exactly the numbers
 * `createRng(seed)` would give (a log-normal factor via `normal()`, then a stall test via
 * `next()`), drawn from an inlined copy of its sfc32 stream. The closure generator keeps its
 * 32-bit state in captured variables, which V8 boxes as heap numbers on every write; this is
 * the hot loop of a Monte Carlo batch, and locals stay in registers (noise.spec.ts checks that
 * both give the same durations). Log-normal with mean 1 and coefficient of variation cv:
 * σ² = ln(1 + cv²), μ = −σ²/2 (standard moments of the log-normal distribution, e.g.
 * N. L. Johnson, S. Kotz, N. Balakrishnan, "Continuous Univariate Distributions", vol. 1, ch. 14).
 * cv = 0 gives the factor exactly 1 (no draw, no floating drift).
 */
export function drawDurations(p: PreparedPlan, noise: NoiseModel, seed: number, out: Float64Array): void {
  const n = p.actionCount;
  const nominal = p.nominalMs;
  const cv = noise.jitterCv;
  const stallP = noise.stallProbability;
  const stallMs = noise.stallMs;
  const sigma2 = Math.log(1 + cv * cv);
  const sigma = Math.sqrt(sigma2);
  const mu = -sigma2 / 2;
  // Seeding as in random.ts: four splitmix32 outputs, then 12 discarded sfc32 outputs.
  let s = seed >>> 0;
  s = (s + 0x9e3779b9) >>> 0;
  let a = splitmixOutput(s);
  s = (s + 0x9e3779b9) >>> 0;
  let b = splitmixOutput(s);
  s = (s + 0x9e3779b9) >>> 0;
  let c = splitmixOutput(s);
  s = (s + 0x9e3779b9) >>> 0;
  let d = splitmixOutput(s);
  // sfc32 step on int32 locals: the same bits as random.ts's uint32 arithmetic (sums mod 2³²).
  let t = 0;
  for (let i = 0; i < 12; i++) {
    t = (a + b + d) | 0;
    d = (d + 1) | 0;
    a = b ^ (b >>> 9);
    b = (c + (c << 3)) | 0;
    c = (c << 21) | (c >>> 11);
    c = (c + t) | 0;
  }
  let hasSpare = false;
  let spare = 0;
  for (let k = 0; k < n; k++) {
    let dur = nominal[k];
    if (cv > 0) {
      let z: number;
      if (hasSpare) {
        z = spare;
        hasSpare = false;
      } else {
        // Box–Muller, as Rng.normal(): u ∈ (0, 1), v ∈ [0, 1), the sine kept for the next call.
        let u = 0;
        while (u === 0) {
          t = (a + b + d) | 0;
          d = (d + 1) | 0;
          a = b ^ (b >>> 9);
          b = (c + (c << 3)) | 0;
          c = (c << 21) | (c >>> 11);
          c = (c + t) | 0;
          u = (t >>> 0) / 4294967296;
        }
        t = (a + b + d) | 0;
        d = (d + 1) | 0;
        a = b ^ (b >>> 9);
        b = (c + (c << 3)) | 0;
        c = (c << 21) | (c >>> 11);
        c = (c + t) | 0;
        const v = (t >>> 0) / 4294967296;
        const r = Math.sqrt(-2 * Math.log(u));
        spare = r * Math.sin(2 * Math.PI * v);
        hasSpare = true;
        z = r * Math.cos(2 * Math.PI * v);
      }
      dur = dur * Math.exp(mu + sigma * z);
    }
    if (stallP > 0) {
      t = (a + b + d) | 0;
      d = (d + 1) | 0;
      a = b ^ (b >>> 9);
      b = (c + (c << 3)) | 0;
      c = (c << 21) | (c >>> 11);
      c = (c + t) | 0;
      if ((t >>> 0) / 4294967296 < stallP) dur += stallMs;
    }
    out[k] = dur;
  }
}

/** One splitmix32 output for state `s` (random.ts's seeding finaliser). */
function splitmixOutput(s: number): number {
  let z = s;
  z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
  z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
  return (z ^ (z >>> 16)) | 0;
}
