import { INSTANCE_BLOCKED_CHARS, INSTANCE_PASSABLE_CHARS } from '@shared/instance-format';
import { instanceFromScenario } from './instance-from-scenario';
import { instanceToDocument, parseInstanceDocument, writeInstanceDocument } from './instance-document';
import { scanJson } from './json-scan';
import { BLOCKED_CHARS, PASSABLE_CHARS } from './map-terrain';
import { parseMap } from './parse-map';
import { parseScenario } from './parse-scenario';

const mapResult = parseMap('type octile\nheight 3\nwidth 4\nmap\n..T.\n.@..\nS...\n', { name: 'yard' });
if (!mapResult.ok) throw new Error('fixture map');
const map = mapResult.value;
const instance = {
  grid: map.grid,
  agents: [{ start: 0, goal: 11 }, { start: 3, goal: 8, startHeading: 'W' as const }],
};

describe('the JSON instance document', () => {
  it('round-trips map, agents and headings through write and parse', () => {
    const text = writeInstanceDocument(instanceToDocument(map, instance, 'two robots'));
    expect(JSON.parse(text)).toEqual({
      format: 'quarterturn-instance', version: 1, name: 'two robots',
      map: { name: 'yard', type: 'octile', width: 4, height: 3, rows: ['..T.', '.@..', 'S...'] },
      agents: [{ start: [0, 0], goal: [3, 2] }, { start: [3, 0], goal: [0, 2], startHeading: 'W' }],
    });
    const back = parseInstanceDocument(text);
    expect(back.ok).toBe(true);
    if (!back.ok) return;
    expect(back.value.name).toBe('two robots');
    expect(back.value.map).toEqual(map);
    expect(back.value.instance).toEqual(instance);
  });

  it('leaves out optional fields that are undefined', () => {
    const doc = { ...instanceToDocument(map, instance), map: { ...instanceToDocument(map, instance).map, name: undefined } };
    expect(JSON.parse(writeInstanceDocument(doc)).map).not.toHaveProperty('name');
  });

  it('carries a scenario instance over unchanged', () => {
    const scen = parseScenario('version 1\n0\tyard.map\t4\t3\t0\t0\t3\t2\t3.82842712\n0\tyard.map\t4\t3\t0\t2\t2\t2\t2\n', { map });
    if (!scen.ok) throw new Error(JSON.stringify(scen.errors));
    const fromScen = instanceFromScenario(map, scen.value, 2);
    if (!fromScen.ok) throw new Error('instance');
    const back = parseInstanceDocument(writeInstanceDocument(instanceToDocument(map, fromScen.value)));
    expect(back.ok && back.value.instance).toEqual(fromScen.value);
  });

  it('names line and column of a value that breaks the schema', () => {
    const text = writeInstanceDocument(instanceToDocument(map, instance)).replace('"goal": [3, 2]', '"goal": [9, 2]');
    const result = parseInstanceDocument(text);
    expect(!result.ok && result.errors).toEqual([
      { line: 16, column: 33, message: 'agents[0].goal x 9 is outside the map (width 4)' },
    ]);
    expect(text.split('\n')[15].slice(32, 33)).toBe('9');
  });

  it('rejects blocked cells, shared goals, bad rows and unknown keys', () => {
    const doc = {
      format: 'quarterturn-instance', version: 1,
      map: { width: 4, height: 3, rows: ['..T.', '.@..', 'S..'] },
      agents: [{ start: [2, 0], goal: [3, 2] }, { start: [0, 0], goal: [3, 2], speed: 2 }],
    };
    const result = parseInstanceDocument(JSON.stringify(doc, null, 1));
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.map((e) => e.message)).toEqual([
      'agents[1]: Unrecognized key: "speed"',
      'map.rows[2] has 3 cells, expected 4 (map.width)',
      "agents[0].start [2, 0] is a blocked cell ('T')",
      'agents[1].goal [3, 2] is also the goal of agents[0]',
    ]);
    expect(result.errors.every((e) => e.line > 1)).toBe(true);
  });

  it('reports JSON syntax errors at their position', () => {
    expect(parseInstanceDocument('{\n  "format": "quarterturn-instance",\n  "version": 1,,\n}')).toEqual({
      ok: false, errors: [{ line: 3, column: 16, message: "invalid JSON: expected a property name in double quotes, found ','" }],
    });
  });
});

describe('scanJson', () => {
  // The reference for what is valid JSON: the platform's JSON.parse (RFC 8259).
  const samples = ['{"a":[1,-2.5e3,true,false,null,"x\\u00e9\\n\\"q\\""]}', '[]', '  "s"  ', '{"__proto__": {"b": 1}}', '0', '[1,[2,[3]]]'];
  it.each(samples)('agrees with JSON.parse on %s', (text) => {
    const scan = scanJson(text);
    expect(scan.ok && scan.value).toEqual(JSON.parse(text));
  });

  const invalid = ['{', '[1,]', '{"a" 1}', "{'a':1}", '01', '"\t"', '[1] x', '', 'nul', '"\\x"'];
  it.each(invalid)('rejects %p as JSON.parse does', (text) => {
    expect(() => JSON.parse(text)).toThrow();
    expect(scanJson(text).ok).toBe(false);
  });

  it('locates values by path, and missing ones at their parent', () => {
    const scan = scanJson('{\n "a": [10,\n   {"b": true}]\n}');
    if (!scan.ok) throw new Error('scan');
    expect(scan.locate(['a', 1, 'b'])).toEqual({ line: 3, column: 10 });
    expect(scan.locate(['a', 1, 'zzz'])).toEqual({ line: 3, column: 4 });
    expect(scan.locate([])).toEqual({ line: 1, column: 1 });
  });

  it('keeps a __proto__ key as plain data', () => {
    const scan = scanJson('{"__proto__": {"polluted": 1}}');
    expect(scan.ok && Object.keys(scan.value as object)).toEqual(['__proto__']);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
});

describe('terrain characters', () => {
  it('are the same in the text reader and in the JSON format', () => {
    // shared/ may not import solvers/, so the two lists are kept equal by this test.
    expect(PASSABLE_CHARS.join('')).toBe(INSTANCE_PASSABLE_CHARS);
    expect(BLOCKED_CHARS.join('')).toBe(INSTANCE_BLOCKED_CHARS);
  });
});
