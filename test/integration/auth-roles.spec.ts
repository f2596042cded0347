/** Every role boundary of the account routes, with real sign-ins and the last-admin rule. */
import { startServer, type RunningServer } from '../../api/src/app';
import { loadConfig } from '../../api/src/config';
import { CookieJar } from '../../api/src/dev/cookie-jar';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { clientFor, signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { createSequelize } from '../../api/src/db/sequelize';
import { seedDemo } from '../../api/src/demo/seed-demo';

// Responses are checked field by field below, so an untyped body keeps the assertions readable.
// eslint-disable-next-line @typescript-eslint/no-explicit-any
type Json = any;

const [researcherId, maintainerId, adminId] = DEMO_IDENTITIES;
const json = (body: unknown) => ({ body: JSON.stringify(body), headers: { 'content-type': 'application/json' } });

describe('roles', () => {
  let db: TestDatabase;
  let server: RunningServer;
  let visitor: SignedInClient;
  let researcher: SignedInClient;
  let maintainer: SignedInClient;
  let admin: SignedInClient;

  beforeAll(async () => {
    db = await createTestDatabase();
    // The demo seed gives the three invented people their roles, as `npm start` does.
    const sequelize = createSequelize(db.url, { poolMax: 1 });
    await seedDemo(sequelize);
    await seedDemo(sequelize); // idempotent
    await sequelize.close();
    const config = { ...loadConfig({ NODE_ENV: 'test' }).config, webDist: '/nonexistent' };
    server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
    const jar = new CookieJar();
    jar.store(await fetch(`${server.url}/api/me`)); // picks up the CSRF cookie
    visitor = clientFor(server.url, jar);
    researcher = await signInAs(server.url, researcherId.login);
    maintainer = await signInAs(server.url, maintainerId.login);
    admin = await signInAs(server.url, adminId.login);
  });
  afterAll(async () => {
    await server?.close();
    await db.drop();
  });

  const role = async (c: SignedInClient) => (await (await c.request('/api/me')).json() as Json).role as string;

  it('gives the seeded demo accounts their roles', async () => {
    expect([await role(visitor), await role(researcher), await role(maintainer), await role(admin)])
      .toEqual(['visitor', 'researcher', 'maintainer', 'admin']);
  });

  it.each([
    ['GET', '/api/admin/users', undefined],
    ['PATCH', '/api/admin/users/1', { role: 'admin' }],
  ])('%s %s: visitor 401, researcher 403, maintainer 403, admin passes', async (method, path, body) => {
    const call = (c: SignedInClient) => c.request(path, { method, ...(body ? json(body) : {}) });
    const v = await call(visitor);
    expect(v.status).toBe(401);
    expect((await v.json() as Json).error.code).toBe('UNAUTHENTICATED');
    for (const c of [researcher, maintainer]) {
      const r = await call(c);
      expect(r.status).toBe(403);
      expect((await r.json() as Json).error.code).toBe('FORBIDDEN');
    }
    if (method === 'GET') {
      const ok = await call(admin);
      expect(ok.status).toBe(200);
      const logins = ((await ok.json() as Json).users as Array<{ login: string }>).map((u) => u.login);
      expect(logins).toEqual(DEMO_IDENTITIES.map((d) => d.login));
    }
  });

  it('lets a visitor read /api/me and /api/stats but not change settings', async () => {
    expect((await visitor.request('/api/stats')).status).toBe(200);
    const res = await visitor.request('/api/me/settings', { method: 'PATCH', ...json({ isEmailOn: false }) });
    expect(res.status).toBe(401);
  });

  it('lets a researcher turn e-mails off and reports the new setting', async () => {
    const res = await researcher.request('/api/me/settings', { method: 'PATCH', ...json({ isEmailOn: false }) });
    expect(res.status).toBe(200);
    expect((await res.json() as Json).account.isEmailOn).toBe(false);
    expect((await (await researcher.request('/api/me')).json() as Json).account.isEmailOn).toBe(false);
  });

  it('rejects bad settings with 400 VALIDATION_FAILED naming the field', async () => {
    const res = await researcher.request('/api/me/settings', { method: 'PATCH', ...json({ isEmailOn: 'no', colour: 'red' }) });
    expect(res.status).toBe(400);
    const body = await res.json() as Json;
    expect(body.error.code).toBe('VALIDATION_FAILED');
    expect(JSON.stringify(body.error.details)).toMatch(/isEmailOn/);
  });

  it('rejects a bad role or user id with 400 and an unknown user with 404', async () => {
    expect((await admin.request('/api/admin/users/1', { method: 'PATCH', ...json({ role: 'owner' }) })).status).toBe(400);
    expect((await admin.request('/api/admin/users/abc', { method: 'PATCH', ...json({ role: 'admin' }) })).status).toBe(400);
    const missing = await admin.request('/api/admin/users/99999', { method: 'PATCH', ...json({ role: 'admin' }) });
    expect(missing.status).toBe(404);
    expect((await missing.json() as Json).error.code).toBe('NOT_FOUND');
  });

  it('lets an admin promote a researcher, effective on the next request', async () => {
    const me = (await (await researcher.request('/api/me')).json() as Json).account;
    const res = await admin.request(`/api/admin/users/${me.id}`, { method: 'PATCH', ...json({ role: 'maintainer' }) });
    expect(res.status).toBe(200);
    expect((await res.json() as Json).role).toBe('maintainer');
    expect(await role(researcher)).toBe('maintainer');
    await admin.request(`/api/admin/users/${me.id}`, { method: 'PATCH', ...json({ role: 'researcher' }) });
  });

  it('refuses to demote the last admin with 409 LAST_ADMIN, and allows it once another admin exists', async () => {
    const adminAccount = (await (await admin.request('/api/me')).json() as Json).account;
    const refused = await admin.request(`/api/admin/users/${adminAccount.id}`, { method: 'PATCH', ...json({ role: 'researcher' }) });
    expect(refused.status).toBe(409);
    expect((await refused.json() as Json).error.code).toBe('LAST_ADMIN');
    expect(await role(admin)).toBe('admin');

    const other = (await (await maintainer.request('/api/me')).json() as Json).account;
    expect((await admin.request(`/api/admin/users/${other.id}`, { method: 'PATCH', ...json({ role: 'admin' }) })).status).toBe(200);
    const demoted = await admin.request(`/api/admin/users/${adminAccount.id}`, { method: 'PATCH', ...json({ role: 'researcher' }) });
    expect(demoted.status).toBe(200);
    expect(await role(admin)).toBe('researcher');
    expect((await admin.request('/api/admin/users')).status).toBe(403);
  });

  it('never lets two admins demote each other at the same time into having none', async () => {
    // State from the previous test: the maintainer identity is now the only admin; add a second.
    const a = (await (await maintainer.request('/api/me')).json() as Json).account;
    const b = (await (await admin.request('/api/me')).json() as Json).account;
    await maintainer.request(`/api/admin/users/${b.id}`, { method: 'PATCH', ...json({ role: 'admin' }) });
    const [r1, r2] = await Promise.all([
      maintainer.request(`/api/admin/users/${b.id}`, { method: 'PATCH', ...json({ role: 'researcher' }) }),
      admin.request(`/api/admin/users/${a.id}`, { method: 'PATCH', ...json({ role: 'researcher' }) }),
    ]);
    // The loser gets 409 LAST_ADMIN when both ran inside the lock, or 403 when it was already demoted.
    expect([r1.status, r2.status].sort()).toEqual([200, expect.any(Number)]);
    expect([403, 409]).toContain(Math.max(r1.status, r2.status));
    const list = (await ((await (r1.status === 200 ? maintainer : admin).request('/api/admin/users')).json() as Json)).users as Array<{ role: string }>;
    expect(list.filter((u) => u.role === 'admin')).toHaveLength(1);
  });
});
