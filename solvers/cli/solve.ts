/**
 * `npm run -s solve -- --map FILE --scen FILE --agents N [--model M] [--time-limit SECONDS] [--json]
 *   [--forward-ms MS] [--turn-ms MS] [--wait-ms MS] [--k K] [--start-heading N|E|S|W|free]`
 *
 * Solves the instance made of the map and the first N scenario rows to minimum sum-of-costs
 * under the plan model M (classic, uniform-duration, orientation-split, weighted-split,
 * k-robust; default classic) through solveModel, which gates every plan by the model's
 * independent validator. The robot profile (forward, quarter-turn and wait times in ms) prices
 * the turn-inclusive figures; --k is required for k-robust.
 * With --json it prints exactly one JSON object on stdout (a stable contract other tools use):
 *   {"status", "soc", "makespan", "lowerBound", "runtimeMs", "nodes": {"generated", "expanded"},
 *    "lowLevelExpansions", "paths": [[[x, y], ...], ...],
 *    "model", "parameters": {"startHeading", "k"?, "switches"?}, "profile", "units": "steps"|"ms",
 *    "turnInclusiveSocMs", "turnInclusiveMakespanMs", "turns",
 *    "schedule": [[{"action", "from": [x, y], "to": [x, y], "heading", "start", "end", "step"}, ...], ...]}
 *   (+ "reason" when not solved; + "states": [[[x, y, heading], ...], ...] for orientation-split)
 * paths as cells per time step, x = column, y = row (empty for weighted-split, whose plan is the
 * schedule); soc, makespan and lowerBound in the model's units (steps; ms for weighted-split);
 * schedule times nominal, in ms. Exit code 0 whenever a result is printed (whatever its status);
 * errors go to stderr with exit code 1 (bad input) or 2 (bad usage).
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { formatParseError } from '../io/parse-result';
import { parseScenario } from '../io/parse-scenario';
import { HEADINGS, PLAN_MODELS, type StartHeading } from '../../shared/plan';
import { DEFAULT_ROBOT_PROFILE } from '../models/heading-schedule';
import { isPlanModel, solveModel } from '../models/solve-model';

const USAGE = 'usage: npm run -s solve -- --map FILE --scen FILE --agents N [--model classic|uniform-duration|orientation-split|weighted-split|k-robust]'
  + ' [--time-limit SECONDS] [--forward-ms MS] [--turn-ms MS] [--wait-ms MS] [--k K] [--start-heading N|E|S|W|free] [--json]';

/** A positive whole number of ms from a flag, or the default. */
function wholeMs(value: string | undefined, flag: string, fallback: number): number {
  if (value === undefined) return fallback;
  const v = Number(value);
  if (value.trim() === '' || !Number.isInteger(v) || v < 1) throw new UsageError(`--${flag} must be a whole number of ms ≥ 1, got '${value}'`);
  return v;
}

class UsageError extends Error {}

function readText(path: string, what: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (error) {
    const code = (error as NodeJS.ErrnoException).code;
    throw new Error(`${path}: the ${what} file ${code === 'ENOENT' ? 'does not exist' : `cannot be read (${code ?? String(error)})`}`);
  }
}

function main(argv: readonly string[]): number {
  let args;
  try {
    args = parseArgs({
      args: [...argv],
      options: {
        map: { type: 'string' },
        scen: { type: 'string' },
        agents: { type: 'string' },
        model: { type: 'string', default: 'classic' },
        'forward-ms': { type: 'string' },
        'turn-ms': { type: 'string' },
        'wait-ms': { type: 'string' },
        k: { type: 'string' },
        'start-heading': { type: 'string', default: 'free' },
        'time-limit': { type: 'string', default: '60' },
        json: { type: 'boolean', default: false },
      },
      strict: true,
    }).values;
  } catch (error) {
    throw new UsageError((error as Error).message);
  }
  if (!args.map || !args.scen || !args.agents) throw new UsageError('--map, --scen and --agents are required');
  const agents = Number(args.agents);
  if (!Number.isInteger(agents) || agents < 1) throw new UsageError(`--agents must be a whole number ≥ 1, got '${args.agents}'`);
  const seconds = Number(args['time-limit']);
  if (!Number.isFinite(seconds) || seconds <= 0) throw new UsageError(`--time-limit must be a positive number of seconds, got '${args['time-limit']}'`);
  const model = args.model;
  if (!isPlanModel(model)) throw new UsageError(`--model must be one of ${PLAN_MODELS.join(', ')}, got '${model}'`);
  const profile = {
    ...DEFAULT_ROBOT_PROFILE,
    forwardMs: wholeMs(args['forward-ms'], 'forward-ms', DEFAULT_ROBOT_PROFILE.forwardMs),
    quarterTurnMs: wholeMs(args['turn-ms'], 'turn-ms', DEFAULT_ROBOT_PROFILE.quarterTurnMs),
    waitMs: wholeMs(args['wait-ms'], 'wait-ms', DEFAULT_ROBOT_PROFILE.waitMs),
  };
  const startHeading = args['start-heading'] as StartHeading;
  if (startHeading !== 'free' && !(HEADINGS as readonly string[]).includes(startHeading)) {
    throw new UsageError(`--start-heading must be N, E, S, W or free, got '${startHeading}'`);
  }
  let k: number | undefined;
  if (args.k !== undefined) {
    k = Number(args.k);
    if (args.k.trim() === '' || !Number.isInteger(k) || k < 0 || k > 20) throw new UsageError(`--k must be a whole number from 0 to 20, got '${args.k}'`);
    if (model !== 'k-robust') throw new UsageError(`--k applies to the k-robust model only, not to ${model}`);
  } else if (model === 'k-robust') {
    throw new UsageError('--k is required with --model k-robust');
  }

  const map = parseMap(readText(args.map, 'map'));
  if (!map.ok) throw new Error(map.errors.map((e) => formatParseError(e, args.map)).join('\n'));
  const scen = parseScenario(readText(args.scen, 'scenario'));
  if (!scen.ok) throw new Error(scen.errors.map((e) => formatParseError(e, args.scen)).join('\n'));
  const inst = instanceFromScenario(map.value, scen.value, agents);
  if (!inst.ok) throw new Error(inst.errors.map((e) => formatParseError(e, args.scen)).join('\n'));

  const r = solveModel(model, inst.value, { timeLimitMs: seconds * 1000, now: () => performance.now(), profile, startHeading, k });
  const width = inst.value.grid.width;
  const plan = r.plan;
  const out = {
    status: r.status,
    soc: r.soc,
    makespan: r.makespan,
    lowerBound: r.lowerBound,
    runtimeMs: Math.round(r.runtimeMs * 1000) / 1000,
    nodes: { generated: r.nodesGenerated, expanded: r.nodesExpanded },
    lowLevelExpansions: r.lowLevelExpansions,
    paths: plan?.kind === 'paths' ? plan.paths.map((p) => p.map((c) => [c % width, Math.floor(c / width)]))
      : plan?.kind === 'states' ? plan.states.map((p) => p.map((s) => [s.cell % width, Math.floor(s.cell / width)])) : [],
    ...(r.reason !== undefined ? { reason: r.reason } : {}),
    model: r.model,
    parameters: r.parameters,
    profile: r.profile,
    units: r.units,
    turnInclusiveSocMs: r.turnInclusiveSocMs,
    turnInclusiveMakespanMs: r.turnInclusiveMakespanMs,
    turns: r.turns,
    schedule: r.schedule,
    ...(plan?.kind === 'states' ? { states: plan.states.map((p) => p.map((s) => [s.cell % width, Math.floor(s.cell / width), s.heading])) } : {}),
  };
  if (args.json) {
    process.stdout.write(`${JSON.stringify(out)}\n`);
  } else {
    process.stdout.write(`${r.status}${r.reason ? ` (${r.reason})` : ''}: ${agents} agents on ${args.map}, model ${model}\n`);
    process.stdout.write(`sum-of-costs ${r.soc ?? '-'}, makespan ${r.makespan ?? '-'}, lower bound ${r.lowerBound ?? '-'} (${r.units})\n`);
    process.stdout.write(`turn-inclusive sum-of-costs ${r.turnInclusiveSocMs ?? '-'} ms, makespan ${r.turnInclusiveMakespanMs ?? '-'} ms, ${r.turns ?? '-'} quarter turns\n`);
    process.stdout.write(`${out.runtimeMs} ms, CT nodes ${r.nodesGenerated} generated / ${r.nodesExpanded} expanded, ${r.lowLevelExpansions} low-level expansions\n`);
  }
  return 0;
}

try {
  process.exitCode = main(process.argv.slice(2));
} catch (error) {
  process.stderr.write(`${(error as Error).message}\n`);
  if (error instanceof UsageError) process.stderr.write(`${USAGE}\n`);
  process.exitCode = error instanceof UsageError ? 2 : 1;
}
