import { parseMap } from './parse-map';
import { parseScenario } from './parse-scenario';
import { writeScenario } from './write-scenario';

const mapResult = parseMap('type octile\nheight 3\nwidth 4\nmap\n....\n.@..\n....\n');
if (!mapResult.ok) throw new Error('fixture map');
const map = mapResult.value;
const row = (fields: (string | number)[]) => fields.join('\t');
const scen = (...rows: string[]) => ['version 1', ...rows, ''].join('\n');
const good = scen(
  row([0, 'tiny.map', 4, 3, 0, 0, 3, 0, '3.00000000']),
  row([1, 'tiny.map', 4, 3, 0, 2, 3, 2, '3.00000000']),
  row([1, 'tiny.map', 4, 3, 2, 1, 0, 1, '2.82842712']),
);
const errorsOf = (text: string, withMap = true) => {
  const result = parseScenario(text, withMap ? { map } : {});
  if (result.ok) throw new Error('expected errors');
  return result.errors;
};

describe('parseScenario', () => {
  it('reads the nine fields of every row, keeping them as given', () => {
    const result = parseScenario(good, { map });
    expect(result.ok).toBe(true);
    if (!result.ok) return;
    expect(result.value.version).toBe('1');
    expect(result.value.rows).toHaveLength(3);
    expect(result.value.rows[2]).toEqual({
      line: 4, fieldColumns: [1, 3, 12, 14, 16, 18, 20, 22, 24],
      bucket: 1, mapFile: 'tiny.map', mapWidth: 4, mapHeight: 3, start: [2, 1], goal: [0, 1], optimalLength: 2.82842712,
    });
  });

  it('accepts version 1.0, space-separated fields, CRLF and trailing blanks', () => {
    const text = 'version 1.0\r\n0 tiny.map 4 3 0 0 3 0 3.0 \r\n\r\n';
    const result = parseScenario(text, { map });
    expect(result.ok && result.value.rows[0]).toMatchObject({ start: [0, 0], goal: [3, 0], optimalLength: 3 });
  });

  it('names the field and the map width when a start lies outside', () => {
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 40, 0, 3, 0, '3'])))).toEqual([
      { line: 2, column: 16, message: 'start_x 40 is outside the map (width 4)' },
    ]);
  });

  it('rejects starts and goals on blocked cells', () => {
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 0, 1, 1, '1.41421356'])))).toEqual([
      { line: 2, column: 20, message: "goal (1, 1) is a blocked cell ('@') of the map" },
    ]);
  });

  it('checks the declared size against the map, and without a map against itself', () => {
    expect(errorsOf(scen(row([0, 'tiny.map', 5, 3, 0, 0, 3, 0, '3'])))).toEqual([
      { line: 2, column: 12, message: 'map_width 5 does not match the map (width 4)' },
    ]);
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 3, 3, 0, '3'])), false)).toEqual([
      { line: 2, column: 18, message: 'start_y 3 is outside the map (map_height 3)' },
    ]);
  });

  it('names malformed fields and wrong field counts', () => {
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 'x', 3, 0, '3']), row([0, 'tiny.map', 4, 3, 0, 0, 3, 0, '-3'])))).toEqual([
      { line: 2, column: 18, message: "start_y 'x' is not a whole number" },
      { line: 3, column: 24, message: "optimal_length '-3' is not a non-negative number" },
    ]);
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 0, 3])))).toEqual([
      { line: 2, column: 21, message: 'a row has 9 fields, found 7: missing goal_y, optimal_length' },
    ]);
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 0, 3, 0, 3, 'extra'])))).toEqual([
      { line: 2, column: 26, message: "unexpected field 'extra' after optimal_length (a row has 9 fields)" },
    ]);
  });

  it('requires the version line, a known version and at least one row', () => {
    expect(errorsOf('0\ttiny.map\t4\t3\t0\t0\t3\t0\t3\n')[0]).toEqual({
      line: 1, column: 1, message: "expected 'version 1' on the first line, found '0\ttiny.map\t4\t3\t0\t0\t3\t0\t3'",
    });
    expect(errorsOf('version 2\n0\ttiny.map\t4\t3\t0\t0\t3\t0\t3\n')).toEqual([
      { line: 1, column: 9, message: "unsupported version '2' (expected 1 or 1.0)" },
    ]);
    expect(errorsOf('version 1\n')).toEqual([{ line: 2, column: 1, message: 'the scenario has no rows after the version line' }]);
    expect(errorsOf('')).toEqual([
      { line: 1, column: 1, message: "empty file: expected 'version 1' on the first line" },
      { line: 2, column: 1, message: 'the scenario has no rows after the version line' },
    ]);
  });

  it('requires every row to name the same map', () => {
    expect(errorsOf(scen(row([0, 'tiny.map', 4, 3, 0, 0, 3, 0, '3']), row([0, 'other.map', 4, 3, 0, 2, 3, 2, '3'])))).toEqual([
      { line: 3, column: 3, message: "map_file 'other.map' differs from 'tiny.map' on line 2 (a scenario belongs to one map)" },
    ]);
  });

  it('rejects a blank line between rows', () => {
    const text = good.replace('3.00000000\n1', '3.00000000\n\n1');
    expect(errorsOf(text)).toEqual([{ line: 3, column: 1, message: 'blank line between scenario rows' }]);
  });

  it('round-trips through writeScenario', () => {
    const result = parseScenario(good, { map });
    if (!result.ok) throw new Error('fixture');
    expect(writeScenario(result.value.rows)).toBe(good);
  });
});
