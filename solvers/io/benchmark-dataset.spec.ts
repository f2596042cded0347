/// <reference types="node" />
/**
 * Checks against the open grid benchmark files in benchmarks/datasets/grid-benchmarks/ (read in
 * place, never copied). Source: N. Sturtevant, "Benchmarks for Grid-Based Pathfinding", IEEE
 * TCIAIG 4(2):144–148, 2012, and R. Stern et al., "Multi-Agent Pathfinding: Definitions,
 * Variants, and Benchmarks", SoCS 2019 (see the dataset's README). The published
 * optimal_length column is the oracle for the octile search: every row of every scenario.
 */
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { createOctileSearch } from '../grid/octile-search';
import { connectedComponents } from '../grid/components';
import { instanceFromScenario, largestAgentCount } from './instance-from-scenario';
import { parseMap } from './parse-map';
import { parseScenario } from './parse-scenario';
import { bucketOf } from './scenario';
import { writeMap } from './write-map';
import { writeScenario } from './write-scenario';
import type { GridMap } from './grid-map';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const DATASET = OPEN_GRID_BENCHMARKS_DIR;
const files = readdirSync(DATASET);
const mapFiles = files.filter((f) => f.endsWith('.map')).sort();
const scenarioFiles = files.filter((f) => f.endsWith('.scen')).sort();
const read = (file: string): string => readFileSync(join(DATASET, file), 'utf8');

const maps = new Map<string, GridMap>();
const mapOf = (file: string): GridMap => {
  let map = maps.get(file);
  if (!map) {
    const result = parseMap(read(file), { name: file.replace(/\.map$/, '') });
    if (!result.ok) throw new Error(`${file}: ${JSON.stringify(result.errors)}`);
    map = result.value;
    maps.set(file, map);
  }
  return map;
};

describe('the open grid benchmark files', () => {
  it('holds the selection its README lists (8 maps, 41 scenarios)', () => {
    expect(mapFiles).toHaveLength(8);
    expect(scenarioFiles).toHaveLength(41);
  });

  it.each(mapFiles)('parses map %s and writes it back byte for byte', (file) => {
    const text = read(file);
    const result = parseMap(text);
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    const [w, h] = [/width (\d+)/.exec(text)?.[1], /height (\d+)/.exec(text)?.[1]].map(Number);
    expect([result.value.width, result.value.height]).toEqual([w, h]);
    expect(result.value.type).toBe('octile');
    expect(writeMap(result.value)).toBe(text);
  });

  it('reads the passable cell counts of the map bodies (., G, S free; @, O, T, W blocked)', () => {
    for (const file of mapFiles) {
      const body = read(file).split('\n').slice(4).join('');
      const free = [...body].filter((ch) => ch === '.' || ch === 'G' || ch === 'S').length;
      expect([file, mapOf(file).grid.passable.reduce((a, b) => a + b, 0)]).toEqual([file, free]);
    }
  });

  it.each(scenarioFiles)('parses scenario %s against its map and writes it back byte for byte', (file) => {
    const text = read(file);
    const mapFile = text.split('\n')[1].split('\t')[1];
    const result = parseScenario(text, { map: mapOf(mapFile) });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.value.rows).toHaveLength(text.trimEnd().split('\n').length - 1);
    expect(writeScenario(result.value.rows)).toBe(text);
    // Every prefix of a standard scenario is a valid instance (no shared starts or goals).
    expect(largestAgentCount(result.value)).toBe(result.value.rows.length);
    const instance = instanceFromScenario(mapOf(mapFile), result.value, result.value.rows.length);
    expect(instance.ok).toBe(true);
  });

  it('recomputes the published optimal_length of every scenario row with the octile search to 1e-6', () => {
    let checked = 0;
    const mismatches: string[] = [];
    for (const file of scenarioFiles) {
      const text = read(file);
      const parsed = parseScenario(text);
      if (!parsed.ok) throw new Error(file);
      const map = mapOf(parsed.value.rows[0].mapFile);
      const search = createOctileSearch(map.grid);
      for (const row of parsed.value.rows) {
        const d = search.distance(row.start[1] * map.width + row.start[0], row.goal[1] * map.width + row.goal[0]);
        // Written as !(… <= …) so that NaN counts as a mismatch too.
        if (!(Math.abs(d - row.optimalLength) <= 1e-6)) mismatches.push(`${file}:${row.line} published ${row.optimalLength}, got ${d}`);
        checked++;
      }
    }
    expect(mismatches).toEqual([]);
    expect(checked).toBe(8769);
  });

  it('puts every row in bucket floor(optimal_length / 4), the convention the generator copies', () => {
    for (const file of scenarioFiles) {
      const parsed = parseScenario(read(file));
      if (!parsed.ok) throw new Error(file);
      const wrong = parsed.value.rows.filter((row) => row.bucket !== bucketOf(row.optimalLength));
      expect([file, wrong.map((r) => r.line)]).toEqual([file, []]);
    }
  });

  it('has every start and goal in the same 4-connected component', () => {
    for (const file of scenarioFiles) {
      const parsed = parseScenario(read(file));
      if (!parsed.ok) throw new Error(file);
      const map = mapOf(parsed.value.rows[0].mapFile);
      const { label } = connectedComponents(map.grid);
      const apart = parsed.value.rows.filter(({ start, goal }) =>
        label[start[1] * map.width + start[0]] !== label[goal[1] * map.width + goal[0]]);
      expect([file, apart.map((r) => r.line)]).toEqual([file, []]);
    }
  });
});
