/// <reference types="node" />
/**
 * Runs the solve CLI as a user would (a child process) on the open grid benchmark files
 * (../shared/datasets/grid-benchmarks/, read in place; Sturtevant 2012 and Stern et al. 2019,
 * see the dataset README) and checks the JSON contract other tools rely on.
 */
import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import { validateClassicPlan } from '../validate/classic';

const ROOT = resolve(__dirname, '../..');
const DATASET = resolve(ROOT, '../shared/datasets/grid-benchmarks');
// The local tsx binary is what `npx tsx` resolves to; calling it directly skips npx's start-up.
const TSX = join(ROOT, 'node_modules/.bin/tsx');
const solve = (...args: string[]) => spawnSync(TSX, ['solvers/cli/solve.ts', ...args], { cwd: ROOT, encoding: 'utf8' });

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
    expect(Object.keys(out).sort()).toEqual(['lowLevelExpansions', 'lowerBound', 'makespan', 'nodes', 'paths', 'runtimeMs', 'soc', 'status'].sort());
    expect(Object.keys(out.nodes).sort()).toEqual(['expanded', 'generated']);
    expect(out.status).toBe('solved');
    expect(out.lowerBound).toBe(out.soc);
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
