/// <reference types="node" />
/**
 * Test helper: seeded batches whose results are pinned in execution-regression.spec.ts (values
 * recorded from the simulator before its broadphase and noise draws were rewritten for speed),
 * and a digest of a batch's per-run metrics so any drift in any run shows.
 */
import { createHash } from 'node:crypto';
import type { Heading, RobotProfile, ScheduledAction } from '@shared/plan';
import { gridFromRows } from '../../grid/grid';
import type { MapfInstance } from '../../instance';
import { createRng } from '../../random';
import type { ExecutablePlan, ExecutionOptions, ExecutionSummary } from '../execution-types';

/** One pinned batch. */
export interface RegressionCase {
  readonly name: string;
  readonly instance: MapfInstance;
  readonly plan: ExecutablePlan;
  readonly profile: RobotProfile;
  readonly options: ExecutionOptions;
}

const DELTA: Record<Heading, [number, number]> = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] };
const ORDER: Heading[] = ['N', 'E', 'S', 'W'];

/** Seeded random walks (forward 60 %, quarter turns 30 %, waits), robots on a lattice `spacing` apart; every third robot stops early. */
function walks(seed: number, robots: number, actions: number, side: number, spacing: number, profile: RobotProfile) {
  const rng = createRng(seed);
  const grid = gridFromRows(Array.from({ length: side }, () => Array(side).fill(1)));
  const schedule: ScheduledAction[][] = [];
  const agents = [];
  for (let r = 0; r < robots; r++) {
    let x = 2 + (r % 10) * spacing;
    let y = 2 + Math.floor(r / 10) * spacing * 2;
    const start = y * side + x;
    let heading: Heading = ORDER[rng.int(4)];
    let now = 0;
    const list: ScheduledAction[] = [];
    const n = actions - (r % 3 === 0 ? rng.int(actions) : 0);
    for (let k = 0; k < n; k++) {
      const u = rng.next();
      const [dx, dy] = DELTA[heading];
      const canMove = x + dx >= 0 && y + dy >= 0 && x + dx < side && y + dy < side;
      let a: ScheduledAction;
      if (u < 0.6 && canMove) {
        a = { action: 'forward', from: [x, y], to: [x + dx, y + dy], heading, start: now, end: now + profile.forwardMs, step: k };
        x += dx;
        y += dy;
      } else if (u < 0.9) {
        const isRight = rng.next() < 0.5;
        heading = ORDER[(ORDER.indexOf(heading) + (isRight ? 1 : 3)) % 4];
        a = { action: isRight ? 'turn-right' : 'turn-left', from: [x, y], to: [x, y], heading, start: now, end: now + profile.quarterTurnMs, step: k };
      } else {
        a = { action: 'wait', from: [x, y], to: [x, y], heading, start: now, end: now + profile.waitMs, step: k };
      }
      now = a.end;
      list.push(a);
    }
    schedule.push(list);
    agents.push({ start, goal: y * side + x });
  }
  return { instance: { grid, agents } as MapfInstance, schedule };
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

/** First 16 hex digits of the SHA-256 of the batch's per-run metrics as JSON (Infinity written out). */
export function perRunDigest(summary: ExecutionSummary): string {
  const json = JSON.stringify(summary.perRun, (_, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? String(v) : v));
  return createHash('sha256').update(json).digest('hex').slice(0, 16);
}
