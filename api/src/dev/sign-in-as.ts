/**
 * Signs in through the real OAuth redirect chain against the local fake provider, for tests
 * and scripted checks: app → provider authorize (identity picked by query) → app callback.
 */
import { CSRF_COOKIE, CSRF_HEADER, SIGN_IN_PATH } from '@shared/auth';
import { CookieJar } from './cookie-jar';

/** A signed-in HTTP client for one app. */
export interface SignedInClient {
  readonly jar: CookieJar;
  /** Value to send in x-csrf-token. */
  readonly csrfToken: string;
  /** fetch on the app with the session cookie and, for unsafe methods, the CSRF header. */
  request(path: string, init?: RequestInit): Promise<Response>;
}

async function hop(url: string, jar: CookieJar): Promise<Response> {
  const res = await fetch(url, { redirect: 'manual', headers: { cookie: jar.header() } });
  jar.store(res);
  return res;
}

function locationOf(res: Response, step: string): string {
  const location = res.headers.get('location');
  if (res.status !== 302 || !location) throw new Error(`sign-in: expected a redirect at ${step}, got ${res.status}`);
  return location;
}

/** Returns a client that calls the app with the jar's cookies and CSRF header. */
export function clientFor(baseUrl: string, jar: CookieJar): SignedInClient {
  return {
    jar,
    get csrfToken() {
      return jar.get(CSRF_COOKIE) ?? '';
    },
    async request(path, init = {}) {
      const headers = new Headers(init.headers);
      headers.set('cookie', jar.header());
      const method = (init.method ?? 'GET').toUpperCase();
      if (!['GET', 'HEAD', 'OPTIONS'].includes(method)) headers.set(CSRF_HEADER, jar.get(CSRF_COOKIE) ?? '');
      if (typeof init.body === 'string' && !headers.has('content-type')) headers.set('content-type', 'application/json');
      const res = await fetch(baseUrl + path, { ...init, headers, redirect: 'manual' });
      jar.store(res);
      return res;
    },
  };
}

/** Signs in as the fake provider's identity `login` and returns a client holding the session. */
export async function signInAs(baseUrl: string, login: string, jar = new CookieJar()): Promise<SignedInClient> {
  const start = await hop(baseUrl + SIGN_IN_PATH, jar);
  const authorize = new URL(locationOf(start, SIGN_IN_PATH));
  authorize.searchParams.set('identity', login);
  const picked = await hop(authorize.toString(), jar);
  const callback = locationOf(picked, 'the provider');
  const done = await hop(callback, jar);
  const target = locationOf(done, 'the callback');
  if (target !== '/') throw new Error(`sign-in as ${login} failed: the callback redirected to ${target}`);
  return clientFor(baseUrl, jar);
}
