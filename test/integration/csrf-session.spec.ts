/**
 * The CSRF token is bound to the session (issue 13, item 11): with real sign-ins and sessions in
 * PostgreSQL, a token from another session, or a cookie/header pair the client chose itself, is
 * refused with 403 CSRF_REJECTED; the session's own token works from the first request after sign-in.
 */
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { startServer, type RunningServer } from '../../api/src/app';
import { SESSION_COOKIE } from '../../api/src/auth/session';
import { loadConfig } from '../../api/src/config';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

const [ada, bob] = DEMO_IDENTITIES;

describe('CSRF token bound to the session', () => {
  let db: TestDatabase;
  let server: RunningServer;
  let adaClient: SignedInClient;
  let bobClient: SignedInClient;

  beforeAll(async () => {
    db = await createTestDatabase();
    const config = { ...loadConfig({ NODE_ENV: 'test' }).config, webDist: '/nonexistent' };
    server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
    adaClient = await signInAs(server.url, ada.login);
    bobClient = await signInAs(server.url, bob.login);
  });
  afterAll(async () => {
    await server?.close();
    await db.drop();
  });

  /** PATCH /api/me/settings with Bob's session cookie and the given CSRF cookie and header. */
  const patchAsBob = (csrfCookie: string, csrfHeader: string) => fetch(`${server.url}/api/me/settings`, {
    method: 'PATCH',
    headers: {
      cookie: `${SESSION_COOKIE}=${bobClient.jar.get(SESSION_COOKIE)}; ${CSRF_COOKIE}=${csrfCookie}`,
      [CSRF_HEADER]: csrfHeader,
      'content-type': 'application/json',
    },
    body: JSON.stringify({ isEmailOn: false }),
  });

  it("accepts the session's own token on the first change after sign-in", async () => {
    const res = await adaClient.request('/api/me/settings', { method: 'PATCH', body: JSON.stringify({ isEmailOn: true }) });
    expect(res.status).toBe(200);
  });

  it("refuses another session's token, even sent as both cookie and header", async () => {
    expect(adaClient.csrfToken).not.toBe(bobClient.csrfToken);
    const res = await patchAsBob(adaClient.csrfToken, adaClient.csrfToken);
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('CSRF_REJECTED');
  });

  it('refuses a cookie and header pair the client made up', async () => {
    const madeUp = 'a'.repeat(43);
    const res = await patchAsBob(madeUp, madeUp);
    expect(res.status).toBe(403);
    expect(((await res.json()) as { error: { code: string } }).error.code).toBe('CSRF_REJECTED');
  });

  it("accepts Bob's own token with Bob's session", async () => {
    const res = await patchAsBob(bobClient.csrfToken, bobClient.csrfToken);
    expect(res.status).toBe(200);
  });
});
