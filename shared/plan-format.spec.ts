/** The plan document schema (zod) and its JSON Schema twin agree; the text format parses and locates mistakes. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Ajv2020 from 'ajv/dist/2020';
import { PlanDocumentSchema } from './plan-format';
import { parsePlanText } from './plan-format-text';

// Outside check: Ajv, a general-purpose JSON Schema validator (draft 2020-12), judges the schema file.
const ajvValidate = new Ajv2020({ strict: true, allErrors: true }).compile(JSON.parse(readFileSync(join(__dirname, 'plan-format.schema.json'), 'utf8')));

const base = { format: 'quarterturn-plan', version: 1, instance: { scenarioId: 3, agents: 1 }, solver: { name: 'x', version: '1' } };
const docs: readonly [string, unknown, boolean][] = [
  ['classic paths', { ...base, model: 'classic', paths: [[[0, 0], [1, 0]]] }, true],
  ['k-robust with k', { ...base, model: 'k-robust', k: 1, paths: [[[0, 0]]] }, true],
  ['k-robust without k', { ...base, model: 'k-robust', paths: [[[0, 0]]] }, false],
  ['orientation states', { ...base, model: 'orientation-split', startHeading: 'E', states: [[[0, 0, 'E'], [1, 0, 'E']]] }, true],
  ['orientation with a bad heading', { ...base, model: 'orientation-split', states: [[[0, 0, 'X']]] }, false],
  ['weighted schedule', { ...base, model: 'weighted-split', schedule: [[{ action: 'forward', from: [0, 0], to: [1, 0], heading: 'E', start: 0, end: 1000, step: 0 }]] }, true],
  ['a lower bound', { ...base, model: 'classic', lowerBound: 2, paths: [[[0, 0]]] }, false],
  ['paths for weighted-split', { ...base, model: 'weighted-split', paths: [[[0, 0]]] }, false],
  ['a cell with three numbers', { ...base, model: 'classic', paths: [[[0, 0, 1]]] }, false],
  ['a fractional cell', { ...base, model: 'classic', paths: [[[0.5, 0]]] }, false],
  ['another format', { ...base, format: 'other', model: 'classic', paths: [[[0, 0]]] }, false],
  ['a NUL in the solver name', { ...base, model: 'classic', solver: { name: 'x\u0000y', version: '1' }, paths: [[[0, 0]]] }, false],
  ['a line break in the solver version', { ...base, model: 'classic', solver: { name: 'x', version: '1\n2' }, paths: [[[0, 0]]] }, false],
  ['a solver name outside ASCII', { ...base, model: 'classic', solver: { name: 'Planificateur café 地图', version: '1' }, paths: [[[0, 0]]] }, true],
  ['with a robot profile', { ...base, model: 'classic', robotProfile: { forwardMs: 1, quarterTurnMs: 1, waitMs: 1, cellPitchMm: 1, robotDiameterMm: 1, timingJitter: 0 }, paths: [[[0, 0]]] }, true],
];

describe('plan document schema', () => {
  it.each(docs)('zod and the JSON Schema agree on %s', (_name, doc, isValid) => {
    expect(PlanDocumentSchema.safeParse(doc).success).toBe(isValid);
    expect(ajvValidate(doc)).toBe(isValid);
  });
});

describe('text plan format', () => {
  it('reads both cell spellings, comments and blank lines', () => {
    const plan = parsePlanText('# plan\n(0,0) (1, 0)  2,0\n\n3,3 # stays\n', { file: 'p.txt', withHeadings: false });
    expect(plan).toEqual({ ok: true, cells: [[[0, 0], [1, 0], [2, 0]], [[3, 3]]], headings: [[], []] });
  });

  it('reads headings for orientation-split', () => {
    const plan = parsePlanText('(0,0,E) 1,0,E 1,0,S', { file: 'p.txt', withHeadings: true });
    expect(plan.ok && plan.headings).toEqual([['E', 'E', 'S']]);
  });

  it('names line, column and field of a bad token', () => {
    const plan = parsePlanText('(0,0)\n(1,1) (2;1)', { file: 'p.txt', withHeadings: false });
    expect(plan).toEqual({ ok: false, problems: [{ file: 'p.txt', line: 2, column: 7, field: 'agent 1, cell 1', message: 'expected a cell as (x,y) or x,y, found "(2;1)"' }] });
  });

  it('demands a heading per cell for orientation-split and refuses one otherwise', () => {
    const missing = parsePlanText('(0,0,N) (1,0)', { file: 'p.txt', withHeadings: true });
    expect(!missing.ok && missing.problems[0]).toMatchObject({ line: 1, column: 9, field: 'agent 0, cell 1' });
    const extra = parsePlanText('(0,0,N)', { file: 'p.txt', withHeadings: false });
    expect(!extra.ok && extra.problems[0]).toMatchObject({ line: 1, column: 6 });
    const bad = parsePlanText('(0,0,Q)', { file: 'p.txt', withHeadings: true });
    expect(!bad.ok && bad.problems[0].message).toBe('heading must be N, E, S or W, found "Q"');
  });

  it('refuses a file without agent lines', () => {
    expect(parsePlanText('# nothing\n', { file: 'p.txt', withHeadings: false }).ok).toBe(false);
  });
});
