import express from 'express';
import request from 'supertest';
import { CSRF_COOKIE, CSRF_HEADER } from '@shared/auth';
import { errorHandler } from '../errors/error-handler';
import { csrfProtection } from './csrf';

const PUBLIC_URL = 'http://127.0.0.1:4300';
const TOKEN = 'a'.repeat(43);

function app(): express.Express {
  const a = express();
  a.use(csrfProtection({ publicUrl: PUBLIC_URL }));
  a.get('/thing', (_req, res) => void res.json({ ok: true }));
  a.post('/thing', (_req, res) => void res.status(201).json({ ok: true }));
  a.delete('/thing', (_req, res) => void res.status(204).end());
  a.use(errorHandler());
  return a;
}

describe('csrfProtection', () => {
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
});
