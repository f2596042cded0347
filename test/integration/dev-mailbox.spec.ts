/**
 * The development mailbox (GET /api/dev/mailbox, issue 13, item 4) holds every sweep e-mail the
 * local fake SMTP server caught: it is served only in development mode (fake sign-in provider,
 * loopback PUBLIC_URL and HOST) and only to admins; with a real OAuth app or a non-loopback host
 * it does not exist, even when a mailbox is handed to the app.
 */
import request from 'supertest';
import { createApp, startServer, type QuarterturnApp, type RunningServer } from '../../api/src/app';
import { loadConfig, type AppConfig } from '../../api/src/config';
import { CookieJar } from '../../api/src/dev/cookie-jar';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { Mailbox } from '../../api/src/dev/fake-smtp/mailbox';
import { clientFor, signInAs } from '../../api/src/dev/sign-in-as';
import { createTestDatabase, type TestDatabase } from '../support/test-database';

const [researcher, maintainer, admin] = DEMO_IDENTITIES;

/** A mailbox holding one sweep e-mail, as the fake SMTP server would after a sweep. */
function mailboxWithOneMessage(): Mailbox {
  const mailbox = new Mailbox();
  mailbox.add({ receivedAt: new Date().toISOString(), from: 'noreply@quarterturn.invalid', to: ['someone@example.test'], subject: 'Quarterturn: sweep "private aisle" finished', text: 'Runs: 4' });
  return mailbox;
}

describe('development mailbox', () => {
  let db: TestDatabase;
  let config: AppConfig;

  beforeAll(async () => {
    db = await createTestDatabase();
    config = { ...loadConfig({ NODE_ENV: 'test', ADMIN_LOGINS: admin.login }).config, webDist: '/nonexistent' };
  });
  afterAll(async () => {
    await db.drop();
  });

  describe('in development mode', () => {
    let server: RunningServer;
    beforeAll(async () => {
      server = await startServer({ config, databaseUrl: db.url, port: 0, fakeOAuthPort: 0, mailbox: mailboxWithOneMessage() });
    });
    afterAll(async () => {
      await server?.close();
    });

    it('answers a visitor 401 UNAUTHENTICATED', async () => {
      const res = await clientFor(server.url, new CookieJar()).request('/api/dev/mailbox');
      expect(res.status).toBe(401);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('UNAUTHENTICATED');
    });

    it.each([researcher.login, maintainer.login])('answers %s 403 FORBIDDEN', async (login) => {
      const client = await signInAs(server.url, login);
      const res = await client.request('/api/dev/mailbox');
      expect(res.status).toBe(403);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('FORBIDDEN');
    });

    it('shows an admin the messages', async () => {
      const client = await signInAs(server.url, admin.login);
      const res = await client.request('/api/dev/mailbox');
      expect(res.status).toBe(200);
      expect(((await res.json()) as { messages: { subject: string }[] }).messages.map((m) => m.subject)).toEqual(['Quarterturn: sweep "private aisle" finished']);
    });
  });

  describe('outside development mode', () => {
    const apps: QuarterturnApp[] = [];
    const appWith = (overrides: Partial<AppConfig>) => {
      const app = createApp({ ...config, databaseUrl: db.url, ...overrides }, { mailbox: mailboxWithOneMessage() });
      apps.push(app);
      return app;
    };
    afterAll(async () => {
      for (const a of apps) await a.dispose();
    });

    it('does not exist with a real OAuth app on a public URL', async () => {
      const app = appWith({
        oauth: { mode: 'github', clientId: 'id', clientSecret: 'secret' }, publicUrl: 'https://bench.example.org', sessionSecret: 'x'.repeat(32), isDevSessionSecret: false,
      });
      const res = await request(app).get('/api/dev/mailbox');
      expect(res.status).toBe(404);
      expect(res.body.error.code).toBe('NOT_FOUND');
    });

    it('does not exist with a real OAuth app even on loopback', async () => {
      const res = await request(appWith({ oauth: { mode: 'github', clientId: 'id', clientSecret: 'secret' } })).get('/api/dev/mailbox');
      expect(res.status).toBe(404);
    });

    it('does not exist on a non-loopback HOST', async () => {
      const res = await request(appWith({ host: '0.0.0.0' })).get('/api/dev/mailbox');
      expect(res.status).toBe(404);
    });
  });
});
