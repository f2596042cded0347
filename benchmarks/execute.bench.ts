/**
 * Speed of the fleet execution simulator: 1,000 Monte Carlo runs of 50 robots × 100 actions
 * (target: well under 2 s on one core). Plans are generated random walks on a 64 × 64 open
 * grid (forward, quarter turns, waits), one robot per start cell 3 cells apart, so collisions
 * happen but are not the norm. Prints ms total and per run per policy (wall clock, and the
 * process CPU time, which is steadier when other jobs share the cores); writes JSON to
 * benchmarks/results/execute.json. Timings are noisy when other work shares the machine, so each
 * policy is timed in several rounds (`--rounds N`, default 5) and the best and median round are
 * printed with the load average.
 */
import { mkdirSync, writeFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import type { RobotProfile } from '../shared/plan';
import { simulateExecution, type ExecutionPolicy } from '../solvers/execute';
import { randomWalks } from '../solvers/execute/testing/random-walks';

const ROBOTS = 50;
const ACTIONS = 100;
const RUNS = 1000;
const SIDE = 64;
const roundsArg = process.argv.indexOf('--rounds');
const ROUNDS = roundsArg >= 0 ? Number(process.argv[roundsArg + 1]) : 5;
if (!(Number.isInteger(ROUNDS) && ROUNDS >= 1)) throw new Error('--rounds must be a positive integer');
const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 1500, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0.1 };

const { instance, schedule } = randomWalks(2024, { robots: ROBOTS, actions: ACTIONS, side: SIDE, spacing: 6, profile, stopsEarly: false });
const results: Record<string, unknown>[] = [];
console.log(`execution simulator: ${ROBOTS} robots × ${ACTIONS} actions, ${RUNS} runs, jitter cv 0.1, stalls 2 % × 2 s; ${ROUNDS} rounds per policy`);
console.log(`load average before: ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);
console.log('policy              best ms/run   median ms/run   best cpu ms/run   collisions/run   success');
const cpuMs = (): number => {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
};
const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
// Warm-up so the JIT has compiled the hot loops before timing.
simulateExecution(instance, { timeline: 'steps', schedule }, profile, { policy: 'dependency-gated', seed: 99, runs: 200, noise: { jitterCv: 0.1 } });
for (const policy of ['open-loop', 'lockstep', 'dependency-gated'] as ExecutionPolicy[]) {
  const wall: number[] = [];
  const cpu: number[] = [];
  let s: ReturnType<typeof simulateExecution> | undefined;
  for (let round = 0; round < ROUNDS; round++) {
    const t0 = performance.now();
    const c0 = cpuMs();
    s = simulateExecution(instance, { timeline: 'steps', schedule }, profile, {
      policy, seed: 1, runs: RUNS, noise: { jitterCv: 0.1, stallProbability: 0.02, stallMs: 2000 },
    });
    wall.push((performance.now() - t0) / RUNS);
    cpu.push((cpuMs() - c0) / RUNS);
  }
  const summary = s as NonNullable<typeof s>;
  const best = Math.min(...wall);
  console.log(`${policy.padEnd(18)} ${best.toFixed(3).padStart(12)} ${median(wall).toFixed(3).padStart(15)} ${Math.min(...cpu).toFixed(3).padStart(17)} ${summary.collisions.mean.toFixed(2).padStart(16)} ${summary.successRate.toFixed(3).padStart(9)}`);
  results.push({
    policy, robots: ROBOTS, actions: ACTIONS, runs: RUNS, rounds: ROUNDS, perRunMsByRound: wall, cpuPerRunMsByRound: cpu,
    bestPerRunMs: best, medianPerRunMs: median(wall), collisionsMean: summary.collisions.mean, successRate: summary.successRate,
  });
}
console.log(`load average after: ${loadavg().map((l) => l.toFixed(2)).join(' ')}`);
const dir = join(__dirname, 'results');
mkdirSync(dir, { recursive: true });
writeFileSync(join(dir, 'execute.json'), JSON.stringify(results, null, 2));
