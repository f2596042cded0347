/** scheduleFromHeadingStates: one action per unit step at the profile's durations (hand-worked examples). */
import type { RobotProfile } from '@shared/plan';
import { tinyInstance } from '../testing/tiny-instance';
import type { OrientedState } from '../validate/orientation-split';
import { scheduleFromHeadingStates } from './heading-schedule';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 300, waitMs: 200, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };

describe('scheduleFromHeadingStates', () => {
  it('turns each step into its action back to back, cost = end of the final arrival', () => {
    // (0, 0) facing N: turn right, forward, wait, forward into (2, 0), then a turn at the goal that costs nothing.
    const inst = tinyInstance('...', [[[0, 0], [2, 0]]]);
    const states: OrientedState[] = [
      { cell: 0, heading: 'N' }, { cell: 0, heading: 'E' }, { cell: 1, heading: 'E' }, { cell: 1, heading: 'E' },
      { cell: 2, heading: 'E' }, { cell: 2, heading: 'S' },
    ];
    const s = scheduleFromHeadingStates(inst, [states], PROFILE);
    expect(s.schedule[0].map((a) => [a.action, a.start, a.end, a.heading, a.step])).toEqual([
      ['turn-right', 0, 300, 'E', 0], ['forward', 300, 1300, 'E', 1], ['wait', 1300, 1500, 'E', 2],
      ['forward', 1500, 2500, 'E', 3], ['turn-right', 2500, 2800, 'S', 4],
    ]);
    expect(s.schedule[0][1].from).toEqual([0, 0]);
    expect(s.schedule[0][1].to).toEqual([1, 0]);
    expect(s.turnInclusiveSocMs).toBe(2500);
    expect(s.turns).toBe(2);
    expect(s.waitStepMs).toBe(200);
  });

  it('gives an idle agent an empty list and cost 0, and sums and maxes over agents', () => {
    const inst = tinyInstance('...', [[[1, 0], [1, 0]], [[0, 0], [0, 0]]]);
    const s = scheduleFromHeadingStates(inst, [[{ cell: 1, heading: 'W' }], [{ cell: 0, heading: 'N' }, { cell: 0, heading: 'W' }]], PROFILE);
    expect(s.schedule[0]).toEqual([]);
    expect(s.schedule[1][0].action).toBe('turn-left');
    expect(s.turnInclusiveSocMs).toBe(0);
    expect(s.turnInclusiveMakespanMs).toBe(0);
  });

  it('refuses a step that is no single action', () => {
    const inst = tinyInstance('...', [[[0, 0], [1, 0]]]);
    expect(() => scheduleFromHeadingStates(inst, [[{ cell: 0, heading: 'N' }, { cell: 0, heading: 'S' }]], PROFILE)).toThrow(/no single action/);
    expect(() => scheduleFromHeadingStates(inst, [[{ cell: 0, heading: 'N' }, { cell: 1, heading: 'E' }]], PROFILE)).toThrow(/agent 0, step 0/);
  });
});
