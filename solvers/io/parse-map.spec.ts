import { parseMap } from './parse-map';
import { writeMap } from './write-map';

const ok = (text: string) => {
  const result = parseMap(text);
  if (!result.ok) throw new Error(JSON.stringify(result.errors));
  return result.value;
};
const errorsOf = (text: string) => {
  const result = parseMap(text);
  if (result.ok) throw new Error('expected errors');
  return result.errors;
};

describe('parseMap', () => {
  const small = 'type octile\nheight 3\nwidth 4\nmap\n.@..\nGTSW\n..O.\n';

  it('reads size, type and passability with x = column, y = row, (0,0) top-left', () => {
    const map = ok(small);
    expect([map.type, map.width, map.height]).toEqual(['octile', 4, 3]);
    // Row 0 ".@..", row 1 "GTSW", row 2 "..O.": G and S pass, T, W, @ and O block (map-terrain.ts).
    expect(Array.from(map.grid.passable)).toEqual([1, 0, 1, 1, 1, 0, 1, 0, 1, 1, 0, 1]);
    expect(map.grid.passable[1 * 4 + 2]).toBe(1); // (x 2, y 1) is 'S'
    expect(map.cellsText).toEqual(['.@..', 'GTSW', '..O.']);
  });

  it('keeps any single-word type and the given name', () => {
    const map = ok(small.replace('octile', 'tile'));
    expect(map.type).toBe('tile');
    const named = parseMap(small, { name: 'tiny' });
    expect(named.ok && named.value.name).toBe('tiny');
  });

  it('accepts CRLF line ends, trailing blanks and blank lines at the end', () => {
    const messy = 'type octile  \r\nheight 3\t\r\nwidth 4\r\nmap \r\n.@.. \r\nGTSW\r\n..O.\t\r\n\r\n  \n';
    expect(ok(messy)).toEqual(ok(small));
  });

  it('accepts a missing final newline and a byte-order mark', () => {
    expect(ok(`\uFEFF${small.trimEnd()}`)).toEqual(ok(small));
  });

  it('names line and column of an unexpected character', () => {
    const errors = errorsOf('type octile\nheight 2\nwidth 3\nmap\n...\n.#.\n');
    expect(errors).toEqual([{ line: 6, column: 2, message: "unexpected character '#' (expected one of . G S @ O T W)" }]);
  });

  it('collects every error, not only the first', () => {
    const errors = errorsOf('type octile\nheight 3\nwidth 3\nmap\nx..\n....\n..y\n');
    expect(errors.map((e) => [e.line, e.column])).toEqual([[5, 1], [6, 4], [7, 3]]);
    expect(errors[1].message).toBe('this map row has 4 cells, expected 3 (the width)');
  });

  it('stops after 100 errors with a note', () => {
    const rows = Array.from({ length: 50 }, () => 'xxxx').join('\n');
    const errors = errorsOf(`type octile\nheight 50\nwidth 4\nmap\n${rows}\n`);
    expect(errors).toHaveLength(101);
    expect(errors[100].message).toMatch(/more errors not shown/);
  });

  it('reports too few and too many rows', () => {
    expect(errorsOf('type octile\nheight 3\nwidth 2\nmap\n..\n..\n')).toEqual([
      { line: 7, column: 1, message: "expected 3 map rows after 'map', found 2" },
    ]);
    expect(errorsOf('type octile\nheight 1\nwidth 2\nmap\n..\n..\n')).toEqual([
      { line: 6, column: 1, message: 'unexpected text after the 1 map row (height 1)' },
    ]);
  });

  it('rejects a blank line inside the rows', () => {
    expect(errorsOf('type octile\nheight 3\nwidth 2\nmap\n..\n\n..\n')).toEqual([
      { line: 6, column: 1, message: 'this map row has 0 cells, expected 2 (the width)' },
    ]);
  });

  it('names bad and missing header fields', () => {
    expect(errorsOf('type octile\nheight -3\nwidth 2\nmap\n..\n')).toEqual([
      { line: 2, column: 8, message: "height '-3' is not a whole number from 1 to 8192" },
    ]);
    expect(errorsOf('type octile\nwidth 2\nmap\n..\n')).toEqual([
      { line: 3, column: 1, message: "missing 'height' header before 'map'" },
    ]);
    expect(errorsOf('type octile\nheight 1\nwidth 2\n..\n')).toEqual([
      { line: 4, column: 1, message: "missing 'map' line between the header and the map rows" },
    ]);
    expect(errorsOf('type octile\nheight 1\nheight 1\nwidth 2\nmap\n..\n')).toEqual([
      { line: 3, column: 1, message: "duplicate 'height' header" },
    ]);
    expect(errorsOf('type octile\ndepth 1\nheight 1\nwidth 2\nmap\n..\n')[0]).toEqual({
      line: 2, column: 1, message: "expected a header line 'type <word>', 'height <H>', 'width <W>' or 'map', found 'depth 1'",
    });
  });

  it('shows invisible characters by code point', () => {
    const [error] = errorsOf('type octile\nheight 1\nwidth 3\nmap\n.\t.\n');
    expect(error).toMatchObject({ line: 5, column: 2, message: expect.stringContaining('U+0009 (tab)') });
  });

  it('round-trips through writeMap', () => {
    const map = ok(small);
    expect(writeMap(map)).toBe(small);
    expect(ok(writeMap(map))).toEqual(map);
  });
});
