/**
 * Changing an instance set after it was made: rename, description, visibility, source
 * (PATCH /api/instance-sets/:id, owner, maintainers and admins), the 409 of a name the owner
 * already uses, and what deleting one map or scenario takes with it (the deletion preview
 * counts exactly what the database cascade then removes).
 */
import type { DeletionPreview, InstanceSetDetail } from '@shared/instance-sets';
import { createSet } from './instance-library-support';
import { insertResults, json, startBoardWorld, type BoardWorld, type SeedResult } from './leaderboard-support';

type ErrorAnswer = { error: { code: string; message: string; details?: { path: string[]; message: string }[] } };

describe('editing an instance set', () => {
  let world: BoardWorld;
  const patch = (id: number, body: unknown, client = world.owner) => client.request(`/api/instance-sets/${id}`, json('PATCH', body));

  beforeAll(async () => {
    world = await startBoardWorld();
  }, 60_000);
  afterAll(() => world?.lib.close());

  it('lets the owner rename a set and change its description, source and visibility', async () => {
    const id = await createSet(world.owner, 'Drafts to rename', 'private');
    const res = await patch(id, { name: '  Harbour drafts  ', description: 'Two lines\nof notes', source: 'made by hand', visibility: 'public' });
    expect(res.status).toBe(200);
    const set = (await res.json()) as InstanceSetDetail;
    expect([set.name, set.description, set.source, set.visibility]).toEqual(['Harbour drafts', 'Two lines\nof notes', 'made by hand', 'public']);
    // Public now: another researcher sees it; private again: he does not.
    expect((await world.other.request(`/api/instance-sets/${id}`)).status).toBe(200);
    expect((await patch(id, { visibility: 'private' })).status).toBe(200);
    expect((await world.other.request(`/api/instance-sets/${id}`)).status).toBe(404);
  });

  it('answers 409 naming the field when the owner already has a set of that name', async () => {
    const id = await createSet(world.owner, 'Second harbour set', 'private');
    const res = await patch(id, { name: 'Board public' });
    expect(res.status).toBe(409);
    const body = (await res.json()) as ErrorAnswer;
    expect(body.error.code).toBe('CONFLICT');
    expect(body.error.details?.map((d) => d.path)).toEqual([['name']]);
    expect(body.error.message).toContain('"Board public"');
    // Keeping its own name is no conflict, and creating a second set of a taken name answers the same shape.
    expect((await patch(id, { name: 'Second harbour set', description: 'same name' })).status).toBe(200);
    const created = await world.owner.request('/api/instance-sets', json('POST', { name: 'Board public' }));
    expect(created.status).toBe(409);
    expect(((await created.json()) as ErrorAnswer).error.details?.map((d) => d.path)).toEqual([['name']]);
  });

  it('lets a maintainer change another person\'s set, which keeps its owner; refuses others', async () => {
    const id = await createSet(world.owner, 'Curated later', 'public');
    const res = await patch(id, { description: 'checked by a maintainer' }, world.curator);
    expect(res.status).toBe(200);
    const [row] = await world.lib.sql<{ owner_id: number; description: string }>('SELECT owner_id, description FROM instance_sets WHERE id = :id', { id });
    const [ownerRow] = await world.lib.sql<{ owner_id: number }>('SELECT owner_id FROM instance_sets WHERE id = :id', { id: world.publicSet });
    expect(row).toEqual({ owner_id: ownerRow.owner_id, description: 'checked by a maintainer' });
    expect((await patch(id, { name: 'Taken over' }, world.other)).status).toBe(403);
    expect((await patch(world.privateSet, { name: 'Taken over' }, world.other)).status).toBe(404);
    expect((await patch(id, { name: 'Taken over' }, world.visitor)).status).toBe(401);
  });

  it('refuses an empty change, a blank name and unknown fields with 400 naming the field', async () => {
    const empty = await patch(world.publicSet, {});
    expect(empty.status).toBe(400);
    const blank = await patch(world.publicSet, { name: '   ' });
    expect(blank.status).toBe(400);
    expect(((await blank.json()) as ErrorAnswer).error.details?.map((d) => d.path)).toEqual([['name']]);
    const unknown = await patch(world.publicSet, { owner: 5 });
    expect(unknown.status).toBe(400);
    const visibility = await patch(world.publicSet, { visibility: 'secret' });
    expect(((await visibility.json()) as ErrorAnswer).error.details?.map((d) => d.path)).toEqual([['visibility']]);
  });
});

describe('deleting one map or scenario', () => {
  let world: BoardWorld;
  let sweepId: number;
  const preview = async (kind: 'instance-sets' | 'maps' | 'scenarios', id: number, client = world.owner) => client.request(`/api/${kind}/${id}/deletion-preview`);
  /** What the database holds over the given scenarios. */
  const heldOver = async (ids: readonly number[]) => (await world.lib.sql<{ scenarios: number; runs: number; results: number; submissions: number; executions: number }>(
    `SELECT (SELECT count(*) FROM scenarios WHERE id IN (:ids))::int AS scenarios, (SELECT count(*) FROM runs WHERE scenario_id IN (:ids))::int AS runs,
       (SELECT count(*) FROM results WHERE scenario_id IN (:ids))::int AS results, (SELECT count(*) FROM submissions WHERE scenario_id IN (:ids))::int AS submissions,
       (SELECT count(*) FROM executions e JOIN results r ON r.id = e.result_id WHERE r.scenario_id IN (:ids))::int AS executions`, { ids }))[0];

  beforeAll(async () => {
    world = await startBoardWorld();
    const [a, b] = world.scenarios;
    const result = (scenarioId: number, seed: number): SeedResult => ({
      scenarioId, agents: 2, model: 'classic', profile: 0, status: 'solved', soc: 4, tiMakespanMs: 2000, lowerBound: 4, runtimeMs: 5, seed,
      openLoop: { success: 1, spread: 0, realised: 2000 },
    });
    // Scenario a: three results; scenario b: one result and one submitted plan.
    await insertResults(world.lib, [result(a, 1), result(a, 2), result(a, 3), result(b, 1)]);
    const [{ id: ownerId }] = await world.lib.sql<{ id: number }>("SELECT owner_id AS id FROM instance_sets WHERE id = :id", { id: world.publicSet });
    [{ id: sweepId }] = await world.lib.sql<{ id: number }>(
      "INSERT INTO sweeps (owner_id, name, definition, status) VALUES (:owner, 'Deletion check', '{}', 'finished') RETURNING id", { owner: ownerId });
    // Two runs over scenario a, one over b, in one sweep.
    for (const [scenario, seed] of [[a, 1], [a, 2], [b, 1]]) {
      await world.lib.sql(
        `INSERT INTO runs (sweep_id, instance_set_id, map_id, scenario_id, agents, model, model_index, params, param_hash, seed, status)
         SELECT :sweep, s.instance_set_id, s.map_id, s.id, 2, 'classic', 0, '{}', 'test', :seed, 'solved' FROM scenarios s WHERE s.id = :scenario`,
        { sweep: sweepId, scenario, seed },
      );
    }
    const submitted = await world.owner.request('/api/submissions', json('POST', {
      format: 'text', text: '(0,0) (1,0) (2,0)\n(2,2) (1,2) (0,2)\n', model: 'classic', instance: { scenarioId: b, agents: 2 },
      solver: { name: 'Hand-made planner', version: '1' },
    }));
    expect(submitted.status).toBe(201);
  }, 60_000);
  afterAll(() => world?.lib.close());

  it('shows the preview only to those who may delete', async () => {
    const maps = await world.lib.sql<{ id: number; instance_set_id: number }>('SELECT id, instance_set_id FROM maps');
    const privMap = maps.find((m) => m.instance_set_id === world.privateSet)!.id;
    const pubMap = maps.find((m) => m.instance_set_id === world.publicSet)!.id;
    expect((await preview('maps', pubMap, world.other)).status).toBe(403);
    expect((await preview('scenarios', world.scenarios[0], world.other)).status).toBe(403);
    expect((await preview('maps', privMap, world.other)).status).toBe(404);
    expect((await preview('maps', privMap, world.visitor)).status).toBe(401);
    expect((await preview('maps', privMap, world.curator)).status).toBe(200);
    expect((await preview('scenarios', world.scenarios[2], world.owner)).status).toBe(200);
  });

  it('previews a whole set\'s deletion: its maps, scenarios and everything over them', async () => {
    const res = await preview('instance-sets', world.publicSet);
    expect(res.status).toBe(200);
    // The public set: one map, scenarios a and b, 4 results + 1 submitted plan, 3 runs of one sweep (set up above).
    expect(await res.json()).toEqual({ kind: 'set', id: world.publicSet, name: 'Board public', maps: 1, scenarios: 2, runs: 3, results: 5, submissions: 1, sweeps: 1 });
    expect((await preview('instance-sets', world.publicSet, world.other)).status).toBe(403);
  });

  it('previews a scenario\'s deletion, and deleting removes exactly that', async () => {
    const [a] = world.scenarios;
    const res = await preview('scenarios', a);
    expect(res.status).toBe(200);
    const p = (await res.json()) as DeletionPreview;
    expect(p).toEqual({ kind: 'scenario', id: a, name: 'tiny-a.scen', maps: 0, scenarios: 0, runs: 2, results: 3, submissions: 0, sweeps: 1 });
    const before = await heldOver([a]);
    expect(before).toEqual({ scenarios: 1, runs: 2, results: 3, submissions: 0, executions: 3 });

    expect((await world.owner.request(`/api/scenarios/${a}`, { method: 'DELETE' })).status).toBe(204);
    expect(await heldOver([a])).toEqual({ scenarios: 0, runs: 0, results: 0, submissions: 0, executions: 0 });
    // The sweep stays, with its run over the other scenario.
    expect(await world.lib.sql('SELECT count(*)::int AS n FROM runs WHERE sweep_id = :id', { id: sweepId })).toEqual([{ n: 1 }]);
  });

  it('previews a map\'s deletion with its scenarios, their results and submitted plans', async () => {
    const [, b] = world.scenarios;
    const [{ id: mapId }] = await world.lib.sql<{ id: number }>('SELECT map_id AS id FROM scenarios WHERE id = :id', { id: b });
    const p = (await (await preview('maps', mapId)).json()) as DeletionPreview;
    // Left on the public map: scenario b with one run, one sweep result and one submitted plan.
    expect(p).toEqual({ kind: 'map', id: mapId, name: 'tiny.map', maps: 0, scenarios: 1, runs: 1, results: 2, submissions: 1, sweeps: 1 });
    expect(await heldOver([b])).toEqual({ scenarios: 1, runs: 1, results: 2, submissions: 1, executions: 4 });
    expect((await world.owner.request(`/api/maps/${mapId}`, { method: 'DELETE' })).status).toBe(204);
    expect(await heldOver([b])).toEqual({ scenarios: 0, runs: 0, results: 0, submissions: 0, executions: 0 });
  });

});
