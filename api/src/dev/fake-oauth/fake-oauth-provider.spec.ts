import request from 'supertest';
import { createFakeOAuthProvider, FAKE_OAUTH_PATHS } from './fake-oauth-provider';
import { DEMO_IDENTITIES } from './demo-identities';

// The parser passport-github2 applies to GitHub's /user answer: our profile must survive it.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const parseProfile = require('passport-github2/lib/profile').parse as (json: unknown) => { id: string; username: string; displayName: string; emails?: Array<{ value: string }> };

const CLIENT = { clientId: 'app', clientSecret: 's3cret', name: 'Test app', redirectUris: ['http://127.0.0.1:9999/cb'] };
const REDIRECT = CLIENT.redirectUris[0];
const who = DEMO_IDENTITIES[1];

function provider(now = () => 1_000_000) {
  return createFakeOAuthProvider({ clients: [CLIENT], now, codeTtlMs: 60_000 });
}

async function authorize(app: ReturnType<typeof provider>, extra: Record<string, string> = {}) {
  return request(app).get(FAKE_OAUTH_PATHS.authorize).query({
    client_id: 'app', redirect_uri: REDIRECT, response_type: 'code', state: 'st-1', scope: 'read:user,user:email', identity: who.login, ...extra,
  });
}

async function codeFrom(app: ReturnType<typeof provider>): Promise<string> {
  const res = await authorize(app);
  return new URL(res.headers.location as string).searchParams.get('code') as string;
}

function exchange(app: ReturnType<typeof provider>, fields: Record<string, string>) {
  return request(app).post(FAKE_OAUTH_PATHS.token).type('form')
    .send({ grant_type: 'authorization_code', client_id: 'app', client_secret: 's3cret', redirect_uri: REDIRECT, ...fields });
}

describe('fake OAuth provider: authorize', () => {
  it('shows a picker listing every demo identity, carrying the request through, with HTML escaped', async () => {
    const res = await request(provider()).get(FAKE_OAUTH_PATHS.authorize)
      .query({ client_id: 'app', redirect_uri: REDIRECT, response_type: 'code', state: '"><script>x</script>' });
    expect(res.status).toBe(200);
    for (const d of DEMO_IDENTITIES) expect(res.text).toContain(`value="${d.login}"`);
    expect(res.text).not.toContain('<script>x');
    expect(res.text).toContain('&quot;&gt;&lt;script&gt;');
    expect(res.headers['content-security-policy']).toContain("form-action 'self' http://127.0.0.1:9999");
  });

  it('redirects to the client with a code and the unchanged state when an identity is picked', async () => {
    const res = await authorize(provider());
    expect(res.status).toBe(302);
    const url = new URL(res.headers.location as string);
    expect(url.origin + url.pathname).toBe(REDIRECT);
    expect(url.searchParams.get('state')).toBe('st-1');
    expect(url.searchParams.get('code')).toMatch(/^[A-Za-z0-9_-]{20,}$/);
  });

  // RFC 6749 §4.1.2.1: with an invalid client or redirect URI the server must not redirect.
  it.each([
    ['unknown client', { client_id: 'other' }],
    ['unregistered redirect_uri', { redirect_uri: 'http://evil.test/cb' }],
  ])('refuses a %s with 400 and no redirect', async (_label, extra) => {
    const res = await authorize(provider(), extra);
    expect(res.status).toBe(400);
    expect(res.headers.location).toBeUndefined();
  });

  it('reports access_denied to the client when the person cancels (RFC 6749 §4.1.2.1)', async () => {
    const res = await authorize(provider(), { identity: '', deny: '1' });
    const url = new URL(res.headers.location as string);
    expect(url.searchParams.get('error')).toBe('access_denied');
    expect(url.searchParams.get('state')).toBe('st-1');
    expect(url.searchParams.get('code')).toBeNull();
  });

  it('rejects response types other than code', async () => {
    const res = await authorize(provider(), { response_type: 'token' });
    expect(new URL(res.headers.location as string).searchParams.get('error')).toBe('unsupported_response_type');
  });
});

describe('fake OAuth provider: token and profile', () => {
  it('exchanges a code once for a token whose profile passport-github2 parses', async () => {
    const app = provider();
    const tokenRes = await exchange(app, { code: await codeFrom(app) });
    expect(tokenRes.status).toBe(200);
    expect(tokenRes.headers['cache-control']).toBe('no-store');
    expect(tokenRes.body).toMatchObject({ token_type: 'bearer' });
    const auth = `Bearer ${tokenRes.body.access_token}`;
    const user = await request(app).get(FAKE_OAUTH_PATHS.user).set('authorization', auth);
    expect(parseProfile(user.body)).toMatchObject({ id: who.id, username: who.login, displayName: who.name, emails: [{ value: who.email }] });
    const emails = await request(app).get(FAKE_OAUTH_PATHS.emails).set('authorization', auth);
    expect(emails.body).toEqual([{ email: who.email, primary: true, verified: true, visibility: 'private' }]);
  });

  it('refuses a reused code and revokes the token issued from it (RFC 6749 §4.1.2)', async () => {
    const app = provider();
    const code = await codeFrom(app);
    const first = await exchange(app, { code });
    const second = await exchange(app, { code });
    expect(second.status).toBe(400);
    expect(second.body.error).toBe('invalid_grant');
    const user = await request(app).get(FAKE_OAUTH_PATHS.user).set('authorization', `Bearer ${first.body.access_token}`);
    expect(user.status).toBe(401);
  });

  it('refuses a redirect_uri different from the authorization request (RFC 6749 §4.1.3)', async () => {
    const app = provider();
    const res = await exchange(app, { code: await codeFrom(app), redirect_uri: 'http://127.0.0.1:9999/other' });
    expect(res.status).toBe(400);
    expect(res.body.error).toBe('invalid_grant');
  });

  it('refuses a wrong client secret with 401 invalid_client, also via HTTP Basic', async () => {
    const app = provider();
    const code = await codeFrom(app);
    const res = await exchange(app, { code, client_secret: 'guess' });
    expect(res.status).toBe(401);
    expect(res.body.error).toBe('invalid_client');
    const basic = await request(app).post(FAKE_OAUTH_PATHS.token).type('form')
      .auth('app', 's3cret').send({ grant_type: 'authorization_code', code, redirect_uri: REDIRECT });
    expect(basic.status).toBe(200);
  });

  it('refuses an expired code', async () => {
    let clock = 1_000_000;
    const app = provider(() => clock);
    const code = await codeFrom(app);
    clock += 60_001;
    const res = await exchange(app, { code });
    expect(res.body).toMatchObject({ error: 'invalid_grant', error_description: expect.stringMatching(/expired/) });
  });

  it('answers the profile endpoints 401 without a valid token', async () => {
    const app = provider();
    expect((await request(app).get(FAKE_OAUTH_PATHS.user)).status).toBe(401);
    expect((await request(app).get(FAKE_OAUTH_PATHS.user).set('authorization', 'Bearer nope')).status).toBe(401);
  });
});
