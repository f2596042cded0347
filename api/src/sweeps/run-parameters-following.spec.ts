/**
 * The following rule in sweep run identities (issue 12, item 3): a model spec with
 * `following: 'allowed'` (or none) must keep the params and param hash it had before the rule
 * existed, so results stored earlier keep their run identity and leaderboard variant; only
 * `following: 'forbidden'` changes them.
 */
import { modelParameters, ModelSpecSchema, repeatedModels, runParameters, SweepDefinitionSchema, type SweepDefinitionInput } from '@shared/sweeps';
import { parameterHash } from './parameter-hash';
import { modelLabel } from './sweep-progress';

const MODELS: SweepDefinitionInput['models'] = [
  { model: 'classic' }, { model: 'uniform-duration', startHeading: 'N' }, { model: 'orientation-split', switches: { wdg: false } },
  { model: 'weighted-split' }, { model: 'k-robust', k: 1 },
];
const definition = (models: SweepDefinitionInput['models']) => SweepDefinitionSchema.parse({
  name: 'h', instances: { instanceSetId: 1 }, agentCounts: { kind: 'list', values: [4] }, models,
  robotProfile: { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 600, timingJitter: 0 },
  timeLimitMs: 10000, memoryLimitMb: 512,
});
const hashes = (models: SweepDefinitionInput['models']): string[] => {
  const def = definition(models);
  return def.models.map((_, i) => parameterHash(runParameters(def, i)));
};

describe('run parameters and the following rule', () => {
  it('keeps the hashes of specs without following, and of following: allowed, as before the rule existed', () => {
    // Computed at commit 49bdc1a (before `following` existed) with this definition and
    // parameterHash(runParameters(def, i)); a change here would split stored results from new ones.
    const before = ['0283c44f04c49ef6', '139ef68f1935e898', '3bfaf2fa7851184a', '5eac9a4a9bbe9cdc', '9134ac7da2945125'];
    expect(hashes(MODELS)).toEqual(before);
    const allowed = MODELS.map((m) => (m.model === 'weighted-split' || m.model === 'k-robust' ? m : { ...m, following: 'allowed' as const }));
    expect(hashes(allowed)).toEqual(before);
    const def = definition(allowed);
    expect(runParameters(def, 0)).toEqual({
      model: { model: 'classic', startHeading: 'free', switches: {} },
      robotProfile: def.robotProfile, timeLimitMs: 10000, memoryLimitMb: 512,
    });
  });

  it('gives following: forbidden its own hash and stores it in params.model.following', () => {
    const forbidden = MODELS.map((m) => (m.model === 'weighted-split' || m.model === 'k-robust' ? m : { ...m, following: 'forbidden' as const }));
    const a = hashes(MODELS);
    const f = hashes(forbidden);
    expect([0, 1, 2].filter((i) => f[i] !== a[i])).toEqual([0, 1, 2]);
    expect(f.slice(3)).toEqual(a.slice(3));
    const def = definition(forbidden);
    expect(modelParameters(def.models[0])).toEqual({ model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden' });
    expect(modelLabel(def.models[0])).toBe('classic following forbidden');
    expect(modelLabel(definition(MODELS).models[0])).toBe('classic');
  });

  it('tells a forbidden spec from an allowed one, and an allowed one from a spec without the field', () => {
    const specs = [{ model: 'classic' }, { model: 'classic', following: 'forbidden' }, { model: 'classic', following: 'allowed' }].map((m) => ModelSpecSchema.parse(m));
    expect(repeatedModels(specs)).toEqual([{ index: 2, message: 'models[2] repeats models[0]: classic, start heading free' }]);
    // The schema refuses the repeat, and accepts the allowed/forbidden pair.
    expect(SweepDefinitionSchema.safeParse({ ...definition(MODELS), models: specs }).success).toBe(false);
    expect(definition(specs.slice(0, 2)).models).toHaveLength(2);
  });

  it('refuses following on weighted-split and k-robust specs, naming the field', () => {
    const bad = SweepDefinitionSchema.safeParse({ ...definition(MODELS), models: [{ model: 'k-robust', k: 1, following: 'forbidden' }] });
    expect(bad.success).toBe(false);
    expect(JSON.stringify(bad.error?.issues)).toContain('following');
    expect(SweepDefinitionSchema.safeParse({ ...definition(MODELS), models: [{ model: 'weighted-split', following: 'allowed' }] }).success).toBe(false);
  });
});
