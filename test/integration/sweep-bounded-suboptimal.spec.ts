/**
 * Bounded-suboptimal search through a real sweep (issue 15, item 1): classic at w = 1 and w = 1.5
 * and the other four plan models at w = 1.5, solved by an in-process worker on the real queue.
 * Results store w (params.model.suboptimality, absent for w = 1), the proven lower bound and the
 * gap, with lower bound ≤ sum-of-costs ≤ w × lower bound; the board keeps the two classic variants
 * apart and says which values are proven optimal and which are bounded. Instances: the open
 * dataset's empty-8-8 (Stern et al., SoCS 2019), read in place.
 */
import pino from 'pino';
import type { LeaderboardPage, LeaderboardSummary } from '@shared/leaderboards';
import type { SweepProgress, SweepResultRow } from '@shared/runs';
import { startSweepWorker, type SweepWorker } from '../../api/src/workers/sweep-worker';
import { createTestDatabase, type TestDatabase } from '../support/test-database';
import { baseDefinition, launchSweep, startSweepServer, uploadSet, waitForSweep, type SweepServer } from '../reliability/support/sweep-harness';

jest.setTimeout(120_000);

const W = 1.5;

describe('bounded-suboptimal search in sweeps and on the board', () => {
  let db: TestDatabase;
  let s: SweepServer;
  let worker: SweepWorker;
  let setId: number;
  let sweepId: number;

  beforeAll(async () => {
    db = await createTestDatabase();
    s = await startSweepServer(db.url);
    ({ setId } = await uploadSet(s, 'bounded floor', ['empty-8-8.map', 'empty-8-8-even-1.scen', 'empty-8-8-even-2.scen']));
    worker = await startSweepWorker({ databaseUrl: db.url, threads: 1, logger: pino({ level: process.env.QT_TEST_LOG ?? 'silent' }), publicUrl: s.url, maintenanceSeconds: 1 });
    const sweep = await launchSweep(s, baseDefinition(setId, {
      name: 'bounded check',
      agentCounts: { kind: 'list', values: [3, 6] },
      models: [
        { model: 'classic' }, { model: 'classic', suboptimality: W }, { model: 'uniform-duration', suboptimality: W },
        { model: 'orientation-split', suboptimality: W }, { model: 'weighted-split', suboptimality: W }, { model: 'k-robust', k: 1, suboptimality: W },
      ],
      execution: { policies: [], runs: 1 },
    }));
    sweepId = sweep.id;
    expect(await waitForSweep(s, sweepId, 100_000)).toBe('finished');
  });
  afterAll(async () => {
    await worker?.stop({ graceful: false });
    await s?.close();
    await db?.drop();
  });

  it('stores w, the lower bound and the gap of every result, within w × the lower bound', async () => {
    const stored = await s.sql<{ model: string; w: string | null; soc: number; lower_bound: number; gap: number; status: string }>(
      `SELECT model, params->'model'->>'suboptimality' AS w, soc, lower_bound, gap, status FROM results WHERE sweep_id = :id ORDER BY id`, { id: sweepId });
    // 2 scenarios × 2 agent counts × 6 model specs.
    expect(stored).toHaveLength(24);
    expect(stored.every((r) => r.status === 'solved')).toBe(true);
    // w = 1 leaves no trace in the params; every other spec carries 1.5.
    expect(stored.filter((r) => r.w === null).map((r) => r.model)).toEqual(['classic', 'classic', 'classic', 'classic']);
    expect(stored.filter((r) => r.w !== null).every((r) => Number(r.w) === W)).toBe(true);
    for (const r of stored) {
      const w = r.w === null ? 1 : Number(r.w);
      expect(r.lower_bound).toBeGreaterThan(0);
      expect(r.soc).toBeGreaterThanOrEqual(r.lower_bound);
      expect(r.soc).toBeLessThanOrEqual(w * r.lower_bound + 1e-9);
      expect(r.gap).toBeCloseTo((r.soc - r.lower_bound) / r.lower_bound, 12);
      if (w === 1) expect(r.gap).toBe(0);
    }
    // The sweep page's rows carry w and the gap too.
    const rows = ((await (await s.client.request(`/api/sweeps/${sweepId}/results`)).json()) as { items: SweepResultRow[] }).items;
    expect(rows).toHaveLength(24);
    expect(rows.filter((r) => r.suboptimality === 1)).toHaveLength(4);
    expect(rows.filter((r) => r.suboptimality === W)).toHaveLength(20);
    expect(rows.every((r) => r.gap !== null && r.lowerBound !== null && r.soc !== null && r.soc <= r.suboptimality * r.lowerBound + 1e-9)).toBe(true);
    const { progress } = (await (await s.client.request(`/api/sweeps/${sweepId}`)).json()) as { progress: SweepProgress };
    expect(progress.perModel.map((m) => m.label)).toEqual([
      'classic', 'classic w=1.5', 'uniform-duration w=1.5', 'orientation-split w=1.5', 'weighted-split w=1.5', 'k-robust k=1 w=1.5',
    ]);
  });

  it('shows the classic results at w = 1 and w = 1.5 as separate variants, proven optimal or bounded', async () => {
    const cols = 'scenario,agents,model,variant,socSteps,lowerBoundSteps,gap,optimality,suboptimality';
    const res = await s.client.request(`/api/leaderboards/rows?cols=${cols}&model.in=classic&sort=agents,variant,scenario&start=0&end=100`);
    expect(res.status).toBe(200);
    const page = (await res.json()) as LeaderboardPage;
    expect(page.rows).toHaveLength(8);
    const exact = page.rows.filter((r) => r.cells['variant'] === '');
    const bounded = page.rows.filter((r) => r.cells['variant'] === 'w=1.5');
    expect([exact.length, bounded.length]).toEqual([4, 4]);
    for (const r of exact) {
      expect(r.cells['suboptimality']).toBe(1);
      expect(r.cells['optimality']).toBe('proven optimal');
      expect(r.cells['socSteps']).toBe(r.cells['lowerBoundSteps']);
    }
    for (const r of bounded) {
      expect(r.cells['suboptimality']).toBe(W);
      const soc = r.cells['socSteps'] as number;
      const lb = r.cells['lowerBoundSteps'] as number;
      expect(soc).toBeLessThanOrEqual(W * lb);
      // Bounded search that reaches its lower bound has proved optimality; otherwise the value is the best known within w.
      expect(r.cells['optimality']).toBe(soc === lb ? 'proven optimal' : 'bounded (w = 1.5)');
      // Never pooled with the exact row of the same instance: that one is never worse.
      const twin = exact.find((e) => e.scenarioId === r.scenarioId && e.agents === r.agents);
      expect(twin).toBeDefined();
      expect(twin?.cells['socSteps'] as number).toBeLessThanOrEqual(soc);
    }
    // Filters read the stored value: every bounded-or-proven classic row at w = 1.5 is found by w.
    const byW = (await (await s.client.request(`/api/leaderboards/rows?cols=${cols}&suboptimality.gt=1&start=0&end=100`)).json()) as LeaderboardPage;
    expect(byW.rows).toHaveLength(20);
    expect(byW.rows.every((r) => String(r.cells['variant']).endsWith('w=1.5'))).toBe(true);
  });

  it('gives the per-model summary one line per w, with the proven optima counted', async () => {
    const summary = (await (await s.client.request('/api/leaderboards/summary')).json()) as LeaderboardSummary;
    const classic = summary.models.filter((m) => m.model === 'classic');
    expect(classic.map((m) => [m.variant, m.suboptimality, m.solved])).toEqual([['', 1, 4], ['w=1.5', W, 4]]);
    expect(classic[0].provenOptimal).toBe(4);
    expect(classic[1].provenOptimal).toBeLessThanOrEqual(4);
    const k = summary.models.find((m) => m.model === 'k-robust');
    expect([k?.variant, k?.suboptimality]).toEqual(['k=1 w=1.5', W]);
  });

  it('labels a bounded entry above its lower bound "bounded (w = 1.5)" and filters it by its stored value', async () => {
    // A stored result as a bounded search may return it: one step above its proven lower bound, on an agent count the sweep did not run.
    await s.sql(`INSERT INTO results (instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, soc, makespan,
        turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
        solver_version, solver_commit, node_version, cpu_model, thread_count)
      SELECT instance_set_id, map_id, scenario_id, 5, model, params, param_hash, seed, status, lower_bound + 1, makespan,
        turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
        solver_version, solver_commit, node_version, cpu_model, thread_count
      FROM results WHERE sweep_id = :id AND model = 'classic' AND params->'model' ? 'suboptimality' ORDER BY id LIMIT 1`, { id: sweepId });
    const cols = 'agents,model,variant,socSteps,lowerBoundSteps,gap,optimality';
    const page = (await (await s.client.request(`/api/leaderboards/rows?cols=${cols}&optimality.in=bounded&agents.eq=5&start=0&end=100`)).json()) as LeaderboardPage;
    expect(page.rows).toHaveLength(1);
    const [row] = page.rows;
    expect([row.agents, row.cells['variant'], row.cells['optimality']]).toEqual([5, 'w=1.5', 'bounded (w = 1.5)']);
    expect(row.cells['gap']).toBeCloseTo(((row.cells['socSteps'] as number) - (row.cells['lowerBoundSteps'] as number)) / (row.cells['lowerBoundSteps'] as number), 12);
    const summary = (await (await s.client.request('/api/leaderboards/summary')).json()) as LeaderboardSummary;
    const line = summary.models.find((m) => m.model === 'classic' && m.variant === 'w=1.5');
    expect(line && line.solved - line.provenOptimal).toBeGreaterThanOrEqual(1);
  });

  it('refuses w below 1 in preview and launch with a 400 naming the field, and stores nothing', async () => {
    const before = await s.sql<{ n: string }>('SELECT count(*) AS n FROM sweeps');
    const def = baseDefinition(setId, { name: 'too low', models: [{ model: 'weighted-split', suboptimality: 0.9 }] });
    for (const path of ['/api/sweeps/preview', '/api/sweeps']) {
      const res = await s.client.request(path, { method: 'POST', body: JSON.stringify(def) });
      expect(res.status).toBe(400);
      const body = (await res.json()) as { error: { code: string; message: string; details: { path: (string | number)[]; message: string }[] } };
      expect(body.error.code).toBe('VALIDATION_FAILED');
      expect(body.error.details).toContainEqual(expect.objectContaining({ path: ['models', 0, 'suboptimality'], message: 'suboptimality (w) must be at least 1 (1 = optimal)' }));
    }
    expect(await s.sql<{ n: string }>('SELECT count(*) AS n FROM sweeps')).toEqual(before);
  });
});
