import { followingRuleText, planMayFollow } from './viewer-pane';

describe('followingRuleText', () => {
  it('says whether the plan model forbids following', () => {
    expect(followingRuleText({ model: 'classic', modelOptions: { startHeading: 'free' } })).toBe('The classic plan was solved with following allowed (the classic rule).');
    expect(followingRuleText({ model: 'orientation-split', modelOptions: { startHeading: 'free', following: 'forbidden' } })).toBe('The orientation-split plan was solved with following forbidden.');
    expect(followingRuleText({ model: 'k-robust', modelOptions: { startHeading: 'free', k: 2 } })).toMatch(/^The k-robust plan \(k = 2\) forbids following/);
    expect(followingRuleText({ model: 'k-robust', modelOptions: { startHeading: 'free', k: 0 } })).toBe('The k-robust plan with k = 0 allows following.');
    expect(followingRuleText({ model: 'weighted-split', modelOptions: { startHeading: 'N' } })).toMatch(/never follows/);
  });
});

describe('planMayFollow', () => {
  it('is true only where the plan rules allow following, so the hazard is shown as a warning only there', () => {
    const free = 'free' as const;
    expect(planMayFollow({ model: 'classic', modelOptions: { startHeading: free } })).toBe(true);
    expect(planMayFollow({ model: 'uniform-duration', modelOptions: { startHeading: free, following: 'allowed' } })).toBe(true);
    expect(planMayFollow({ model: 'classic', modelOptions: { startHeading: free, following: 'forbidden' } })).toBe(false);
    expect(planMayFollow({ model: 'orientation-split', modelOptions: { startHeading: free, following: 'forbidden' } })).toBe(false);
    expect(planMayFollow({ model: 'k-robust', modelOptions: { startHeading: free, k: 0 } })).toBe(true);
    expect(planMayFollow({ model: 'k-robust', modelOptions: { startHeading: free, k: 1 } })).toBe(false);
    expect(planMayFollow({ model: 'weighted-split', modelOptions: { startHeading: free } })).toBe(false);
  });
});
