import { GANTT_KINDS, GANTT_MIN_ROW_PX, ganttRowHeight, ganttSegments } from './gantt-layout';
import { runPaths, testInstance } from './plan-viewer-testing';

const named = (s: ReturnType<typeof ganttSegments>) =>
  Array.from({ length: s.count }, (_, i) => [s.robot[i], GANTT_KINDS[s.kind[i]], s.t0[i], s.t1[i]]);

describe('ganttSegments', () => {
  it('lays out a turn, forwards, a dependency hold and padding (hand-worked)', () => {
    // Robot 0 faces N at [1, 0] and drives east to [3, 0]: turn 0–500, forwards 500–1500–2500.
    // Robot 1 at [0, 0] follows into [1, 0]; dependency-gated it waits until robot 0 has left cell 1 (1500).
    const instance = testInstance('....', [[1, 3, 'N'], [0, 1, 'E']]);
    const { track } = runPaths(instance, [[1, 2, 3], [0, 1]], { policy: 'dependency-gated' });
    expect(named(ganttSegments(track))).toEqual([
      [0, 'turn', 0, 500], [0, 'forward', 500, 1500], [0, 'forward', 1500, 2500],
      [1, 'held', 0, 1500], [1, 'forward', 1500, 2500], [1, 'at-goal', 2500, 3500],
    ]);
  });

  it('ends a stopped robot with a stopped segment up to the horizon', () => {
    // Robots 0 and 1 meet head-on and stop at 650 ms (hand-worked: 2 m apart, 70 cm disks, 1 m/s each);
    // robot 2 waits one step and drives one cell, so the run lasts until 2000 ms.
    const instance = testInstance('.....', [[0, 2], [2, 0], [4, 3]]);
    const { track } = runPaths(instance, [[0, 1, 2], [2, 1, 0], [4, 4, 3]], { onCollision: 'stop' });
    const rounded = named(ganttSegments(track)).map(([r, k, a, b]) => [r, k, Math.round(Number(a) * 1000) / 1000, Math.round(Number(b) * 1000) / 1000]);
    expect(rounded).toEqual([
      [0, 'forward', 0, 650], [0, 'stopped', 650, 2000],
      [1, 'forward', 0, 650], [1, 'stopped', 650, 2000],
      [2, 'wait', 0, 1000], [2, 'forward', 1000, 2000],
    ]);
  });

  it('keeps rows between 2 and 14 px', () => {
    expect(ganttRowHeight(4, 400)).toBe(14);
    expect(ganttRowHeight(30, 400)).toBe(13);
    // Many robots keep a readable row (the chart scrolls): 40 robots in 320 px would be 8 px, 200 would be 2 px.
    expect(ganttRowHeight(40, 320)).toBe(GANTT_MIN_ROW_PX);
    expect(ganttRowHeight(200, 400)).toBe(GANTT_MIN_ROW_PX);
    expect(GANTT_MIN_ROW_PX).toBeGreaterThanOrEqual(10);
  });
});
