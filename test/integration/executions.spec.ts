/**
 * POST/GET /api/executions against a real PostgreSQL and the full app: solving and simulating a
 * stored scenario, plans sent in the body (a colliding one reports its collisions), policies and
 * noise changing the outcome, roles, visibility and every refusal naming its field.
 */
import PF from 'pathfinding';
import type { ExecutionView, InstanceExecutionInput } from '@shared/executions';
import { EXECUTION_LIMITS, SAFETY_NOTE } from '@shared/executions-constants';
import type { UploadResponse } from '@shared/instance-sets';
import type { SubmissionView } from '@shared/submissions';
import { DEMO_IDENTITIES } from '../../api/src/dev/fake-oauth/demo-identities';
import {
  createSet, json, setRole, signInAs, startLibraryServer, upload, visitorClient,
  type LibraryServer, type SignedInClient,
} from './instance-library-support';
import { RELAY_MAP, RELAY_MAP_NAME, RELAY_PROFILE, RELAY_SCENARIO, RELAY_SCENARIO_NAME, RELAY_TASKS } from './execution-fixtures';

const [researcherId, otherId] = DEMO_IDENTITIES;

describe('executions API', () => {
  let lib: LibraryServer;
  let url: string;
  let owner: SignedInClient;
  let mapId: number;
  let scenarioId: number;
  let padMapId: number;

  beforeAll(async () => {
    lib = await startLibraryServer();
    url = lib.server.url;
    owner = await signInAs(url, researcherId.login);
    const setId = await createSet(owner, 'relay yard');
    const res = await upload(url, owner, setId, [
      { name: RELAY_MAP_NAME, bytes: Buffer.from(RELAY_MAP) },
      { name: RELAY_SCENARIO_NAME, bytes: Buffer.from(RELAY_SCENARIO) },
      { name: 'open-pad.map', bytes: Buffer.from(['type octile', 'height 8', 'width 8', 'map', ...Array(8).fill('........'), ''].join('\n')) },
    ]);
    expect(res.status).toBe(201);
    const stored = res.body as UploadResponse;
    mapId = stored.maps.find((m) => m.name === RELAY_MAP_NAME)!.id;
    padMapId = stored.maps.find((m) => m.name === 'open-pad.map')!.id;
    scenarioId = stored.scenarios[0].id;
  }, 60_000);
  afterAll(async () => {
    await lib?.close();
  });

  const post = async (client: SignedInClient, body: unknown) => {
    const res = await client.request('/api/executions', json('POST', body));
    return { status: res.status, body: (await res.json()) as ExecutionView & { error?: { code: string; message: string } } };
  };
  const fromScenario = (over: Partial<InstanceExecutionInput> = {}): InstanceExecutionInput => ({
    instance: { scenarioId, agents: RELAY_TASKS.length },
    model: 'classic',
    profile: RELAY_PROFILE,
    policy: 'open-loop',
    runs: 20,
    seed: 7,
    ...over,
  });

  describe('solving a stored scenario', () => {
    let view: ExecutionView;

    beforeAll(async () => {
      const res = await post(owner, fromScenario());
      expect(res.status).toBe(201);
      view = res.body;
    });

    it('answers the instance, an optimal validated plan and its figures, with model and profile', () => {
      expect(view.source).toMatchObject({ mapId, scenarioId, mapName: RELAY_MAP_NAME, scenarioName: RELAY_SCENARIO_NAME });
      expect(view.instance.rows).toEqual(['............', '.@@@@@@@@@@.', '............']);
      expect(view.instance.agents.map((a) => [a.start, a.goal])).toEqual(RELAY_TASKS.map((t) => [t.start, t.goal]));
      expect(view.model).toBe('classic');
      expect(view.profile).toEqual(RELAY_PROFILE);
      expect(view.plan).toMatchObject({ origin: 'solved', timeline: 'steps' });
      expect(view.figures).toMatchObject({ unit: 'steps', isValid: true });
      // Outside check: the sum of single-robot shortest paths by the npm `pathfinding` library
      // (BreadthFirstFinder, shortest on 4-connected grids per its README). Following is allowed in
      // the classic model, so this lower bound is reached and is the optimal sum-of-costs.
      const matrix = RELAY_MAP.split('\n').slice(4, 7).map((r) => [...r].map((ch) => (ch === '.' ? 0 : 1)));
      const alone = RELAY_TASKS.map((t) => new PF.BreadthFirstFinder().findPath(t.start[0], t.start[1], t.goal[0], t.goal[1], new PF.Grid(12, 3, matrix)).length - 1);
      expect(view.figures.soc).toBe(alone.reduce((s: number, c: number) => s + c, 0));
      expect(view.figures.makespan).toBe(7);
      // Free start heading: every robot faces east, so no turns; 7 forwards of 1000 ms each.
      expect(view.figures.turnInclusiveMakespanMs).toBe(7000);
      expect(view.safetyNote).toBe(SAFETY_NOTE);
    });

    it('simulates the requested batch: nose-to-tail following is safe at nominal times', () => {
      expect(view.summary).toMatchObject({ policy: 'open-loop', runs: 20, seed: 7, successRate: 1, collisions: { total: 0 } });
      expect(view.summary.noise).toEqual({ jitterCv: 0, stallProbability: 0, stallMs: 0 });
      // Zero noise: every run alike, so the t interval of the mean has width 0; 20 runs are too few for a p95 interval (≥ 72).
      expect(view.summary.realisedMakespanMs).toEqual({ mean: 7000, p95: 7000, count: 20, meanCi95: [7000, 7000], p95Ci95: null });
      expect(view.summary.finishSpreadMs).toEqual({ mean: 0, p95: 0, count: 20, meanCi95: [0, 0], p95Ci95: null });
      expect(view.summary.perRun).toHaveLength(20);
    });

    it('stores it: GET answers the same execution to its owner', async () => {
      const res = await owner.request(`/api/executions/${view.id}`);
      expect(res.status).toBe(200);
      const got = (await res.json()) as ExecutionView;
      expect(got).toEqual(view);
      const [row] = await lib.sql<{ owner_id: number; policy: string }>(
        "SELECT owner_id, request->>'policy' AS policy FROM plan_executions WHERE id = :id", { id: view.id });
      expect(row.policy).toBe('open-loop');
    });

    it('hides it from another researcher (404) but shows it to a maintainer', async () => {
      const other = await signInAs(url, otherId.login);
      expect((await other.request(`/api/executions/${view.id}`)).status).toBe(404);
      await setRole(lib, otherId.login, 'maintainer');
      expect((await other.request(`/api/executions/${view.id}`)).status).toBe(200);
      await setRole(lib, otherId.login, 'researcher');
    });
  });

  describe('policies and noise', () => {
    const noisy = { jitterCv: 0.3 };

    it('with timing jitter, open-loop followers catch up and collide', async () => {
      const { status, body } = await post(owner, fromScenario({ noise: noisy }));
      expect(status).toBe(201);
      expect(body.summary.collisions.total).toBeGreaterThan(0);
      expect(body.summary.successRate).toBeLessThan(1);
      expect(body.summary.firstCollision).not.toBeNull();
    });

    it('dependency-gated execution of the same plan and noise has no collision, at the price of waiting', async () => {
      const { status, body } = await post(owner, fromScenario({ noise: noisy, policy: 'dependency-gated' }));
      expect(status).toBe(201);
      expect(body.summary.collisions.total).toBe(0);
      expect(body.summary.successRate).toBe(1);
      expect(body.summary.waitingMs.mean).toBeGreaterThan(0);
      // Each follower enters a cell only once its leader has left it completely, so the queue stretches.
      expect(body.summary.realisedMakespanMs.mean).toBeGreaterThan(7000);
    });

    it('a fixed start heading adds the quarter turns to the turn-inclusive and realised makespan', async () => {
      // Facing north, each robot turns right once (500 ms) before its 7 forwards: 7500 ms.
      const { body } = await post(owner, fromScenario({ modelOptions: { startHeading: 'N' }, runs: 1 }));
      expect(body.figures.turnInclusiveMakespanMs).toBe(7500);
      expect(body.summary.realisedMakespanMs.mean).toBe(7500);
      expect(body.plan.schedule[0].slice(0, 2).map((a) => a.action)).toEqual(['turn-right', 'forward']);
    });
  });

  describe('plans sent in the body', () => {
    it('a head-on plan fails the classic validator and its execution reports the collision', async () => {
      // Robots 0 and 1 swap ends of the top lane through the same cell at t = 1.
      const { status, body } = await post(owner, {
        instance: { mapId, agents: [{ start: [0, 0], goal: [2, 0] }, { start: [2, 0], goal: [0, 0] }] },
        model: 'classic',
        profile: RELAY_PROFILE,
        plan: { kind: 'paths', paths: [[[0, 0], [1, 0], [2, 0]], [[2, 0], [1, 0], [0, 0]]] },
        policy: 'open-loop',
        runs: 1,
      });
      expect(status).toBe(201);
      expect(body.plan.origin).toBe('given');
      expect(body.figures.isValid).toBe(false);
      expect(body.figures.validation).toMatch(/\(1, 0\)|\[1, 0\]/);
      expect(body.summary.successRate).toBe(0);
      expect(body.summary.collisions.total).toBe(1);
      // Disks of 700 mm approaching head-on at 1 m/s each from 2 m apart first touch when 0.7 m
      // apart: after (2000 − 700) / 2 mm = 650 mm each, i.e. 650 ms (worked by hand).
      expect(body.summary.firstCollision).toMatchObject({ robots: [0, 1], run: 0 });
      expect(body.summary.firstCollision!.timeMs).toBeCloseTo(650, 6);
    });

    it('a hand-worked single robot: one quarter turn then two forwards', async () => {
      const { status, body } = await post(owner, {
        instance: { mapId, agents: [{ start: [0, 0], goal: [0, 2], startHeading: 'E' }] },
        model: 'classic',
        profile: RELAY_PROFILE,
        plan: { kind: 'paths', paths: [[[0, 0], [0, 1], [0, 2]]] },
        policy: 'open-loop',
        runs: 1,
      });
      expect(status).toBe(201);
      expect(body.plan.schedule[0].map((a) => [a.action, a.start, a.end])).toEqual([['turn-right', 0, 500], ['forward', 500, 1500], ['forward', 1500, 2500]]);
      expect(body.figures).toMatchObject({ isValid: true, soc: 2, makespan: 2, turnInclusiveMakespanMs: 2500 });
      expect(body.summary.realisedMakespanMs.mean).toBe(2500);
    });

    it('refuses a schedule that does not start where the robot stands, naming agent, action and field', async () => {
      const { status, body } = await post(owner, {
        instance: { mapId, agents: [{ start: [0, 0], goal: [1, 0] }] },
        model: 'weighted-split',
        profile: RELAY_PROFILE,
        plan: { kind: 'schedule', schedule: [[{ action: 'forward', from: [5, 0], to: [1, 0], heading: 'E', start: 0, end: 1000, step: 0 }]] },
        policy: 'open-loop',
      });
      expect(status).toBe(400);
      expect(body.error?.code).toBe('PLAN_REJECTED');
      expect(body.error?.message).toContain('agent 0, action 0, field "from"');
    });
  });

  describe('refusals', () => {
    it('refuses visitors with 401 on POST and GET', async () => {
      const visitor = await visitorClient(url);
      expect((await visitor.request('/api/executions', json('POST', fromScenario()))).status).toBe(401);
      expect((await visitor.request('/api/executions/1')).status).toBe(401);
    });

    it.each([
      ['policy', { policy: 'sideways' }],
      ['profile.forwardMs', { profile: { ...RELAY_PROFILE, forwardMs: -5 } }],
      ['noise.jitterCv', { noise: { jitterCv: 7 } }],
      ['runs', { runs: 0 }],
      ['instance.agents.0.start', { instance: { mapId: 0, agents: [] } }],
    ])('answers 400 naming the field %s', async (field, over) => {
      const body = { ...fromScenario(), ...over } as Record<string, unknown>;
      if (field === 'instance.agents.0.start') body.instance = { mapId, agents: [{ start: [1, 1], goal: [0, 0] }] };
      const res = await post(owner, body);
      expect(res.status).toBe(400);
      expect(res.body.error?.code).toBe('VALIDATION_FAILED');
      expect(res.body.error?.message).toContain(`${field}:`);
    });

    it('answers 404 for a scenario that does not exist and for an unknown execution', async () => {
      expect((await post(owner, fromScenario({ instance: { scenarioId: 999_999, agents: 1 } }))).body.error?.code).toBe('SCENARIO_NOT_FOUND');
      const res = await owner.request('/api/executions/999999');
      expect(res.status).toBe(404);
      expect(((await res.json()) as { error: { code: string } }).error.code).toBe('EXECUTION_NOT_FOUND');
    });

    it('refuses to solve more agents than the inline limit, and says to send a plan', async () => {
      const cell = (i: number): [number, number] => [i % 8, Math.floor(i / 8)];
      const agents = Array.from({ length: EXECUTION_LIMITS.maxSolveAgents + 1 }, (_, i) => ({ start: cell(i), goal: cell(63 - i) }));
      const { status, body } = await post(owner, { ...fromScenario(), instance: { mapId: padMapId, agents } });
      expect(status).toBe(422);
      expect(body.error?.code).toBe('SOLVE_TOO_LARGE');
      expect(body.error?.message).toContain('send a plan');
    });

    it('names the robot whose start repeats another one', async () => {
      const { status, body } = await post(owner, { ...fromScenario(), instance: { mapId, agents: [{ start: [0, 0], goal: [1, 0] }, { start: [0, 0], goal: [2, 0] }] } });
      expect(status).toBe(400);
      expect(body.error?.message).toContain('instance.agents.1.start: agent 1 has the same start as agent 0');
    });

  });

  describe('a stored result', () => {
    let resultId: number;

    beforeAll(async () => {
      // A result stored the way plans reach the board: a submission, which the classic validator accepted.
      const text = '(3,0) (4,0) (5,0) (6,0) (7,0) (8,0) (9,0) (10,0)\n(2,0) (3,0) (4,0) (5,0) (6,0) (7,0) (8,0) (9,0)\n';
      const res = await owner.request('/api/submissions', json('POST', {
        format: 'text', text, model: 'classic', instance: { scenarioId, agents: 2 }, robotProfile: RELAY_PROFILE,
        solver: { name: 'Hand-made planner', version: '1.0' },
      }));
      expect(res.status).toBe(201);
      resultId = ((await res.json()) as SubmissionView).resultId;
    });

    it('replays the stored plan with its model and robot profile under the policy asked for', async () => {
      const { status, body } = await post(owner, { resultId, policy: 'lockstep', runs: 3, seed: 4 });
      expect(status).toBe(201);
      expect(body.source).toMatchObject({ resultId, scenarioId, mapId, scenarioName: RELAY_SCENARIO_NAME });
      expect(body.model).toBe('classic');
      expect(body.profile).toEqual(RELAY_PROFILE);
      expect(body.plan.origin).toBe('result');
      // Reproducibility: the build that computed it (package.json version, Node of this process).
      expect(body.computedBy).toMatchObject({ version: expect.stringMatching(/^\d+\.\d+\.\d+/), node: process.version });
      expect(body.computedBy?.cpuModel).toBeTruthy();
      expect(body.plan.schedule.map((list) => list.filter((a) => a.action === 'forward').length)).toEqual([7, 7]);
      // Hand-worked: both robots drive 7 forwards of 1000 ms nose to tail, facing east from the start (free heading).
      expect(body.figures).toMatchObject({ isValid: true, soc: 14, makespan: 7, turnInclusiveMakespanMs: 7000, lowerBound: null });
      expect(body.summary).toMatchObject({ runs: 3, successRate: 1 });
      expect(body.summary.realisedMakespanMs.mean).toBe(7000);
      expect(body.summary.finishSpreadMs.mean).toBe(0);
    });

    it('with jitter, open-loop followers on the stored plan collide and dependency-gated ones do not', async () => {
      const noise = { jitterCv: 0.3 };
      const open = await post(owner, { resultId, policy: 'open-loop', noise, runs: 40, seed: 11 });
      const gated = await post(owner, { resultId, policy: 'dependency-gated', noise, runs: 40, seed: 11 });
      expect([open.status, gated.status]).toEqual([201, 201]);
      expect(open.body.summary.collisions.total).toBeGreaterThan(0);
      expect(gated.body.summary.collisions.total).toBe(0);
      expect(gated.body.summary.successRate).toBe(1);
    });

    it('answers 404 for an unknown result and for one of a set the caller may not see', async () => {
      const missing = await post(owner, { resultId: 987_654, policy: 'open-loop' });
      expect(missing.status).toBe(404);
      expect(missing.body.error?.code).toBe('RESULT_NOT_FOUND');
      const other = await signInAs(url, otherId.login);
      const hidden = await post(other, { resultId, policy: 'open-loop' });
      expect(hidden.status).toBe(404);
      expect(hidden.body.error?.code).toBe('RESULT_NOT_FOUND');
    });

    it('answers 409 for a result that has no plan, saying how it ended', async () => {
      const [row] = await lib.sql<{ id: number }>(
        `INSERT INTO results (instance_set_id, map_id, scenario_id, agents, model, params, param_hash, seed, status, reason, runtime_ms, nodes,
           robot_profile, robot_profile_hash, solver_version, solver_commit, node_version, cpu_model, thread_count)
         SELECT instance_set_id, map_id, scenario_id, agents, model, params, 'timeout-test', seed, 'timeout', 'time limit of 1000 ms', 1000, 5,
           robot_profile, robot_profile_hash, solver_version, solver_commit, node_version, cpu_model, thread_count FROM results WHERE id = :id RETURNING id`,
        { id: resultId },
      );
      const { status, body } = await post(owner, { resultId: row.id, policy: 'open-loop' });
      expect(status).toBe(409);
      expect(body.error?.code).toBe('RESULT_NOT_SOLVED');
      expect(body.error?.message).toContain('timeout');
    });
  });
});
