import { definitionFromForm, parseFactors, parseIntegers, SWEEP_FORM_DEFAULTS } from './sweep-form-rules';

describe('sweep form rules', () => {
  it('builds a valid definition from the defaults once a set is chosen', () => {
    const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'floor', instanceSetId: 3 });
    expect('definition' in out && out.definition.agentCounts).toEqual({ kind: 'list', values: [2, 4, 6] });
    expect('definition' in out && out.definition.timeLimitMs).toBe(30_000);
  });

  it('names the field of the first problem', () => {
    expect(definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 3, countList: '2, x' })).toEqual({ problem: 'agentCounts.values.1: Invalid input: expected number, received NaN' });
    expect(definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x' })).toEqual({ problem: 'Choose an instance set.' });
  });

  it('turns ablation checkboxes into switches set to false on unit-step models only', () => {
    const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, models: ['classic', 'weighted-split'], switchesOff: ['wdg'] });
    expect('definition' in out && out.definition.models).toEqual([
      { model: 'classic', startHeading: 'free', switches: { wdg: false }, following: 'allowed' },
      { model: 'weighted-split', startHeading: 'free' },
    ]);
  });

  it('gives the following rule to classic, uniform-duration and orientation-split only', () => {
    const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, models: ['orientation-split', 'k-robust', 'weighted-split'], following: 'forbidden' });
    expect('definition' in out && out.definition.models).toEqual([
      { model: 'orientation-split', startHeading: 'free', switches: {}, following: 'forbidden' },
      { model: 'k-robust', k: 1, startHeading: 'free', switches: {} },
      { model: 'weighted-split', startHeading: 'free' },
    ]);
  });

  it('asks for each following model once per rule when both are chosen, and the schema accepts them as different specs', () => {
    const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, models: ['classic', 'uniform-duration'], following: 'both' });
    expect('definition' in out && out.definition.models.map((m) => [m.model, 'following' in m ? m.following : null])).toEqual([
      ['classic', 'allowed'], ['classic', 'forbidden'], ['uniform-duration', 'allowed'], ['uniform-duration', 'forbidden'],
    ]);
  });

  it('asks for every model once per suboptimality factor w, leaving w = 1 out as stored params do', () => {
    const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, models: ['classic', 'weighted-split', 'k-robust'], suboptimality: '1, 1.5' });
    expect('definition' in out && out.definition.models.map((m) => [m.model, m.suboptimality ?? 1])).toEqual([
      ['classic', 1], ['classic', 1.5], ['weighted-split', 1], ['weighted-split', 1.5], ['k-robust', 1], ['k-robust', 1.5],
    ]);
  });

  it('names the suboptimality field when a factor is missing, no number or out of range', () => {
    const problem = (suboptimality: string) => {
      const out = definitionFromForm({ ...SWEEP_FORM_DEFAULTS, name: 'x', instanceSetId: 1, models: ['classic'], suboptimality });
      return 'problem' in out ? out.problem : null;
    };
    expect(problem('')).toBe('suboptimality (w): give at least one factor; 1 = optimal.');
    expect(problem('0.5')).toBe('models.0.suboptimality: suboptimality (w) must be at least 1 (1 = optimal)');
    expect(problem('1.2x')).toContain('models.0.suboptimality');
    expect(problem('11')).toBe('models.0.suboptimality: suboptimality (w) must be at most 10');
    expect(parseFactors('1, 1.5 1.5;2')).toEqual([1, 1.5, 2]);
  });

  it('parses integer lists with commas and spaces', () => {
    expect(parseIntegers('1, 2 3;4')).toEqual([1, 2, 3, 4]);
  });
});
