/**
 * Demotion ends access (issue 13, item 6). A maintainer launches a sweep over someone else's
 * private instance set and watches its live stream; an admin demotes him to researcher. From
 * then on the stream delivers nothing more and closes, and the sweep and its results answer 404:
 * he keeps only what his current role and the set's visibility allow (his sweeps over public or
 * his own sets). The role comes from the database on every request, never from the session.
 * Stream events are sent with pg_notify as a worker would, so no worker is needed.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import request from 'supertest';
import { CSRF_HEADER } from '@shared/auth';
import type { SweepListResponse } from '@shared/runs';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { signInAs, type SignedInClient } from '../../api/src/dev/sign-in-as';
import { readEvents } from '../support/sse-events';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, DATASET, launchSweep, MAINTAINER, startSweepServer, uploadSet, waitUntil, type SweepServer } from '../reliability/support/sweep-harness';

const admin = DEMO_IDENTITIES.find((d) => d.demoRole === 'admin') ?? DEMO_IDENTITIES[2];

jest.setTimeout(60_000);

describe('demotion ends access to sweeps', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let adminClient: SignedInClient;
  let privateSetId: number;
  let publicSetId: number;
  let maintainerId: number;

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url, { ADMIN_LOGINS: admin.login });
    adminClient = await signInAs(s.url, admin.login);
    // The admin's private set: a maintainer sees it (curator), a researcher other than its owner does not.
    const created = await adminClient.request('/api/instance-sets', { method: 'POST', body: JSON.stringify({ name: 'night shift floor', visibility: 'private' }) });
    expect(created.status).toBe(201);
    privateSetId = ((await created.json()) as { id: number }).id;
    let upload = request(s.url).post(`/api/instance-sets/${privateSetId}/files`).set('cookie', adminClient.jar.header()).set(CSRF_HEADER, adminClient.csrfToken);
    for (const f of ['empty-8-8.map', 'empty-8-8-even-1.scen']) upload = upload.attach('files', readFileSync(join(DATASET, f)), { filename: f, contentType: 'application/octet-stream' });
    expect((await upload).status).toBe(201);
    ({ setId: publicSetId } = await uploadSet(s, 'open floor', ['empty-8-8.map', 'empty-8-8-even-2.scen']));
    maintainerId = ((await (await s.client.request('/api/me')).json()) as { account: { id: number } }).account.id;
  });
  afterAll(async () => {
    await s?.close();
    await db?.drop();
  });

  it('stops the live stream, hides the sweep over the private set and keeps the one over the public set', async () => {
    const hidden = await launchSweep(s, baseDefinition(privateSetId, { name: 'night shift check' }));
    const kept = await launchSweep(s, baseDefinition(publicSetId, { name: 'open floor check' }));
    const [run] = await s.sql<{ id: number }>('SELECT id FROM runs WHERE sweep_id = :id ORDER BY id LIMIT 1', { id: hidden.id });
    const stream = readEvents(await s.client.request(`/api/sweeps/${hidden.id}/events`));
    const notify = () => s.sql("SELECT pg_notify('qt_sweep_events', :p)", { p: JSON.stringify({ sweepId: hidden.id, runId: run.id }) });
    // While he is a maintainer the stream carries the run's row.
    await waitUntil(async () => {
      await notify();
      await new Promise((r) => setTimeout(r, 100));
      return stream.events.some((e) => e.event === 'result');
    }, 10_000, 'a result event before the demotion');

    const demoted = await adminClient.request(`/api/admin/users/${maintainerId}`, { method: 'PATCH', body: JSON.stringify({ role: 'researcher' }) });
    expect(demoted.status).toBe(200);
    const before = stream.events.length;
    await notify();
    await waitUntil(async () => stream.isEnded(), 10_000, 'the stream to close after the demotion');
    await stream.cancel();

    expect(stream.events.slice(before)).toEqual([]);
    expect((await s.client.request(`/api/sweeps/${hidden.id}`)).status).toBe(404);
    expect((await s.client.request(`/api/sweeps/${hidden.id}/results`)).status).toBe(404);
    expect((await s.client.request(`/api/sweeps/${hidden.id}/events`)).status).toBe(404);
    const list = (await (await s.client.request('/api/sweeps')).json()) as SweepListResponse;
    expect(list.items.map((i) => i.id)).toEqual([kept.id]);
    expect((await s.client.request(`/api/sweeps/${kept.id}/results`)).status).toBe(200);
    expect(((await (await s.client.request('/api/stats')).json()) as { sweeps: number }).sweeps).toBe(1);
  });

  it('reads the role from the database on each request: the session row holds the account id only', async () => {
    const rows = await s.sql<{ sess: { passport?: { user?: unknown } } }>('SELECT sess FROM session');
    expect(rows.length).toBeGreaterThan(0);
    for (const r of rows) {
      expect(JSON.stringify(r.sess)).not.toMatch(/role|maintainer|researcher|admin/);
      if (r.sess.passport) expect(typeof r.sess.passport.user).toBe('number');
    }
    expect(((await (await s.client.request('/api/me')).json()) as { role: string }).role).toBe('researcher');
  });
});
