import { createHmac } from 'node:crypto';
import express from 'express';
import request from 'supertest';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { errorHandler } from '../errors/error-handler';
import { createCsrf } from './csrf';

const PUBLIC_URL = 'http://127.0.0.1:4300';
const SECRET = 'unit-test-session-secret';
const TOKEN = 'a'.repeat(43);

/** A session cookie as express-session signs it (cookie-signature's sign(): base64 HMAC-SHA256 without padding). */
function sessionCookie(id: string, secret = SECRET): string {
  const signature = createHmac('sha256', secret).update(id).digest('base64').replace(/=+$/, '');
  return `qt_sid=${encodeURIComponent(`s:${id}.${signature}`)}`;
}

/** The qt_csrf value a response sets, if any. */
function issuedToken(res: request.Response): string | undefined {
  const cookies = (res.headers['set-cookie'] as unknown as string[] | undefined) ?? [];
  return cookies.find((c) => c.startsWith(`${CSRF_COOKIE}=`))?.split(';')[0].slice(CSRF_COOKIE.length + 1);
}

function app(): express.Express {
  const a = express();
  a.use(createCsrf({ publicUrl: PUBLIC_URL, secret: SECRET, sessionCookie: 'qt_sid' }).protect);
  a.get('/thing', (_req, res) => void res.json({ ok: true }));
  a.post('/thing', (_req, res) => void res.status(201).json({ ok: true }));
  a.delete('/thing', (_req, res) => void res.status(204).end());
  a.use(errorHandler());
  return a;
}

describe('createCsrf().protect', () => {
  it('issues a JS-readable SameSite=Strict token cookie on a first GET', async () => {
    const res = await request(app()).get('/thing');
    expect(res.status).toBe(200);
    const cookie = (res.headers['set-cookie'] as unknown as string[]).find((c) => c.startsWith(`${CSRF_COOKIE}=`));
    expect(cookie).toMatch(new RegExp(`^${CSRF_COOKIE}=[A-Za-z0-9_-]{43};`));
    expect(cookie).toMatch(/SameSite=Strict/i);
    expect(cookie).not.toMatch(/HttpOnly/i);
  });

  it('does not reissue the cookie when the client already has one', async () => {
    const res = await request(app()).get('/thing').set('cookie', `${CSRF_COOKIE}=${TOKEN}`);
    expect(res.headers['set-cookie']).toBeUndefined();
  });

  it('rejects a POST without the header', async () => {
    const res = await request(app()).post('/thing').set('cookie', `${CSRF_COOKIE}=${TOKEN}`);
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('CSRF_REJECTED');
  });

  it('rejects a POST whose header differs from the cookie', async () => {
    const res = await request(app()).post('/thing').set('cookie', `${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, 'b'.repeat(43));
    expect(res.status).toBe(403);
    expect(res.body.error.code).toBe('CSRF_REJECTED');
  });

  it('rejects a header token when there is no cookie to match', async () => {
    const res = await request(app()).delete('/thing').set(CSRF_HEADER, TOKEN);
    expect(res.status).toBe(403);
  });

  it('rejects a matching token sent from a foreign Origin', async () => {
    const res = await request(app()).post('/thing')
      .set('cookie', `${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, TOKEN).set('origin', 'http://127.0.0.1:4200');
    expect(res.status).toBe(403);
    expect(res.body.error.message).toMatch(/origin/i);
  });

  it('accepts a matching token with the own Origin or no Origin', async () => {
    const ok1 = await request(app()).post('/thing').set('cookie', `${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, TOKEN).set('origin', PUBLIC_URL);
    const ok2 = await request(app()).delete('/thing').set('cookie', `other=1; ${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, TOKEN);
    expect(ok1.status).toBe(201);
    expect(ok2.status).toBe(204);
  });

  it('binds the token to the session: a GET with a session cookie gets a token of that session only', async () => {
    const first = issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('session-one')));
    const again = issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('session-one')));
    const other = issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('session-two')));
    expect(first).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(again).toBe(first);
    expect(other).not.toBe(first);
  });

  it("accepts the session's own token and refuses another session's, even echoed in its cookie", async () => {
    const own = issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('session-one'))) as string;
    const foreign = issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('session-two'))) as string;
    const ok = await request(app()).post('/thing').set('cookie', `${sessionCookie('session-one')}; ${CSRF_COOKIE}=${own}`).set(CSRF_HEADER, own);
    const refused = await request(app()).post('/thing').set('cookie', `${sessionCookie('session-one')}; ${CSRF_COOKIE}=${foreign}`).set(CSRF_HEADER, foreign);
    expect(ok.status).toBe(201);
    expect(refused.status).toBe(403);
    expect(refused.body.error.code).toBe('CSRF_REJECTED');
  });

  it('refuses a made-up token pair next to a session cookie and reissues the bound token', async () => {
    const res = await request(app()).post('/thing').set('cookie', `${sessionCookie('session-one')}; ${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, TOKEN);
    expect(res.status).toBe(403);
    expect(issuedToken(res)).toMatch(/^[A-Za-z0-9_-]{43}$/);
    expect(issuedToken(res)).not.toBe(TOKEN);
  });

  it('treats a session cookie signed with another secret as no session', async () => {
    const res = await request(app()).post('/thing').set('cookie', `${sessionCookie('session-one', 'another-secret-value')}; ${CSRF_COOKIE}=${TOKEN}`).set(CSRF_HEADER, TOKEN);
    expect(res.status).toBe(201);
  });

  it('reissue() replaces a token cookie set earlier in the same response', async () => {
    const a = express();
    const csrf = createCsrf({ publicUrl: PUBLIC_URL, secret: SECRET, sessionCookie: 'qt_sid' });
    a.use(csrf.protect);
    a.get('/switch', (_req, res) => {
      csrf.reissue(res, 'new-session');
      res.json({ ok: true });
    });
    const res = await request(a).get('/switch').set('cookie', sessionCookie('old-session'));
    const tokens = ((res.headers['set-cookie'] as unknown as string[]) ?? []).filter((c) => c.startsWith(`${CSRF_COOKIE}=`));
    expect(tokens).toHaveLength(1);
    expect(issuedToken(res)).toBe(issuedToken(await request(app()).get('/thing').set('cookie', sessionCookie('new-session'))));
  });
});
