/**
 * The OpenAPI document against the real app (issue 16, item 2): every route the Express router
 * serves under /api is documented and nothing else is, every documented example passes its zod
 * schema, the document is valid OpenAPI 3.1 (checked by @seriousme/openapi-schema-validator,
 * which carries the OpenAPI Initiative's published 3.1 JSON Schema), and the token scope it
 * states for a route is the one enforced.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { createApp, type QuarterturnApp } from '../app';
import { loadConfig } from '../config';
import { Mailbox } from '../dev/fake-smtp/mailbox';
import { API_ROUTES } from './api-routes';
import { buildOpenApiDocument, tokenScopeOf } from './openapi-document';

interface Layer {
  readonly route?: { readonly path: string | string[]; readonly methods: Record<string, boolean> };
  readonly handle: { readonly stack?: Layer[] };
  readonly rawPath?: string | string[];
}

/** `METHOD /api/path/{param}` of every route in a router stack (Express 5: router 2.x layers). */
function routesOf(stack: readonly Layer[], prefix: string): string[] {
  const out: string[] = [];
  for (const layer of stack) {
    if (layer.route) {
      const paths = Array.isArray(layer.route.path) ? layer.route.path : [layer.route.path];
      for (const p of paths) {
        for (const [method, isOn] of Object.entries(layer.route.methods)) {
          if (isOn && method !== '_all') out.push(`${method.toUpperCase()} ${(prefix + p).replace(/\/$/, '').replace(/:(\w+)/g, '{$1}')}`);
        }
      }
    } else if (layer.handle.stack) {
      const mount = typeof layer.rawPath === 'string' && layer.rawPath !== '/' ? layer.rawPath : '';
      out.push(...routesOf(layer.handle.stack, prefix + mount));
    }
  }
  return out;
}

describe('OpenAPI document', () => {
  let app: QuarterturnApp;

  beforeAll(() => {
    // Nothing listens on port 1: the app is only walked and asked for its document, which needs no database.
    const { config } = loadConfig({ NODE_ENV: 'test', DATABASE_URL: 'postgres://nobody@127.0.0.1:1/none' });
    // With a mailbox and the fake provider on loopback, the development-only mailbox route is mounted too.
    app = createApp({ ...config, webDist: '/nonexistent-web-dist' }, { mailbox: new Mailbox() });
  });
  afterAll(() => app.dispose());

  it('documents every route the app serves under /api, and no other', () => {
    const served = new Set(routesOf((app as unknown as { router: { stack: Layer[] } }).router.stack, '').filter((r) => r.includes(' /api/')));
    const documented = new Set(API_ROUTES.map((r) => `${r.method.toUpperCase()} ${r.path}`));
    expect(served.size).toBeGreaterThanOrEqual(45);
    expect([...served].filter((r) => !documented.has(r))).toEqual([]);
    expect([...documented].filter((r) => !served.has(r))).toEqual([]);
    expect(documented.size).toBe(API_ROUTES.length);
  });

  it('has examples that pass their own schemas', () => {
    let checked = 0;
    for (const route of API_ROUTES) {
      if (route.body?.example !== undefined) {
        const parsed = route.body.schema.safeParse(route.body.example);
        expect({ route: `${route.method} ${route.path}`, issues: parsed.error?.issues ?? [] }).toEqual({ route: `${route.method} ${route.path}`, issues: [] });
        checked++;
      }
      if (route.queryExample !== undefined) {
        expect(route.query).toBeDefined();
        const parsed = route.query!.safeParse(route.queryExample);
        expect({ route: `${route.method} ${route.path}`, issues: parsed.error?.issues ?? [] }).toEqual({ route: `${route.method} ${route.path}`, issues: [] });
        checked++;
      }
    }
    expect(checked).toBe(API_ROUTES.filter((r) => r.body?.example !== undefined).length + API_ROUTES.filter((r) => r.queryExample !== undefined).length);
    expect(checked).toBeGreaterThanOrEqual(15);
  });

  it('gives every JSON request body an example', () => {
    const missing = API_ROUTES.filter((r) => r.body && (r.body.contentType ?? 'application/json') === 'application/json' && r.body.example === undefined);
    expect(missing.map((r) => `${r.method} ${r.path}`)).toEqual([]);
  });

  it('refuses a wrong example (the check above can fail)', () => {
    const submit = API_ROUTES.find((r) => r.method === 'post' && r.path === '/api/submissions');
    expect(submit?.body?.schema.safeParse({ format: 'text', text: '(0,0)\n' }).success).toBe(false);
  });

  it('is a valid OpenAPI 3.1 document', () => {
    const dir = mkdtempSync(join(tmpdir(), 'qt-openapi-'));
    try {
      const path = join(dir, 'openapi.json');
      writeFileSync(path, JSON.stringify(buildOpenApiDocument()));
      // The validator is ESM only; a child process imports it without Jest's module system.
      const script = "import { Validator } from '@seriousme/openapi-schema-validator'; const v = new Validator(); const r = await v.validate(process.argv[1]); console.log(JSON.stringify({ valid: r.valid, version: v.version, errors: r.errors ?? null }));";
      const out = JSON.parse(execFileSync(process.execPath, ['--input-type=module', '-e', script, path], { cwd: join(__dirname, '..', '..', '..'), encoding: 'utf8' })) as { valid: boolean; version: string; errors: unknown };
      expect(out).toEqual({ valid: true, version: '3.1', errors: null });
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  });

  it('states the token scope the server enforces', () => {
    const doc = buildOpenApiDocument();
    const scopeIn = (path: string, method: 'get' | 'post' | 'delete') => (doc.paths?.[path]?.[method] as Record<string, unknown> | undefined)?.['x-token-scope'];
    expect(scopeIn('/api/leaderboards/rows', 'get')).toBe('read');
    expect(scopeIn('/api/submissions', 'post')).toBe('submit');
    expect(scopeIn('/api/sweeps', 'post')).toBe('sweep');
    expect(scopeIn('/api/sweeps/{id}/cancel', 'post')).toBe('sweep');
    expect(scopeIn('/api/instance-sets', 'post')).toBeNull();
    expect(scopeIn('/api/me/tokens', 'post')).toBeNull();
    expect(scopeIn('/api/me/tokens', 'get')).toBeNull();
    expect(tokenScopeOf({ method: 'delete', path: '/api/maps/{id}' })).toBeNull();
  });

  it('is served at GET /api/openapi.json to anyone', async () => {
    const res = await request(app).get('/api/openapi.json');
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^application\/json/);
    expect(res.body).toMatchObject({ openapi: '3.1.0', info: { title: 'Quarterturn API' } });
    expect(Object.keys(res.body.paths as object)).toContain('/api/submissions');
  });
});
