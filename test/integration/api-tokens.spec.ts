/**
 * Personal API tokens over HTTP on a real PostgreSQL (issue 16, item 1): hashed storage, every
 * scope boundary (read, submit, sweep), the sweep scope following the account's current role,
 * Bearer requests without CSRF and ahead of a cookie session, 401 for bad, expired and revoked
 * tokens, last use written at most once a minute, and the per-token rate limit.
 * The board world (leaderboard-support.ts): owner and other are researchers, curator a maintainer;
 * the tiny map is 5 × 4 with a wall at (1, 1), agents (0,0)→(2,0) and (2,2)→(0,2).
 */
import { createHash, randomBytes } from 'node:crypto';
import type { ApiTokenListResponse, CreatedApiToken } from '@shared/api-tokens';
import type { MeResponse } from '@shared/auth';
import { loadConfig } from '../../api/src/config';
import { startServer, type RunningServer } from '../../api/src/app';
import { signInAs } from '../../api/src/dev/sign-in-as';
import { API_ROUTES } from '../../api/src/openapi/api-routes';
import { ErrorBodySchema } from '../../api/src/openapi/response-schemas';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { json, startBoardWorld, type BoardWorld } from './leaderboard-support';
import { setRole, type SignedInClient } from './instance-library-support';

const PLAN = { format: 'text', text: '(0,0) (1,0) (2,0)\n2,2 1,2 0,2\n', model: 'classic', solver: { name: 'Script planner', version: '1' } };

/** Creates a token through the person's browser session; throws unless 201. */
async function createToken(client: SignedInClient, scopes: string[], name = `token ${scopes.join('+')}`, expiresInDays = 30): Promise<CreatedApiToken> {
  const res = await client.request('/api/me/tokens', json('POST', { name, scopes, expiresInDays }));
  if (res.status !== 201) throw new Error(`create token: ${res.status} ${await res.text()}`);
  return (await res.json()) as CreatedApiToken;
}

/** A plain fetch with the token and nothing else: no cookie, no CSRF header. */
function withToken(baseUrl: string, secret: string, path: string, init: RequestInit = {}): Promise<Response> {
  const headers = new Headers(init.headers);
  headers.set('authorization', `Bearer ${secret}`);
  if (typeof init.body === 'string') headers.set('content-type', 'application/json');
  return fetch(baseUrl + path, { ...init, headers, redirect: 'manual' });
}

async function errorOf(res: Response): Promise<{ code: string; message: string; details?: { missingScope?: string | null } }> {
  return ((await res.json()) as { error: { code: string; message: string; details?: { missingScope?: string | null } } }).error;
}

jest.setTimeout(60_000);

describe('personal API tokens', () => {
  let world: BoardWorld;
  let url: string;
  const call = (secret: string, path: string, init?: RequestInit) => withToken(url, secret, path, init);
  const sweepDefinition = () => ({
    name: 'token launched',
    instances: { instanceSetId: world.publicSet },
    agentCounts: { kind: 'list', values: [2] },
    models: [{ model: 'classic' }],
    robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0 },
    timeLimitMs: 5_000,
    memoryLimitMb: 256,
    execution: { policies: ['open-loop'], runs: 1 },
    seeds: [1],
  });

  beforeAll(async () => {
    world = await startBoardWorld();
    url = world.lib.server.url;
  }, 60_000);
  afterAll(() => world?.lib.close());

  it('shows the secret once and stores only its SHA-256', async () => {
    const created = await createToken(world.owner, ['read'], 'laptop script');
    expect(created.secret).toMatch(/^qtk_[A-Za-z0-9_-]{43}$/);
    expect(created.token).toMatchObject({ name: 'laptop script', scopes: ['read'], lastUsedAt: null });
    const [row] = await world.lib.sql<{ hash: Buffer; everything: string }>(
      'SELECT secret_sha256 AS hash, row_to_json(t)::text AS everything FROM api_tokens t WHERE id = :id', { id: created.token.id },
    );
    expect(row.hash.equals(createHash('sha256').update(created.secret).digest())).toBe(true);
    expect(row.everything).not.toContain(created.secret.slice(4));
    const list = (await (await world.owner.request('/api/me/tokens')).json()) as ApiTokenListResponse;
    expect(list.tokens.map((t) => t.id)).toContain(created.token.id);
    expect(JSON.stringify(list)).not.toContain(created.secret);
  });

  it('lets a read token GET what its account may see and nothing more, and write nothing', async () => {
    const { secret } = await createToken(world.owner, ['read']);
    const me = (await (await call(secret, '/api/me')).json()) as MeResponse;
    expect(me.account?.login).toBe('marguerite-oyelaran');
    expect((await call(secret, `/api/instance-sets/${world.privateSet}`)).status).toBe(200);
    const submit = await call(secret, '/api/submissions', json('POST', { ...PLAN, instance: { scenarioId: world.scenarios[0], agents: 2 } }));
    expect(submit.status).toBe(403);
    expect(await errorOf(submit)).toMatchObject({ code: 'FORBIDDEN', details: { missingScope: 'submit' } });
    const createSet = await call(secret, '/api/instance-sets', json('POST', { name: 'by token', visibility: 'public' }));
    expect(createSet.status).toBe(403);
    expect((await errorOf(createSet)).details).toEqual({ missingScope: null });
    // Tokens cannot see or mint tokens.
    expect((await call(secret, '/api/me/tokens')).status).toBe(403);
    expect((await call(secret, '/api/ME/Tokens')).status).toBe(403);
    expect((await world.lib.sql<{ n: number }>("SELECT count(*)::int AS n FROM instance_sets WHERE name = 'by token'"))[0].n).toBe(0);
  });

  it('keeps the visibility rules: another researcher\'s read token does not see the private set', async () => {
    const { secret } = await createToken(world.other, ['read']);
    expect((await call(secret, `/api/instance-sets/${world.privateSet}`)).status).toBe(404);
    expect((await call(secret, `/api/instance-sets/${world.publicSet}`)).status).toBe(200);
  });

  it('lets a submit token submit a plan, but neither read nor launch a sweep', async () => {
    const { secret } = await createToken(world.owner, ['submit']);
    const res = await call(secret, '/api/submissions', json('POST', { ...PLAN, instance: { scenarioId: world.scenarios[0], agents: 2 } }));
    expect(res.status).toBe(201);
    expect((await errorOf(await call(secret, '/api/me'))).details).toEqual({ missingScope: 'read' });
    const sweep = await call(secret, '/api/sweeps', json('POST', sweepDefinition()));
    expect(sweep.status).toBe(403);
    expect((await errorOf(sweep)).details).toEqual({ missingScope: 'sweep' });
  });

  it('refuses the sweep scope to a researcher', async () => {
    const res = await world.owner.request('/api/me/tokens', json('POST', { name: 'sweeper', scopes: ['read', 'sweep'], expiresInDays: 7 }));
    expect(res.status).toBe(403);
    expect((await world.lib.sql<{ n: number }>("SELECT count(*)::int AS n FROM api_tokens WHERE name = 'sweeper'"))[0].n).toBe(0);
  });

  it('lets a maintainer\'s sweep token launch and cancel a sweep until he is demoted', async () => {
    const { secret } = await createToken(world.curator, ['sweep']);
    const launched = await call(secret, '/api/sweeps', json('POST', sweepDefinition()));
    expect(launched.status).toBe(201);
    const { id } = (await launched.json()) as { id: number };
    expect((await call(secret, `/api/sweeps/${id}/cancel`, { method: 'POST' })).status).toBe(200);
    try {
      await setRole(world.lib, 'tobiah-venkat', 'researcher');
      const refused = await call(secret, '/api/sweeps', json('POST', sweepDefinition()));
      expect(refused.status).toBe(403);
      expect((await errorOf(refused)).message).toMatch(/maintainer or admin; it is researcher now/);
    } finally {
      await setRole(world.lib, 'tobiah-venkat', 'maintainer');
    }
    expect((await world.lib.sql<{ n: number }>("SELECT count(*)::int AS n FROM sweeps WHERE name = 'token launched'"))[0].n).toBe(1);
  });

  it('needs no CSRF header with a token while a cookie session still does', async () => {
    const { secret } = await createToken(world.owner, ['submit']);
    const body = JSON.stringify({ ...PLAN, instance: { scenarioId: world.scenarios[1], agents: 2 } });
    const cookieOnly = await fetch(`${url}/api/submissions`, { method: 'POST', body, headers: { cookie: world.owner.jar.header(), 'content-type': 'application/json' } });
    expect(cookieOnly.status).toBe(403);
    expect((await errorOf(cookieOnly)).code).toBe('CSRF_REJECTED');
    expect((await call(secret, '/api/submissions', { method: 'POST', body })).status).toBe(201);
  });

  it('uses the token, not the session, when a request carries both, and sets no cookie', async () => {
    const { secret } = await createToken(world.other, ['read']);
    const res = await withToken(url, secret, '/api/me', { headers: { cookie: world.owner.jar.header() } });
    expect(((await res.json()) as MeResponse).account?.login).toBe('ilse-marchetti');
    expect(res.headers.get('set-cookie')).toBeNull();
  });

  it('leaves another Authorization scheme to the session and its CSRF check', async () => {
    // Browsers resend Basic credentials by themselves behind a password-protected proxy.
    const basic = 'Basic dXNlcjpwdw==';
    const me = await fetch(`${url}/api/me`, { headers: { authorization: basic, cookie: world.owner.jar.header() } });
    expect(((await me.json()) as MeResponse).account?.login).toBe('marguerite-oyelaran');
    const body = JSON.stringify({ name: 'basic forged', scopes: ['read'], expiresInDays: 1 });
    const forged = await fetch(`${url}/api/me/tokens`, { method: 'POST', body, headers: { authorization: basic, cookie: world.owner.jar.header(), 'content-type': 'application/json' } });
    expect(forged.status).toBe(403);
    expect((await errorOf(forged)).code).toBe('CSRF_REJECTED');
  });

  it('answers 401 in the error shape for a malformed, unknown, expired or revoked token, never falling back to the session', async () => {
    const unknown = `qtk_${randomBytes(32).toString('base64url')}`;
    for (const authorization of ['Bearer', 'Bearer not-a-token', `Bearer ${unknown} ${unknown}`]) {
      const malformed = await fetch(`${url}/api/me`, { headers: { authorization } });
      expect([authorization, malformed.status]).toEqual([authorization, 401]);
    }
    const res = await withToken(url, unknown, '/api/me', { headers: { cookie: world.owner.jar.header() } });
    expect(res.status).toBe(401);
    expect(res.headers.get('www-authenticate')).toMatch(/^Bearer .*invalid_token/);
    expect(await errorOf(res)).toMatchObject({ code: 'UNAUTHENTICATED' });

    const expiring = await createToken(world.owner, ['read']);
    expect((await call(expiring.secret, '/api/me')).status).toBe(200);
    await world.lib.sql("UPDATE api_tokens SET expires_at = now() - interval '1 second' WHERE id = :id", { id: expiring.token.id });
    expect((await call(expiring.secret, '/api/me')).status).toBe(401);

    const revoking = await createToken(world.owner, ['read']);
    expect((await world.other.request(`/api/me/tokens/${revoking.token.id}`, { method: 'DELETE' })).status).toBe(404);
    expect((await call(revoking.secret, '/api/me')).status).toBe(200);
    expect((await world.owner.request(`/api/me/tokens/${revoking.token.id}`, { method: 'DELETE' })).status).toBe(204);
    expect((await call(revoking.secret, '/api/me')).status).toBe(401);
    const list = (await (await world.owner.request('/api/me/tokens')).json()) as ApiTokenListResponse;
    expect(list.tokens.map((t) => t.id)).not.toContain(revoking.token.id);
  });

  it('answers in the shapes the OpenAPI document states for the account and token routes and for errors', async () => {
    const schemaOf = (method: string, path: string) => {
      const schema = API_ROUTES.find((r) => r.method === method && r.path === path)?.response.body?.schema;
      if (!schema) throw new Error(`no response schema for ${method} ${path}`);
      return schema;
    };
    const created = await world.owner.request('/api/me/tokens', json('POST', { name: 'shape check', scopes: ['read'], expiresInDays: 1 }));
    const { secret } = (await created.clone().json()) as CreatedApiToken;
    const answers: Array<[string, unknown, { safeParse(v: unknown): { success: boolean; error?: unknown } }]> = [
      ['POST /api/me/tokens', await created.json(), schemaOf('post', '/api/me/tokens')],
      ['GET /api/me/tokens', await (await world.owner.request('/api/me/tokens')).json(), schemaOf('get', '/api/me/tokens')],
      ['GET /api/me (token)', await (await call(secret, '/api/me')).json(), schemaOf('get', '/api/me')],
      ['GET /api/me (visitor)', await (await fetch(`${url}/api/me`)).json(), schemaOf('get', '/api/me')],
      ['403 scope', await (await call(secret, '/api/submissions', json('POST', {}))).json(), ErrorBodySchema],
      ['401 token', await (await call(`qtk_${'x'.repeat(43)}`, '/api/me')).json(), ErrorBodySchema],
    ];
    expect(answers.map(([what, body, schema]) => [what, schema.safeParse(body).success])).toEqual(answers.map(([what]) => [what, true]));
  });

  it('records the last use at most once a minute', async () => {
    const { secret, token } = await createToken(world.owner, ['read']);
    const lastUsed = async () => (await world.lib.sql<{ at: Date | null }>('SELECT last_used_at AS at FROM api_tokens WHERE id = :id', { id: token.id }))[0].at;
    expect(await lastUsed()).toBeNull();
    await call(secret, '/api/me');
    const first = await lastUsed();
    expect(first).toBeInstanceOf(Date);
    await call(secret, '/api/me');
    expect((await lastUsed())?.getTime()).toBe(first?.getTime());
    await world.lib.sql("UPDATE api_tokens SET last_used_at = now() - interval '2 minutes' WHERE id = :id", { id: token.id });
    const moved = await lastUsed();
    await call(secret, '/api/me');
    expect((await lastUsed())!.getTime()).toBeGreaterThan(moved!.getTime() + 60_000);
    const listed = (await (await world.owner.request('/api/me/tokens')).json()) as ApiTokenListResponse;
    expect(listed.tokens.find((t) => t.id === token.id)?.lastUsedAt).not.toBeNull();
  });
});

describe('API token rate limit', () => {
  let db: TestDatabase;
  let server: RunningServer;

  beforeAll(async () => {
    db = await createTestDatabase();
    const { config } = loadConfig({ NODE_ENV: 'test', LOG_LEVEL: 'silent', API_TOKEN_RATE_LIMIT: '3', API_TOKEN_RATE_WINDOW_MS: '60000' });
    server = await startServer({ config: { ...config, webDist: '/nonexistent' }, databaseUrl: db.url, port: 0, fakeOAuthPort: 0 });
  });
  afterAll(async () => {
    await server?.close();
    await db?.drop();
  });

  it('answers 429 past API_TOKEN_RATE_LIMIT requests of one token, and counts each token apart', async () => {
    const client = await signInAs(server.url, 'marguerite-oyelaran');
    const busy = await createToken(client, ['read'], 'busy');
    const calm = await createToken(client, ['read'], 'calm');
    const statuses: number[] = [];
    for (let i = 0; i < 4; i++) statuses.push((await withToken(server.url, busy.secret, '/api/me')).status);
    expect(statuses).toEqual([200, 200, 200, 429]);
    const limited = await withToken(server.url, busy.secret, '/api/me');
    expect(await errorOf(limited)).toMatchObject({ code: 'RATE_LIMITED' });
    expect((await withToken(server.url, calm.secret, '/api/me')).status).toBe(200);
  });
});
