/**
 * The suboptimality factor w in sweep run identities (issue 15, item 1): w = 1 keeps the params
 * and param hash specs had before the factor existed; w > 1 gets its own, pinned here.
 */
import { runParameters, SweepDefinitionSchema, type SweepDefinitionInput } from '@shared/sweeps';
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

describe('run parameters and the suboptimality factor', () => {
  it('keeps the hashes of w = 1 specs as before the factor existed', () => {
    // The same pins as run-parameters-following.spec.ts (computed at commit 49bdc1a).
    const before = ['0283c44f04c49ef6', '139ef68f1935e898', '3bfaf2fa7851184a', '5eac9a4a9bbe9cdc', '9134ac7da2945125'];
    expect(hashes(MODELS.map((m) => ({ ...m, suboptimality: 1 })))).toEqual(before);
  });

  it('gives w = 1.2 its own pinned hash on every model and stores it in params.model.suboptimality', () => {
    // Computed with this definition and parameterHash(runParameters(def, i)) when w was introduced;
    // a change here would split stored bounded results from new ones.
    const pinned = hashes(MODELS.map((m) => ({ ...m, suboptimality: 1.2 })));
    expect(pinned).toEqual(['8c05023143a48bd5', '8cf0da0e9544200b', 'e20dd96e640f58b4', 'e1a465eba279b32b', 'a9bdb173f816cfe8']);
    expect(new Set([...pinned, ...hashes(MODELS)]).size).toBe(10);
    const def = definition([{ model: 'classic', suboptimality: 1.2 }]);
    expect(runParameters(def, 0)).toEqual({
      model: { model: 'classic', startHeading: 'free', switches: {}, suboptimality: 1.2 },
      robotProfile: def.robotProfile, timeLimitMs: 10000, memoryLimitMb: 512,
    });
    expect(modelLabel(def.models[0])).toBe('classic w=1.2');
    expect(modelLabel(definition([{ model: 'classic', suboptimality: 1 }]).models[0])).toBe('classic');
  });
});
