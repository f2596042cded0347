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
import type { Heading, RobotProfile, ScheduledAction } from '../shared/plan';
import { simulateExecution, type ExecutionPolicy } from '../solvers/execute';
import { gridFromRows } from '../solvers/grid/grid';
import type { MapfInstance } from '../solvers/instance';
import { createRng } from '../solvers/random';

const ROBOTS = 50;
const ACTIONS = 100;
const RUNS = 1000;
const SIDE = 64;
const roundsArg = process.argv.indexOf('--rounds');
const ROUNDS = roundsArg >= 0 ? Number(process.argv[roundsArg + 1]) : 5;
if (!(Number.isInteger(ROUNDS) && ROUNDS >= 1)) throw new Error('--rounds must be a positive integer');
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
