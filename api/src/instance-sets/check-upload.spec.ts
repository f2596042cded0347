import { checkUpload, scenarioMapNames } from './check-upload';
import { unsafePathReason, type UploadEntry } from './upload-entry';

const entry = (name: string, text: string): UploadEntry => ({ name, label: name, bytes: Buffer.from(text, 'utf8') });
const NONE = { mapNames: new Set<string>(), scenarioNames: new Set<string>(), maps: new Map() };
const MAP = 'type octile\nheight 2\nwidth 3\nmap\n..@\n...\n';

describe('checkUpload', () => {
  it('accepts a map and a scenario on it, counting free cells and usable agents', () => {
    const scen = 'version 1\n0\tsmall.map\t3\t2\t0\t0\t2\t1\t2.41421356\n0\tsmall.map\t3\t2\t1\t1\t0\t1\t1.00000000\n';
    const out = checkUpload([entry('small.map', MAP), entry('small-1.scen', scen)], NONE);
    expect(out.problems).toEqual([]);
    expect(out.maps.map((m) => [m.name, m.passableCount])).toEqual([['small.map', 5]]);
    expect(out.scenarios.map((s) => [s.mapName, s.maxAgents])).toEqual([['small.map', 2]]);
  });

  it('reports a start on a blocked cell at its line and column', () => {
    // Start (2, 0) is the '@' of row 0; start_x, the fifth field, begins at column 17 ('0', tab, 9-letter name, tab, '3', tab, '2', tab).
    const scen = 'version 1\n0\tsmall.map\t3\t2\t2\t0\t0\t1\t1\n';
    const out = checkUpload([entry('small.map', MAP), entry('bad.scen', scen)], NONE);
    expect(out.problems).toEqual([{ file: 'bad.scen', line: 2, column: 17, message: "start (2, 0) is a blocked cell ('@') of the map" }]);
  });

  it('refuses two files of the same name in one upload', () => {
    const out = checkUpload([entry('a.map', MAP), { ...entry('a.map', MAP), label: 'z.zip:x/a.map' }], NONE);
    expect(out.problems).toEqual([expect.objectContaining({ file: 'z.zip:x/a.map', message: expect.stringMatching(/two files named 'a.map'/) })]);
  });

  it('locates every problem by 1-based line and column inside the file, never by a 0-based row (issue 14, item 10)', () => {
    const files: Record<string, string> = {
      'chars.map': 'type octile\nheight 2\nwidth 3\nmap\n.x.\n...\n',
      'short.map': 'type octile\nheight 3\nwidth 3\nmap\n...\n..\n...\n',
      'blank.map': 'type octile\nheight 3\nwidth 2\nmap\n..\n\n..\n',
      'long.map': 'type octile\nheight 2\nwidth 2\nmap\n..\n...\n..\n',
      'header.map': 'type octile\nheight 0\nwidth 2\nmap\n..\n',
      'few.map': 'type octile\nheight 3\nwidth 2\nmap\n..\n..\n',
      'blocked.scen': 'version 1\n0\tsmall.map\t3\t2\t2\t0\t0\t1\t1\n',
      'outside.scen': 'version 1\n0\tsmall.map\t3\t2\t0\t0\t0\t5\t1\n',
      'fields.scen': 'version 1\n0\tsmall.map\t3\t2\t0\t0\t0\n',
      'version.scen': 'version 7\n0\tsmall.map\t3\t2\t0\t0\t1\t0\t1\n',
    };
    const out = checkUpload([entry('small.map', MAP), ...Object.entries(files).map(([n, t]) => entry(n, t))], NONE);
    const located = out.problems.filter((p) => p.line > 0);
    // Every bad file is reported, each at a place in it.
    expect(new Set(located.map((p) => p.file))).toEqual(new Set(Object.keys(files)));
    expect(located.length).toBeGreaterThanOrEqual(Object.keys(files).length);
    for (const p of out.problems) {
      const lines = files[p.file].split('\n');
      // A missing row is reported on the line where it should have been, one past the last.
      expect(p.line).toBeLessThanOrEqual(lines.length);
      expect(p.column).toBeGreaterThanOrEqual(1);
      expect(p.column).toBeLessThanOrEqual((lines[p.line - 1] ?? '').length + 1);
      expect(p.message).not.toMatch(/\brows? \d/);
    }
    const at = (file: string) => located.filter((p) => p.file === file).map((p) => [p.line, p.column]);
    expect(at('chars.map')).toEqual([[5, 2]]);
    expect(at('short.map')).toEqual([[6, 3]]);
    expect(at('blank.map')).toEqual([[6, 1]]);
    expect(at('long.map')).toEqual([[6, 3], [7, 1]]);
    expect(at('blocked.scen')).toEqual([[2, 17]]);
  });

  it('reads the map names scenarios refer to from their first row, by base name', () => {
    expect(scenarioMapNames([entry('s.scen', 'version 1\n0\tmaps/den.map\t3\t2\t0\t0\t1\t0\t1\n'), entry('m.map', MAP)])).toEqual(['den.map']);
  });
});

describe('unsafePathReason', () => {
  it.each([
    ['a.map', null], ['dir/a.map', null], ['../a.map', /climbs out/], ['dir/../../a.map', /climbs out/],
    ['/etc/a.map', /absolute/], ['C:/a.map', /absolute/], ['dir\\a.map', /backslash/], ['a\0.map', /NUL/],
  ])('%s', (path, reason) => {
    const got = unsafePathReason(path);
    if (reason === null) expect(got).toBeNull();
    else expect(got).toMatch(reason);
  });
});
