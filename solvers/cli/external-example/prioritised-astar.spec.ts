/**
 * The example external solver: its plans pass Quarterturn's classic validator, and the program
 * run as a real process writes the text plan format and says why it fails. Instances: the open
 * dataset's maps and "even" scenarios (Stern et al., SoCS 2019), read in place; validated with
 * solvers/io and solvers/validate (the solver itself imports neither).
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { parsePlanText } from '@shared/plan-format-text';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../../benchmarks/datasets/open-grid-benchmarks';
import { instanceFromScenario } from '../../io/instance-from-scenario';
import { parseMap } from '../../io/parse-map';
import { parseScenario } from '../../io/parse-scenario';
import { validateClassicPlan } from '../../validate/classic';
import { prioritisedPlanning, readMap, readScenario } from './prioritised-astar';

const SCRIPT = join(__dirname, 'prioritised-astar.ts');
const ROOT = resolve(__dirname, '..', '..', '..');
const file = (name: string) => readFileSync(join(OPEN_GRID_BENCHMARKS_DIR, name), 'utf8');

describe('prioritised planning with space-time A*', () => {
  it('gives plans the classic validator accepts on the open dataset', () => {
    const cases: [string, string, number][] = [];
    for (const [map, agents] of [['empty-8-8', 12], ['random-32-32-10', 40], ['maze-32-32-2', 8], ['room-32-32-4', 30]] as const) {
      for (const even of [1, 2, 3]) cases.push([map, `${map}-even-${even}.scen`, agents]);
    }
    let validated = 0;
    let solved = 0;
    for (const [mapName, scen, agents] of cases) {
      const grid = readMap(file(`${mapName}.map`));
      const plan = prioritisedPlanning(grid, readScenario(file(scen), grid, agents), Infinity);
      if (!('paths' in plan)) continue;
      solved++;
      const map = parseMap(file(`${mapName}.map`), { name: mapName });
      if (!map.ok) throw new Error('map');
      const scenario = parseScenario(file(scen), { map: map.value });
      if (!scenario.ok) throw new Error('scenario');
      const instance = instanceFromScenario(map.value, scenario.value, agents);
      if (!instance.ok) throw new Error('instance');
      const check = validateClassicPlan(instance.value, plan.paths);
      expect({ scen, agents, violation: check.violation?.message ?? null }).toEqual({ scen, agents, violation: null });
      validated++;
    }
    expect(cases).toHaveLength(12);
    // Prioritised planning is incomplete, but these instances are easy for it.
    expect([solved, validated]).toEqual([12, 12]);
  });

  it('runs as a program: writes the text plan format, and exits 1 on bad input with the reason', () => {
    const dir = mkdtempSync(join(tmpdir(), 'qt-prio-'));
    try {
      const out = join(dir, 'plan.txt');
      const args = ['--import', 'tsx', SCRIPT, '--map', join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8.map'), '--scenario', join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8-even-1.scen'), '--agents', '5', '--plan', out, '--time-limit-ms', '20000'];
      execFileSync(process.execPath, args, { cwd: ROOT, stdio: 'pipe' });
      const text = parsePlanText(readFileSync(out, 'utf8'), { file: 'plan.txt', withHeadings: false });
      expect(text.ok && text.cells.length).toBe(5);
      writeFileSync(join(dir, 'short.scen'), 'version 1\n');
      const bad = spawnSync(process.execPath, [...args.slice(0, 4), join(OPEN_GRID_BENCHMARKS_DIR, 'empty-8-8.map'), '--scenario', join(dir, 'short.scen'), '--agents', '2', '--plan', out], { cwd: ROOT, encoding: 'utf8' });
      expect([bad.status, bad.stderr.trim()]).toEqual([1, 'the scenario has 0 rows, fewer than 2 agents']);
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });
});
