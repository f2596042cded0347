/**
 * Speed of the fleet execution simulator: 1,000 Monte Carlo runs of 50 robots × 100 actions
 * (target: well under 2 s on one core). Plans are generated random walks on a 64 × 64 open
 * grid (forward, quarter turns, waits), one robot per start cell 3 cells apart, so collisions
 * happen but are not the norm. Prints ms total and per run per policy (wall clock, and the
 * process CPU time, which is steadier when other jobs share the cores); writes JSON to
 * benchmarks/results/execute.json. Timings are noisy when other work shares the machine.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import type { Heading, RobotProfile, ScheduledAction } from '../shared/plan';
import { simulateExecution, type ExecutionPolicy } from '../solvers/execute';
import { gridFromRows } from '../solvers/grid/grid';
import type { MapfInstance } from '../solvers/instance';
import { createRng } from '../solvers/random';

const ROBOTS = 50;
const ACTIONS = 100;
const RUNS = 1000;
const SIDE = 64;
const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0.1 };
const DELTA: Record<Heading, [number, number]> = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] };
const ORDER: Heading[] = ['N', 'E', 'S', 'W'];

function generate(seed: number): { instance: MapfInstance; schedule: ScheduledAction[][] } {
  const rng = createRng(seed);
  const grid = gridFromRows(Array.from({ length: SIDE }, () => Array(SIDE).fill(1)));
  const schedule: ScheduledAction[][] = [];
  const agents = [];
  for (let r = 0; r < ROBOTS; r++) {
    let x = 2 + (r % 10) * 6;
    let y = 2 + Math.floor(r / 10) * 12;
    const start = y * SIDE + x;
    let heading: Heading = ORDER[rng.int(4)];
    let now = 0;
    const list: ScheduledAction[] = [];
    for (let k = 0; k < ACTIONS; k++) {
      const u = rng.next();
      const [dx, dy] = DELTA[heading];
      const canMove = x + dx >= 0 && y + dy >= 0 && x + dx < SIDE && y + dy < SIDE;
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
    agents.push({ start, goal: y * SIDE + x });
  }
  return { instance: { grid, agents }, schedule };
}

const { instance, schedule } = generate(2024);
const results: Record<string, unknown>[] = [];
console.log(`execution simulator: ${ROBOTS} robots × ${ACTIONS} actions, ${RUNS} runs, jitter cv 0.1, stalls 2 % × 2 s`);
console.log('policy              total ms   ms/run   cpu ms/run   collisions/run   success');
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
// Warm-up so the JIT has compiled the hot loops before timing.
simulateExecution(instance, { timeline: 'steps', schedule }, profile, { policy: 'dependency-gated', seed: 99, runs: 200, noise: { jitterCv: 0.1 } });
for (const policy of ['open-loop', 'lockstep', 'dependency-gated'] as ExecutionPolicy[]) {
  const t0 = performance.now();
  const c0 = cpuMs();
  const s = simulateExecution(instance, { timeline: 'steps', schedule }, profile, {
    policy, seed: 1, runs: RUNS, noise: { jitterCv: 0.1, stallProbability: 0.02, stallMs: 2000 },
  });
  const ms = performance.now() - t0;
  const cpu = cpuMs() - c0;
  console.log(`${policy.padEnd(18)} ${ms.toFixed(0).padStart(9)} ${(ms / RUNS).toFixed(3).padStart(8)} ${(cpu / RUNS).toFixed(3).padStart(12)} ${s.collisions.mean.toFixed(2).padStart(16)} ${s.successRate.toFixed(3).padStart(9)}`);
  results.push({ policy, robots: ROBOTS, actions: ACTIONS, runs: RUNS, totalMs: ms, perRunMs: ms / RUNS, cpuPerRunMs: cpu / RUNS, collisionsMean: s.collisions.mean, successRate: s.successRate });
}
const dir = join(__dirname, 'results');
mkdirSync(dir, { recursive: true });
writeFileSync(join(dir, 'execute.json'), JSON.stringify(results, null, 2));
