/**
 * What one request for the leaderboard's first page costs in database round trips (issue 13,
 * item 12: p95 1.1 s at 50 concurrent clients): a visitor's touches no session row, a signed-in
 * one reads its session and account and writes its session row only when the stored expiry has
 * fallen more than SESSION_TOUCH_INTERVAL_MS behind the rolling cookie's.
 */
import pg from 'pg';
import { startServer, type RunningServer } from '../../api/src/app';
import { SESSION_COOKIE, SESSION_TOUCH_INTERVAL_MS } from '../../api/src/auth/session';
import { loadConfig } from '../../api/src/config';
import { CookieJar } from '../../api/src/dev/cookie-jar';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { clientFor, signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

const FIRST_PAGE = '/api/leaderboards/rows?start=0&end=100';

describe('cost of a leaderboard first page', () => {
  let db: TestDatabase;
  let server: RunningServer;
  let researcher: SignedInClient;
  let visitor: SignedInClient;
  /** SQL sent to the session store's pool and through Sequelize since the last reset. */
  let sessionSql: string[];
  let appSql: string[];
  let querySpy: jest.SpyInstance;

  beforeAll(async () => {
    db = await createTestDatabase();
    const config = { ...loadConfig({ NODE_ENV: 'test' }).config, webDist: '/nonexistent' };
    server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
    researcher = await signInAs(server.url, DEMO_IDENTITIES[0].login);
    visitor = clientFor(server.url, new CookieJar());
    await (await visitor.request(FIRST_PAGE)).arrayBuffer(); // receives its CSRF cookie, as a browser keeps it
    const original = pg.Pool.prototype.query;
    querySpy = jest.spyOn(pg.Pool.prototype, 'query').mockImplementation(function (this: pg.Pool, ...args: unknown[]) {
      sessionSql.push(String(typeof args[0] === 'string' ? args[0] : (args[0] as { text: string }).text));
      return (original as (...a: unknown[]) => unknown).apply(this, args);
    } as never);
    server.app.context.sequelize.addHook('beforeQuery', (_options, query) => {
      appSql.push(String((query as { sql?: string }).sql ?? 'query'));
    });
  });
  afterAll(async () => {
    querySpy?.mockRestore();
    await server?.close();
    await db.drop();
  });
  beforeEach(() => {
    sessionSql = [];
    appSql = [];
  });

  /** The session id in the researcher's cookie (`s:<id>.<signature>`). */
  const researcherSid = () => decodeURIComponent(researcher.jar.get(SESSION_COOKIE) ?? '').slice(2).split('.')[0];

  it("answers a visitor's request with the page and its row count, and no session query", async () => {
    const res = await visitor.request(FIRST_PAGE);

    expect(res.status).toBe(200);
    expect(sessionSql).toEqual([]);
    expect(appSql).toHaveLength(2);
  });

  it("reads a signed-in person's session and account once and writes no session row", async () => {
    const res = await researcher.request(FIRST_PAGE);

    expect(res.status).toBe(200);
    expect(sessionSql).toHaveLength(1);
    expect(sessionSql[0]).toMatch(/^SELECT sess, expire FROM "session"/);
    expect(appSql).toHaveLength(3);
  });

  it('writes the session expiry again once it lags the cookie by more than the touch interval', async () => {
    // Arrange: the stored expiry as if the last write was over an interval ago.
    const c = new pg.Client({ connectionString: db.url });
    await c.connect();
    const { rowCount } = await c.query('UPDATE "session" SET expire = expire - make_interval(secs => $1) WHERE sid = $2', [SESSION_TOUCH_INTERVAL_MS / 1000 + 60, researcherSid()]);
    await c.end();
    expect(rowCount).toBe(1);

    const first = await researcher.request(FIRST_PAGE);
    const firstSql = sessionSql.splice(0);
    const second = await researcher.request(FIRST_PAGE);

    expect([first.status, second.status]).toEqual([200, 200]);
    expect(firstSql.filter((q) => q.startsWith('UPDATE'))).toHaveLength(1);
    expect(sessionSql.filter((q) => q.startsWith('UPDATE'))).toHaveLength(0);
  });
});
