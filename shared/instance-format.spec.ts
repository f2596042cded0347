/// <reference types="node" />
import Ajv2020 from 'ajv/dist/2020';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { INSTANCE_BLOCKED_CHARS, INSTANCE_PASSABLE_CHARS, InstanceDocumentSchema } from './instance-format';
import { instanceFormatJsonSchema, instanceFormatJsonSchemaText } from './instance-format-json-schema';

const checkedIn = readFileSync(join(__dirname, 'instance-format.schema.json'), 'utf8');
// Outside check: Ajv, a general-purpose JSON Schema validator (draft 2020-12), judges the schema file.
const ajvValidate = new Ajv2020({ strict: true, allErrors: true }).compile(JSON.parse(checkedIn));

const valid = {
  format: 'quarterturn-instance', version: 1, name: 'corridor swap',
  map: { name: 'corridor', type: 'octile', width: 5, height: 2, rows: ['.....', '@@G@@'] },
  agents: [{ start: [0, 0], goal: [4, 0], startHeading: 'E' }, { start: [4, 0], goal: [0, 0] }],
};
const withAgent = (agent: unknown) => ({ ...valid, agents: [agent] });
const structurallyInvalid: [string, unknown][] = [
  ['wrong format', { ...valid, format: 'other' }],
  ['version 2', { ...valid, version: 2 }],
  ['no agents', { ...valid, agents: [] }],
  ['unknown top-level key', { ...valid, extra: 1 }],
  ['cell with three numbers', withAgent({ start: [0, 0, 0], goal: [1, 0] })],
  ['negative coordinate', withAgent({ start: [-1, 0], goal: [1, 0] })],
  ['fractional coordinate', withAgent({ start: [0.5, 0], goal: [1, 0] })],
  ['unknown heading', withAgent({ start: [0, 0], goal: [1, 0], startHeading: 'NE' })],
  ['bad terrain character', { ...valid, map: { ...valid.map, rows: ['..#..', '@@G@@'] } }],
  ['zero width', { ...valid, map: { ...valid.map, width: 0 } }],
  ['missing rows', { ...valid, map: { width: 5, height: 2 } }],
];
// Valid JSON Schema instances that only the zod refinements reject (documented in the schema's description).
const semanticallyInvalid: [string, unknown][] = [
  ['row shorter than width', { ...valid, map: { ...valid.map, rows: ['....', '@@G@@'] } }],
  ['too few rows', { ...valid, map: { ...valid.map, height: 3 } }],
  ['start outside', withAgent({ start: [5, 0], goal: [1, 0] })],
  ['goal on a blocked cell', withAgent({ start: [0, 0], goal: [0, 1] })],
  ['shared start', { ...valid, agents: [{ start: [0, 0], goal: [1, 0] }, { start: [0, 0], goal: [2, 0] }] }],
];

describe('the instance format schemas', () => {
  it('keeps the checked-in JSON Schema equal to the one generated from zod', () => {
    expect(checkedIn).toBe(instanceFormatJsonSchemaText());
    expect(JSON.parse(checkedIn)).toEqual(instanceFormatJsonSchema());
  });

  it('accepts a valid document in both', () => {
    expect(InstanceDocumentSchema.safeParse(valid).success).toBe(true);
    expect(ajvValidate(valid)).toBe(true);
  });

  it.each(structurallyInvalid)('rejects %s in both', (_name, doc) => {
    expect(InstanceDocumentSchema.safeParse(doc).success).toBe(false);
    expect(ajvValidate(doc)).toBe(false);
  });

  it.each(semanticallyInvalid)('rejects %s in zod (beyond what JSON Schema can say)', (_name, doc) => {
    expect(ajvValidate(doc)).toBe(true);
    expect(InstanceDocumentSchema.safeParse(doc).success).toBe(false);
  });

  it('lists the same terrain characters as the schema pattern', () => {
    expect(checkedIn).toContain(`^[${INSTANCE_PASSABLE_CHARS}${INSTANCE_BLOCKED_CHARS}]+$`);
  });
});
