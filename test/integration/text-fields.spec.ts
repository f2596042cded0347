/**
 * Control characters in user-supplied text (issue 13, item 7): a NUL in a sweep name answered
 * 500 (PostgreSQL refuses NUL in text), and other control characters were stored and later
 * broke exports. Every text field of a request schema refuses them with 400 VALIDATION_FAILED
 * naming the field; multi-line fields (descriptions) still take line breaks and tabs.
 */
import type { SweepDefinitionInput } from '@shared/sweeps';
import { json, startBoardWorld, type BoardWorld } from './leaderboard-support';

interface ErrorJson {
  readonly error: { readonly code: string; readonly message: string; readonly details: readonly { readonly path?: readonly (string | number)[]; readonly field?: string }[] };
}

describe('control characters in text fields', () => {
  let world: BoardWorld;

  beforeAll(async () => {
    world = await startBoardWorld();
  }, 60_000);
  afterAll(() => world?.lib.close());

  const definition = (name: string): SweepDefinitionInput => ({
    name,
    instances: { instanceSetId: world.publicSet },
    agentCounts: { kind: 'list', values: [1, 2] },
    models: [{ model: 'classic' }],
    robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0 },
    timeLimitMs: 10_000,
    memoryLimitMb: 256,
  });

  /** Expects 400 VALIDATION_FAILED whose details name `path`. */
  const expectRefused = async (res: Response, path: readonly (string | number)[]) => {
    const body = (await res.json()) as ErrorJson;
    expect({ status: res.status, code: body.error?.code }).toEqual({ status: 400, code: 'VALIDATION_FAILED' });
    expect(body.error.details.map((d) => d.path)).toContainEqual(path);
    expect(body.error.message).toContain('control character');
  };

  it.each([
    ['NUL', 'depot\u0000check'],
    ['a line break', 'depot\ncheck'],
    ['an escape', 'depot \u001b[31mcheck'],
  ])('refuses a sweep name with %s in preview and launch', async (_what, name) => {
    const preview = await world.curator.request('/api/sweeps/preview', json('POST', definition(name)));
    const launch = await world.curator.request('/api/sweeps', json('POST', definition(name)));
    expect([preview.status, launch.status]).toEqual([400, 400]);
    await expectRefused(preview, ['name']);
    await expectRefused(launch, ['name']);
    expect(await world.lib.sql('SELECT id FROM sweeps')).toEqual([]);
  });

  it.each(['name', 'description', 'source'])('refuses an instance set whose %s holds NUL', async (field) => {
    const body = { name: `nul ${field}`, description: 'fine', source: 'fine', [field]: `bad\u0000${field}` };
    await expectRefused(await world.owner.request('/api/instance-sets', json('POST', body)), [field]);
  });

  it('refuses a line break in an instance set name but keeps line breaks and tabs in its description and source', async () => {
    await expectRefused(await world.owner.request('/api/instance-sets', json('POST', { name: 'two\nlines' })), ['name']);
    const res = await world.owner.request('/api/instance-sets', json('POST', { name: 'multi-line notes', description: 'line one\r\nline two\n\tindented', source: 'from\nhere' }));
    expect(res.status).toBe(201);
    expect(((await res.json()) as { description: string }).description).toBe('line one\r\nline two\n\tindented');
  });

  it('refuses a search text with NUL', async () => {
    await expectRefused(await world.owner.request('/api/instance-sets?q=a%00b'), ['q']);
  });

  it('refuses a submitted plan whose solver name holds NUL, in the request and in a JSON plan document', async () => {
    // A valid plan for agent 0 of the tiny scenario, (0,0) → (2,0): only the solver name is wrong.
    const instance = { scenarioId: world.scenarios[0], agents: 1 };
    const solver = { name: 'Hand\u0000planner', version: '1.0' };
    await expectRefused(await world.other.request('/api/submissions', json('POST', { format: 'text', text: '(0,0) (1,0) (2,0)\n', model: 'classic', instance, solver })), ['solver', 'name']);

    const doc = { format: 'quarterturn-plan', version: 1, model: 'classic', instance, solver: { name: 'ok', version: '1.0\u0007' }, paths: [[[0, 0], [1, 0], [2, 0]]] };
    const res = await world.other.request('/api/submissions', json('POST', { format: 'json', text: JSON.stringify(doc) }));
    const body = (await res.json()) as ErrorJson;
    expect({ status: res.status, code: body.error.code, field: body.error.details[0]?.field }).toEqual({ status: 400, code: 'VALIDATION_FAILED', field: 'solver.version' });
    expect(await world.lib.sql('SELECT id FROM submissions')).toEqual([]);
  });
});
