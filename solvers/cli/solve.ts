/**
 * `npm run -s solve -- --map FILE --scen FILE --agents N [--model M] [--time-limit SECONDS] [--json]
 *   [--forward-ms MS] [--turn-ms MS] [--wait-ms MS] [--k K] [--start-heading N|E|S|W|free]
 *   [--following allowed|forbidden] [--suboptimality W]`   (`--help` lists every option with unit, default and range)
 *
 * Solves the instance made of the map and the first N scenario rows to minimum sum-of-costs
 * under the plan model M (classic, uniform-duration, orientation-split, weighted-split,
 * k-robust; default classic) through solveModel, which gates every plan by the model's
 * independent validator. The robot profile (forward, quarter-turn and wait times in ms) prices
 * the turn-inclusive figures; --k is required for k-robust; --following forbidden adds the
 * following conflict (classic, uniform-duration, orientation-split only); --suboptimality W > 1
 * asks for a bounded-suboptimal plan (sum-of-costs ≤ W × the proven lower bound). These options are
 * shared with `execute` and parsed by shared-options.ts: same names, units, defaults, ranges
 * and messages in both CLIs.
 * With --json it prints exactly one JSON object on stdout (a stable contract other tools use):
 *   {"status", "soc", "makespan", "lowerBound", "suboptimality", "gap", "runtimeMs", "nodes": {"generated", "expanded"},
 *    "lowLevelExpansions", "paths": [[[x, y], ...], ...],
 *    "model", "parameters": {"startHeading", "k"?, "following"?, "switches"?, "suboptimality"?}, "profile", "units": "steps"|"ms",
 *    "turnInclusiveSocMs", "turnInclusiveMakespanMs", "turns",
 *    "schedule": [[{"action", "from": [x, y], "to": [x, y], "heading", "start", "end", "step"}, ...], ...]}
 *   (+ "reason" when not solved; + "states": [[[x, y, heading], ...], ...] for orientation-split)
 * paths as cells per time step, x = column, y = row (empty for weighted-split, whose plan is the
 * schedule); suboptimality = w (1 = optimal), gap = (soc − lowerBound) / lowerBound (null unless
 * solved); soc, makespan and lowerBound in the model's units (steps; ms for weighted-split);
 * schedule times nominal, in ms. Exit code 0 whenever a result is printed (whatever its status);
 * errors go to stderr with exit code 1 (bad input file) or 2 (bad usage, with the usage line).
 * --wait-ms with weighted-split adds a note on stderr: its waits last any whole number of ms.
 */
import { parseArgs } from 'node:util';
import { DEFAULT_ROBOT_PROFILE } from '../models/heading-schedule';
import { solveModel } from '../models/solve-model';
import { loadInstance } from './load-instance';
import { SHARED_HELP, SHARED_OPTION_SPECS, UsageError, modelSolveOptions, parseSharedOptions, usageErrorOf } from './shared-options';

const USAGE = 'usage: npm run -s solve -- --map FILE --scen FILE --agents N [--model M] [--time-limit SECONDS]'
  + ' [--forward-ms MS] [--turn-ms MS] [--wait-ms MS] [--k K] [--start-heading N|E|S|W|free] [--following allowed|forbidden] [--suboptimality W] [--json]'
  + '  (--help lists every option)';

const HELP = [
  USAGE, '',
  'Solves the instance to minimum sum-of-costs (or within --suboptimality W of it) under the plan model and prints the result.',
  'Options (shared with `npm run execute`, same names, units, defaults and ranges):',
  ...SHARED_HELP, '',
  'Exit code 0 whenever a result is printed (whatever its status), 1 on a bad input file, 2 on bad usage.',
].join('\n');

function main(argv: readonly string[]): number {
  let raw;
  try {
    raw = parseArgs({ args: [...argv], options: SHARED_OPTION_SPECS, strict: true }).values;
  } catch (error) {
    throw usageErrorOf(error);
  }
  if (raw.help) {
    process.stdout.write(`${HELP}\n`);
    return 0;
  }
  const { options, notes } = parseSharedOptions(raw);
  for (const note of notes) process.stderr.write(`solve: ${note}\n`);
  const { agents, model } = options;
  const profile = { ...DEFAULT_ROBOT_PROFILE, ...options.timing };
  const instance = loadInstance(options.mapFile, options.scenFile, agents);

  const r = solveModel(model, instance, modelSolveOptions(options, profile));
  const width = instance.grid.width;
  const plan = r.plan;
  const out = {
    status: r.status,
    soc: r.soc,
    makespan: r.makespan,
    lowerBound: r.lowerBound,
    suboptimality: options.suboptimality,
    gap: r.gap,
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
  if (options.json) {
    process.stdout.write(`${JSON.stringify(out)}\n`);
  } else {
    process.stdout.write(`${r.status}${r.reason ? ` (${r.reason})` : ''}: ${agents} agents on ${options.mapFile}, model ${model}${options.following !== undefined ? `, following ${options.following}` : ''}\n`);
    process.stdout.write(`sum-of-costs ${r.soc ?? '-'}, makespan ${r.makespan ?? '-'}, lower bound ${r.lowerBound ?? '-'} (${r.units})`
      + `${options.suboptimality > 1 ? `, w = ${options.suboptimality}, gap ${r.gap === null ? '-' : `${(r.gap * 100).toFixed(2)} %`}` : ''}\n`);
    process.stdout.write(`turn-inclusive sum-of-costs ${r.turnInclusiveSocMs ?? '-'} ms, makespan ${r.turnInclusiveMakespanMs ?? '-'} ms, ${r.turns ?? '-'} quarter turns\n`);
    process.stdout.write(`${out.runtimeMs} ms, CT nodes ${r.nodesGenerated} generated / ${r.nodesExpanded} expanded, ${r.lowLevelExpansions} low-level expansions\n`);
  }
  return 0;
}

try {
  process.exitCode = main(process.argv.slice(2));
} catch (error) {
  process.stderr.write(`solve: ${(error as Error).message}\n`);
  if (error instanceof UsageError) process.stderr.write(`${USAGE}\n`);
  process.exitCode = error instanceof UsageError ? 2 : 1;
}
