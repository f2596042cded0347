/** The /api/auth rate limit answers in the one error shape once a client exceeds it. */
import { startServer, type RunningServer } from '../../api/src/app';
import { loadConfig } from '../../api/src/config';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

// Responses are checked field by field below, so an untyped body keeps the assertions readable.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Json = any;

describe('auth rate limit', () => {
  let db: TestDatabase;
  let server: RunningServer;

  beforeAll(async () => {
    db = await createTestDatabase();
    const config = { ...loadConfig({ NODE_ENV: 'test', AUTH_RATE_LIMIT: '3' }).config, webDist: '/nonexistent' };
    server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
  });
  afterAll(async () => {
    await server?.close();
    await db.drop();
  });

  it('allows the limit, then answers 429 RATE_LIMITED with a Retry-After hint', async () => {
    const statuses: number[] = [];
    for (let i = 0; i < 3; i++) statuses.push((await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' })).status);
    const over = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    expect(statuses).toEqual([302, 302, 302]);
    expect(over.status).toBe(429);
    expect((await over.json() as Json).error.code).toBe('RATE_LIMITED');
    expect(over.headers.get('retry-after')).toMatch(/^\d+$/);
  });

  it('limits only /api/auth, not the rest of the API', async () => {
    const res = await fetch(`${server.url}/api/me`);
    expect(res.status).toBe(200);
  });
});
