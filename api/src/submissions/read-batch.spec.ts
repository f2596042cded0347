/** Reading a batch up front: where the manifest may sit in a zip, and the 400 that names file, line, column and field. */
import yazl from 'yazl';
import { AppError } from '../errors/app-error';
import { readJsonBatch, readZipBatch } from './read-batch';

const solver = { name: 'Lantern', version: '0.9' };
const manifest = (plans: unknown[]) => JSON.stringify({ format: 'quarterturn-plan-batch', version: 1, defaults: { model: 'classic', solver }, plans }, null, 2);
const entry = { file: 'a.txt', instance: { scenarioId: 3, agents: 1 } };

function zipOf(files: Record<string, string>): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, text] of Object.entries(files)) zip.addBuffer(Buffer.from(text), name);
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream.on('data', (c: Buffer) => chunks.push(c)).on('end', () => resolve(Buffer.concat(chunks))).on('error', reject);
  });
}

/** The AppError `run` throws (fails the test when it throws none or another error). */
async function refusal(run: () => unknown): Promise<AppError> {
  try {
    await run();
  } catch (err) {
    if (err instanceof AppError) return err;
    throw err;
  }
  throw new Error('expected a refusal');
}

describe('readZipBatch', () => {
  it('reads batch.json at the root and the plan files it names, with the line of each entry', async () => {
    const zip = await zipOf({ 'batch.json': manifest([entry, { ...entry, file: 'plans/b.txt' }]), 'a.txt': '(0,0)\n', 'plans/b.txt': '(1,0)\n', 'notes.md': 'ignored' });

    const batch = await readZipBatch('week.zip', zip);

    // Two-space JSON: lines 1–3 open, format, version; defaults 4–10; plans opens on 11; an entry takes 7 lines (12–18, 19–25).
    expect(batch.plans.map((p) => [p.file, p.line, p.text])).toEqual([['a.txt', 12, '(0,0)\n'], ['plans/b.txt', 19, '(1,0)\n']]);
    expect(batch.plans[0].request).toEqual({ format: 'text', file: 'a.txt', instance: { scenarioId: 3, agents: 1 }, model: 'classic', startHeading: 'free', solver });
  });

  it('finds the manifest in the one top folder of a zipped folder, and plan paths are relative to it', async () => {
    const zip = await zipOf({ 'week/batch.json': manifest([entry]), 'week/a.txt': '(0,0)\n' });

    const batch = await readZipBatch('week.zip', zip);

    expect(batch.plans.map((p) => p.file)).toEqual(['week/a.txt']);
  });

  it('refuses a zip with two manifests at the same depth, naming them', async () => {
    const zip = await zipOf({ 'x/batch.json': manifest([entry]), 'y/batch.json': manifest([entry]) });

    const err = await refusal(() => readZipBatch('two.zip', zip));

    expect(err.status).toBe(400);
    expect((err.details as { file: string; field: string; message: string }[])[0]).toMatchObject({ file: 'two.zip', field: 'batch.json', message: expect.stringContaining('x/batch.json, y/batch.json') });
  });

  it('places a JSON syntax error in batch.json at its line and column', async () => {
    const zip = await zipOf({ 'batch.json': '{\n  "format": "quarterturn-plan-batch",\n  "version": 1,,\n}' });

    const err = await refusal(() => readZipBatch('bad.zip', zip));

    // Line 3 is `  "version": 1,,`: the second comma, at column 16, cannot start a key.
    expect((err.details as unknown[])[0]).toMatchObject({ file: 'batch.json', line: 3, column: 16, field: 'document' });
    expect(err.message).toContain('batch.json, line 3, column 16');
  });

  it('refuses something that is no zip, naming the archive', async () => {
    const err = await refusal(() => readZipBatch('plans.zip', Buffer.from('not a zip at all')));

    expect((err.details as unknown[])[0]).toMatchObject({ file: 'plans.zip', field: 'archive' });
  });

  it('reports every entry naming a missing file, not only the first', async () => {
    const zip = await zipOf({ 'batch.json': manifest([{ ...entry, file: 'x.txt' }, { ...entry, file: 'y.txt' }]) });

    const err = await refusal(() => readZipBatch('w.zip', zip));

    expect((err.details as { field: string }[]).map((d) => d.field)).toEqual(['plans[0].file', 'plans[1].file']);
    expect(err.message).toContain('and 1 more problem');
  });
});

describe('readJsonBatch', () => {
  it('takes a bare array of plans as the manifest\'s plans', () => {
    const batch = readJsonBatch([{ text: '(0,0)\n', model: 'classic', solver, instance: { scenarioId: 3, agents: 1 } }]);

    expect(batch).toMatchObject({ source: 'json', fileName: null, plans: [{ file: 'plans[0]', line: 0, text: '(0,0)\n' }] });
  });

  it('names the field of a schema problem in the request body', async () => {
    const err = await refusal(() => readJsonBatch([{ text: '(0,0)\n', model: 'classic', solver, instance: { scenarioId: 3, agents: 0 } }]));

    expect((err.details as unknown[])[0]).toMatchObject({ file: 'request body', line: 0, field: 'plans[0].instance.agents' });
  });
});
