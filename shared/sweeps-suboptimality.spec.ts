/** The suboptimality factor w of model specs (issue 15, item 1): schema, stored parameters, labels and repeats. */
import {
  describeModelSpec, isBounded, modelParameters, ModelSpecSchema, repeatedModels, suboptimalityOf, SweepDefinitionSchema,
} from './sweeps';
import { PLAN_MODELS } from './plan';

const spec = (model: string, extra: Record<string, unknown> = {}) =>
  ModelSpecSchema.parse({ model, ...(model === 'k-robust' ? { k: 1 } : {}), ...extra });

const definition = (models: unknown[]) => ({
  name: 'w', instances: { instanceSetId: 1 }, agentCounts: { kind: 'list', values: [4] }, models,
  robotProfile: { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 600, timingJitter: 0 },
  timeLimitMs: 10000, memoryLimitMb: 512,
});

describe('suboptimality factor w in model specs', () => {
  it('is accepted on every plan model and defaults to exact search', () => {
    expect(PLAN_MODELS).toHaveLength(5);
    for (const model of PLAN_MODELS) {
      const bounded = spec(model, { suboptimality: 1.5 });
      expect(suboptimalityOf(bounded)).toBe(1.5);
      expect(isBounded(bounded)).toBe(true);
      expect(suboptimalityOf(spec(model))).toBe(1);
      expect(isBounded(spec(model, { suboptimality: 1 }))).toBe(false);
    }
  });

  it('refuses w below 1, above 10, with more than 3 decimals or not a number, naming the field', () => {
    for (const w of [0.99, 0, -1, 10.5, 1.2345, '1.5', Number.NaN]) {
      const r = SweepDefinitionSchema.safeParse(definition([{ model: 'classic', suboptimality: w }]));
      expect(r.success).toBe(false);
      const issue = r.error?.issues[0];
      expect(issue?.path).toEqual(['models', 0, 'suboptimality']);
      expect(issue?.message).toContain('suboptimality (w)');
    }
    expect(SweepDefinitionSchema.safeParse(definition([{ model: 'classic', suboptimality: 10 }])).success).toBe(true);
    expect(SweepDefinitionSchema.safeParse(definition([{ model: 'classic', suboptimality: 1.125 }])).success).toBe(true);
  });

  it('leaves w = 1 out of the stored parameters and keeps w > 1', () => {
    expect(modelParameters(spec('classic', { suboptimality: 1 }))).toEqual({ model: 'classic', startHeading: 'free', switches: {} });
    expect(modelParameters(spec('weighted-split', { suboptimality: 1 }))).toEqual({ model: 'weighted-split', startHeading: 'free' });
    expect(modelParameters(spec('classic', { suboptimality: 1, following: 'allowed' }))).toEqual({ model: 'classic', startHeading: 'free', switches: {} });
    expect(modelParameters(spec('k-robust', { suboptimality: 2 }))).toEqual({ model: 'k-robust', k: 1, startHeading: 'free', switches: {}, suboptimality: 2 });
    expect(modelParameters(spec('classic', { suboptimality: 1.2, following: 'forbidden' })))
      .toEqual({ model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden', suboptimality: 1.2 });
  });

  it('names w in the label of a bounded spec only', () => {
    expect(describeModelSpec(spec('classic', { suboptimality: 1.2 }))).toBe('classic, w = 1.2, start heading free');
    expect(describeModelSpec(spec('classic', { suboptimality: 1 }))).toBe('classic, start heading free');
    expect(describeModelSpec(spec('k-robust', { suboptimality: 3 })))
      .toBe('k-robust k=1, w = 3, start heading free');
  });

  it('tells specs at different w apart and w = 1 from a spec without it', () => {
    const specs = [spec('classic'), spec('classic', { suboptimality: 1.5 }), spec('classic', { suboptimality: 1 }), spec('classic', { suboptimality: 2 })];
    expect(repeatedModels(specs)).toEqual([{ index: 2, message: 'models[2] repeats models[0]: classic, start heading free' }]);
  });
});
