/**
 * GET /api/executions/:id on an execution stored before issue 12 (no intervals, no metric counts,
 * no per-robot waiting in its summary, real PostgreSQL): the answer has every field
 * ExecutionSummaryView declares. The success-rate interval is Wilson from rate × runs; counts and
 * intervals of the metrics are computed from the stored per-run values, so they equal what the
 * simulator computes for the same runs today; per-robot waiting, never recorded per run, is null.
 * A sweep-stored replay that kept only its collisions mean answers the p95 and total as null (not stored).
 */
import { wilsonInterval } from '@shared/confidence-interval';
import type { ExecutionView } from '@shared/executions';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import { createSet, json, signInAs, startLibraryServer, upload, type LibraryServer, type SignedInClient } from './instance-library-support';
import { RELAY_MAP, RELAY_MAP_NAME, RELAY_PROFILE, RELAY_SCENARIO, RELAY_SCENARIO_NAME, RELAY_TASKS } from './execution-fixtures';

const METRICS = ['realisedMakespanMs', 'realisedSocMs', 'finishSpreadMs', 'waitingMs'] as const;

describe('an execution stored before issue 12, read back', () => {
  let lib: LibraryServer;
  let owner: SignedInClient;
  let current: ExecutionView;
  let old: ExecutionView;
  let scenarioId: number;

  beforeAll(async () => {
    lib = await startLibraryServer();
    owner = await signInAs(lib.server.url, DEMO_IDENTITIES[0].login);
    const setId = await createSet(owner, 'relay yard');
    const res = await upload(lib.server.url, owner, setId, [
      { name: RELAY_MAP_NAME, bytes: Buffer.from(RELAY_MAP) },
      { name: RELAY_SCENARIO_NAME, bytes: Buffer.from(RELAY_SCENARIO) },
    ]);
    expect(res.status).toBe(201);
    scenarioId = (res.body as { scenarios: { id: number }[] }).scenarios[0].id;
    // Jitter makes open-loop followers collide in some runs (success rate strictly between 0 and 1);
    // 80 runs are enough for the distribution-free p95 interval (≥ 72).
    const posted = await owner.request('/api/executions', json('POST', {
      instance: { scenarioId, agents: RELAY_TASKS.length }, model: 'classic', profile: RELAY_PROFILE,
      policy: 'open-loop', noise: { jitterCv: 0.3 }, runs: 80, seed: 11,
    }));
    expect(posted.status).toBe(201);
    current = (await posted.json()) as ExecutionView;

    // The same execution as a row written before issue 12: the summary without the fields added then.
    const [row] = await lib.sql<{ owner_id: number; request: unknown; plan: unknown; summary: Record<string, unknown> }>(
      'SELECT owner_id, request, plan, summary FROM plan_executions WHERE id = :id', { id: current.id });
    const summary = { ...row.summary };
    for (const k of ['successRateCi95', 'ci95', 'waitingPerRobotMs']) delete summary[k];
    for (const k of METRICS) summary[k] = { mean: (summary[k] as { mean: unknown }).mean, p95: (summary[k] as { p95: unknown }).p95 };
    summary['perRun'] = (summary['perRun'] as Record<string, unknown>[]).map(({ waitingMeanPerRobotMs: _mean, waitingMaxPerRobotMs: _max, ...rest }) => rest);
    const [inserted] = await lib.sql<{ id: number }>(
      `INSERT INTO plan_executions (owner_id, request, plan, summary) VALUES (:owner, CAST(:request AS jsonb), CAST(:plan AS jsonb), CAST(:summary AS jsonb)) RETURNING id`,
      { owner: row.owner_id, request: JSON.stringify(row.request), plan: JSON.stringify(row.plan), summary: JSON.stringify(summary) },
    );
    const [check] = await lib.sql<{ keys: string[] }>("SELECT array(SELECT jsonb_object_keys(summary->'realisedMakespanMs')) AS keys FROM plan_executions WHERE id = :id", { id: inserted.id });
    expect(check.keys.sort()).toEqual(['mean', 'p95']);
    const got = await owner.request(`/api/executions/${inserted.id}`);
    expect(got.status).toBe(200);
    old = (await got.json()) as ExecutionView;
  }, 90_000);
  afterAll(async () => {
    await lib?.close();
  });

  it('gets the Wilson interval of its success rate from rate × runs', () => {
    const s = old.summary;
    const successes = s.perRun.filter((r) => r.isSuccess).length;
    expect(successes).toBeGreaterThan(0);
    expect(successes).toBeLessThan(s.runs);
    expect(s.successRateCi95).toEqual(wilsonInterval(successes, 80));
    expect(s.successRateCi95).toEqual(current.summary.successRateCi95);
    expect(s.ci95.successRate).toEqual(s.successRateCi95);
  });

  it('gets counts and intervals of its metrics from its own per-run values, equal to the simulator\'s', () => {
    for (const k of METRICS) {
      expect(old.summary[k]).toEqual(current.summary[k]);
      expect(old.summary[k].count).toBe(old.summary.perRun.filter((r) => r[k] !== null).length);
    }
    expect(old.summary.realisedMakespanMs.meanCi95).not.toBeNull();
    expect(old.summary.realisedMakespanMs.p95Ci95).not.toBeNull();
    expect(old.summary.ci95).toEqual(current.summary.ci95);
  });

  it('says per-robot waiting was not recorded (null), per batch and per run', () => {
    expect(current.summary.waitingPerRobotMs).not.toBeNull();
    expect(old.summary.waitingPerRobotMs).toBeNull();
    expect(old.summary.perRun).toHaveLength(80);
    expect(old.summary.perRun.every((r) => r.waitingMeanPerRobotMs === null && r.waitingMaxPerRobotMs === null)).toBe(true);
  });

  it('GET /api/executions/stored/:id answers the collision p95 and total of a row that did not store them as null, not 0', async () => {
    const profile = JSON.stringify(RELAY_PROFILE);
    const [result] = await lib.sql<{ id: number }>(
      `INSERT INTO results (instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, soc, makespan,
         turn_inclusive_soc_ms, turn_inclusive_makespan_ms, lower_bound, runtime_ms, nodes, robot_profile, robot_profile_hash,
         solver_version, solver_commit, node_version, cpu_model, thread_count)
       SELECT s.instance_set_id, s.map_id, s.id, 4, 'classic', '{}', 'p', 3, 'solved', 28, 7, 28000, 7000, 28, 5, 1, CAST(:profile AS jsonb), 'h',
         '0.1.0', 'test', 'v20', 'test cpu', 1 FROM scenarios s WHERE s.id = :scenarioId RETURNING id`, { profile, scenarioId });
    // An early sweep row: the collisions mean in its column, nothing about collisions in metrics.
    await lib.sql(`INSERT INTO executions (result_id, policy, noise, runs, success_rate, collisions_mean, realised_makespan_mean_ms,
        realised_makespan_p95_ms, finish_spread_mean_ms, metrics)
      VALUES (:id, 'open-loop', '{"jitterCv":0.1}', 20, 0.85, 0.15, 7300, 7900, 400, CAST(:metrics AS jsonb))`,
    { id: result.id, metrics: JSON.stringify({ realisedMakespanMs: { mean: 7300, p95: 7900 } }) });
    const res = await owner.request(`/api/executions/stored/${result.id}`);
    expect(res.status).toBe(200);
    const body = (await res.json()) as StoredResultExecutionsView;
    expect(body.executions).toHaveLength(1);
    expect(body.executions[0].figures.collisions).toEqual({ mean: 0.15, p95: null, total: null });
  });
});
