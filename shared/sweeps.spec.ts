import { agentCountsOf, canonicalJson, CBS_SWITCH_NAMES, CBS_SWITCH_TEXT, cbsSwitchLabel, describeModelSpec, checkSweepSize, expandSweep, ModelSpecSchema, repeatedModels, SweepDefinitionSchema, sweepSize, type SweepDefinition } from './sweeps';

const def = (over: Record<string, unknown> = {}): SweepDefinition => SweepDefinitionSchema.parse({
  name: 'floor test',
  instances: { instanceSetId: 1 },
  agentCounts: { kind: 'range', from: 2, to: 10, step: 4 },
  models: [{ model: 'classic' }, { model: 'k-robust', k: 1 }],
  robotProfile: { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 400, robotDiameterMm: 300, timingJitter: 0 },
  timeLimitMs: 5000,
  memoryLimitMb: 512,
  execution: { policies: ['open-loop', 'lockstep'], runs: 10 },
  seeds: [1, 2, 3],
  ...over,
});
const scenarios = [{ id: 11, maxAgents: 100 }, { id: 12, maxAgents: 6 }];

describe('sweep definitions', () => {
  it('expands a range with both ends when the step reaches them', () => {
    expect(agentCountsOf({ kind: 'range', from: 2, to: 10, step: 4 })).toEqual([2, 6, 10]);
    expect(agentCountsOf({ kind: 'list', values: [5, 1, 5] })).toEqual([1, 5]);
  });

  it('counts exactly the runs it lists, skipping counts a scenario cannot give', () => {
    const d = def();
    const runs = expandSweep(d, scenarios);
    // By hand: scenario 11 gives 3 counts, scenario 12 gives 2 (10 > 6): 5 instances × 2 models × 3 seeds.
    expect(runs).toHaveLength(30);
    expect(sweepSize(d, scenarios)).toEqual({ runs: 30, skippedInstances: 1, simulations: 30 * 2 * 10 });
    expect(new Set(runs.map((r) => `${r.scenarioId}/${r.agents}/${r.modelIndex}/${r.seed}`)).size).toBe(30);
  });

  it('narrows to chosen scenarios', () => {
    expect(sweepSize(def({ instances: { instanceSetId: 1, scenarioIds: [12] } }), scenarios).runs).toBe(2 * 2 * 3);
  });

  it('refuses empty and absurd sizes with a sentence', () => {
    expect(checkSweepSize({ runs: 0, skippedInstances: 3, simulations: 0 })).toMatch(/no runs/);
    expect(checkSweepSize({ runs: 5001, skippedInstances: 0, simulations: 0 })).toBe(
      'This sweep expands to 5,001 runs; at most 5,000 are allowed. Choose fewer scenarios, agent counts, models or seeds.');
    expect(checkSweepSize({ runs: 10, skippedInstances: 0, simulations: 3_000_000 })).toMatch(/simulated fleet runs/);
    expect(checkSweepSize({ runs: 10, skippedInstances: 0, simulations: 10 })).toBeNull();
  });

  it('rejects bad input naming the field', () => {
    const r = SweepDefinitionSchema.safeParse({ ...def(), agentCounts: { kind: 'range', from: 8, to: 2, step: 1 } });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['agentCounts', 'to']);
  });

  it('fills model defaults: free start heading, every CBS switch on', () => {
    expect(def().models[0]).toEqual({ model: 'classic', startHeading: 'free', switches: {} });
  });

  it('names every model spec that repeats an earlier one, defaults and switches left on included', () => {
    const models = ModelSpecSchema.array().parse([
      { model: 'classic' }, { model: 'k-robust', k: 1 }, { model: 'k-robust', k: 2 }, { model: 'classic', switches: { wdg: false, bypass: false } },
      { model: 'classic', startHeading: 'free', switches: { bypass: true } }, { model: 'classic', switches: { bypass: false, wdg: false, rectangleReasoning: true } },
    ]);
    expect(repeatedModels(models)).toEqual([
      { index: 4, message: 'models[4] repeats models[0]: classic, start heading free' },
      { index: 5, message: 'models[5] repeats models[3]: classic, start heading free, switched off: Bypass, WDG heuristic' },
    ]);
    expect(SweepDefinitionSchema.safeParse({ ...def(), models: [{ model: 'weighted-split' }, { model: 'weighted-split', startHeading: 'free' }] }).error?.issues)
      .toEqual([expect.objectContaining({ path: ['models', 1], message: 'models[1] repeats models[0]: weighted-split, start heading free' })]);
  });

  it('gives every CBS switch a label and an explanation of its own, and describes specs with the labels, not the field names', () => {
    // The labels are ours; the field names stay the API contract (issue 14, item 11).
    const labels = CBS_SWITCH_NAMES.map(cbsSwitchLabel);
    expect(labels).toEqual(['Prioritised conflicts', 'Bypass', 'WDG heuristic', 'Disjoint splitting', 'Target reasoning', 'Corridor reasoning', 'Rectangle reasoning']);
    expect(new Set(labels).size).toBe(CBS_SWITCH_NAMES.length);
    expect(Object.keys(CBS_SWITCH_TEXT).sort()).toEqual([...CBS_SWITCH_NAMES].sort());
    for (const n of CBS_SWITCH_NAMES) expect(CBS_SWITCH_TEXT[n].explanation).toMatch(/^[A-Z].{30,140}\.$/);
    const spec = ModelSpecSchema.parse({ model: 'k-robust', k: 2, switches: { disjointSplitting: false, prioritizeConflicts: false, corridorReasoning: true } });
    expect(describeModelSpec(spec)).toBe('k-robust k=2, start heading free, switched off: Prioritised conflicts, Disjoint splitting');
  });

  it('writes canonical JSON whatever the key order', () => {
    expect(canonicalJson({ b: 1, a: { d: [2, { f: 1, e: 0 }], c: null } })).toBe('{"a":{"c":null,"d":[2,{"e":0,"f":1}]},"b":1}');
  });
});
