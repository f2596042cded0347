/**
 * Duplicate plan model specs (issue 13, item 8): preview accepted a definition listing the same
 * model twice and launch then failed with a generic 409 (two runs with one identity). Preview and
 * launch apply the same rule, and the answer names the repeat.
 */
import type { SweepDefinitionInput } from '@shared/sweeps';
import { json, startBoardWorld, type BoardWorld } from './leaderboard-support';

interface ErrorJson {
  readonly error: { readonly code: string; readonly message: string; readonly details: readonly { readonly path: readonly (string | number)[]; readonly message: string }[] };
}

describe('sweeps with duplicate model specs', () => {
  let world: BoardWorld;

  beforeAll(async () => {
    world = await startBoardWorld();
  }, 60_000);
  afterAll(() => world?.lib.close());

  const definition = (models: SweepDefinitionInput['models']): SweepDefinitionInput => ({
    name: 'duplicate check',
    instances: { instanceSetId: world.publicSet },
    agentCounts: { kind: 'list', values: [1, 2] },
    models,
    robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0 },
    timeLimitMs: 10_000,
    memoryLimitMb: 256,
    execution: { policies: [], runs: 1 },
  });
  const post = (path: string, def: SweepDefinitionInput) => world.curator.request(path, json('POST', def));

  it.each([
    [
      'the same k-robust spec with its defaults spelled out',
      [{ model: 'classic' }, { model: 'k-robust', k: 2 }, { model: 'weighted-split' }, { model: 'k-robust', k: 2, startHeading: 'free', switches: {} }],
      3, 'models[3] repeats models[1]: k-robust k=2, start heading free',
    ],
    [
      'a switch left on written out (absent means on)',
      [{ model: 'classic', switches: { bypass: false } }, { model: 'classic', switches: { bypass: false, wdg: true } }],
      1, 'models[1] repeats models[0]: classic, start heading free, switched off: Bypass',
    ],
  ] as const)('refuses %s in preview and in launch, naming the repeat', async (_what, models, index, message) => {
    const def = definition(models as unknown as SweepDefinitionInput['models']);
    const preview = await post('/api/sweeps/preview', def);
    const launch = await post('/api/sweeps', def);
    expect([preview.status, launch.status]).toEqual([400, 400]);
    for (const body of [(await preview.json()) as ErrorJson, (await launch.json()) as ErrorJson]) {
      expect(body.error.code).toBe('VALIDATION_FAILED');
      expect(body.error.details).toContainEqual(expect.objectContaining({ path: ['models', index], message }));
      expect(body.error.message).toContain(message);
    }
    expect(await world.lib.sql('SELECT id FROM sweeps')).toEqual([]);
  });

  it('previews and launches specs that differ only in k, start heading or switches', async () => {
    const def = definition([
      { model: 'k-robust', k: 1 }, { model: 'k-robust', k: 2 }, { model: 'classic' }, { model: 'classic', startHeading: 'N' },
      { model: 'classic', switches: { bypass: false } },
    ]);
    const preview = await post('/api/sweeps/preview', def);
    expect(preview.status).toBe(200);
    // 2 scenarios × 2 agent counts × 5 models × 1 seed.
    expect(((await preview.json()) as { size: { runs: number } }).size.runs).toBe(20);
    expect((await post('/api/sweeps', def)).status).toBe(201);
  });
});
