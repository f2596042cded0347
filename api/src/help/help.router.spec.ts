import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { extractGuide, PUBLISHED_SCHEMAS } from '@shared/help';
import { createTestDatabase, type TestDatabase } from '../../../test/support/test-database';
import { createApp, type QuarterturnApp } from '../app';
import { loadConfig } from '../config';
import { readHelpFiles } from './help-files';

const ROOT = join(__dirname, '..', '..', '..');

describe('help routes', () => {
  let db: TestDatabase;
  let app: QuarterturnApp;

  beforeAll(async () => {
    db = await createTestDatabase();
    const { config } = loadConfig({ NODE_ENV: 'test', DATABASE_URL: db.url });
    app = createApp({ ...config, webDist: '/nonexistent-web-dist' });
  });
  afterAll(async () => {
    await app?.dispose();
    await db?.drop();
  });

  it('serves the user guide part of README.md as Markdown to a visitor', async () => {
    const res = await request(app).get('/api/help/guide');

    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('text/markdown; charset=utf-8');
    expect(res.text).toBe(extractGuide(readFileSync(join(ROOT, 'README.md'), 'utf8')));
    for (const heading of ['## Signing in', '## Roles', '## Plan models', '## Execution policies', '## What the figures mean', '## File formats', '## Command-line tools']) {
      expect(res.text).toContain(`\n${heading}\n`);
    }
    expect(res.text).not.toContain('user-guide:');
  });

  it.each(['plan-format.schema.json', 'instance-format.schema.json', 'trial-log.schema.json', 'submission-batch-format.schema.json'])('serves shared/%s byte for byte as a JSON Schema', async (name) => {
    const res = await request(app).get(`/api/schemas/${name}`).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });

    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/schema+json; charset=utf-8');
    expect((res.body as Buffer).equals(readFileSync(join(ROOT, 'shared', name)))).toBe(true);
    expect(JSON.parse((res.body as Buffer).toString('utf8')).$schema).toBe('https://json-schema.org/draft/2020-12/schema');
  });

  it('answers an unknown schema name with 404 NOT_FOUND naming the published ones', async () => {
    const res = await request(app).get('/api/schemas/sweeps.schema.json');

    expect(res.status).toBe(404);
    expect(res.body.error.code).toBe('NOT_FOUND');
    expect(res.body.error.message).toContain('plan-format.schema.json, instance-format.schema.json');
  });

  it('serves no other repository file through the schema route', async () => {
    const res = await request(app).get('/api/schemas/..%2F..%2Fpackage.json');

    expect(res.status).toBe(404);
    expect(res.text).not.toContain('"dependencies"');
  });
});

describe('readHelpFiles', () => {
  let root: string;

  beforeEach(() => {
    root = mkdtempSync(join(tmpdir(), 'qt-help-'));
    mkdirSync(join(root, 'shared'));
    for (const name of PUBLISHED_SCHEMAS) writeFileSync(join(root, 'shared', name), '{}');
  });
  afterEach(() => rmSync(root, { recursive: true, force: true }));

  it('takes the text between the guide markers', () => {
    writeFileSync(join(root, 'README.md'), '# X\nintro\n<!-- user-guide:start -->\n## Guide\ntext\n<!-- user-guide:end -->\n## Later\n');

    expect(readHelpFiles(root).guide).toBe('## Guide\ntext');
  });

  it('refuses a README without the guide markers, naming them', () => {
    writeFileSync(join(root, 'README.md'), '# X\nno guide here\n');

    expect(() => readHelpFiles(root)).toThrow('<!-- user-guide:start -->');
  });
});
