import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { createTestDatabase, type TestDatabase } from '../../test/support/test-database';
import { createApp, type QuarterturnApp } from './app';
import { loadConfig, type AppConfig } from './config';
import { createSequelize } from './db/sequelize';
import { createStatsService } from './stats/stats.service';

const pkgVersion = (JSON.parse(readFileSync(join(__dirname, '..', '..', 'package.json'), 'utf8')) as { version: string }).version;

describe('createApp', () => {
  let db: TestDatabase;
  let config: AppConfig;
  const apps: QuarterturnApp[] = [];
  const make = (overrides: Partial<AppConfig> = {}, deps: Parameters<typeof createApp>[1] = {}) => {
    const app = createApp({ ...config, ...overrides }, deps);
    apps.push(app);
    return app;
  };

  beforeAll(async () => {
    db = await createTestDatabase();
    config = { ...loadConfig({ NODE_ENV: 'test', DATABASE_URL: db.url }).config, webDist: '/nonexistent-web-dist' };
  });
  afterAll(async () => {
    for (const a of apps) await a.dispose();
    await db.drop();
  });

  it('reports health with the database up and the package version', async () => {
    const res = await request(make()).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok', db: 'up', version: pkgVersion });
  });

  it('reports degraded health when the database is unreachable', async () => {
    // Port 1 on loopback: nothing listens there, so the connection is refused at once.
    const dead = createSequelize('postgres://postgres@127.0.0.1:1/none');
    try {
      const res = await request(make({}, { sequelize: dead })).get('/api/health');
      expect(res.body).toMatchObject({ status: 'degraded', db: 'down' });
    } finally {
      await dead.close();
    }
  });

  it('answers unknown /api routes with 404 NOT_FOUND in the error shape', async () => {
    const res = await request(make()).get('/api/no-such-thing');
    expect(res.status).toBe(404);
    expect(res.body).toEqual({ error: { code: 'NOT_FOUND', message: 'No route for GET /api/no-such-thing' } });
  });

  it('answers a failing handler with a generic 500 that carries no stack', async () => {
    const app = make();
    // Registered after createApp so it replaces whatever counter a feature registered.
    app.context.stats.register('sweeps', async () => {
      throw new Error('relation "sweeps" does not exist');
    });
    const res = await request(app).get('/api/stats');
    expect(res.status).toBe(500);
    expect(res.body.error.code).toBe('INTERNAL');
    expect(Object.keys(res.body.error).sort()).toEqual(['code', 'details', 'message']);
    expect(JSON.stringify(res.body)).not.toMatch(/relation|sweeps|\.ts:\d+/);
    expect(res.body.error.details.requestId).toBe(res.headers['x-request-id']);
  });

  it('answers /api/stats from the counters in app.context.stats, passing null for a visitor', async () => {
    const app = make();
    app.context.stats.register('maps', async (viewer) => (viewer ? 99 : 7));
    const res = await request(app).get('/api/stats');
    expect(res.status).toBe(200);
    expect(res.body.maps).toBe(7);
    expect(Object.keys(res.body).sort()).toEqual(['instanceSets', 'maps', 'results', 'scenarios', 'sweeps']);
  });

  it('uses a stats service handed in through deps', async () => {
    const stats = createStatsService();
    const app = make({}, { stats });
    expect(app.context.stats).toBe(stats);
  });

  it('tells a visitor it is a visitor', async () => {
    const res = await request(make()).get('/api/me');
    expect(res.body).toEqual({ account: null, role: 'visitor' });
  });

  it('rejects JSON bodies over 1 MB with 413 before anything else runs', async () => {
    const res = await request(make()).patch('/api/me/settings')
      .set('cookie', `qt_csrf=${'t'.repeat(43)}`).set('x-csrf-token', 't'.repeat(43))
      .set('content-type', 'application/json').send(JSON.stringify({ pad: 'x'.repeat(1_100_000) }));
    expect(res.status).toBe(413);
    expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
  });

  it('sends a same-origin Content-Security-Policy and no x-powered-by', async () => {
    const res = await request(make()).get('/api/health');
    const csp = res.headers['content-security-policy'] as string;
    expect(csp).toContain("default-src 'self'");
    expect(csp).toContain("script-src 'self'");
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).not.toMatch(/https?:\/\//);
    expect(csp).not.toContain('upgrade-insecure-requests');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });

  describe('with a web build', () => {
    let dist: string;
    beforeAll(() => {
      dist = mkdtempSync(join(tmpdir(), 'qt-web-'));
      writeFileSync(join(dist, 'index.html'), '<!doctype html><title>shell</title>');
      writeFileSync(join(dist, 'main-AB12CD34.js'), 'console.log(1)');
    });
    afterAll(() => rmSync(dist, { recursive: true, force: true }));

    it('serves files, long-caching hashed ones', async () => {
      const res = await request(make({ webDist: dist })).get('/main-AB12CD34.js');
      expect(res.status).toBe(200);
      expect(res.headers['cache-control']).toContain('immutable');
    });

    it('falls back to index.html for client routes but not for /api', async () => {
      const app = make({ webDist: dist });
      const page = await request(app).get('/sweeps/12/runs');
      expect(page.status).toBe(200);
      expect(page.text).toContain('<title>shell</title>');
      expect(page.headers['cache-control']).toBe('no-cache');
      const api = await request(app).get('/api/no-such-area/12');
      expect(api.status).toBe(404);
      expect(api.body.error.code).toBe('NOT_FOUND');
    });
  });
});
