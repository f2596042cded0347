/**
 * The robot profile of a plan submission: the profiles offered for an instance (those its stored
 * results use, most used first, then the starter profile), and the plan scored under the profile
 * the request names. The tiny map (leaderboard-support.ts) is 5 × 4 with a wall at (1, 1).
 */
import { STARTER_PROFILE } from '@shared/executions-constants';
import { profileLabel } from '@shared/leaderboards';
import type { SubmissionProfilesResponse, SubmissionView } from '@shared/submissions';
import { parameterHash } from '../../api/src/sweeps/parameter-hash';
import { insertResults, json, PROFILES, startBoardWorld, type BoardWorld, type SeedResult } from './leaderboard-support';

const solver = { name: 'Hand-made planner', version: '3.0' };
/** Agent 0 (0,0)→(2,0) east along row 0, agent 1 (2,2)→(0,2) west along row 2: SOC 4, makespan 2 (hand-worked). */
const TWO_AGENT_PLAN = '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n';

describe('the robot profile of a plan submission', () => {
  let world: BoardWorld;
  let scenarioA: number;
  let scenarioB: number;

  const result = (scenarioId: number, agents: number, profile: number, seed: number): SeedResult => ({
    scenarioId, agents, model: 'classic', profile, status: 'solved', soc: 4, tiMakespanMs: 2000, lowerBound: 4, runtimeMs: 5, seed,
  });
  const profiles = async (query: string, client = world.other) => client.request(`/api/submissions/profiles?${query}`);
  const profilesOf = async (scenarioId: number, agents: number) =>
    (await (await profiles(`scenarioId=${scenarioId}&agents=${agents}`)).json()) as SubmissionProfilesResponse;

  beforeAll(async () => {
    world = await startBoardWorld();
    [scenarioA, scenarioB] = world.scenarios;
    // Scenario a with 2 agents: the second profile twice, the first (equal to the starter profile) once.
    // Scenario a with 3 agents: the second profile only.
    await insertResults(world.lib, [result(scenarioA, 2, 1, 1), result(scenarioA, 2, 1, 2), result(scenarioA, 2, 0, 3), result(scenarioA, 3, 1, 1)]);
  }, 60_000);
  afterAll(() => world?.lib.close());

  it('offers the starter profile alone for an instance without results', async () => {
    const body = await profilesOf(scenarioB, 2);
    expect(body.items).toEqual([{ profile: STARTER_PROFILE, label: profileLabel(STARTER_PROFILE), results: 0 }]);
  });

  it('offers the profiles of the instance\'s results, most used first, without a second starter entry', async () => {
    // PROFILES[0] has the starter profile's figures, so it is not offered twice.
    expect(parameterHash(PROFILES[0])).toBe(parameterHash(STARTER_PROFILE));
    const body = await profilesOf(scenarioA, 2);
    expect(body.items.map((i) => [i.profile, i.results])).toEqual([[PROFILES[1], 2], [PROFILES[0], 1]]);
    expect(body.items[0].label).toBe(profileLabel(PROFILES[1]));
  });

  it('adds the starter profile after the instance\'s own when none of them is it', async () => {
    const body = await profilesOf(scenarioA, 3);
    expect(body.items.map((i) => [i.profile, i.results])).toEqual([[PROFILES[1], 1], [STARTER_PROFILE, 0]]);
  });

  it('answers 404 for a private scenario, 401 for visitors and 400 naming a bad query field', async () => {
    const priv = `scenarioId=${world.scenarios[2]}&agents=1`;
    expect((await profiles(priv)).status).toBe(404);
    expect((await profiles(priv, world.visitor)).status).toBe(401);
    expect((await profiles(priv, world.owner)).status).toBe(200);
    const bad = await profiles(`scenarioId=${scenarioA}&agents=0`);
    expect(bad.status).toBe(400);
    const body = (await bad.json()) as { error: { code: string; details: { path: string[] }[] } };
    expect(body.error.code).toBe('VALIDATION_FAILED');
    expect(body.error.details.map((d) => d.path)).toEqual([['agents']]);
  });

  it('scores a text plan under the profile the request names and shows it', async () => {
    const res = await world.other.request('/api/submissions', json('POST', {
      format: 'text', text: TWO_AGENT_PLAN, model: 'classic', instance: { scenarioId: scenarioA, agents: 2 }, solver, robotProfile: PROFILES[1],
    }));
    expect(res.status).toBe(201);
    const view = (await res.json()) as SubmissionView;
    expect(view.robotProfile).toEqual(PROFILES[1]);
    expect(view.profileLabel).toBe(profileLabel(PROFILES[1]));
    // PROFILES[1] drives a cell in 800 ms; free start heading, no turns: 2 forwards = 1600 ms per robot.
    expect([view.turnInclusiveSocMs, view.turnInclusiveMakespanMs]).toEqual([3200, 1600]);
    const [row] = await world.lib.sql<{ robot_profile_hash: string }>('SELECT robot_profile_hash FROM results WHERE id = :id', { id: view.resultId });
    expect(row.robot_profile_hash).toBe(parameterHash(PROFILES[1]));
    // The submitted plan now counts among the instance's results under that profile.
    expect((await profilesOf(scenarioA, 2)).items.map((i) => i.results)).toEqual([3, 1]);
  });

  it('uses the request\'s profile for a JSON document that names none, and refuses a document naming another', async () => {
    const doc = { format: 'quarterturn-plan', version: 1, model: 'classic', instance: { scenarioId: scenarioB, agents: 2 }, solver,
      paths: [[[0, 0], [1, 0], [2, 0]], [[2, 2], [1, 2], [0, 2]]] };
    const ok = await world.other.request('/api/submissions', json('POST', { format: 'json', text: JSON.stringify(doc), robotProfile: PROFILES[1] }));
    expect(ok.status).toBe(201);
    expect(((await ok.json()) as SubmissionView).turnInclusiveMakespanMs).toBe(1600);

    const before = await world.lib.sql<{ n: number }>('SELECT count(*)::int AS n FROM results');
    const clash = await world.other.request('/api/submissions', json('POST', {
      format: 'json', fileName: 'mine.json', text: JSON.stringify({ ...doc, robotProfile: PROFILES[0] }), robotProfile: PROFILES[1],
    }));
    expect(clash.status).toBe(400);
    const body = (await clash.json()) as { error: { code: string; details: { file: string; field: string }[] } };
    expect(body.error.code).toBe('VALIDATION_FAILED');
    expect(body.error.details[0]).toMatchObject({ file: 'mine.json', field: 'robotProfile' });
    expect(await world.lib.sql('SELECT count(*)::int AS n FROM results')).toEqual(before);
  });

  it('lists accepted submissions with their profile', async () => {
    const list = (await (await world.other.request('/api/submissions')).json()) as { items: SubmissionView[] };
    expect(list.items).toHaveLength(2);
    expect(list.items.map((i) => i.profileLabel)).toEqual([profileLabel(PROFILES[1]), profileLabel(PROFILES[1])]);
  });
});
