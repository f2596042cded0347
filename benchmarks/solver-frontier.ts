/**
 * The reach of each plan model under bounded-suboptimal search (issue 15, item 4): for every
 * plan model, suboptimality factor w and map, the largest agent count at which every chosen
 * even scenario is solved within the time limit, with the median runtime and gap there.
 *
 *   npm run bench:solver -- --frontier                                  # the full table (hours)
 *   npm run bench:solver -- --frontier --maps random-32-32-20 --w 1.2    # the step targets
 *   npm run bench:solver -- --frontier --models classic --w 1.5 --time-limit 10 --step 20
 *   npm run bench:solver -- --frontier --clock cpu --maps room-32-32-4 --out benchmarks/results/frontier-room.json
 *   npm run bench:solver -- --frontier --models classic --w 1.2 --scen gen-1,gen-2,gen-3,gen-4,gen-5 --start 100
 *
 * --scen: `1` … `5` are the open even files, `random-1` the open random file, `gen-N` a scenario
 * generated with seed N (the even files of random-32-32-20 stop at 100 rows).
 *
 * --clock wall (default) times each solve by the wall clock; --clock cpu by the CPU time of this
 * process (user + system, all its threads, so garbage-collector threads count against the solver:
 * the figure errs on the slow side). The CPU clock lets the table be measured while other work
 * shares the cores, or in shards (one map per process, --out per shard) on a multi-core machine,
 * without the other processes eating into a solve's limit.
 *
 * Agent counts go up from --start in steps of --step; a count counts as reached when all its
 * scenarios are solved, validated by the model's independent validator (solveModel refuses a plan
 * that fails it) and within w × their proven lower bound. The first scenario that fails ends the
 * climb for that model, w and map (later scenarios at that count are not run: the count is lost
 * anyway). Writes everything to benchmarks/results/frontier.json.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { execFileSync } from 'node:child_process';
import { cpus, hostname, loadavg } from 'node:os';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { PLAN_MODELS, type PlanModel } from '../shared/plan';
import { instanceFromScenario } from '../solvers/io/instance-from-scenario';
import { parseMap } from '../solvers/io/parse-map';
import { parseScenario } from '../solvers/io/parse-scenario';
import type { GridMap } from '../solvers/io/grid-map';
import type { Scenario } from '../solvers/io/scenario';
import { generateScenario } from '../solvers/generate/random-scenario';
import { DEFAULT_ROBOT_PROFILE } from '../solvers/models/heading-schedule';
import { isPlanModel, solveModel } from '../solvers/models/solve-model';
import { OPEN_GRID_BENCHMARKS_DIR } from './datasets/open-grid-benchmarks';

const root = join(__dirname, '..');

/** CPU time of this process so far, ms (user + system of all its threads). */
function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

/** The commit measured (with "+changes" when the tree differs from it), or "unknown" outside a git checkout. */
function commitOf(): string {
  try {
    const head = execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: root, encoding: 'utf8' }).trim();
    const dirty = execFileSync('git', ['status', '--porcelain', '--', 'solvers', 'shared'], { cwd: root, encoding: 'utf8' }).trim() !== '';
    return dirty ? `${head}+changes` : head;
  } catch {
    return 'unknown';
  }
}

/** One solve at one agent count. */
interface FrontierRun {
  readonly model: PlanModel;
  readonly w: number;
  readonly map: string;
  readonly scenario: string;
  readonly agents: number;
  readonly status: string;
  readonly soc: number | null;
  readonly lowerBound: number | null;
  readonly gap: number | null;
  readonly runtimeMs: number;
}

/** The reach of one model at one w on one map. */
interface FrontierRow {
  readonly model: PlanModel;
  readonly w: number;
  readonly map: string;
  /** Largest count with every scenario solved (0: not even --start). */
  readonly reached: number;
  readonly medianRuntimeMs: number | null;
  readonly medianGap: number | null;
  /** Why the next count was not reached. */
  readonly stoppedBy: string;
}

const median = (xs: readonly number[]): number | null => {
  if (xs.length === 0) return null;
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

/** Rows of a generated scenario (`gen-N`): the even files of random-32-32-20 stop at 100 rows. */
const GENERATED_ROWS = 400;

/**
 * One --scen entry: `3` = the open file `<map>-even-3.scen`, `random-1` = `<map>-random-1.scen`,
 * `gen-3` = a scenario generated here with seed 3 (solvers/generate/random-scenario.ts, random mode,
 * GENERATED_ROWS rows): the open even files of random-32-32-20 hold 100 rows only, so agent counts
 * above 100 on that map need the random file or generated ones.
 */
function scenarioOf(map: GridMap, mapName: string, entry: string): { name: string; scen: Scenario } {
  const generated = /^gen-(\d+)$/.exec(entry);
  if (generated) {
    const text = generateScenario(map, { seed: Number(generated[1]), mode: 'random', count: GENERATED_ROWS, mapFile: `${mapName}.map` }).text;
    const parsed = parseScenario(text);
    if (!parsed.ok) throw new Error(`generated scenario ${entry}: ${parsed.errors.map((e) => e.message).join('; ')}`);
    return { name: `${mapName}-${entry}`, scen: parsed.value };
  }
  const file = /^\d+$/.test(entry) ? `${mapName}-even-${entry}` : `${mapName}-${entry}`;
  const parsed = parseScenario(readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, `${file}.scen`), 'utf8'));
  if (!parsed.ok) throw new Error(`${file}.scen: ${parsed.errors.map((e) => `line ${e.line}: ${e.message}`).join('; ')}`);
  return { name: file, scen: parsed.value };
}

/** Runs the frontier benchmark with the command-line `args` (those after --frontier). */
export function runFrontier(args: readonly string[]): void {
  const { values } = parseArgs({
    args: [...args],
    options: {
      frontier: { type: 'boolean' },
      models: { type: 'string', default: 'all' },
      w: { type: 'string', default: '1,1.1,1.2,1.5' },
      maps: { type: 'string', default: 'random-32-32-20,room-32-32-4,warehouse-10-20-10-2-1' },
      scen: { type: 'string', default: '1,2,3,4,5' },
      'time-limit': { type: 'string', default: '60' },
      start: { type: 'string', default: '10' },
      step: { type: 'string', default: '10' },
      'max-agents': { type: 'string', default: '1000' },
      k: { type: 'string', default: '1' },
      clock: { type: 'string', default: 'wall' },
      out: { type: 'string', default: join(root, 'benchmarks', 'results', 'frontier.json') },
    },
  });
  const models: PlanModel[] = values.models === 'all' ? [...PLAN_MODELS] : values.models.split(',').map((m) => {
    if (!isPlanModel(m.trim())) throw new Error(`--models: unknown plan model '${m}' (expected all or some of ${PLAN_MODELS.join(', ')})`);
    return m.trim() as PlanModel;
  });
  const factors = values.w.split(',').map(Number);
  if (factors.some((w) => !(w >= 1))) throw new Error(`--w: every factor must be a number ≥ 1 (got ${values.w})`);
  const maps = values.maps.split(',').map((m) => m.trim());
  const scens = values.scen.split(',').map((s) => s.trim());
  const timeLimitMs = Number(values['time-limit']) * 1000;
  const start = Number(values.start);
  const step = Number(values.step);
  const maxAgents = Number(values['max-agents']);
  const k = Number(values.k);
  const profile = DEFAULT_ROBOT_PROFILE;
  if (values.clock !== 'wall' && values.clock !== 'cpu') throw new Error(`--clock: wall or cpu (got ${values.clock})`);
  const clock = values.clock;
  const now = clock === 'cpu' ? cpuMs : () => performance.now();

  const runs: FrontierRun[] = [];
  const rows: FrontierRow[] = [];
  const started = new Date().toISOString();
  console.log(`frontier: ${models.join(', ')} × w ${factors.join(', ')} × ${maps.join(', ')}; scenarios ${scens.join(',')}; limit ${timeLimitMs / 1000} s (${clock} clock); k-robust k = ${k}`);
  // Written after every row, so a long measurement that is stopped keeps what it reached.
  const write = (finished: boolean) => {
    mkdirSync(dirname(values.out), { recursive: true });
    writeFileSync(values.out, JSON.stringify({
      started, finished: finished ? new Date().toISOString() : null, commit: commitOf(),
      machine: { host: hostname(), cpu: cpus()[0]?.model, cores: cpus().length, node: process.version, loadAverage: loadavg() },
      clock, timeLimitMs, start, step, k, profile, models, factors, maps, scenarios: scens, rows, runs,
    }, null, 2));
  };
  for (const mapName of maps) {
    const map = parseMap(readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, `${mapName}.map`), 'utf8'), { name: mapName });
    if (!map.ok) throw new Error(`${mapName}.map: ${map.errors.map((e) => `line ${e.line}: ${e.message}`).join('; ')}`);
    const scenarios = scens.map((s) => scenarioOf(map.value, mapName, s));
    const usable = Math.min(maxAgents, ...scenarios.map((s) => s.scen.rows.length));
    for (const model of models) for (const w of factors) {
      let reached = 0;
      let atReached: FrontierRun[] = [];
      let stoppedBy = `no more rows (${usable})`;
      for (let agents = start; agents <= usable; agents += step) {
        const here: FrontierRun[] = [];
        let failed: string | null = null;
        for (const { name, scen } of scenarios) {
          const inst = instanceFromScenario(map.value, scen, agents);
          if (!inst.ok) throw new Error(`${name}: ${inst.errors.map((e) => e.message).join('; ')}`);
          const r = solveModel(model, inst.value, {
            timeLimitMs, now, profile, suboptimality: w, k: model === 'k-robust' ? k : undefined,
          });
          const run: FrontierRun = {
            model, w, map: mapName, scenario: name, agents, status: r.status, soc: r.soc, lowerBound: r.lowerBound, gap: r.gap, runtimeMs: Math.round(r.runtimeMs),
          };
          runs.push(run);
          here.push(run);
          // solveModel returns `solved` only for a validated plan within w × its lower bound.
          if (r.status !== 'solved') { failed = `${name} at ${agents}: ${r.status}${r.reason ? ` (${r.reason})` : ''}`; break; }
        }
        if (failed) { stoppedBy = failed; break; }
        reached = agents;
        atReached = here;
        console.log(`  ${model} w=${w} ${mapName}: ${agents} agents solved on ${here.length}/${scenarios.length}, median ${median(here.map((r) => r.runtimeMs))} ms`);
      }
      const row: FrontierRow = {
        model, w, map: mapName, reached,
        medianRuntimeMs: median(atReached.map((r) => r.runtimeMs)),
        medianGap: median(atReached.map((r) => r.gap ?? 0)),
        stoppedBy,
      };
      rows.push(row);
      write(false);
      console.log(`${model} w=${w} ${mapName}: reached ${reached} (median ${row.medianRuntimeMs ?? '-'} ms, gap ${row.medianGap === null ? '-' : (row.medianGap * 100).toFixed(1) + ' %'}); stopped by ${stoppedBy}`);
    }
  }
  console.log(`\n| map | plan model | w | agents reached (${scens.length}/${scens.length} within ${timeLimitMs / 1000} s) | median runtime at it (ms) | median gap at it |`);
  console.log('|---|---|---:|---:|---:|---:|');
  for (const r of rows) {
    console.log(`| ${r.map} | ${r.model} | ${r.w} | ${r.reached} | ${r.medianRuntimeMs ?? '–'} | ${r.medianGap === null ? '–' : `${(r.medianGap * 100).toFixed(1)} %`} |`);
  }
  write(true);
  console.log(`wrote ${values.out}`);
}
