import { finishHistogram, finishTimes } from './finish-histogram';
import { runPaths, testInstance } from './plan-viewer-testing';

describe('finishHistogram', () => {
  it('bins equal widths from min to max, the max in the last bin (hand-worked)', () => {
    expect(finishHistogram([0, 1, 2, 3, 4, 10], 5)).toEqual({ edges: [0, 2, 4, 6, 8, 10], counts: [2, 2, 1, 0, 1], peak: 2 });
  });

  it('puts equal values in one bin and ignores robots that never finish', () => {
    expect(finishHistogram([7, 7, Infinity], 4)).toEqual({ edges: [6.5, 7.5], counts: [2], peak: 2 });
    expect(finishHistogram([], 4)).toEqual({ edges: [], counts: [], peak: 0 });
  });
});

describe('finishTimes', () => {
  it('is the end of each robot’s last forward, as the realised makespan counts it', () => {
    const instance = testInstance('....', [[1, 3, 'N'], [0, 0]]);
    const { track, runner } = runPaths(instance, [[1, 2, 3], [0, 0, 0]]);
    const finishes = finishTimes(track);
    expect(finishes).toEqual([2500, 0]);
    expect(Math.max(...finishes)).toBe(runner.run(0).realisedMakespanMs);
  });
});
