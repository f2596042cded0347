/** The board view contract: the bestAmong switch, computed interval columns and the unit-split columns. */
import { DEFAULT_VIEW, ENTRY_COLUMNS, parseView, viewToParams, ViewParamError } from './leaderboards';

const error = (params: Record<string, string>): ViewParamError => {
  try {
    parseView(params);
  } catch (err) {
    if (err instanceof ViewParamError) return err;
    throw err;
  }
  throw new Error('parseView accepted the parameters');
};

describe('leaderboard views', () => {
  it('considers only plans executable at nominal times unless the link asks for all, and round-trips the choice', () => {
    expect(parseView({}).bestAmong).toBe('executable');
    expect(DEFAULT_VIEW.bestAmong).toBe('executable');
    const all = parseView({ bestAmong: 'all', layout: 'compare' });
    expect(all.bestAmong).toBe('all');
    expect(viewToParams(all)).toEqual({ layout: 'compare', bestAmong: 'all' });
    expect(viewToParams(parseView({}))).toEqual({});
    expect(error({ bestAmong: 'best' }).param).toBe('bestAmong');
  });

  it('shows interval columns but refuses to sort or filter them (they are computed per page)', () => {
    expect(parseView({ cols: 'model,successOpenLoop,successOpenLoopLo,successOpenLoopHi' }).columns).toHaveLength(4);
    expect(error({ sort: '-successLockstepHi' }).param).toBe('sort');
    expect(error({ 'successGatedLo.gt': '0.5' }).param).toBe('successGatedLo.gt');
  });

  it('never mixes steps and ms in one column, and points old links at the split columns', () => {
    const units = ENTRY_COLUMNS.filter((c) => c.kind === 'number').map((c) => c.unit ?? '');
    expect(units).not.toContain('model unit');
    const byLabel = new Map<string, string[]>();
    for (const c of ENTRY_COLUMNS) byLabel.set(c.label, [...(byLabel.get(c.label) ?? []), c.unit ?? '']);
    expect(['Sum-of-costs', 'Makespan', 'Lower bound'].map((l) => byLabel.get(l))).toEqual([['steps', 'ms'], ['steps', 'ms'], ['steps', 'ms']]);
    expect(error({ cols: 'map,soc' }).message).toContain('socSteps and socMs');
    expect(error({ sort: 'lowerBound' }).message).toContain('lowerBoundSteps and lowerBoundMs');
  });

  it('says "solved rate" and "execution success rate", never a bare success rate', () => {
    const labels = ENTRY_COLUMNS.map((c) => c.label);
    expect(labels.filter((l) => /success rate/i.test(l)).every((l) => l.startsWith('Execution success rate'))).toBe(true);
    expect(labels.filter((l) => /success rate/i.test(l))).toHaveLength(9);
  });
});
