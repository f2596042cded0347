/**
 * A small OAuth 2.0 authorization server (authorization-code grant, RFC 6749 §4.1) that
 * stands in for GitHub on a developer machine and in tests. It serves the four endpoints
 * passport-github2 calls: authorize, token, user profile and user e-mails.
 */
import { randomBytes } from 'node:crypto';
import express, { type Express, type Request, type Response } from 'express';
import { DEMO_IDENTITIES, type DemoIdentity } from './demo-identities';
import { escapeHtml, pickerPage } from './picker-page';

/** A registered OAuth client (our API). */
export interface FakeOAuthClient {
  readonly clientId: string;
  readonly clientSecret: string;
  readonly name: string;
  /** Exact redirect URIs this client may use (RFC 6749 §3.1.2.2). */
  readonly redirectUris: readonly string[];
}

/** Options of the fake provider. */
export interface FakeOAuthOptions {
  readonly clients: readonly FakeOAuthClient[];
  readonly identities?: readonly DemoIdentity[];
  /** Lifetime of authorization codes; RFC 6749 §4.1.2 recommends at most 10 minutes. */
  readonly codeTtlMs?: number;
  readonly tokenTtlMs?: number;
  /** Injected clock for expiry tests. */
  readonly now?: () => number;
}

/** The endpoint paths, relative to the provider's base URL. */
export const FAKE_OAUTH_PATHS = {
  authorize: '/oauth/authorize',
  token: '/oauth/token',
  user: '/api/user',
  emails: '/api/user/emails',
} as const;

interface IssuedCode {
  readonly clientId: string;
  readonly redirectUri: string;
  readonly identity: DemoIdentity;
  readonly scope: string;
  readonly expiresAt: number;
  isUsed: boolean;
  readonly tokens: string[];
}

interface IssuedToken {
  readonly identity: DemoIdentity;
  readonly scope: string;
  readonly expiresAt: number;
}

const token = () => randomBytes(24).toString('base64url');

function badRequestPage(res: Response, message: string): void {
  // RFC 6749 §4.1.2.1: with a bad client or redirect URI, tell the user and do NOT redirect.
  res.status(400).type('html').send(`<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Sign-in request rejected</title></head>`
    + `<body><h1>Sign-in request rejected</h1><p>${escapeHtml(message)}</p></body></html>`);
}

function oauthError(res: Response, status: number, error: string, description: string): void {
  res.status(status).set('Cache-Control', 'no-store').json({ error, error_description: description });
}

function redirectWith(res: Response, redirectUri: string, params: Record<string, string | undefined>): void {
  const url = new URL(redirectUri);
  for (const [k, v] of Object.entries(params)) if (v !== undefined) url.searchParams.set(k, v);
  res.redirect(302, url.toString());
}

function str(v: unknown): string | undefined {
  return typeof v === 'string' ? v : undefined;
}

/** Builds the provider's Express app (no listen). */
export function createFakeOAuthProvider(options: FakeOAuthOptions): Express {
  const identities = options.identities ?? DEMO_IDENTITIES;
  const now = options.now ?? Date.now;
  const codeTtlMs = options.codeTtlMs ?? 10 * 60 * 1000;
  const tokenTtlMs = options.tokenTtlMs ?? 60 * 60 * 1000;
  const codes = new Map<string, IssuedCode>();
  const tokens = new Map<string, IssuedToken>();
  const clientById = (id: string | undefined) => options.clients.find((c) => c.clientId === id);

  const app = express();
  app.disable('x-powered-by');
  app.use(express.urlencoded({ extended: false, limit: '16kb' }));
  app.use(express.json({ limit: '16kb' }));

  app.get(FAKE_OAUTH_PATHS.authorize, (req: Request, res: Response) => {
    const q = req.query;
    const client = clientById(str(q.client_id));
    if (!client) return badRequestPage(res, `Unknown client_id "${str(q.client_id) ?? ''}".`);
    const asked = str(q.redirect_uri);
    // §3.1.2.3: the redirect URI may be omitted only when exactly one is registered.
    const redirectUri = asked ?? (client.redirectUris.length === 1 ? client.redirectUris[0] : undefined);
    if (!redirectUri || !client.redirectUris.includes(redirectUri)) {
      return badRequestPage(res, `redirect_uri "${asked ?? ''}" is not registered for client ${client.clientId}.`);
    }
    const state = str(q.state);
    if (str(q.response_type) !== 'code') {
      return redirectWith(res, redirectUri, { error: 'unsupported_response_type', state });
    }
    if (str(q.deny) !== undefined) {
      return redirectWith(res, redirectUri, { error: 'access_denied', error_description: 'The user cancelled sign-in.', state });
    }
    const login = str(q.identity);
    if (login === undefined) {
      const carried: Record<string, string> = {};
      for (const key of ['client_id', 'redirect_uri', 'response_type', 'scope', 'state']) {
        const v = str(q[key]);
        if (v !== undefined) carried[key] = v;
      }
      // The form posts back here and the provider then redirects to the client, so the
      // client's origin must be an allowed form target (browsers check form-action on redirects).
      res.set('Content-Security-Policy', `default-src 'none'; style-src 'unsafe-inline'; form-action 'self' ${new URL(redirectUri).origin}; frame-ancestors 'none'`);
      return res.type('html').send(pickerPage(identities, carried, client.name));
    }
    const identity = identities.find((d) => d.login === login);
    if (!identity) return badRequestPage(res, `No demo identity "${login}".`);
    const code = token();
    codes.set(code, { clientId: client.clientId, redirectUri, identity, scope: str(q.scope) ?? '', expiresAt: now() + codeTtlMs, isUsed: false, tokens: [] });
    return redirectWith(res, redirectUri, { code, state });
  });

  app.post(FAKE_OAUTH_PATHS.token, (req: Request, res: Response) => {
    const body = (req.body ?? {}) as Record<string, unknown>;
    let clientId = str(body.client_id);
    let clientSecret = str(body.client_secret);
    const basic = /^Basic (.+)$/i.exec(req.get('authorization') ?? '');
    if (basic) {
      // §2.3.1: HTTP Basic with form-urlencoded id and secret.
      const [id, secret] = Buffer.from(basic[1], 'base64').toString('utf8').split(':');
      clientId = decodeURIComponent(id ?? '');
      clientSecret = decodeURIComponent(secret ?? '');
    }
    const client = clientById(clientId);
    if (!client || client.clientSecret !== clientSecret) return oauthError(res, 401, 'invalid_client', 'Unknown client or wrong secret.');
    if (str(body.grant_type) !== 'authorization_code') return oauthError(res, 400, 'unsupported_grant_type', 'Only authorization_code is supported.');
    const code = str(body.code);
    if (!code) return oauthError(res, 400, 'invalid_request', 'Missing code.');
    const issued = codes.get(code);
    if (!issued || issued.clientId !== client.clientId) return oauthError(res, 400, 'invalid_grant', 'Unknown authorization code.');
    if (issued.isUsed) {
      // §4.1.2: a reused code SHOULD revoke every token issued from it.
      for (const t of issued.tokens) tokens.delete(t);
      return oauthError(res, 400, 'invalid_grant', 'Authorization code already used.');
    }
    issued.isUsed = true;
    if (issued.expiresAt <= now()) return oauthError(res, 400, 'invalid_grant', 'Authorization code expired.');
    // §4.1.3: the redirect_uri must be identical to the one of the authorization request.
    if (str(body.redirect_uri) !== issued.redirectUri) return oauthError(res, 400, 'invalid_grant', 'redirect_uri does not match the authorization request.');
    const accessToken = token();
    tokens.set(accessToken, { identity: issued.identity, scope: issued.scope, expiresAt: now() + tokenTtlMs });
    issued.tokens.push(accessToken);
    res.set({ 'Cache-Control': 'no-store', Pragma: 'no-cache' }).json({ access_token: accessToken, token_type: 'bearer', scope: issued.scope });
  });

  const bearer = (req: Request): IssuedToken | undefined => {
    // passport-github2 sends "Bearer"; GitHub also accepts the older "token" scheme.
    const m = /^(?:Bearer|token) (\S+)$/i.exec(req.get('authorization') ?? '');
    const t = m ? tokens.get(m[1]) : undefined;
    return t && t.expiresAt > now() ? t : undefined;
  };

  app.get(FAKE_OAUTH_PATHS.user, (req: Request, res: Response) => {
    const t = bearer(req);
    if (!t) return void res.status(401).json({ message: 'Bad credentials' });
    const d = t.identity;
    res.json({ id: Number(d.id), login: d.login, name: d.name, email: d.email, type: 'User' });
  });

  app.get(FAKE_OAUTH_PATHS.emails, (req: Request, res: Response) => {
    const t = bearer(req);
    if (!t) return void res.status(401).json({ message: 'Bad credentials' });
    if (!t.scope.split(/[ ,]/).some((s) => s === 'user:email' || s === 'user')) {
      return void res.status(403).json({ message: 'Token lacks the user:email scope' });
    }
    res.json([{ email: t.identity.email, primary: true, verified: true, visibility: 'private' }]);
  });

  app.use((req: Request, res: Response) => {
    res.status(404).json({ message: `Not found: ${req.method} ${req.path}` });
  });
  return app;
}
