/**
 * Solver benchmark: optimal classic CBS over the open benchmark files in
 * benchmarks/datasets/grid-benchmarks (read in place). Prints one line per run, a summary per
 * map and agent count (solved, median and max runtime, CT nodes expanded, low-level expansions
 * per second) and writes everything to benchmarks/results/solver.json.
 *
 *   npm run bench:solver                                   # the speed target of TARGETS.md
 *   npm run bench:solver -- --agents 10,20 --time-limit 5   # a quick run
 *   npm run bench:solver -- --map empty-8-8 --agents 4,8,12,16 --scen 1,2
 *   npm run bench:solver -- --switches '{"wdg":false}'       # an ablation
 *   npm run bench:solver -- --models all --agents 10,20,30 --time-limit 10   # the five plan models
 *   npm run bench:solver -- --frontier [--w 1,1.2] [--maps M1,M2]   # largest agent counts per model and w (solver-frontier.ts)
 *
 * --models classic (default) | all | a comma list of plan models; every model runs through
 * solveModel on the same instances (k-robust with --k, default 2; start heading --start-heading,
 * default free; robot profile --forward-ms / --turn-ms / --wait-ms, defaults 1000 / 800 / 1000).
 * With more than one model a last table compares them: solved (validated) runs, median runtime,
 * and the median ratio of turn-inclusive makespan to classic's on instances both solved.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { instanceFromScenario } from '../solvers/io/instance-from-scenario';
import { parseMap } from '../solvers/io/parse-map';
import { parseScenario } from '../solvers/io/parse-scenario';
import { PLAN_MODELS, type PlanModel, type StartHeading } from '../shared/plan';
import { DEFAULT_ROBOT_PROFILE } from '../solvers/models/heading-schedule';
import { isPlanModel, solveModel } from '../solvers/models/solve-model';
import type { CbsSwitches } from '../solvers/search/cbs-types';
import { OPEN_GRID_BENCHMARKS_DIR } from './datasets/open-grid-benchmarks';
import { runFrontier } from './solver-frontier';

// --frontier: the reach of every plan model under bounded-suboptimal search (solver-frontier.ts).
if (process.argv.includes('--frontier')) {
  runFrontier(process.argv.slice(2));
  process.exit(0);
}

const root = join(__dirname, '..');
const dataset = OPEN_GRID_BENCHMARKS_DIR;

const { values } = parseArgs({
  options: {
    map: { type: 'string', multiple: true },
    scen: { type: 'string', default: '1,2,3,4,5' },
    agents: { type: 'string', default: '10,20,30,40,50,60' },
    'time-limit': { type: 'string', default: '30' },
    switches: { type: 'string' },
    models: { type: 'string', default: 'classic' },
    k: { type: 'string', default: '2' },
    'start-heading': { type: 'string', default: 'free' },
    'forward-ms': { type: 'string', default: String(DEFAULT_ROBOT_PROFILE.forwardMs) },
    'turn-ms': { type: 'string', default: String(DEFAULT_ROBOT_PROFILE.quarterTurnMs) },
    'wait-ms': { type: 'string', default: String(DEFAULT_ROBOT_PROFILE.waitMs) },
    out: { type: 'string', default: join(root, 'benchmarks', 'results', 'solver.json') },
    help: { type: 'boolean', short: 'h' },
  },
});
if (values.help) {
  // The header comment above is the help: the options, their defaults and the examples.
  process.stdout.write([
    'usage: npm run bench:solver -- [--map NAME]... [--scen 1,2,...] [--agents 10,20,...] [--time-limit SECONDS]',
    '         [--models classic|all|M1,M2] [--k K] [--start-heading N|E|S|W|free] [--forward-ms MS] [--turn-ms MS] [--wait-ms MS]',
    "         [--switches JSON] [--out FILE]",
    '       npm run bench:solver -- --frontier [--models all|M1,M2] [--w 1,1.1,1.2,1.5] [--maps M1,M2] [--scen 1,...] [--time-limit 60]',
    '         [--start 10] [--step 10] [--max-agents N] [--k 1] [--out FILE]   (see benchmarks/solver-frontier.ts)',
    'defaults: --map random-32-32-20 --scen 1,2,3,4,5 --agents 10,20,30,40,50,60 --time-limit 30 --models classic --k 2',
    `          --start-heading free --forward-ms ${DEFAULT_ROBOT_PROFILE.forwardMs} --turn-ms ${DEFAULT_ROBOT_PROFILE.quarterTurnMs} --wait-ms ${DEFAULT_ROBOT_PROFILE.waitMs}`,
    '          --out benchmarks/results/solver.json',
    'maps and scenarios are read from benchmarks/datasets/grid-benchmarks (NAME without .map; --scen numbers the even-N scenarios)',
    '',
  ].join('\n'));
  process.exit(0);
}
const maps = values.map ?? ['random-32-32-20'];
const scens = values.scen.split(',').map((s) => s.trim());
const agentCounts = values.agents.split(',').map(Number);
const timeLimitMs = Number(values['time-limit']) * 1000;
const switches = values.switches ? (JSON.parse(values.switches) as Partial<CbsSwitches>) : undefined;
const models: PlanModel[] = values.models === 'all' ? [...PLAN_MODELS] : values.models.split(',').map((m) => {
  const name = m.trim();
  if (!isPlanModel(name)) throw new Error(`--models: unknown plan model '${name}' (expected all or some of ${PLAN_MODELS.join(', ')})`);
  return name;
});
const robustK = Number(values.k);
const startHeading = values['start-heading'] as StartHeading;
const profile = {
  ...DEFAULT_ROBOT_PROFILE, forwardMs: Number(values['forward-ms']), quarterTurnMs: Number(values['turn-ms']), waitMs: Number(values['wait-ms']),
};

interface Run {
  model: PlanModel;
  map: string;
  scenario: string;
  agents: number;
  status: string;
  valid: boolean | null;
  soc: number | null;
  lowerBound: number | null;
  runtimeMs: number;
  nodesGenerated: number;
  nodesExpanded: number;
  lowLevelExpansions: number;
  turnInclusiveMakespanMs: number | null;
}

const runs: Run[] = [];
const started = new Date().toISOString();
console.log(`model map scenario agents status soc lowerBound runtimeMs expanded generated lowLevel valid turnInclusiveMakespanMs (limit ${timeLimitMs / 1000} s)`);
for (const mapName of maps) {
  const mapFile = join(dataset, `${mapName}.map`);
  const map = parseMap(readFileSync(mapFile, 'utf8'), { name: mapName });
  if (!map.ok) throw new Error(`${mapFile}: ${map.errors.map((e) => `line ${e.line}: ${e.message}`).join('; ')}`);
  for (const s of scens) {
    const scenFile = join(dataset, `${mapName}-even-${s}.scen`);
    const scen = parseScenario(readFileSync(scenFile, 'utf8'));
    if (!scen.ok) throw new Error(`${scenFile}: ${scen.errors.map((e) => `line ${e.line}: ${e.message}`).join('; ')}`);
    for (const k of agentCounts) {
      if (k > scen.value.rows.length) continue;
      const inst = instanceFromScenario(map.value, scen.value, k);
      if (!inst.ok) throw new Error(`${scenFile}: ${inst.errors.map((e) => e.message).join('; ')}`);
      for (const model of models) {
        const r = solveModel(model, inst.value, {
          timeLimitMs, now: () => performance.now(), switches, profile, startHeading, k: model === 'k-robust' ? robustK : undefined,
        });
        // solveModel has already passed the plan through the model's independent validator.
        const valid = r.status === 'solved' ? r.isValidated : null;
        const run: Run = {
          model, map: mapName, scenario: `${mapName}-even-${s}`, agents: k, status: r.status, valid, soc: r.soc, lowerBound: r.lowerBound,
          runtimeMs: Math.round(r.runtimeMs), nodesGenerated: r.nodesGenerated, nodesExpanded: r.nodesExpanded, lowLevelExpansions: r.lowLevelExpansions,
          turnInclusiveMakespanMs: r.turnInclusiveMakespanMs,
        };
        runs.push(run);
        console.log([model, mapName, s, k, r.status, r.soc ?? '-', r.lowerBound ?? '-', run.runtimeMs, r.nodesExpanded, r.nodesGenerated, r.lowLevelExpansions, valid ?? '-', r.turnInclusiveMakespanMs ?? '-'].join(' '));
      }
    }
  }
}

const median = (xs: number[]): number => {
  if (xs.length === 0) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const summary = [];
console.log('\nmodel map agents solved/runs invalid median-ms max-ms median-expanded LL-exp/s (runtimes over all runs; unsolved count at the limit)');
for (const model of models) for (const mapName of maps) {
  for (const k of agentCounts) {
    const rs = runs.filter((r) => r.model === model && r.map === mapName && r.agents === k);
    if (rs.length === 0) continue;
    const solved = rs.filter((r) => r.status === 'solved' && r.valid === true).length;
    const invalid = rs.filter((r) => r.valid === false).length;
    const times = rs.map((r) => r.runtimeMs);
    const totalMs = times.reduce((a, b) => a + b, 0);
    const ll = rs.reduce((a, r) => a + r.lowLevelExpansions, 0);
    const row = {
      model, map: mapName, agents: k, runs: rs.length, solved, invalid, medianMs: median(times), maxMs: Math.max(...times),
      medianExpanded: median(rs.map((r) => r.nodesExpanded)), lowLevelPerSecond: totalMs > 0 ? Math.round((ll / totalMs) * 1000) : 0,
    };
    summary.push(row);
    console.log([model, mapName, k, `${solved}/${rs.length}`, invalid, row.medianMs, row.maxMs, row.medianExpanded, row.lowLevelPerSecond].join(' '));
  }
}
const totalSolved = runs.filter((r) => r.status === 'solved' && r.valid === true).length;
console.log(`\ntotal solved (valid, proven optimal): ${totalSolved}/${runs.length}`);

// One table comparing the models on the same instances.
const comparison = [];
if (models.length > 1) {
  const key = (r: Run): string => `${r.scenario}/${r.agents}`;
  const classicMs = new Map(runs.filter((r) => r.model === 'classic' && r.valid === true).map((r) => [key(r), r.turnInclusiveMakespanMs as number]));
  console.log(`\nmodel | solved | median ms | median turn-inclusive makespan / classic (k = ${robustK}, start ${startHeading}, forward ${profile.forwardMs} ms, quarter turn ${profile.quarterTurnMs} ms, wait ${profile.waitMs} ms)`);
  for (const model of models) {
    const rs = runs.filter((r) => r.model === model);
    const solved = rs.filter((r) => r.valid === true);
    const ratios = solved.filter((r) => classicMs.has(key(r))).map((r) => (r.turnInclusiveMakespanMs as number) / (classicMs.get(key(r)) as number));
    const row = { model, runs: rs.length, solved: solved.length, medianMs: median(rs.map((r) => r.runtimeMs)), makespanRatioToClassic: ratios.length ? median(ratios) : null, ratioPairs: ratios.length };
    comparison.push(row);
    console.log(`${model} | ${solved.length}/${rs.length} | ${row.medianMs} | ${row.makespanRatioToClassic === null ? '-' : row.makespanRatioToClassic.toFixed(3)} (${ratios.length} pairs)`);
  }
}
mkdirSync(dirname(values.out), { recursive: true });
writeFileSync(values.out, JSON.stringify({
  started, finished: new Date().toISOString(), node: process.version, timeLimitMs, switches: switches ?? 'default (all on)',
  models, k: robustK, startHeading, profile, totalSolved, totalRuns: runs.length, summary, comparison, runs,
}, null, 2));
console.log(`wrote ${values.out}`);
