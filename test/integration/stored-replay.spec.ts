/**
 * Stored = replayed (issue 12, item 1): a real sweep (in-process worker, real queue, real
 * PostgreSQL) stores its Monte Carlo replays; GET /api/executions/stored/:resultId answers the
 * exact settings of each, and POST /api/executions with those settings reproduces the stored
 * figures to the digit, which is what the plan viewer does when it opens a stored result.
 * Instances: the open dataset's empty-8-8 (Stern et al., SoCS 2019), read in place.
 */
import pino from 'pino';
import type { ExecutionView } from '@shared/executions';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(120_000);

describe('a stored sweep result replayed with its stored settings', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let sweepId: number;
  let setId: number;

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    const upload = await uploadSet(s, 'depot floor', ['empty-8-8.map', 'empty-8-8-even-1.scen']);
    setId = upload.setId;
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    // Noise the viewer's old defaults (jitter 0, no stalls, seed 1) would not reproduce: jitter 0.15,
    // 5 % stalls of 1.5 s, seed 7; the three plan kinds (paths, steps schedule, ms schedule).
    const sweep = await launchSweep(s, baseDefinition(upload.setId, {
      name: 'stored replay check',
      agentCounts: { kind: 'list', values: [4, 8] },
      models: [{ model: 'classic' }, { model: 'classic', following: 'forbidden' }, { model: 'orientation-split' }, { model: 'weighted-split', startHeading: 'N' }],
      robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.15 },
      execution: { policies: ['open-loop', 'lockstep', 'dependency-gated'], stallProbability: 0.05, stallMs: 1500, runs: 25 },
      seeds: [7],
    }));
    sweepId = sweep.id;
    expect(await waitForSweep(s, sweepId, 100_000)).toBe('finished');
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  async function storedOf(resultId: number): Promise<StoredResultExecutionsView> {
    const res = await s.client.request(`/api/executions/stored/${resultId}`);
    expect(res.status).toBe(200);
    return (await res.json()) as StoredResultExecutionsView;
  }

  it('answers each policy with the settings it ran with, and a POST with them reproduces the stored figures to the digit', async () => {
    const results = await s.sql<{ id: number; model: string; seed: string; following: string | null }>(
      "SELECT id, model, seed, params->'model'->>'following' AS following FROM results WHERE sweep_id = :sweepId AND status = 'solved' ORDER BY id", { sweepId });
    // 1 scenario × 2 agent counts × 4 model specs, all solved on an empty 8×8 map.
    expect(results).toHaveLength(8);
    let compared = 0;
    for (const r of results) {
      const stored = await storedOf(r.id);
      expect(stored).toMatchObject({ resultId: r.id, sweepId, model: r.model });
      expect(stored.executions.map((e) => e.settings.policy)).toEqual(['open-loop', 'lockstep', 'dependency-gated']);
      const rows = await s.sql<{ policy: string; success_rate: number; realised_makespan_mean_ms: number | null; realised_makespan_p95_ms: number | null; finish_spread_mean_ms: number | null; collisions_mean: number }>(
        'SELECT policy, success_rate, realised_makespan_mean_ms, realised_makespan_p95_ms, finish_spread_mean_ms, collisions_mean FROM executions WHERE result_id = :id', { id: r.id });
      for (const e of stored.executions) {
        expect(e.settings).toEqual({ policy: e.settings.policy, noise: { jitterCv: 0.15, stallProbability: 0.05, stallMs: 1500 }, runs: 25, seed: Number(r.seed), onCollision: 'count' });
        expect(e.error).toBeNull();
        const res = await s.client.request('/api/executions', { method: 'POST', body: JSON.stringify({ resultId: r.id, ...e.settings }) });
        expect(res.status).toBe(201);
        const view = (await res.json()) as ExecutionView;
        const replay = view.summary;
        // The plan is re-checked under the rule it was solved with, and the viewer can say so.
        expect((view.modelOptions as { following?: string }).following).toBe(r.following ?? undefined);
        expect(view.figures.isValid).toBe(true);
        const row = rows.find((x) => x.policy === e.settings.policy)!;
        // The leaderboard's columns, then the rest of the stored metrics: exact equality, no tolerance.
        expect([replay.successRate, replay.realisedMakespanMs.mean, replay.realisedMakespanMs.p95, replay.finishSpreadMs.mean, replay.collisions.mean])
          .toEqual([row.success_rate, row.realised_makespan_mean_ms, row.realised_makespan_p95_ms, row.finish_spread_mean_ms, row.collisions_mean]);
        expect({ s: replay.successRate, m: replay.realisedMakespanMs, f: replay.finishSpreadMs, w: replay.waitingMs, c: replay.collisions })
          .toEqual({ s: e.figures.successRate, m: e.figures.realisedMakespanMs, f: e.figures.finishSpreadMs, w: e.figures.waitingMs, c: e.figures.collisions });
        // Rows written since issue 12 record seed, collision mode and the 95 % intervals themselves.
        expect(e.recorded).toEqual({ seed: true, onCollision: true });
        expect({ ci: replay.successRateCi95, perRobot: replay.waitingPerRobotMs }).toEqual({ ci: e.figures.successRateCi95, perRobot: e.figures.waitingPerRobotMs });
        expect(replay.runs).toBe(25);
        compared++;
      }
    }
    expect(compared).toBe(24);
    expect(results.filter((r) => r.following === 'forbidden')).toHaveLength(2);
  });

  it('the settings matter: the old viewer defaults (no jitter, no stalls, seed 1) give other figures for some result', async () => {
    const [r] = await s.sql<{ id: number }>("SELECT id FROM results WHERE sweep_id = :sweepId AND model = 'classic' AND agents = 8 AND NOT params->'model' ? 'following'", { sweepId });
    const stored = await storedOf(r.id);
    const open = stored.executions.find((e) => e.settings.policy === 'open-loop')!;
    const res = await s.client.request('/api/executions', { method: 'POST', body: JSON.stringify({ resultId: r.id, policy: 'open-loop', noise: { jitterCv: 0, stallProbability: 0, stallMs: 0 }, seed: 1, runs: 25 }) });
    const replay = ((await res.json()) as ExecutionView).summary;
    expect(replay.realisedMakespanMs.mean).not.toBe(open.figures.realisedMakespanMs.mean);
  });

  it('rows stored before the settings were recorded take the run seed and the count mode', async () => {
    const [r] = await s.sql<{ id: number; seed: string }>("SELECT id, seed FROM results WHERE sweep_id = :sweepId AND model = 'classic' AND agents = 4 AND NOT params->'model' ? 'following'", { sweepId });
    await s.sql("UPDATE executions SET metrics = metrics - 'seed' - 'onCollision' WHERE result_id = :id RETURNING id", { id: r.id });
    const stored = await storedOf(r.id);
    expect(stored.executions).toHaveLength(3);
    for (const e of stored.executions) {
      expect(e.recorded).toEqual({ seed: false, onCollision: false });
      expect([e.settings.seed, e.settings.onCollision]).toEqual([7, 'count']);
    }
  });

  it('is answered to visitors for a public set, and 404 with the one error shape when unknown or hidden', async () => {
    const [r] = await s.sql<{ id: number }>('SELECT id FROM results WHERE sweep_id = :sweepId ORDER BY id LIMIT 1', { sweepId });
    const visitor = await fetch(`${s.url}/api/executions/stored/${r.id}`);
    expect(visitor.status).toBe(200);
    expect(((await visitor.json()) as StoredResultExecutionsView).executions).toHaveLength(3);

    const unknown = await s.client.request('/api/executions/stored/987654');
    expect(unknown.status).toBe(404);
    expect(await unknown.json()).toEqual({ error: { code: 'RESULT_NOT_FOUND', message: 'No result 987654' } });

    const bad = await s.client.request('/api/executions/stored/abc');
    expect(bad.status).toBe(400);
    expect(((await bad.json()) as { error: { code: string; details: { path: string[] }[] } }).error.details[0].path).toEqual(['resultId']);

    await s.sql("UPDATE instance_sets SET visibility = 'private' WHERE id = :setId RETURNING id", { setId });
    const hidden = await fetch(`${s.url}/api/executions/stored/${r.id}`);
    expect(hidden.status).toBe(404);
    expect(((await hidden.json()) as { error: { code: string } }).error.code).toBe('RESULT_NOT_FOUND');
  });
});
