/// <reference types="node" />
/**
 * Runs the solve CLI as a user would (a child process) on the open grid benchmark files
 * (benchmarks/datasets/grid-benchmarks/, read in place; Sturtevant 2012 and Stern et al. 2019,
 * see the dataset README) and checks the JSON contract other tools rely on.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import type { Heading } from '../../shared/plan';
import { validateClassicPlan } from '../validate/classic';
import { validateKRobustPlan } from '../validate/k-robust';
import { validateOrientationPlan } from '../validate/orientation-split';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';
import { WEIGHTED_SPLIT_WAIT_NOTE } from './shared-options';

const ROOT = resolve(__dirname, '../..');
const DATASET = OPEN_GRID_BENCHMARKS_DIR;
// The local tsx binary is what `npx tsx` resolves to; calling it directly skips npx's start-up.
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const solve = (...args: string[]) => spawnSync(TSX, ['solvers/cli/solve.ts', ...args], { cwd: ROOT, encoding: 'utf8' });
const CORE_KEYS = ['lowLevelExpansions', 'lowerBound', 'makespan', 'nodes', 'paths', 'runtimeMs', 'soc', 'status', 'suboptimality', 'gap'];
const MODEL_KEYS = ['model', 'parameters', 'profile', 'units', 'turnInclusiveSocMs', 'turnInclusiveMakespanMs', 'turns', 'schedule'];

describe('npm run solve', () => {
  it('prints exactly one JSON object with the stable fields and a valid optimal plan', () => {
    const mapFile = join(DATASET, 'empty-8-8.map');
    const scenFile = join(DATASET, 'empty-8-8-even-1.scen');
    const run = solve('--map', mapFile, '--scen', scenFile, '--agents', '6', '--json', '--time-limit', '20');
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('');
    const lines = run.stdout.trim().split('\n');
    expect(lines).toHaveLength(1);
    const out = JSON.parse(lines[0]);
    expect(Object.keys(out).sort()).toEqual([...CORE_KEYS, ...MODEL_KEYS].sort());
    expect(Object.keys(out.nodes).sort()).toEqual(['expanded', 'generated']);
    expect(out.status).toBe('solved');
    expect(out.lowerBound).toBe(out.soc);
    expect([out.suboptimality, out.gap]).toEqual([1, 0]);
    // Paths are [x, y] per step: map them back to cells and let the independent validator judge them.
    const map = parseMap(readFileSync(mapFile, 'utf8'));
    const scen = parseScenario(readFileSync(scenFile, 'utf8'));
    if (!map.ok || !scen.ok) throw new Error('dataset files did not parse');
    const inst = instanceFromScenario(map.value, scen.value, 6);
    if (!inst.ok) throw new Error('instance');
    const paths = (out.paths as [number, number][][]).map((p) => p.map(([x, y]) => y * 8 + x));
    expect(paths[0][0]).toBe(scen.value.rows[0].start[1] * 8 + scen.value.rows[0].start[0]);
    const check = validateClassicPlan(inst.value, paths);
    expect(check.ok).toBe(true);
    expect(check.soc).toBe(out.soc);
    expect(check.makespan).toBe(out.makespan);
  });

  it('takes --suboptimality: a validated plan within w × the lower bound, w and the gap in the JSON', () => {
    const mapFile = join(DATASET, 'empty-8-8.map');
    const scenFile = join(DATASET, 'empty-8-8-even-1.scen');
    const run = solve('--map', mapFile, '--scen', scenFile, '--agents', '12', '--suboptimality', '1.5', '--json');
    expect([run.status, run.stderr]).toEqual([0, '']);
    const out = JSON.parse(run.stdout);
    expect(out.status).toBe('solved');
    expect([out.suboptimality, out.parameters.suboptimality]).toEqual([1.5, 1.5]);
    expect(out.soc).toBeLessThanOrEqual(1.5 * out.lowerBound);
    expect(out.gap).toBeCloseTo((out.soc - out.lowerBound) / out.lowerBound, 12);
    const map = parseMap(readFileSync(mapFile, 'utf8'));
    const scen = parseScenario(readFileSync(scenFile, 'utf8'));
    if (!map.ok || !scen.ok) throw new Error('dataset files did not parse');
    const inst = instanceFromScenario(map.value, scen.value, 12);
    if (!inst.ok) throw new Error('instance');
    const check = validateClassicPlan(inst.value, (out.paths as [number, number][][]).map((p) => p.map(([x, y]) => y * 8 + x)));
    expect([check.ok, check.soc]).toEqual([true, out.soc]);
  });

  it('solves, validates and reports every plan model with the schedule contract', () => {
    const mapFile = join(DATASET, 'empty-8-8.map');
    const scenFile = join(DATASET, 'empty-8-8-even-1.scen');
    const map = parseMap(readFileSync(mapFile, 'utf8'));
    const scen = parseScenario(readFileSync(scenFile, 'utf8'));
    if (!map.ok || !scen.ok) throw new Error('dataset files did not parse');
    const inst = instanceFromScenario(map.value, scen.value, 5);
    if (!inst.ok) throw new Error('instance');
    const profile = ['--forward-ms', '900', '--turn-ms', '400', '--wait-ms', '700'];
    const runs: [string, string[]][] = [
      ['classic', []], ['uniform-duration', []], ['orientation-split', ['--start-heading', 'E']], ['weighted-split', []], ['k-robust', ['--k', '2']],
    ];
    const results = new Map<string, Record<string, any>>();
    for (const [model, extra] of runs) {
      const run = solve('--map', mapFile, '--scen', scenFile, '--agents', '5', '--json', '--model', model, ...profile, ...extra);
      // --wait-ms given with weighted-split earns the one note of issue 12, item 7 (its waits last any whole number of ms).
      expect(run.stderr).toBe(model === 'weighted-split' ? `solve: ${WEIGHTED_SPLIT_WAIT_NOTE}\n` : '');
      expect(run.status).toBe(0);
      const out = JSON.parse(run.stdout.trim());
      results.set(model, out);
      expect(out.status).toBe('solved');
      expect(out.model).toBe(model);
      expect(out.profile).toMatchObject({ forwardMs: 900, quarterTurnMs: 400, waitMs: 700 });
      for (const key of MODEL_KEYS) expect(out).toHaveProperty(key);
      expect(out.schedule).toHaveLength(5);
      for (const acts of out.schedule) {
        for (const a of acts) {
          expect(['forward', 'turn-left', 'turn-right', 'wait']).toContain(a.action);
          expect(['N', 'E', 'S', 'W']).toContain(a.heading);
          expect(a.from).toHaveLength(2);
          expect(a.to).toHaveLength(2);
          expect(a.end).toBeGreaterThan(a.start);
          // Waits last waitMs on the back-to-back models; uniform-duration and weighted-split waits fill gaps.
          if (a.action === 'forward') expect(a.end - a.start).toBe(900);
          else if (a.action !== 'wait') expect(a.end - a.start).toBe(400);
          else if (['classic', 'k-robust', 'orientation-split'].includes(model)) expect(a.end - a.start).toBe(700);
        }
      }
      const turns = out.schedule.flat().filter((a: { action: string }) => a.action.startsWith('turn')).length;
      expect(out.turns).toBe(turns);
    }
    // Paths of the unit-step models go back through the independent validators.
    const cells = (out: Record<string, any>) => (out.paths as [number, number][][]).map((p) => p.map(([x, y]) => y * 8 + x));
    expect(validateClassicPlan(inst.value, cells(results.get('classic')!)).soc).toBe(results.get('classic')!.soc);
    expect(validateKRobustPlan(inst.value, cells(results.get('k-robust')!), 2).ok).toBe(true);
    const states = (results.get('orientation-split')!.states as [number, number, Heading][][]).map((p) => p.map(([x, y, heading]) => ({ cell: y * 8 + x, heading })));
    expect(validateOrientationPlan(inst.value, states, 'E').soc).toBe(results.get('orientation-split')!.soc);
    expect(results.get('weighted-split')!.units).toBe('ms');
    expect(results.get('k-robust')!.parameters.k).toBe(2);
    // Uniform-duration: turn-inclusive makespan = classic makespan × (forward + 2 × quarter turn).
    expect(results.get('uniform-duration')!.turnInclusiveMakespanMs).toBe(results.get('classic')!.makespan * (900 + 2 * 400));
  });

  it('refuses --k without k-robust, k-robust without --k, and a bad heading, with usage', () => {
    const base = ['--map', join(DATASET, 'empty-8-8.map'), '--scen', join(DATASET, 'empty-8-8-even-1.scen'), '--agents', '2'];
    expect(solve(...base, '--model', 'k-robust').stderr).toMatch(/--k is required/);
    expect(solve(...base, '--k', '1').stderr).toMatch(/--k applies to the k-robust model only/);
    const bad = solve(...base, '--model', 'orientation-split', '--start-heading', 'NE');
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--start-heading must be N, E, S, W or free/);
    expect(solve(...base, '--model', 'diagonal').stderr).toMatch(/--model must be one of/);
    expect(solve(...base, '--turn-ms', '0').stderr).toMatch(/--turn-ms must be a whole number/);
  });

  it('names the following rule in its figures and refuses it for k-robust (following-option.spec.ts solves with it)', () => {
    const base = ['--map', join(DATASET, 'empty-8-8.map'), '--scen', join(DATASET, 'empty-8-8-even-1.scen'), '--agents', '4'];
    const forbidden = solve(...base, '--following', 'forbidden');
    expect(forbidden.status).toBe(0);
    expect(forbidden.stdout).toMatch(/^solved: 4 agents on .*, model classic, following forbidden\n/);
    expect(solve(...base, '--model', 'k-robust', '--k', '1', '--following', 'forbidden').stderr)
      .toMatch(/^solve: --following applies to classic, uniform-duration, orientation-split only, not k-robust: /);
  });

  it('prints its help on stdout with exit code 0', () => {
    const run = solve('--help');
    expect(run.status).toBe(0);
    expect(run.stdout).toMatch(/^usage: npm run -s solve -- /);
    expect(run.stdout).toContain('--time-limit SECONDS');
  });

  it('names the missing file on stderr and exits 1', () => {
    const run = solve('--map', join(DATASET, 'no-such.map'), '--scen', join(DATASET, 'empty-8-8-even-1.scen'), '--agents', '2', '--json');
    expect(run.status).toBe(1);
    expect(run.stdout).toBe('');
    expect(run.stderr).toMatch(/no-such\.map: the map file does not exist/);
  });

  it('rejects an agent count beyond the scenario with the scenario file named', () => {
    const scen = join(DATASET, 'empty-8-8-even-1.scen');
    const run = solve('--map', join(DATASET, 'empty-8-8.map'), '--scen', scen, '--agents', '100000', '--json');
    expect(run.status).toBe(1);
    expect(run.stderr).toContain(scen);
    expect(run.stderr).toMatch(/agent count 100000/);
  });

  it('prints usage and exits 2 when an argument is missing', () => {
    const run = solve('--map', join(DATASET, 'empty-8-8.map'), '--agents', '2');
    expect(run.status).toBe(2);
    expect(run.stderr).toMatch(/--scen/);
    expect(run.stderr).toMatch(/usage/);
  });
});
