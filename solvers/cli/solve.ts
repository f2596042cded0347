/**
 * `npm run -s solve -- --map FILE --scen FILE --agents N [--model classic] [--time-limit SECONDS] [--json]`
 *
 * Solves the instance made of the map and the first N scenario rows to minimum sum-of-costs.
 * With --json it prints exactly one JSON object on stdout (a stable contract other tools use):
 *   {"status", "soc", "makespan", "lowerBound", "runtimeMs", "nodes": {"generated", "expanded"},
 *    "lowLevelExpansions", "paths": [[[x, y], ...], ...]}   (+ "reason" when not solved)
 * paths as cells per time step, x = column, y = row. Exit code 0 whenever a result is printed
 * (whatever its status); errors go to stderr with exit code 1 (bad input) or 2 (bad usage).
 */
import { readFileSync } from 'node:fs';
import { parseArgs } from 'node:util';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { formatParseError } from '../io/parse-result';
import { parseScenario } from '../io/parse-scenario';
import { solveClassic } from '../models/classic';

const USAGE = 'usage: npm run -s solve -- --map FILE --scen FILE --agents N [--model classic] [--time-limit SECONDS] [--json]';

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
  if (args.model !== 'classic') throw new UsageError(`--model ${args.model}: only 'classic' is available in this command so far`);

  const map = parseMap(readText(args.map, 'map'));
  if (!map.ok) throw new Error(map.errors.map((e) => formatParseError(e, args.map)).join('\n'));
  const scen = parseScenario(readText(args.scen, 'scenario'));
  if (!scen.ok) throw new Error(scen.errors.map((e) => formatParseError(e, args.scen)).join('\n'));
  const inst = instanceFromScenario(map.value, scen.value, agents);
  if (!inst.ok) throw new Error(inst.errors.map((e) => formatParseError(e, args.scen)).join('\n'));

  const r = solveClassic(inst.value, { timeLimitMs: seconds * 1000, now: () => performance.now() });
  const width = inst.value.grid.width;
  const out = {
    status: r.status,
    soc: r.soc,
    makespan: r.makespan,
    lowerBound: r.lowerBound,
    runtimeMs: Math.round(r.runtimeMs * 1000) / 1000,
    nodes: { generated: r.nodesGenerated, expanded: r.nodesExpanded },
    lowLevelExpansions: r.lowLevelExpansions,
    paths: r.paths.map((p) => p.map((c) => [c % width, Math.floor(c / width)])),
    ...(r.reason !== undefined ? { reason: r.reason } : {}),
  };
  if (args.json) {
    process.stdout.write(`${JSON.stringify(out)}\n`);
  } else {
    process.stdout.write(`${r.status}${r.reason ? ` (${r.reason})` : ''}: ${agents} agents on ${args.map}\n`);
    process.stdout.write(`sum-of-costs ${r.soc ?? '-'}, makespan ${r.makespan ?? '-'}, lower bound ${r.lowerBound ?? '-'}\n`);
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
