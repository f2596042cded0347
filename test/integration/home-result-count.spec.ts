/**
 * The home page's "Results" figure (issue 14, item 10: it said 0 whatever the hub held, because
 * no feature registered its counter). It counts stored results over the sets the viewer may
 * see: a visitor counts public sets only, the owner also his private set, a maintainer all.
 */
import { insertResults, startBoardWorld, type BoardWorld, type SeedResult, type SignedInClient } from './leaderboard-support';

describe('GET /api/stats results', () => {
  let world: BoardWorld;

  beforeAll(async () => {
    world = await startBoardWorld();
  });
  afterAll(() => world?.lib.close());

  const results = async (c: SignedInClient): Promise<number> => ((await (await c.request('/api/stats')).json()) as { results: number }).results;
  const result = (scenarioId: number, status: SeedResult['status'], seed: number): SeedResult => ({
    scenarioId, agents: 2, model: 'classic', profile: 0, status, soc: status === 'solved' ? 4 : null,
    tiMakespanMs: status === 'solved' ? 3000 : null, lowerBound: null, runtimeMs: 5, seed,
  });

  it('counts 0 before any result is stored, for everyone', async () => {
    for (const c of [world.visitor, world.owner, world.other, world.curator]) expect(await results(c)).toBe(0);
  });

  it('counts every stored result (solved or not) over the sets the viewer may see', async () => {
    const [publicA, publicB, privateA] = world.scenarios;
    // 3 results on the public set (one a time limit), 2 on the owner's private set.
    await insertResults(world.lib, [
      result(publicA, 'solved', 1), result(publicA, 'timeout', 2), result(publicB, 'solved', 3),
      result(privateA, 'solved', 4), result(privateA, 'error', 5),
    ]);
    expect(await results(world.visitor)).toBe(3);
    expect(await results(world.other)).toBe(3);
    expect(await results(world.owner)).toBe(5);
    expect(await results(world.curator)).toBe(5);
  });
});
