/** Runs the fake OAuth provider on 127.0.0.1 for `npm start` and tests. */
import { createServer } from 'node:http';
import { closeServer, listen } from '../../http/listen';
import { createFakeOAuthProvider, type FakeOAuthOptions } from './fake-oauth-provider';

/** A running fake provider. */
export interface RunningFakeOAuth {
  /** Base URL, e.g. http://127.0.0.1:4301 (no trailing slash). */
  readonly url: string;
  readonly port: number;
  close(): Promise<void>;
}

/** Starts the fake provider on loopback `port` (0 = any free port). */
export async function startFakeOAuth(port: number, options: FakeOAuthOptions): Promise<RunningFakeOAuth> {
  const server = createServer(createFakeOAuthProvider(options));
  // Loopback only: anyone who can reach this provider can sign in as an admin.
  const bound = await listen(server, port, '127.0.0.1');
  return { url: `http://127.0.0.1:${bound}`, port: bound, close: () => closeServer(server, 1000) };
}
