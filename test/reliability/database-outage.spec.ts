/**
 * A PostgreSQL outage while people are signed in (issue 13, item 9), on a throwaway cluster of
 * its own that the test stops and starts again: every route answers 503 DATABASE_UNAVAILABLE
 * with Retry-After instead of 500, the session cookie is neither replaced nor dropped (the
 * failing session store must not sign anyone out), an open sweep stream is told the database
 * is gone, and once PostgreSQL is back the same session works and the stream resumes.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Client } from 'pg';
import { SWEEP_EVENT_NAMES } from '@shared/runs';
import { SESSION_COOKIE } from '../../api/src/auth/session';
import { migrate } from '../../api/src/db/migrate';
import { startCluster, type PgCluster } from '../../scripts/postgres';
import { freePort } from '../support/free-port';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitUntil, type SweepServer } from './support/sweep-harness';

jest.setTimeout(120_000);

/** Reads an SSE response into a list of event names as they arrive. */
function eventNames(res: Response) {
  const names: string[] = [];
  const reader = (res.body as ReadableStream<Uint8Array>).getReader();
  const done = (async () => {
    let buf = '';
    for (;;) {
      const { value, done: isDone } = await reader.read();
      if (isDone) return;
      buf += Buffer.from(value).toString('utf8');
      let end: number;
      while ((end = buf.indexOf('\n\n')) >= 0) {
        const ev = /^event: (.+)$/m.exec(buf.slice(0, end))?.[1];
        buf = buf.slice(end + 2);
        if (ev) names.push(ev);
      }
    }
  })().catch(() => undefined);
  return { names, stop: async () => { await reader.cancel().catch(() => undefined); await done; } };
}

describe('a PostgreSQL outage', () => {
  let dataDir: string;
  let port: number;
  let cluster: PgCluster;
  let s: SweepServer;

  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'qt-outage-pg-'));
    port = await freePort();
    cluster = startCluster(dataDir, port, { isThrowaway: true, log: () => undefined });
    const admin = new Client({ connectionString: cluster.adminUrl });
    await admin.connect();
    await admin.query('CREATE DATABASE qt_outage');
    await admin.end();
    const url = cluster.urlFor('qt_outage');
    await migrate(url);
    s = await startSweepServer(url);
  }, 60_000);
  afterAll(async () => {
    await s?.close().catch(() => undefined);
    cluster?.stop();
    if (dataDir) rmSync(dataDir, { recursive: true, force: true });
  });

  it('answers 503 DATABASE_UNAVAILABLE with Retry-After, keeps the session and tells an open sweep stream, then recovers', async () => {
    const { setId } = await uploadSet(s, 'outage floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    // No worker runs: the sweep stays queued, its stream open.
    const sweep = await launchSweep(s, baseDefinition(setId, { name: 'outage check' }));
    const stream = eventNames(await s.client.request(`/api/sweeps/${sweep.id}/events`));
    await waitUntil(async () => stream.names.includes(SWEEP_EVENT_NAMES.progress), 10_000, 'the first progress event');
    const sessionCookie = s.client.jar.get(SESSION_COOKIE);
    expect(sessionCookie).toBeDefined();

    cluster.stop();
    try {
      for (const [method, path, body] of [['GET', '/api/me'], ['GET', '/api/sweeps'], ['GET', `/api/sweeps/${sweep.id}`], ['PATCH', '/api/me/settings', { isEmailOn: false }]] as const) {
        const res = await s.client.request(path, { method, ...(body ? { body: JSON.stringify(body) } : {}) });
        expect([method, path, res.status]).toEqual([method, path, 503]);
        expect(((await res.json()) as { error: { code: string } }).error.code).toBe('DATABASE_UNAVAILABLE');
        expect(Number(res.headers.get('retry-after'))).toBeGreaterThanOrEqual(1);
        // No new, emptied or expired session cookie: the browser keeps the one it has.
        expect(res.headers.getSetCookie().filter((c) => c.startsWith(`${SESSION_COOKIE}=`))).toEqual([]);
      }
      expect(s.client.jar.get(SESSION_COOKIE)).toBe(sessionCookie);
      await waitUntil(async () => stream.names.includes(SWEEP_EVENT_NAMES.unavailable), 15_000, 'the stream to say the database is unavailable');
    } finally {
      cluster = startCluster(dataDir, port, { isThrowaway: true, log: () => undefined });
    }

    const progressBefore = stream.names.lastIndexOf(SWEEP_EVENT_NAMES.unavailable);
    let me: { account: { login: string } | null } | undefined;
    await waitUntil(async () => {
      const res = await s.client.request('/api/me');
      if (res.status === 200) me = (await res.json()) as typeof me;
      return res.status === 200;
    }, 30_000, 'GET /api/me to answer again');
    expect(me?.account?.login).toBe('tobiah-venkat');
    expect(s.client.jar.get(SESSION_COOKIE)).toBe(sessionCookie);
    await waitUntil(async () => stream.names.slice(progressBefore + 1).includes(SWEEP_EVENT_NAMES.progress), 30_000, 'the stream to resume with a progress event');
    await stream.stop();
  });
});
