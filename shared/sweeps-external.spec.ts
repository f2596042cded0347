/** Model specs that name an external solver (issue 16, item 4): refusals, identity and what built-in specs keep. */
import { canonicalJson, describeModelSpec, modelParameters, ModelSpecSchema, repeatedModels } from './sweeps';

const EXAMPLE = { name: 'prioritised-astar', version: '1.0.0' };

describe('external solver specs', () => {
  it('refuse w, a forbidden following rule and CBS switches, naming the field', () => {
    const issues = (extra: Record<string, unknown>) => {
      const r = ModelSpecSchema.safeParse({ model: 'classic', externalSolver: EXAMPLE, ...extra });
      return r.success ? [] : r.error.issues.map((i) => [i.path.join('.'), i.message]);
    };
    expect(issues({})).toEqual([]);
    expect(issues({ suboptimality: 1.5 })).toEqual([['suboptimality', 'an external solver takes no suboptimality (w); leave it at 1']]);
    expect(issues({ following: 'forbidden' })).toEqual([['following', expect.stringContaining('classic following rule')]]);
    expect(issues({ switches: { wdg: false } })).toEqual([['switches', expect.stringContaining('CBS switches')]]);
    // Allowed following and w = 1 say nothing the solver could break.
    expect(issues({ following: 'allowed', suboptimality: 1 })).toEqual([]);
    expect(ModelSpecSchema.safeParse({ model: 'classic', externalSolver: { name: 'Bad Name', version: '1' } }).success).toBe(false);
  });

  it('keep the solver in the run params, so its runs are never the built-in ones; built-in params stay as they were', () => {
    const builtIn = ModelSpecSchema.parse({ model: 'classic' });
    const external = ModelSpecSchema.parse({ model: 'classic', externalSolver: EXAMPLE });
    // The params of a built-in spec, exactly as before the field existed (their hash is the run identity).
    expect(canonicalJson(modelParameters(builtIn))).toBe('{"model":"classic","startHeading":"free","switches":{}}');
    expect(modelParameters(external)).toEqual({ model: 'classic', startHeading: 'free', switches: {}, externalSolver: EXAMPLE });
    expect(repeatedModels([builtIn, external])).toEqual([]);
    expect(repeatedModels([external, external])).toEqual([{ index: 1, message: 'models[1] repeats models[0]: classic, by prioritised-astar@1.0.0, start heading free' }]);
    expect(repeatedModels([external, ModelSpecSchema.parse({ model: 'classic', externalSolver: { ...EXAMPLE, version: '1.0.1' } })])).toEqual([]);
    expect(describeModelSpec(ModelSpecSchema.parse({ model: 'k-robust', k: 1, externalSolver: EXAMPLE }))).toBe('k-robust k=1, by prioritised-astar@1.0.0, start heading free');
  });
});
