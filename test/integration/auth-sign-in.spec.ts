/**
 * The whole sign-in path over real sockets: app → fake OAuth provider → callback, with
 * sessions in PostgreSQL. Each server runs on free ports against this suite's database.
 */
import { Client } from 'pg';
import { startServer, type RunningServer } from '../../api/src/app';
import { loadConfig, type AppConfig } from '../../api/src/config';
import { CookieJar } from '../../api/src/dev/cookie-jar';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { clientFor, signInAs } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

// Responses are checked field by field below, so an untyped body keeps the assertions readable.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Json = any;

const [researcher, maintainer, admin] = DEMO_IDENTITIES;

describe('sign-in through the fake OAuth provider', () => {
  let db: TestDatabase;
  let config: AppConfig;
  let server: RunningServer;

  const boot = (overrides: Partial<AppConfig> = {}) =>
    startServer({ config: { ...config, ...overrides }, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });

  async function sql<T extends object>(text: string, params: unknown[] = []): Promise<T[]> {
    const c = new Client({ connectionString: db.url });
    await c.connect();
    try {
      return (await c.query<T>(text, params)).rows;
    } finally {
      await c.end();
    }
  }

  beforeAll(async () => {
    db = await createTestDatabase();
    config = { ...loadConfig({ NODE_ENV: 'test', ADMIN_LOGINS: admin.login.toUpperCase() }).config, webDist: '/nonexistent' };
    server = await boot();
  });
  afterAll(async () => {
    await server?.close();
    await db.drop();
  });

  it('redirects to the provider with our client id, callback and a state', async () => {
    const res = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    expect(res.status).toBe(302);
    const to = new URL(res.headers.get('location') as string);
    expect(to.origin).toBe(server.fakeOAuthUrl);
    expect(to.searchParams.get('redirect_uri')).toBe(`${server.url}/api/auth/github/callback`);
    expect(to.searchParams.get('state')).toMatch(/.{8,}/);
    expect(to.searchParams.get('response_type')).toBe('code');
  });

  it('creates a researcher on first sign-in and shows the account on /api/me', async () => {
    const client = await signInAs(server.url, researcher.login);
    const me = await (await client.request('/api/me')).json() as Json;
    expect(me).toMatchObject({ role: 'researcher', account: { login: researcher.login, displayName: researcher.name, email: researcher.email, role: 'researcher', isEmailOn: true } });
    const rows = await sql<{ provider: string; provider_id: string }>('SELECT provider, provider_id FROM users WHERE login = $1', [researcher.login]);
    expect(rows).toEqual([{ provider: 'fake', provider_id: researcher.id }]);
  });

  it('makes a login listed in ADMIN_LOGINS (any case) an admin on first sign-in', async () => {
    const client = await signInAs(server.url, admin.login);
    const me = await (await client.request('/api/me')).json() as Json;
    expect(me.role).toBe('admin');
  });

  it('signs the same person into the same account again', async () => {
    await signInAs(server.url, maintainer.login);
    await signInAs(server.url, maintainer.login);
    const rows = await sql('SELECT id FROM users WHERE login = $1', [maintainer.login]);
    expect(rows).toHaveLength(1);
  });

  it('issues a new session id at sign-in (no session fixation)', async () => {
    const jar = new CookieJar();
    await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' }).then((r) => jar.store(r));
    const before = jar.get('qt_sid');
    expect(before).toBeDefined();
    await signInAs(server.url, researcher.login, jar);
    expect(jar.get('qt_sid')).toBeDefined();
    expect(jar.get('qt_sid')).not.toBe(before);
  });

  it('sets the session cookie httpOnly and SameSite=Lax', async () => {
    const res = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    const sid = res.headers.getSetCookie().find((c) => c.startsWith('qt_sid='));
    expect(sid).toMatch(/HttpOnly/i);
    expect(sid).toMatch(/SameSite=Lax/i);
    expect(sid).not.toMatch(/Secure/i);
  });

  it('refuses a callback whose state does not match the session', async () => {
    const jar = new CookieJar();
    const start = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    jar.store(start);
    const authorize = new URL(start.headers.get('location') as string);
    authorize.searchParams.set('identity', researcher.login);
    authorize.searchParams.set('state', 'forged-state');
    const picked = await fetch(authorize, { redirect: 'manual' });
    const cb = await fetch(picked.headers.get('location') as string, { redirect: 'manual', headers: { cookie: jar.header() } });
    expect(cb.status).toBe(302);
    expect(cb.headers.get('location')).toBe('/?signin=failed');
    jar.store(cb);
    expect((await (await clientFor(server.url, jar).request('/api/me')).json() as Json).role).toBe('visitor');
  });

  it('refuses a replayed callback (the code is single-use)', async () => {
    const jar = new CookieJar();
    const start = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    jar.store(start);
    const authorize = new URL(start.headers.get('location') as string);
    authorize.searchParams.set('identity', researcher.login);
    const callback = (await fetch(authorize, { redirect: 'manual' })).headers.get('location') as string;
    const first = await fetch(callback, { redirect: 'manual', headers: { cookie: jar.header() } });
    expect(first.headers.get('location')).toBe('/');
    // An attacker replaying the same URL with a fresh sign-in attempt of their own.
    const other = new CookieJar();
    const theirs = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    other.store(theirs);
    const replay = new URL(callback);
    replay.searchParams.set('state', new URL(theirs.headers.get('location') as string).searchParams.get('state') as string);
    const second = await fetch(replay, { redirect: 'manual', headers: { cookie: other.header() } });
    expect(second.headers.get('location')).toBe('/?signin=failed');
  });

  it('reports a cancelled sign-in as failed', async () => {
    const jar = new CookieJar();
    const start = await fetch(`${server.url}/api/auth/github`, { redirect: 'manual' });
    jar.store(start);
    const authorize = new URL(start.headers.get('location') as string);
    authorize.searchParams.set('deny', '1');
    const back = await fetch(authorize, { redirect: 'manual' });
    const cb = await fetch(back.headers.get('location') as string, { redirect: 'manual', headers: { cookie: jar.header() } });
    expect(cb.headers.get('location')).toBe('/?signin=failed');
  });

  it('logs out with the CSRF header and ends the session', async () => {
    const client = await signInAs(server.url, researcher.login);
    const sidBefore = client.jar.get('qt_sid');
    const out = await client.request('/api/auth/logout', { method: 'POST' });
    expect(out.status).toBe(204);
    expect((await (await client.request('/api/me')).json() as Json).role).toBe('visitor');
    // The old cookie must be dead server-side too, not just cleared in this jar.
    const stale = await fetch(`${server.url}/api/me`, { headers: { cookie: `qt_sid=${sidBefore}` } });
    expect((await stale.json() as Json).role).toBe('visitor');
  });

  it('refuses logout without the CSRF header', async () => {
    const client = await signInAs(server.url, researcher.login);
    const res = await fetch(`${server.url}/api/auth/logout`, { method: 'POST', headers: { cookie: client.jar.header() } });
    expect(res.status).toBe(403);
    expect((await res.json() as Json).error.code).toBe('CSRF_REJECTED');
    expect((await (await client.request('/api/me')).json() as Json).role).toBe('researcher');
  });

  it('keeps a session across a restart of the app on the same database', async () => {
    const client = await signInAs(server.url, maintainer.login);
    const cookie = client.jar.header();
    await server.close();
    server = await boot();
    const res = await fetch(`${server.url}/api/me`, { headers: { cookie } });
    expect((await res.json() as Json).account?.login).toBe(maintainer.login);
  });
});
