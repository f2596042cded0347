/**
 * Seeded timing noise: a log-normal factor with mean 1 per action, plus optional stalls.
 * Draws happen in a fixed order (actions in plan order, padding included; per action the
 * factor, then the stall test), so a seed always gives the same durations.
 */
import type { RobotProfile } from '@shared/plan';
import type { Rng } from '../random';
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
 * Fills `out` with realised durations. Log-normal with mean 1 and coefficient of variation cv:
 * σ² = ln(1 + cv²), μ = −σ²/2 (standard moments of the log-normal distribution, e.g.
 * N. L. Johnson, S. Kotz, N. Balakrishnan, "Continuous Univariate Distributions", vol. 1, ch. 14).
 * cv = 0 gives the factor exactly 1 (no draw, no floating drift).
 */
export function drawDurations(p: PreparedPlan, noise: NoiseModel, rng: Rng, out: Float64Array): void {
  const n = p.actionCount;
  const nominal = p.nominalMs;
  const cv = noise.jitterCv;
  const stallP = noise.stallProbability;
  const stallMs = noise.stallMs;
  const sigma2 = Math.log(1 + cv * cv);
  const sigma = Math.sqrt(sigma2);
  const mu = -sigma2 / 2;
  for (let a = 0; a < n; a++) {
    let d = cv > 0 ? nominal[a] * Math.exp(mu + sigma * rng.normal()) : nominal[a];
    if (stallP > 0 && rng.next() < stallP) d += stallMs;
    out[a] = d;
  }
}
