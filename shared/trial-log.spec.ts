/** The trial log parsers (CSV and JSON) and the JSON Schema twin of the JSON spelling. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Ajv2020 from 'ajv/dist/2020';
import { ACTION_KINDS, HEADINGS } from './plan';
import {
  formatTrialLogCsv, formatTrialLogError, formatTrialLogJson, MAX_REPORTED_ERRORS, MAX_TRIAL_LOG_BYTES, MAX_TRIAL_LOG_ROWS, MAX_TRIAL_ROBOT, MAX_TRIAL_TIME_MS, parseTrialLog,
  parseTrialLogCsv, parseTrialLogJson, TRIAL_EVENTS, type TrialLogError, type TrialLogParse,
} from './trial-log';

const schema = JSON.parse(readFileSync(join(__dirname, 'trial-log.schema.json'), 'utf8'));
// Outside check: Ajv, a general-purpose JSON Schema validator (draft 2020-12), judges the schema file.
const ajvValidate = new Ajv2020({ strict: true, allErrors: true }).compile(schema);

function errorsOf(parse: TrialLogParse): readonly TrialLogError[] {
  if (parse.kind !== 'invalid') throw new Error('expected the log to be refused');
  return parse.errors;
}

const CSV = [
  '# run 3 of result 17, robots from the lab',
  'robot,action,start_ms,end_ms,heading,event,x_mm,y_mm',
  '0,forward,0,1010,E,,300,0',
  '1,turn-left,0,480.5,N,,,',
  '',
  '0,wait,1010,2020,E,,300,0',
  '1,forward,500,1500,N,collision,0,-300',
].join('\r\n');

describe('parseTrialLogCsv', () => {
  it('reads required and optional columns in any order, skipping comments and blank lines, keeping line numbers', () => {
    const parse = parseTrialLogCsv('run.csv', CSV);

    expect(parse).toEqual({
      kind: 'parsed',
      log: {
        file: 'run.csv', format: 'csv', rows: [
          { robot: 0, action: 'forward', startMs: 0, endMs: 1010, heading: 'E', xMm: 300, yMm: 0, line: 3 },
          { robot: 1, action: 'turn-left', startMs: 0, endMs: 480.5, heading: 'N', line: 4 },
          { robot: 0, action: 'wait', startMs: 1010, endMs: 2020, heading: 'E', xMm: 300, yMm: 0, line: 6 },
          { robot: 1, action: 'forward', startMs: 500, endMs: 1500, heading: 'N', event: 'collision', xMm: 0, yMm: -300, line: 7 },
        ],
      },
    });
  });

  it('refuses a header whose required columns are missing or out of order, naming the column', () => {
    const errors = errorsOf(parseTrialLogCsv('a.csv', 'robot,start_ms,action,end_ms\n0,0,forward,10\n'));

    expect(errors[0]).toEqual(expect.objectContaining({ file: 'a.csv', line: 1, column: 7, field: 'action' }));
    expect(errors[0].message).toContain('column 2 of the header must be "action"');
  });

  it('refuses an unknown or doubled optional column', () => {
    const errors = errorsOf(parseTrialLogCsv('a.csv', 'robot,action,start_ms,end_ms,speed,event,event\n'));

    expect(errors.map((e) => [e.line, e.column, e.field])).toEqual([[1, 30, 'speed'], [1, 42, 'event']]);
    expect(errors[0].message).toContain('unknown column "speed"');
    expect(errors[1].message).toContain('appears twice');
  });

  it('names line, column and field of each bad value', () => {
    const text = 'robot,action,start_ms,end_ms,heading,event\n-1,forward,0,10,,\n0,jump,0,10,,\n0,wait,1e3,2000,,\n0,wait,2000,1990,X,crash\n';

    const errors = errorsOf(parseTrialLogCsv('b.csv', text));

    expect(errors.map((e) => [e.line, e.column, e.field])).toEqual([
      [2, 1, 'robot'], [3, 3, 'action'], [4, 8, 'start_ms'], [5, 18, 'heading'], [5, 20, 'event'], [5, 13, 'end_ms'],
    ]);
    expect(errors[0].message).toBe(`must be an integer from 0 to ${MAX_TRIAL_ROBOT}, got "-1"`);
    expect(errors[5].message).toBe('is 1990, before start_ms 2000');
    expect(formatTrialLogError(errors[1])).toBe('b.csv:3:3: action: must be one of forward, turn-left, turn-right, wait, got "jump"');
  });

  it('refuses a row with the wrong number of fields and a missing required value', () => {
    const errors = errorsOf(parseTrialLogCsv('c.csv', 'robot,action,start_ms,end_ms\n0,forward,0\n0,forward,,10\n0,wait,10,20,5\n'));

    expect(errors.map((e) => [e.line, e.column, e.field, e.message])).toEqual([
      [2, 12, null, 'has 3 fields but the header has 4 columns'],
      [3, 11, 'start_ms', 'is required'],
      [4, 14, null, 'has 5 fields but the header has 4 columns'],
    ]);
  });

  it("refuses one robot's rows out of time order or overlapping, naming the earlier row's line", () => {
    const text = 'robot,action,start_ms,end_ms\n0,forward,0,1000\n1,forward,0,1000\n0,wait,900,1900\n';

    const errors = errorsOf(parseTrialLogCsv('d.csv', text));

    expect(errors).toHaveLength(1);
    expect(errors[0]).toEqual(expect.objectContaining({ line: 4, column: 8, field: 'start_ms' }));
    expect(errors[0].message).toContain('before its previous action (line 2) ends at 1000 ms');
  });

  it('refuses rows of a robot after its abort', () => {
    const errors = errorsOf(parseTrialLogCsv('e.csv', 'robot,action,start_ms,end_ms,event\n0,forward,0,500,abort\n0,wait,500,600,\n'));

    expect(errors[0]).toEqual(expect.objectContaining({ line: 3, column: 1, field: 'robot', message: 'robot 0 aborted at line 2 and has no later rows' }));
  });

  it('refuses x_mm without y_mm, and quoted fields', () => {
    const errors = errorsOf(parseTrialLogCsv('f.csv', 'robot,action,start_ms,end_ms,x_mm,y_mm\n0,forward,0,500,3,\n0,"wait",500,600,,\n'));

    expect(errors.map((e) => [e.line, e.field])).toEqual([[2, 'y_mm'], [3, 'action']]);
  });

  it('refuses an empty file, a header without rows and a file past the byte limit, with no place', () => {
    expect(errorsOf(parseTrialLogCsv('g.csv', '  \n'))[0].message).toBe('the file is empty');
    expect(errorsOf(parseTrialLogCsv('g.csv', 'robot,action,start_ms,end_ms\n'))[0].message).toBe('the log has a header but no action rows');
    const big = `robot,action,start_ms,end_ms\n${'#'.repeat(MAX_TRIAL_LOG_BYTES)}\n`;

    const errors = errorsOf(parseTrialLogCsv('g.csv', big));

    expect(errors).toEqual([expect.objectContaining({ line: null, column: null, field: null })]);
    expect(errors[0].message).toContain(`larger than ${MAX_TRIAL_LOG_BYTES} bytes`);
  });

  it('refuses more rows than the limit at the first row past it', () => {
    const rows = Array.from({ length: MAX_TRIAL_LOG_ROWS + 1 }, (_, k) => `0,wait,${k},${k + 1}`);

    const errors = errorsOf(parseTrialLogCsv('h.csv', `robot,action,start_ms,end_ms\n${rows.join('\n')}\n`));

    expect(errors).toEqual([expect.objectContaining({ line: MAX_TRIAL_LOG_ROWS + 2, message: `more than ${MAX_TRIAL_LOG_ROWS} action rows (the limit of one log)` })]);
  });

  it('stops after MAX_REPORTED_ERRORS problems and says so', () => {
    const rows = Array.from({ length: 50 }, () => '0,fly,0,1');

    const errors = errorsOf(parseTrialLogCsv('i.csv', `robot,action,start_ms,end_ms\n${rows.join('\n')}\n`));

    expect(errors).toHaveLength(MAX_REPORTED_ERRORS + 1);
    expect(errors[MAX_REPORTED_ERRORS].message).toContain(`stopped after ${MAX_REPORTED_ERRORS} problems`);
  });
});

const JSON_LOG = `{
  "format": "quarterturn-trial-log",
  "version": 1,
  "rows": [
    { "robot": 0, "action": "forward", "start_ms": 0, "end_ms": 1010, "heading": "E", "x_mm": 300, "y_mm": 0 },
    { "robot": 1, "action": "turn-left", "start_ms": 0, "end_ms": 480.5, "event": null },
    {
      "robot": 1, "action": "forward", "start_ms": 500, "end_ms": 1500, "event": "abort"
    }
  ]
}
`;

describe('parseTrialLogJson', () => {
  it('reads the rows with the line where each row object starts', () => {
    const parse = parseTrialLogJson('run.json', JSON_LOG);

    expect(parse).toEqual({
      kind: 'parsed',
      log: {
        file: 'run.json', format: 'json', rows: [
          { robot: 0, action: 'forward', startMs: 0, endMs: 1010, heading: 'E', xMm: 300, yMm: 0, line: 5 },
          { robot: 1, action: 'turn-left', startMs: 0, endMs: 480.5, line: 6 },
          { robot: 1, action: 'forward', startMs: 500, endMs: 1500, event: 'abort', line: 7 },
        ],
      },
    });
  });

  it('names the JSON path, line and column of a bad value, also inside a row spanning lines', () => {
    const text = JSON_LOG.replace('"end_ms": 1500', '"end_ms": "1500"').replace('"robot": 0', '"robot": 0.5');

    const errors = errorsOf(parseTrialLogJson('run.json', text));

    expect(errors.map((e) => [e.line, e.column, e.field])).toEqual([[5, 16, 'rows[0].robot'], [8, 67, 'rows[2].end_ms']]);
    expect(errors[1].message).toBe('must be a number, got "1500"');
  });

  it('refuses unknown keys, a wrong format or version and a missing rows array', () => {
    const errors = errorsOf(parseTrialLogJson('x.json', '{"format":"other","version":2,"extra":1}'));

    expect(errors.map((e) => e.field)).toEqual(['extra', 'format', 'version', 'rows']);
  });

  it('gives the line and column of a syntax error and of a duplicate key', () => {
    const broken = errorsOf(parseTrialLogJson('y.json', '{\n  "format": "quarterturn-trial-log",\n  "rows": [,]\n}'));
    const doubled = errorsOf(parseTrialLogJson('y.json', '{"rows": [], "rows": []}'));

    expect(broken).toEqual([expect.objectContaining({ line: 3, column: 12, field: null })]);
    expect(broken[0].message).toContain('not valid JSON');
    expect(doubled[0]).toEqual(expect.objectContaining({ line: 1, column: 14 }));
    expect(doubled[0].message).toContain('key "rows" appears twice');
  });

  it('applies the same order rule as the CSV spelling', () => {
    const text = JSON_LOG.replace('"start_ms": 500', '"start_ms": 400');

    const errors = errorsOf(parseTrialLogJson('run.json', text));

    expect(errors).toEqual([expect.objectContaining({ line: 8, field: 'rows[2].start_ms' })]);
  });
});

describe('formatTrialLogCsv and formatTrialLogJson', () => {
  it('write text that parses back to the same rows, each row on its own line', () => {
    const parsed = parseTrialLogCsv('run.csv', CSV);
    if (parsed.kind !== 'parsed') throw new Error('the example should parse');
    const rows = parsed.log.rows.map(({ line: _line, ...row }) => row);

    const csv = parseTrialLogCsv('again.csv', formatTrialLogCsv(rows));
    const json = parseTrialLogJson('again.json', formatTrialLogJson(rows));

    expect(csv).toEqual({ kind: 'parsed', log: { file: 'again.csv', format: 'csv', rows: rows.map((r, i) => ({ ...r, line: i + 2 })) } });
    expect(json).toEqual({ kind: 'parsed', log: { file: 'again.json', format: 'json', rows: rows.map((r, i) => ({ ...r, line: i + 5 })) } });
  });
});

describe('parseTrialLog', () => {
  it('picks the spelling by extension, else by content', () => {
    expect(parseTrialLog('run.log', JSON_LOG)).toEqual(expect.objectContaining({ kind: 'parsed', log: expect.objectContaining({ format: 'json' }) }));
    expect(parseTrialLog('run.txt', CSV)).toEqual(expect.objectContaining({ kind: 'parsed', log: expect.objectContaining({ format: 'csv' }) }));
    expect(parseTrialLog('run.csv', JSON_LOG).kind).toBe('invalid');
  });
});

describe('trial-log.schema.json', () => {
  const row = { robot: 0, action: 'forward', start_ms: 0, end_ms: 10 };
  const docs: readonly [string, unknown][] = [
    ['a plain log', { format: 'quarterturn-trial-log', version: 1, rows: [row] }],
    ['optional columns and nulls', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, x_mm: -3.5, y_mm: 2, heading: 'W', event: 'collision' }, { ...row, start_ms: 10, end_ms: 20, event: null }] }],
    ['no rows', { format: 'quarterturn-trial-log', version: 1, rows: [] }],
    ['another format', { format: 'other', version: 1, rows: [row] }],
    ['version 2', { format: 'quarterturn-trial-log', version: 2, rows: [row] }],
    ['a negative robot', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, robot: -1 }] }],
    ['a fractional robot', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, robot: 1.5 }] }],
    ['an unknown action', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, action: 'jump' }] }],
    ['a negative time', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, start_ms: -1 }] }],
    ['a time past 24 h', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, end_ms: MAX_TRIAL_TIME_MS + 1 }] }],
    ['x_mm without y_mm', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, x_mm: 1 }] }],
    ['an unknown event', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, event: 'crash' }] }],
    ['a bad heading', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, heading: 'NE' }] }],
    ['an unknown key in a row', { format: 'quarterturn-trial-log', version: 1, rows: [{ ...row, speed: 1 }] }],
    ['a missing end_ms', { format: 'quarterturn-trial-log', version: 1, rows: [{ robot: 0, action: 'wait', start_ms: 0 }] }],
  ];

  it.each(docs)('agrees with the parser on %s', (_name, doc) => {
    const isParsed = parseTrialLogJson('s.json', JSON.stringify(doc)).kind === 'parsed';

    expect(ajvValidate(doc)).toBe(isParsed);
  });

  it('states the same vocabulary and limits as the parser', () => {
    const rowSchema = schema.properties.rows.items.properties;

    expect(rowSchema.action.enum).toEqual([...ACTION_KINDS]);
    expect(rowSchema.heading.enum).toEqual([...HEADINGS, null]);
    expect(rowSchema.event.enum).toEqual([...TRIAL_EVENTS, null]);
    expect(rowSchema.robot.maximum).toBe(MAX_TRIAL_ROBOT);
    expect(rowSchema.end_ms.maximum).toBe(MAX_TRIAL_TIME_MS);
    expect(schema.properties.rows.maxItems).toBe(MAX_TRIAL_LOG_ROWS);
  });
});
