import { CHART_CARD, chartCardWidth } from './chart-card-width';

describe('chartCardWidth', () => {
  it('splits a wide grid into 520 px-or-wider columns and keeps one column on a phone (hand-worked)', () => {
    // 1200 px: two columns of (1200 − 16) / 2 = 592, less 18 px inset = 574.
    expect(chartCardWidth(1200)).toBe(574);
    // 1000 px: 2 × 520 + 16 = 1056 does not fit, so one column: 1000 − 18.
    expect(chartCardWidth(1000)).toBe(982);
    // A 358 px grid (390 px screen): the card takes the whole width.
    expect(chartCardWidth(358)).toBe(358 - CHART_CARD.inset);
    // 1700 px: three columns of (1700 − 32) / 3 = 556, less 18.
    expect(chartCardWidth(1700)).toBe(538);
  });
});
