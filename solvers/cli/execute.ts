/**
 * `npm run -s execute -- --map FILE --scen FILE --agents N --model M [model options]
 *   --policy open-loop|lockstep|dependency-gated [--jitter CV] [--stall-prob P --stall-ms MS]
 *   [--on-collision count|stop] [--runs R] [--seed S] [--json]`
 * Solves the instance under the plan model, then simulates the plan on the robot fleet.
 * Model options: --start-heading N|E|S|W|free (default free), --forward-ms, --quarter-turn-ms,
 * --wait-ms, --pitch-mm, --diameter-mm (robot profile; defaults below), --time-limit-ms (30000).
 * Models: classic, uniform-duration, orientation-split, weighted-split, k-robust (with --k 0..4).
 * With --json it prints exactly one JSON object (a stable contract):
 * {"runs","successRate","collisions":{"mean","total"},"realisedMakespanMs":{"mean","p95"},
 *  "finishSpreadMs":{"mean","p95"},"waitingMs":{"mean"},"firstCollision":null|{"robots","timeMs","at"}}
 * (`at` = [x, y] mm from the centre of cell [0, 0], y downwards). Exit 0 after a simulation,
 * 1 when the solver found no plan, 2 on a usage or input error.
 * Simulation is no safety assessment: follow the applicable safety standards and local rules.
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { HEADINGS, PLAN_MODELS, type RobotProfile, type StartHeading } from '../../shared/plan';
import { EXECUTION_POLICIES, simulateExecution, type ExecutablePlan, type ExecutionPolicy, type ExecutionSummary } from '../execute';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { formatParseError } from '../io/parse-result';
import { parseScenario } from '../io/parse-scenario';
import { isPlanModel, solveModel } from '../models/solve-model';

const DEFAULT_PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 800, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
const SAFETY_NOTE = 'Simulation is no safety assessment: follow the applicable safety standards and local rules before running robots near people.';

class UsageError extends Error {}

function number(value: string | undefined, flag: string, fallback: number, check: (v: number) => boolean, rule: string): number {
  if (value === undefined) return fallback;
  const v = Number(value);
  if (value.trim() === '' || !Number.isFinite(v) || !check(v)) throw new UsageError(`--${flag}: ${rule}, got ${JSON.stringify(value)}`);
  return v;
}

function readFile(path: string, flag: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    throw new UsageError(`--${flag} ${path}: cannot be read (${(error as NodeJS.ErrnoException).code ?? String(error)})`);
  }
}

function loadInstance(mapFile: string, scenFile: string, agents: number): MapfInstance {
  const map = parseMap(readFile(mapFile, 'map'));
  if (!map.ok) throw new UsageError(map.errors.map((e) => formatParseError(e, mapFile)).join('\n'));
  const scen = parseScenario(readFile(scenFile, 'scen'));
  if (!scen.ok) throw new UsageError(scen.errors.map((e) => formatParseError(e, scenFile)).join('\n'));
  const instance = instanceFromScenario(map.value, scen.value, agents);
  if (!instance.ok) throw new UsageError(instance.errors.map((e) => formatParseError(e, scenFile)).join('\n'));
  return instance.value;
}

/** Solves under the model (validated by its own validator); a plan for the simulator, or the reason there is none. */
function solve(model: string, instance: MapfInstance, profile: RobotProfile, startHeading: StartHeading, k: number | undefined, timeLimitMs: number): ExecutablePlan | string {
  if (!isPlanModel(model)) throw new UsageError(`--model: expected one of ${PLAN_MODELS.join(', ')}, got ${JSON.stringify(model)}`);
  if (model === 'k-robust' && k === undefined) throw new UsageError('--k is required with --model k-robust');
  const result = solveModel(model, instance, { profile, startHeading, k, timeLimitMs, now: () => performance.now() });
  if (result.status !== 'solved') return `${model}: ${result.status}${result.reason ? ` (${result.reason})` : ''}`;
  return { timeline: result.timeline, schedule: result.schedule, paddingWaitMs: result.waitStepMs };
}

/** The stable JSON contract of `--json`. */
function contract(s: ExecutionSummary): unknown {
  return {
    runs: s.runs,
    successRate: s.successRate,
    collisions: { mean: s.collisions.mean, total: s.collisions.total },
    realisedMakespanMs: s.realisedMakespanMs,
    finishSpreadMs: s.finishSpreadMs,
    waitingMs: { mean: s.waitingMs.mean },
    firstCollision: s.firstCollision ? { robots: s.firstCollision.robots, timeMs: s.firstCollision.timeMs, at: s.firstCollision.at } : null,
  };
}

function main(argv: string[]): number {
  const { values } = parseArgs({
    args: argv,
    options: {
      map: { type: 'string' }, scen: { type: 'string' }, agents: { type: 'string' }, model: { type: 'string' },
      'start-heading': { type: 'string' }, 'forward-ms': { type: 'string' }, 'quarter-turn-ms': { type: 'string' },
      'wait-ms': { type: 'string' }, 'pitch-mm': { type: 'string' }, 'diameter-mm': { type: 'string' },
      'time-limit-ms': { type: 'string' }, policy: { type: 'string' }, jitter: { type: 'string' },
      'stall-prob': { type: 'string' }, 'stall-ms': { type: 'string' }, 'on-collision': { type: 'string' },
      runs: { type: 'string' }, seed: { type: 'string' }, k: { type: 'string' }, json: { type: 'boolean' },
    },
    strict: true,
  });
  for (const flag of ['map', 'scen', 'agents', 'model', 'policy'] as const) if (values[flag] === undefined) throw new UsageError(`--${flag} is required`);
  const positive = (v: number) => v > 0;
  const agents = number(values.agents, 'agents', 0, (v) => Number.isInteger(v) && v >= 1, 'a positive integer');
  const policy = values.policy as ExecutionPolicy;
  if (!EXECUTION_POLICIES.includes(policy)) throw new UsageError(`--policy: expected ${EXECUTION_POLICIES.join(', ')}, got ${JSON.stringify(values.policy)}`);
  const onCollision = values['on-collision'] ?? 'count';
  if (onCollision !== 'count' && onCollision !== 'stop') throw new UsageError(`--on-collision: expected count or stop, got ${JSON.stringify(onCollision)}`);
  const startHeading = (values['start-heading'] ?? 'free') as StartHeading;
  if (startHeading !== 'free' && !HEADINGS.includes(startHeading)) throw new UsageError(`--start-heading: expected N, E, S, W or free, got ${JSON.stringify(startHeading)}`);
  const integerMs = (v: number) => Number.isInteger(v) && v > 0;
  const profile: RobotProfile = {
    forwardMs: number(values['forward-ms'], 'forward-ms', DEFAULT_PROFILE.forwardMs, integerMs, 'a positive integer'),
    quarterTurnMs: number(values['quarter-turn-ms'], 'quarter-turn-ms', DEFAULT_PROFILE.quarterTurnMs, integerMs, 'a positive integer'),
    waitMs: number(values['wait-ms'], 'wait-ms', DEFAULT_PROFILE.waitMs, integerMs, 'a positive integer'),
    cellPitchMm: number(values['pitch-mm'], 'pitch-mm', DEFAULT_PROFILE.cellPitchMm, positive, 'a positive number'),
    robotDiameterMm: number(values['diameter-mm'], 'diameter-mm', DEFAULT_PROFILE.robotDiameterMm, positive, 'a positive number'),
    timingJitter: number(values.jitter, 'jitter', 0, (v) => v >= 0, 'a number ≥ 0'),
  };
  const noise = {
    jitterCv: profile.timingJitter,
    stallProbability: number(values['stall-prob'], 'stall-prob', 0, (v) => v >= 0 && v <= 1, 'a probability in [0, 1]'),
    stallMs: number(values['stall-ms'], 'stall-ms', 0, (v) => v >= 0, 'a number ≥ 0'),
  };
  const runs = number(values.runs, 'runs', 100, (v) => Number.isInteger(v) && v >= 1, 'a positive integer');
  const seed = number(values.seed, 'seed', 1, Number.isInteger, 'an integer');
  const timeLimitMs = number(values['time-limit-ms'], 'time-limit-ms', 30_000, positive, 'a positive number');

  const instance = loadInstance(values.map as string, values.scen as string, agents);
  const k = values.k === undefined ? undefined : number(values.k, 'k', 0, (v) => Number.isInteger(v) && v >= 0 && v <= 4, 'an integer from 0 to 4');
  const plan = solve(values.model as string, instance, profile, startHeading, k, timeLimitMs);
  if (typeof plan === 'string') {
    console.error(`no plan: ${plan}`);
    return 1;
  }
  const summary = simulateExecution(instance, plan, profile, { policy, noise, onCollision, runs, seed });
  if (values.json) {
    console.log(JSON.stringify(contract(summary)));
    return 0;
  }
  const fmt = (v: number | null) => (v === null ? 'n/a' : v.toFixed(0));
  console.log(`${values.model}, ${policy}, ${summary.runs} runs (seed ${seed}), jitter cv ${noise.jitterCv}, stalls ${noise.stallProbability} × ${noise.stallMs} ms`);
  console.log(`success rate        ${(summary.successRate * 100).toFixed(1)} %`);
  console.log(`collisions          mean ${summary.collisions.mean.toFixed(2)}, total ${summary.collisions.total}`);
  console.log(`realised makespan   mean ${fmt(summary.realisedMakespanMs.mean)} ms, p95 ${fmt(summary.realisedMakespanMs.p95)} ms`);
  console.log(`finish spread       mean ${fmt(summary.finishSpreadMs.mean)} ms, p95 ${fmt(summary.finishSpreadMs.p95)} ms`);
  console.log(`waiting             mean ${fmt(summary.waitingMs.mean)} ms`);
  const c = summary.firstCollision;
  if (c) console.log(`first collision     run ${c.run}: robots ${c.robots[0]} and ${c.robots[1]} at ${c.timeMs.toFixed(0)} ms near cell [${c.cell[0]}, ${c.cell[1]}]`);
  console.log(SAFETY_NOTE);
  return 0;
}

try {
  process.exitCode = main(process.argv.slice(2));
} catch (error) {
  if (!(error instanceof UsageError) && !(error instanceof TypeError && 'code' in error)) throw error;
  console.error(`execute: ${error.message}`);
  process.exitCode = 2;
}
