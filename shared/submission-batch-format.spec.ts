/// <reference types="node" />
/** The batch manifest: zod and its JSON Schema twin agree, and the entry rules apply defaults and refuse what a plan cannot be read without. */
import Ajv2020 from 'ajv/dist/2020';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { BatchManifestSchema, resolveBatchEntry, type BatchManifest } from './submission-batch-format';
import { batchManifestJsonSchema, batchManifestJsonSchemaText } from './submission-batch-format-json-schema';

const checkedIn = readFileSync(join(__dirname, 'submission-batch-format.schema.json'), 'utf8');
// Outside check: Ajv, a general-purpose JSON Schema validator (draft 2020-12), judges the schema file.
const ajvValidate = new Ajv2020({ strict: true, allErrors: true }).compile(JSON.parse(checkedIn));

const solver = { name: 'Lantern', version: '0.9' };
const zipManifest = {
  format: 'quarterturn-plan-batch', version: 1,
  defaults: { set: 'Depot aisles', model: 'classic', solver },
  plans: [
    { file: 'plans/a.txt', instance: { map: 'aisle.map', scenario: 'aisle-1.scen', agents: 4 } },
    { file: 'plans/b.json', robotProfile: { forwardMs: 900, quarterTurnMs: 500, waitMs: 900, cellPitchMm: 400, robotDiameterMm: 300, timingJitter: 0 } },
    { file: 'plans/c.txt', instance: { scenarioId: 7, agents: 2 }, model: 'k-robust', k: 2, startHeading: 'E' },
  ],
};
const jsonManifest = { format: 'quarterturn-plan-batch', version: 1, plans: [{ text: '(0,0) (1,0)\n', model: 'classic', solver, instance: { scenarioId: 3, agents: 1 } }] };
const invalid: [string, unknown][] = [
  ['a wrong format name', { ...jsonManifest, format: 'quarterturn-plan' }],
  ['version 2', { ...jsonManifest, version: 2 }],
  ['no plans', { ...jsonManifest, plans: [] }],
  ['an unknown key in an entry', { ...jsonManifest, plans: [{ ...jsonManifest.plans[0], lowerBound: 3 }] }],
  ['agents as text', { ...jsonManifest, plans: [{ ...jsonManifest.plans[0], instance: { scenarioId: 3, agents: 'one' } }] }],
  ['an unknown model', { ...jsonManifest, plans: [{ ...jsonManifest.plans[0], model: 'weighted-split' }] }],
  ['201 plans', { ...jsonManifest, plans: Array.from({ length: 201 }, () => jsonManifest.plans[0]) }],
];

const parse = (value: unknown): BatchManifest => BatchManifestSchema.parse(value);

describe('batch manifest schemas', () => {
  it('keeps the checked-in JSON Schema equal to the one generated from zod', () => {
    expect(checkedIn).toBe(batchManifestJsonSchemaText());
    expect(JSON.parse(checkedIn)).toEqual(batchManifestJsonSchema());
  });

  it.each([['zip', zipManifest], ['JSON', jsonManifest]])('accepts a %s manifest in both', (_name, manifest) => {
    expect(BatchManifestSchema.safeParse(manifest).success).toBe(true);
    expect(ajvValidate(manifest)).toBe(true);
  });

  it.each(invalid)('rejects %s in both', (_name, manifest) => {
    expect(BatchManifestSchema.safeParse(manifest).success).toBe(false);
    expect(ajvValidate(manifest)).toBe(false);
  });
});

describe('resolveBatchEntry', () => {
  it('fills a text plan from defaults and keeps what the entry says itself', () => {
    const m = parse(zipManifest);

    const a = resolveBatchEntry(m, 0, 'zip');
    const c = resolveBatchEntry(m, 2, 'zip');

    expect(a).toEqual({ ok: true, entry: { format: 'text', file: 'plans/a.txt', text: undefined, instance: { set: 'Depot aisles', map: 'aisle.map', scenario: 'aisle-1.scen', agents: 4 }, model: 'classic', startHeading: 'free', solver } });
    // A scenario id needs no set: the default set is left out.
    expect(c).toMatchObject({ ok: true, entry: { format: 'text', model: 'k-robust', k: 2, startHeading: 'E' } });
    expect(c.ok && c.entry.format === 'text' && c.entry.instance).toEqual({ scenarioId: 7, agents: 2 });
  });

  it('tells a plan document by its .json name and keeps only its robot profile', () => {
    const b = resolveBatchEntry(parse(zipManifest), 1, 'zip');

    expect(b).toEqual({ ok: true, entry: { format: 'json', file: 'plans/b.json', text: undefined, robotProfile: zipManifest.plans[1].robotProfile } });
  });

  it('tells inline text by its first character: { starts a plan document', () => {
    const m = parse({ ...jsonManifest, plans: [{ text: '  {"format": "quarterturn-plan"}' }, jsonManifest.plans[0]] });

    expect(resolveBatchEntry(m, 0, 'json')).toMatchObject({ ok: true, entry: { format: 'json' } });
    expect(resolveBatchEntry(m, 1, 'json')).toMatchObject({ ok: true, entry: { format: 'text' } });
  });

  it('refuses a text plan without model, solver or instance, naming each field', () => {
    const m = parse({ format: 'quarterturn-plan-batch', version: 1, plans: [{ file: 'x.txt' }] });

    const r = resolveBatchEntry(m, 0, 'zip');

    expect(r.ok).toBe(false);
    expect(!r.ok && r.problems.map((p) => p.path.join('.'))).toEqual(['plans.0.instance', 'plans.0.model', 'plans.0.solver']);
  });

  it('refuses a plan document entry that names what the document names', () => {
    const m = parse({ format: 'quarterturn-plan-batch', version: 1, plans: [{ file: 'x.json', model: 'classic', instance: { scenarioId: 1, agents: 1 } }] });

    const r = resolveBatchEntry(m, 0, 'zip');

    expect(!r.ok && r.problems.map((p) => p.path.join('.'))).toEqual(['plans.0.instance', 'plans.0.model']);
  });

  it('refuses a scenario named by file name without a set, and by both name and id', () => {
    const m = parse({
      format: 'quarterturn-plan-batch', version: 1, defaults: { model: 'classic', solver },
      plans: [{ file: 'a.txt', instance: { scenario: 'a.scen', agents: 1 } }, { file: 'b.txt', instance: { setId: 2, scenario: 'a.scen', scenarioId: 4, agents: 1 } }],
    });

    expect(resolveBatchEntry(m, 0, 'zip')).toEqual({ ok: false, problems: [{ path: ['plans', 0, 'instance', 'set'], message: expect.stringContaining('needs its instance set') }] });
    expect(resolveBatchEntry(m, 1, 'zip')).toEqual({ ok: false, problems: [{ path: ['plans', 1, 'instance'], message: expect.stringContaining('either by file name') }] });
  });

  it('refuses a file in a JSON batch and text in a zip batch', () => {
    const m = parse({ format: 'quarterturn-plan-batch', version: 1, defaults: { model: 'classic', solver }, plans: [{ file: 'a.txt', text: 'x', instance: { scenarioId: 1, agents: 1 } }] });

    expect(resolveBatchEntry(m, 0, 'zip')).toMatchObject({ ok: false, problems: [{ path: ['plans', 0, 'text'] }] });
    expect(resolveBatchEntry(m, 0, 'json')).toMatchObject({ ok: false, problems: [{ path: ['plans', 0, 'file'] }] });
  });
});
