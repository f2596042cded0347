/**
 * Plan submissions end to end over HTTP: valid plans in both formats enter the board marked
 * `submitted` with execution metrics; invalid ones answer the first violation and store nothing.
 * The tiny map (leaderboard-support.ts) is 5 × 4 with a wall at (1, 1); agents (0,0)→(2,0),
 * (2,2)→(0,2), (4,3)→(4,0). Expected figures are worked by hand below.
 */
import type { LeaderboardPage } from '@shared/leaderboards';
import type { SubmissionListResponse, SubmissionView } from '@shared/submissions';
import { json, startBoardWorld, type BoardWorld } from './leaderboard-support';

const solver = { name: 'Hand-made planner', version: '2.1' };

describe('plan submissions', () => {
  let world: BoardWorld;
  let scenario: number;
  const stored = async () => (await world.lib.sql<{ s: number; r: number; e: number }>(
    'SELECT (SELECT count(*) FROM submissions)::int AS s, (SELECT count(*) FROM results)::int AS r, (SELECT count(*) FROM executions)::int AS e',
  ))[0];

  beforeAll(async () => {
    world = await startBoardWorld();
    scenario = world.scenarios[0];
  }, 60_000);
  afterAll(() => world?.lib.close());

  const submit = (body: unknown, client = world.other) => client.request('/api/submissions', json('POST', body));

  it('accepts a valid classic plan in the text format and puts it on the board as submitted', async () => {
    // Hand-worked: agent 0 goes east twice (cost 2); agent 1 goes west twice along row 2 (cost 2). SOC 4, makespan 2.
    const text = '# two agents\n(0,0) (1,0) (2,0)\n2,2 1,2 0,2\n';
    const res = await submit({ format: 'text', text, model: 'classic', instance: { scenarioId: scenario, agents: 2 }, solver });
    expect(res.status).toBe(201);
    const view = (await res.json()) as SubmissionView;
    expect([view.soc, view.makespan]).toEqual([4, 2]);
    // Starter profile (forward 1000 ms, quarter turn 600 ms), free start heading: each robot starts facing its move, 2 forwards = 2000 ms.
    expect([view.turnInclusiveSocMs, view.turnInclusiveMakespanMs]).toEqual([4000, 2000]);
    expect(view.executions.map((e) => e.policy).sort()).toEqual(['dependency-gated', 'lockstep', 'open-loop']);

    const page = (await (await world.visitor.request('/api/leaderboards/rows?cols=model,source,solver,socSteps,lowerBoundSteps,runtimeMs,successOpenLoop&source.in=submitted')).json()) as LeaderboardPage;
    expect(page.rows).toHaveLength(1);
    expect(page.rows[0].cells).toMatchObject({ model: 'classic', source: 'submitted', solver: 'Hand-made planner 2.1', socSteps: 4, lowerBoundSteps: null, runtimeMs: null });
    expect(typeof page.rows[0].cells['successOpenLoop']).toBe('number');
    // Two robots on rows 0 and 2 never come near each other: the zero-noise open-loop replay is collision-free.
    expect(page.rows[0].isExecutableAtNominal).toBe(true);
    const stored = await world.lib.sql('SELECT executable_at_nominal, nominal_collisions FROM results WHERE submission_id IS NOT NULL');
    expect(stored).toEqual([{ executable_at_nominal: true, nominal_collisions: 0 }]);
  });

  it('accepts a k-robust plan as a JSON document and keeps k apart as its variant', async () => {
    // The two agents use rows 0 and 2 only, so no cell is ever shared and the plan is k-robust for any k. SOC 4.
    const doc = { format: 'quarterturn-plan', version: 1, model: 'k-robust', k: 2, instance: { scenarioId: scenario, agents: 2 }, solver,
      paths: [[[0, 0], [1, 0], [2, 0]], [[2, 2], [1, 2], [0, 2]]] };
    const res = await submit({ format: 'json', fileName: 'robust.json', text: JSON.stringify(doc, null, 2) });
    expect(res.status).toBe(201);
    const rows = await world.lib.sql<{ variant: string; source: string }>("SELECT variant, source FROM leaderboard_entries WHERE model = 'k-robust'");
    expect(rows).toEqual([{ variant: 'k=2', source: 'submitted' }]);
  });

  it('rejects a plan with a vertex conflict, answers the first violation and stores nothing', async () => {
    const before = await stored();
    // Agent 0 (0,0)→(2,0) and agent 2 (4,3)→(4,0) are fine; agent 1 goes up into (2,0) and arrives at t = 2, the very step agent 0 arrives there.
    const text = '(0,0) (1,0) (2,0)\n(2,2) (2,1) (2,0) (1,0) (0,0) (0,1) (0,2)\n(4,3) (4,2) (4,1) (4,0)\n';
    const res = await submit({ format: 'text', text, model: 'classic', instance: { scenarioId: scenario, agents: 3 }, solver });
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { code: string; details: { violation: { agents: number[]; time: number; cell: number[]; kind: string } } } };
    expect(body.error.code).toBe('PLAN_REJECTED');
    expect(body.error.details.violation).toMatchObject({ kind: 'vertex', agents: [0, 1], time: 2, cell: [2, 0] });
    expect(await stored()).toEqual(before);
  });

  it('reports an off-grid cell as written in the file', async () => {
    const text = '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2) (-1,2) (0,2)\n';
    const res = await submit({ format: 'text', text, model: 'classic', instance: { scenarioId: scenario, agents: 2 }, solver });
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { details: { violation: { kind: string; agents: number[]; time: number; cell: number[] } } } };
    expect(body.error.details.violation).toMatchObject({ kind: 'off-grid', agents: [1], time: 3, cell: [-1, 2] });
  });

  it('names line, column and field of a text format mistake', async () => {
    const res = await submit({ format: 'text', fileName: 'mine.txt', text: '(0,0) (1,0)\n(2,2) (1;2)\n', model: 'classic', instance: { scenarioId: scenario, agents: 2 }, solver });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { message: string; details: { file: string; line: number; column: number; field: string }[] } };
    expect(body.error.details[0]).toMatchObject({ file: 'mine.txt', line: 2, column: 7, field: 'agent 1, cell 1' });
    expect(body.error.message).toContain('mine.txt, line 2, column 7');
  });

  it('places a JSON syntax error at its line and column', async () => {
    const res = await submit({ format: 'json', fileName: 'bad.json', text: '{\n  "format": "quarterturn-plan",\n  "version": 1,,\n}' });
    expect(res.status).toBe(400);
    const body = (await res.json()) as { error: { details: { line: number; column: number }[] } };
    // Line 3 is `  "version": 1,,`: the second comma, at column 16, is the first character JSON cannot take.
    expect(body.error.details[0]).toMatchObject({ line: 3, column: 16 });
  });

  it('refuses a lower bound in a plan document', async () => {
    const doc = { format: 'quarterturn-plan', version: 1, model: 'classic', instance: { scenarioId: scenario, agents: 1 }, solver, lowerBound: 1, paths: [[[0, 0], [1, 0], [2, 0]]] };
    const res = await submit({ format: 'json', text: JSON.stringify(doc) });
    expect(res.status).toBe(400);
    expect(JSON.stringify(await res.json())).toContain('lowerBound');
  });

  it('hides private scenarios from other researchers and refuses visitors', async () => {
    const text = '(0,0) (1,0) (2,0)\n';
    const priv = { format: 'text', text, model: 'classic', instance: { scenarioId: world.scenarios[2], agents: 1 }, solver };
    expect((await submit(priv)).status).toBe(404);
    expect((await submit(priv, world.visitor)).status).toBe(401);
    expect((await submit(priv, world.owner)).status).toBe(201);
  });

  it('accepts an orientation-split plan of (x, y, heading) states and costs its quarter turns', async () => {
    // Hand-worked, both robots facing north at the start: robot 0 turns right to face east and drives
    // (0,0)→(2,0); robot 1 turns left to face west and drives (2,2)→(0,2). Three unit steps each: SOC 6,
    // makespan 3. Starter profile: 600 ms + 2 × 1000 ms = 2600 ms per robot, 2 quarter turns in all.
    const states = [
      [[0, 0, 'N'], [0, 0, 'E'], [1, 0, 'E'], [2, 0, 'E']],
      [[2, 2, 'N'], [2, 2, 'W'], [1, 2, 'W'], [0, 2, 'W']],
    ];
    const doc = { format: 'quarterturn-plan', version: 1, model: 'orientation-split', startHeading: 'N', instance: { scenarioId: scenario, agents: 2 }, solver, states };
    const res = await submit({ format: 'json', text: JSON.stringify(doc) }, world.owner);
    expect(res.status).toBe(201);
    const view = (await res.json()) as SubmissionView;
    expect([view.soc, view.makespan, view.turnInclusiveSocMs, view.turnInclusiveMakespanMs]).toEqual([6, 3, 5200, 2600]);
    const [row] = await world.lib.sql<{ turns: number }>('SELECT turns FROM results WHERE id = :id', { id: view.resultId });
    expect(row.turns).toBe(2);
  });

  it('rejects an orientation-split plan that turns half round in one step', async () => {
    const before = await stored();
    const states = [[[0, 0, 'N'], [0, 0, 'S'], [0, 1, 'S']]];
    const doc = { format: 'quarterturn-plan', version: 1, model: 'orientation-split', startHeading: 'N', instance: { scenarioId: scenario, agents: 1 }, solver, states };
    const res = await submit({ format: 'json', text: JSON.stringify(doc) }, world.owner);
    expect(res.status).toBe(422);
    const body = (await res.json()) as { error: { details: { violation: { agents: number[]; time: number } } } };
    // The illegal step is the one that begins at time 0.
    expect(body.error.details.violation).toMatchObject({ agents: [0], time: 0 });
    expect(await stored()).toEqual(before);
  });

  it('lists the researcher\'s own accepted submissions', async () => {
    const list = (await (await world.other.request('/api/submissions')).json()) as SubmissionListResponse;
    expect(list.items.map((i) => i.model).sort()).toEqual(['classic', 'k-robust']);
    expect(list.items.every((i) => i.solver.name === solver.name)).toBe(true);
  });
});
