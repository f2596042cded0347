/// <reference types="node" />
/**
 * Test helper: seeded batches whose results are pinned in execution-regression.spec.ts (values
 * recorded from the simulator before its broadphase and noise draws were rewritten for speed),
 * and a digest of a batch's per-run metrics so any drift in any run shows.
 */
import { createHash } from 'node:crypto';
import type { RobotProfile } from '@shared/plan';
import type { MapfInstance } from '../../instance';
import type { ExecutablePlan, ExecutionOptions, ExecutionSummary } from '../execution-types';
import { randomWalks } from './random-walks';

/** One pinned batch. */
export interface RegressionCase {
  readonly name: string;
  readonly instance: MapfInstance;
  readonly plan: ExecutablePlan;
  readonly profile: RobotProfile;
  readonly options: ExecutionOptions;
}

/** The walks of the pinned batches: every third robot stops early. */
function walks(seed: number, robots: number, actions: number, side: number, spacing: number, profile: RobotProfile) {
  return randomWalks(seed, { robots, actions, side, spacing, profile, stopsEarly: true });
}

const base: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0.1 };

/** The pinned batches: every policy, both collision modes, jitter and stalls, both broadphases, both timelines. */
export function regressionCases(): RegressionCase[] {
  const cases: RegressionCase[] = [];
  const sparse = walks(2024, 20, 60, 32, 3, base);
  const stalls = { jitterCv: 0.1, stallProbability: 0.02, stallMs: 2000 };
  for (const policy of ['open-loop', 'lockstep', 'dependency-gated'] as const) {
    for (const onCollision of ['count', 'stop'] as const) {
      cases.push({
        name: `sparse ${policy} ${onCollision}`, instance: sparse.instance, plan: { timeline: 'steps', schedule: sparse.schedule }, profile: base,
        options: { policy, onCollision, seed: 3, runs: 10, noise: stalls },
      });
    }
  }
  // Dense walks: with a small diameter and stalls only, stop-rule ties at equal times (order of found collisions matters).
  const small = { ...base, robotDiameterMm: 200 };
  const dense = walks(7, 30, 60, 24, 2, small);
  cases.push({
    name: 'dense ties open-loop stop', instance: dense.instance, plan: { timeline: 'steps', schedule: dense.schedule }, profile: small,
    options: { policy: 'open-loop', onCollision: 'stop', seed: 15, runs: 12, noise: { jitterCv: 0, stallProbability: 0.05, stallMs: 1000 } },
  });
  // Robots wider than two cells: reach 2, a candidate list too long, so the sweep.
  const wide = { ...base, robotDiameterMm: 1300 };
  const denseWide = walks(7, 30, 60, 24, 2, wide);
  for (const onCollision of ['count', 'stop'] as const) {
    cases.push({
      name: `dense wide lockstep ${onCollision}`, instance: denseWide.instance, plan: { timeline: 'steps', schedule: denseWide.schedule }, profile: wide,
      options: { policy: 'lockstep', onCollision, seed: 14, runs: 12, noise: { jitterCv: 0.3, stallProbability: 0.1, stallMs: 500 } },
    });
  }
  cases.push({
    name: 'sparse ms-timeline dependency-gated zero noise', instance: sparse.instance, plan: { timeline: 'ms', schedule: sparse.schedule }, profile: base,
    options: { policy: 'dependency-gated', seed: 1, runs: 3, noise: { jitterCv: 0 } },
  });
  return cases;
}

/**
 * First 16 hex digits of the SHA-256 of the batch's per-run metrics as JSON (Infinity written
 * out), over the fields the digests were pinned with (commit 16336ae); fields added since (the
 * per-robot waiting) are checked by their own specs, so the pins keep proving the old ones unchanged.
 */
export function perRunDigest(summary: ExecutionSummary): string {
  const pinned = summary.perRun.map((m) => ({
    run: m.run, isSuccess: m.isSuccess, isDeadlocked: m.isDeadlocked, collisions: m.collisions, realisedMakespanMs: m.realisedMakespanMs,
    realisedSocMs: m.realisedSocMs, waitingMs: m.waitingMs, finishSpreadMs: m.finishSpreadMs,
  }));
  const json = JSON.stringify(pinned, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
  return createHash('sha256').update(json).digest('hex').slice(0, 16);
}
