/**
 * `npm run -s execute -- --map FILE --scen FILE --agents N [--model M] [solve's options]
 *   --policy open-loop|lockstep|dependency-gated [--jitter CV] [--stall-prob P --stall-ms MS]
 *   [--on-collision count|stop] [--runs R] [--seed S] [--pitch-mm MM] [--diameter-mm MM] [--json]`
 *   (`--help` lists every option with unit, default and range)
 * Solves the instance under the plan model exactly as `solve` does, then simulates the plan on
 * the robot fleet. The options it shares with `solve` (--model, --time-limit in SECONDS,
 * --forward-ms, --turn-ms, --wait-ms, --k, --start-heading, --following, --json) are parsed by
 * shared-options.ts: same names, units, defaults, ranges and messages. The former names
 * --quarter-turn-ms and --time-limit-ms are refused with a message naming the new option (a
 * silent alias would let a time limit in ms be read as seconds or the other way round).
 * Own options: the execution policy, the noise, the collision mode, runs, seed and the robot's
 * geometry (pitch and diameter, mm). When the plan may contain following, the policy is
 * open-loop or lockstep and the diameter exceeds pitch/√2 (right-angle following then collides
 * at any timing), a warning goes to stderr.
 * With --json it prints exactly one JSON object (a stable contract):
 * {"runs","successRate","collisions":{"mean","total"},"realisedMakespanMs":{"mean","p95"},
 *  "finishSpreadMs":{"mean","p95"},"waitingMs":{"mean"},"firstCollision":null|{"robots","timeMs","at"},
 *  "ci95":{"successRate":[lo,hi],"realisedMakespanMs":[lo,hi]|null,"finishSpreadMs":[lo,hi]|null}}
 * and, only with --suboptimality W > 1, a last key "plan":{"suboptimality","soc","lowerBound","gap"} (the
 * bounded plan's sum-of-costs, the lower bound its search proved and their gap, model units)
 * (`at` = [x, y] mm from the centre of cell [0, 0], y downwards; `waitingMs` is the total over
 * robots per run; `ci95` holds 95 % intervals of the success rate (Wilson) and of the MEANS).
 * Exit 0 after a simulation, 1 when the solver found no plan, 2 on a usage or input error.
 * Simulation is no safety assessment: follow the applicable safety standards and local rules.
 */
import { parseArgs } from 'node:util';
import { followingHazard } from '../../shared/following-hazard';
import { FOLLOWING_MODELS, type RobotProfile } from '../../shared/plan';
import { SAFETY_NOTE } from '../../shared/executions-constants';
import { EXECUTION_POLICIES, simulateExecution, type CollisionMode, type ExecutionPolicy } from '../execute';
import { solveModel } from '../models/solve-model';
import { executeJson, executeReportLines } from './execution-report';
import { InputError, loadInstance } from './load-instance';
import { SHARED_HELP, SHARED_OPTION_SPECS, UsageError, modelSolveOptions, parseSharedOptions, usageErrorOf } from './shared-options';

/** Defaults of execute's own options. */
const EXECUTE_DEFAULTS = { runs: 100, seed: 1, jitter: 0, stallProbability: 0, stallMs: 0, onCollision: 'count', cellPitchMm: 500, robotDiameterMm: 400 } as const;

/** Former option names of execute and the option that replaced each (issue 12, item 9). */
const RETIRED_OPTIONS: Readonly<Record<string, string>> = {
  'quarter-turn-ms': "--quarter-turn-ms is no longer accepted: use --turn-ms MS (solve's name; same unit, ms)",
  'time-limit-ms': '--time-limit-ms is no longer accepted: use --time-limit SECONDS (in seconds, as solve takes it; e.g. --time-limit 30 for 30000 ms)',
};

const EXECUTE_OPTION_SPECS = {
  ...SHARED_OPTION_SPECS,
  policy: { type: 'string' },
  jitter: { type: 'string' },
  'stall-prob': { type: 'string' },
  'stall-ms': { type: 'string' },
  'on-collision': { type: 'string' },
  runs: { type: 'string' },
  seed: { type: 'string' },
  'pitch-mm': { type: 'string' },
  'diameter-mm': { type: 'string' },
  'quarter-turn-ms': { type: 'string' },
  'time-limit-ms': { type: 'string' },
} as const;

const USAGE = 'usage: npm run -s execute -- --map FILE --scen FILE --agents N [--model M] --policy open-loop|lockstep|dependency-gated'
  + ' [--time-limit SECONDS] [--forward-ms MS] [--turn-ms MS] [--wait-ms MS] [--k K] [--start-heading N|E|S|W|free] [--following allowed|forbidden]'
  + ' [--suboptimality W] [--jitter CV] [--stall-prob P --stall-ms MS] [--on-collision count|stop] [--runs R] [--seed S] [--pitch-mm MM] [--diameter-mm MM] [--json]'
  + '  (--help lists every option)';

const HELP = [
  USAGE, '',
  'Solves the instance under the plan model (as `npm run solve`), then replays the plan on a simulated fleet.',
  'Options shared with `npm run solve` (same names, units, defaults and ranges):',
  ...SHARED_HELP, '',
  'Execution options:',
  `  --policy P                 open-loop, lockstep or dependency-gated, required`,
  `  --jitter CV                coefficient of variation of action durations, number ≥ 0 (default ${EXECUTE_DEFAULTS.jitter})`,
  `  --stall-prob P             probability that an action stalls, number in [0, 1] (default ${EXECUTE_DEFAULTS.stallProbability})`,
  `  --stall-ms MS              length of a stall, number of ms ≥ 0 (default ${EXECUTE_DEFAULTS.stallMs})`,
  `  --on-collision MODE        count (robots drive on) or stop (both stop, the run fails) (default ${EXECUTE_DEFAULTS.onCollision})`,
  `  --runs R                   Monte Carlo runs, whole number ≥ 1 (default ${EXECUTE_DEFAULTS.runs})`,
  `  --seed S                   seed of the noise, whole number (default ${EXECUTE_DEFAULTS.seed})`,
  `  --pitch-mm MM              robot profile: distance between cell centres, mm > 0 (default ${EXECUTE_DEFAULTS.cellPitchMm})`,
  `  --diameter-mm MM           robot profile: diameter of the robot's disk, mm > 0 (default ${EXECUTE_DEFAULTS.robotDiameterMm})`,
  '',
  'Former names, refused: --quarter-turn-ms (now --turn-ms), --time-limit-ms (now --time-limit, in seconds).',
  'Exit code 0 after a simulation, 1 when the solver found no plan, 2 on a usage or input error.',
  SAFETY_NOTE,
].join('\n');

/** A number from a flag that passes `check`, or the default; the message says the rule. */
function numberOption(value: string | undefined, flag: string, fallback: number, check: (v: number) => boolean, rule: string): number {
  if (value === undefined) return fallback;
  const v = Number(value);
  if (value.trim() === '' || !Number.isFinite(v) || !check(v)) throw new UsageError(`--${flag} must be ${rule}, got '${value}'`);
  return v;
}

function main(argv: string[]): number {
  let raw;
  try {
    raw = parseArgs({ args: argv, options: EXECUTE_OPTION_SPECS, strict: true }).values;
  } catch (error) {
    throw usageErrorOf(error);
  }
  if (raw.help) {
    console.log(HELP);
    return 0;
  }
  for (const [name, message] of Object.entries(RETIRED_OPTIONS)) if (raw[name as keyof typeof raw] !== undefined) throw new UsageError(message);
  const { options, notes } = parseSharedOptions(raw);
  if (raw.policy === undefined) throw new UsageError('--policy is required');
  const policy = raw.policy as ExecutionPolicy;
  if (!EXECUTION_POLICIES.includes(policy)) throw new UsageError(`--policy must be one of ${EXECUTION_POLICIES.join(', ')}, got '${raw.policy}'`);
  const onCollision = (raw['on-collision'] ?? EXECUTE_DEFAULTS.onCollision) as CollisionMode;
  if (onCollision !== 'count' && onCollision !== 'stop') throw new UsageError(`--on-collision must be count or stop, got '${onCollision}'`);
  const positive = (v: number) => v > 0;
  const profile: RobotProfile = {
    ...options.timing,
    cellPitchMm: numberOption(raw['pitch-mm'], 'pitch-mm', EXECUTE_DEFAULTS.cellPitchMm, positive, 'a number of mm > 0'),
    robotDiameterMm: numberOption(raw['diameter-mm'], 'diameter-mm', EXECUTE_DEFAULTS.robotDiameterMm, positive, 'a number of mm > 0'),
    timingJitter: numberOption(raw.jitter, 'jitter', EXECUTE_DEFAULTS.jitter, (v) => v >= 0, 'a number ≥ 0'),
  };
  const noise = {
    jitterCv: profile.timingJitter,
    stallProbability: numberOption(raw['stall-prob'], 'stall-prob', EXECUTE_DEFAULTS.stallProbability, (v) => v >= 0 && v <= 1, 'a probability in [0, 1]'),
    stallMs: numberOption(raw['stall-ms'], 'stall-ms', EXECUTE_DEFAULTS.stallMs, (v) => v >= 0, 'a number of ms ≥ 0'),
  };
  const runs = numberOption(raw.runs, 'runs', EXECUTE_DEFAULTS.runs, (v) => Number.isInteger(v) && v >= 1, 'a whole number ≥ 1');
  const seed = numberOption(raw.seed, 'seed', EXECUTE_DEFAULTS.seed, Number.isInteger, 'a whole number');
  for (const note of notes) console.error(`execute: ${note}`);
  // Plans that may contain following (the unit-step models unless it is forbidden; k-robust only at k = 0) collide at
  // nominal times when the robots are too wide for it (shared/following-hazard.ts): say so before the figures show it.
  // Dependency gating starts a move into a cell only once the action leaving it has ended, so it is spared.
  const mayFollow = (options.following !== 'forbidden' && (FOLLOWING_MODELS as readonly string[]).includes(options.model)) || options.k === 0;
  const hazard = followingHazard(profile);
  if (mayFollow && policy !== 'dependency-gated' && hazard.message !== null) console.error(`execute: warning: ${hazard.message}`);

  const instance = loadInstance(options.mapFile, options.scenFile, options.agents);
  const result = solveModel(options.model, instance, modelSolveOptions(options, profile));
  if (result.status !== 'solved') {
    console.error(`execute: no plan: ${options.model}: ${result.status}${result.reason ? ` (${result.reason})` : ''}`);
    return 1;
  }
  const plan = { timeline: result.timeline, schedule: result.schedule, paddingWaitMs: result.waitStepMs };
  const summary = simulateExecution(instance, plan, profile, { policy, noise, onCollision, runs, seed });
  if (options.json) {
    const bound = options.suboptimality > 1
      ? { plan: { suboptimality: options.suboptimality, soc: result.soc, lowerBound: result.lowerBound, gap: result.gap } } : {};
    console.log(JSON.stringify({ ...executeJson(summary), ...bound }));
    return 0;
  }
  const report = executeReportLines(summary, {
    model: options.model, profile, seed, stallProbability: noise.stallProbability, stallMs: noise.stallMs, following: options.following,
  });
  for (const line of report) console.log(line);
  if (options.suboptimality > 1) {
    console.log(`bounded plan (w = ${options.suboptimality}): sum-of-costs ${result.soc}, proven lower bound ${result.lowerBound}`
      + ` (${result.units}), gap ${((result.gap ?? 0) * 100).toFixed(2)} %`);
  }
  console.log(SAFETY_NOTE);
  return 0;
}

try {
  process.exitCode = main(process.argv.slice(2));
} catch (error) {
  if (!(error instanceof UsageError) && !(error instanceof InputError)) throw error;
  console.error(`execute: ${error.message}`);
  if (error instanceof UsageError) console.error(USAGE);
  process.exitCode = 2;
}
