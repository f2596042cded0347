import { instanceFromScenario, largestAgentCount } from './instance-from-scenario';
import { parseMap } from './parse-map';
import { parseScenario } from './parse-scenario';

const mapResult = parseMap('type octile\nheight 2\nwidth 4\nmap\n....\n..@.\n');
if (!mapResult.ok) throw new Error('fixture map');
const map = mapResult.value;
const scenario = (rows: string[]) => {
  const result = parseScenario(['version 1', ...rows].join('\n'));
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.value;
};
const rows = [
  '0\tm.map\t4\t2\t0\t0\t3\t0\t3',
  '0\tm.map\t4\t2\t1\t0\t3\t1\t2.41421356',
  '0\tm.map\t4\t2\t2\t0\t3\t0\t1', // goal shared with line 2
  '0\tm.map\t4\t2\t1\t0\t0\t1\t1.41421356', // start shared with line 3
];

describe('instanceFromScenario', () => {
  it('uses the first k rows, cells as y * width + x', () => {
    const result = instanceFromScenario(map, scenario(rows), 2);
    expect(result.ok && result.value.agents).toEqual([{ start: 0, goal: 3 }, { start: 1, goal: 7 }]);
    expect(result.ok && result.value.grid).toBe(map.grid);
  });

  it('reports shared goals and starts with the lines of both rows', () => {
    const result = instanceFromScenario(map, scenario(rows), 4);
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors).toEqual([
      { line: 4, column: 17, message: 'goal (3, 0) is also the goal of the agent on line 2' },
      { line: 5, column: 13, message: 'start (1, 0) is also the start of the agent on line 3' },
    ]);
  });

  it('checks rows against the map when the scenario was parsed without it', () => {
    const result = instanceFromScenario(map, scenario(['0\tm.map\t4\t2\t2\t1\t0\t0\t2']), 1);
    expect(!result.ok && result.errors).toEqual([{ line: 2, column: 13, message: "start (2, 1) is a blocked cell ('@') of the map" }]);
  });

  it('rejects agent counts outside 1..rows', () => {
    for (const k of [0, 5, 1.5]) expect(instanceFromScenario(map, scenario(rows), k).ok).toBe(false);
  });

  it('finds the largest prefix without shared starts or goals', () => {
    expect(largestAgentCount(scenario(rows))).toBe(2);
    expect(largestAgentCount(scenario(rows.slice(0, 2)))).toBe(2);
  });
});
