/**
 * Test helper: optimal weighted-split plans of small random instances (solveModel, which
 * validates each plan), under several timing profiles with diameter ≤ pitch.
 */
import type { RobotProfile, StartHeading } from '@shared/plan';
import { randomGridInstance } from '../../testing/random-grid-instance';
import type { MapfInstance } from '../../instance';
import { solveModel, type ModelResult } from '../../models/solve-model';
import { createRng, type Rng } from '../../random';

/** Turns slower, faster and as fast as moves; waits shorter and longer; diameter ≤ pitch. */
export const WEIGHTED_TEST_PROFILES: readonly RobotProfile[] = [
  { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 },
  { forwardMs: 800, quarterTurnMs: 300, waitMs: 500, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0 },
  { forwardMs: 1200, quarterTurnMs: 1200, waitMs: 1700, cellPitchMm: 500, robotDiameterMm: 500, timingJitter: 0 },
  { forwardMs: 700, quarterTurnMs: 2100, waitMs: 300, cellPitchMm: 600, robotDiameterMm: 450, timingJitter: 0 },
];

/** A random small instance: 3–5 × 3–5 cells, about 15 % blocked, 2–4 agents on distinct starts and goals. */
function randomInstance(rng: Rng): MapfInstance {
  const width = 3 + rng.int(3);
  const height = 3 + rng.int(3);
  return randomGridInstance(rng, width, height, () => 2 + rng.int(3), 0.15);
}

/** One solved, validated plan with its instance and profile. */
export interface WeightedTestPlan {
  readonly instance: MapfInstance;
  readonly profile: RobotProfile;
  readonly solved: ModelResult;
}

/** Up to `wanted` solved plans from a seeded stream of random instances (profiles in turn, start headings mixed). */
export function weightedTestPlans(wanted: number, seed = 1212): WeightedTestPlan[] {
  const rng = createRng(seed);
  const plans: WeightedTestPlan[] = [];
  for (let trial = 0; trial < 400 && plans.length < wanted; trial++) {
    const instance = randomInstance(rng);
    const profile = WEIGHTED_TEST_PROFILES[trial % WEIGHTED_TEST_PROFILES.length];
    const startHeading: StartHeading = trial % 3 === 0 ? 'free' : (['N', 'E', 'S', 'W'] as const)[rng.int(4)];
    const solved = solveModel('weighted-split', instance, { profile, startHeading, nodeLimit: 300 });
    if (solved.status !== 'solved' || !solved.isValidated) continue;
    plans.push({ instance, profile, solved });
  }
  return plans;
}
