/**
 * Revoking an API token cuts the live sweep stream it opened (issue 16, item 1: a token keeps every
 * access rule). A maintainer watches his sweep's event stream with a read token; once he revokes the
 * token in his session, the next access check ends the stream and nothing more is delivered, while a
 * stream opened by his browser session goes on. Stream events are sent with pg_notify as a worker would.
 */
import type { CreatedApiToken } from '@shared/api-tokens';
import { readEvents } from '../support/sse-events';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitUntil, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(60_000);

describe('a revoked token ends the sweep stream it opened', () => {
  let db: TestDatabase;
  let s: SweepServer;

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
  });
  afterAll(async () => {
    await s?.close();
    await db?.drop();
  });

  it('ends the token stream after the revocation and keeps the session stream', async () => {
    const { setId } = await uploadSet(s, 'token watch floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    const sweep = await launchSweep(s, baseDefinition(setId, { name: 'watched by a script' }));
    const [run] = await s.sql<{ id: number }>('SELECT id FROM runs WHERE sweep_id = :id ORDER BY id LIMIT 1', { id: sweep.id });
    const created = await s.client.request('/api/me/tokens', { method: 'POST', body: JSON.stringify({ name: 'watcher', scopes: ['read'], expiresInDays: 7 }) });
    expect(created.status).toBe(201);
    const token = (await created.json()) as CreatedApiToken;

    const byToken = readEvents(await fetch(`${s.url}/api/sweeps/${sweep.id}/events`, { headers: { authorization: `Bearer ${token.secret}` } }));
    const bySession = readEvents(await s.client.request(`/api/sweeps/${sweep.id}/events`));
    const notify = () => s.sql("SELECT pg_notify('qt_sweep_events', :p)", { p: JSON.stringify({ sweepId: sweep.id, runId: run.id }) });
    await waitUntil(async () => {
      await notify();
      await new Promise((r) => setTimeout(r, 100));
      return byToken.events.some((e) => e.event === 'result') && bySession.events.some((e) => e.event === 'result');
    }, 10_000, 'a result event on both streams before the revocation');

    expect((await s.client.request(`/api/me/tokens/${token.token.id}`, { method: 'DELETE' })).status).toBe(204);
    const tokenBefore = byToken.events.length;
    const sessionBefore = bySession.events.length;
    await notify();
    await waitUntil(async () => byToken.isEnded(), 10_000, 'the token stream to close after the revocation');
    await waitUntil(async () => bySession.events.length > sessionBefore, 10_000, 'the session stream to carry the next event');

    expect(byToken.events.slice(tokenBefore)).toEqual([]);
    expect(bySession.isEnded()).toBe(false);
    // The revoked token opens nothing new either.
    expect((await fetch(`${s.url}/api/sweeps/${sweep.id}/events`, { headers: { authorization: `Bearer ${token.secret}` } })).status).toBe(401);
    await byToken.cancel();
    await bySession.cancel();
  });
});
