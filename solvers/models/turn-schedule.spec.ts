import type { RobotProfile } from '@shared/plan';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import { classicOracle } from '../testing/classic-oracle';
import { validateClassicPlan } from '../validate/classic';
import { scheduleFromPaths, uniformStepMs } from './turn-schedule';
import { uniformDurationSchedule } from './uniform-duration';

const profile: RobotProfile = { forwardMs: 1000, quarterTurnMs: 700, waitMs: 400, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
const open4 = `
....
....
....
....`;

describe('scheduleFromPaths (classic, back to back)', () => {
  it('inserts one quarter turn before a move in a new direction and none when the heading is right', () => {
    // Arrange: E, E, S from a free start heading (robot starts facing E).
    const inst = tinyInstance(open4, [[[0, 0], [2, 1]]]);
    const path = cellsOf(inst.grid, [[0, 0], [1, 0], [2, 0], [2, 1]]);
    // Act
    const s = scheduleFromPaths(inst, [path], profile, { startHeading: 'free', stretch: 'none' });
    // Assert: hand-worked: 3 forwards + 1 right turn (E → S is clockwise with y downwards).
    expect(s.schedule[0].map((a) => `${a.action}:${a.heading}:${a.start}-${a.end}:${a.step}`)).toEqual([
      'forward:E:0-1000:0', 'forward:E:1000-2000:1', 'turn-right:S:2000-2700:2', 'forward:S:2700-3700:2',
    ]);
    expect(s.turns).toBe(1);
    expect(s.turnInclusiveSocMs).toBe(3700);
  });

  it('turns from a fixed start heading, and the instance heading overrides the option', () => {
    const inst = tinyInstance(open4, [[[0, 0], [1, 0]], [[0, 2], [1, 2], 'W']]);
    const paths = [cellsOf(inst.grid, [[0, 0], [1, 0]]), cellsOf(inst.grid, [[0, 2], [1, 2]])];
    const s = scheduleFromPaths(inst, paths, profile, { startHeading: 'N', stretch: 'none' });
    expect(s.schedule[0].map((a) => a.action)).toEqual(['turn-right', 'forward']);
    // Facing W and moving E is a reversal: two right turns (the documented U-turn direction).
    expect(s.schedule[1].map((a) => `${a.action}:${a.heading}`)).toEqual(['turn-right:N', 'turn-right:E', 'forward:E']);
    expect(s.turnsPerAgent).toEqual([1, 2]);
    expect(s.agentCostsMs).toEqual([1700, 2400]);
    expect(s.turnInclusiveMakespanMs).toBe(2400);
  });

  it('gives waits profile.waitMs and does not charge trailing waits at the goal', () => {
    const inst = tinyInstance(open4, [[[0, 0], [1, 0]]]);
    const path = cellsOf(inst.grid, [[0, 0], [0, 0], [1, 0], [1, 0], [1, 0]]);
    const s = scheduleFromPaths(inst, [path], profile, { startHeading: 'E', stretch: 'none' });
    expect(s.schedule[0].map((a) => `${a.action}:${a.start}-${a.end}`)).toEqual(['wait:0-400', 'forward:400-1400', 'wait:1400-1800', 'wait:1800-2200']);
    expect(s.agentCostsMs).toEqual([1400]);
  });

  it('gives an agent already at its goal an empty list and cost 0', () => {
    const inst = tinyInstance(open4, [[[3, 3], [3, 3]]]);
    const s = scheduleFromPaths(inst, [[inst.agents[0].start]], profile, { startHeading: 'free', stretch: 'none' });
    expect(s.schedule[0]).toEqual([]);
    expect(s.turnInclusiveSocMs).toBe(0);
  });

  it('rejects a path with a jump, a wrong start or a blocked cell, naming agent and step', () => {
    const inst = tinyInstance('..#\n...', [[[0, 0], [1, 1]]]);
    const run = (cells: [number, number][]) => () =>
      scheduleFromPaths(inst, [cellsOf(inst.grid, cells)], profile, { startHeading: 'free', stretch: 'none' });
    expect(run([[0, 0], [1, 1]])).toThrow('agent 0, step 1: move from cell 0 to 4 is not between 4-neighbours');
    expect(run([[1, 0], [1, 1]])).toThrow('agent 0: path starts at cell 1');
    expect(run([[0, 0], [1, 0], [2, 0], [2, 1], [1, 1]])).toThrow('agent 0, step 2: cell 2 is not a free cell');
  });
});

describe('scheduleFromPaths (uniform duration)', () => {
  const S = uniformStepMs(profile);

  it('keeps every abstract step inside [t·S, (t+1)·S) and fills it exactly', () => {
    const inst = tinyInstance(open4, [[[0, 0], [0, 1], 'S'], [[3, 0], [0, 0], 'S']]);
    const paths = [
      cellsOf(inst.grid, [[0, 0], [0, 0], [0, 0], [0, 0], [0, 1]]),
      cellsOf(inst.grid, [[3, 0], [2, 0], [1, 0], [0, 0]]),
    ];
    const s = uniformDurationSchedule(inst, paths, profile, 'free');
    for (const list of s.schedule) {
      for (const a of list) {
        expect(a.start).toBeGreaterThanOrEqual(a.step * S);
        expect(a.end).toBeLessThanOrEqual((a.step + 1) * S);
      }
      for (let t = 0; t < list.length; t++) if (t > 0) expect(list[t].start).toBe(list[t - 1].end);
      expect(list[list.length - 1].end).toBe((list[list.length - 1].step + 1) * S);
    }
    // Agent 1 faces S and moves W: S → W is clockwise (one right turn), then forward, then it waits out the step.
    expect(s.schedule[1].slice(0, 3).map((a) => `${a.action}:${a.start}-${a.end}`)).toEqual([
      'turn-right:0-700', 'forward:700-1700', 'wait:1700-2400',
    ]);
    expect(s.turnInclusiveMakespanMs).toBe(4 * S);
    expect(s.turnInclusiveSocMs).toBe(7 * S);
  });

  it('turn-inclusive makespan = makespan × (forward + 2 quarter turns) on optimally solved instances', () => {
    // Optimal plans from the exhaustive classic oracle, checked by the independent validator.
    const cases = [
      tinyInstance(open4, [[[0, 0], [3, 3]], [[3, 3], [0, 0]], [[0, 3], [3, 0]]]),
      tinyInstance('....\n.##.\n....', [[[0, 0], [3, 2]], [[3, 2], [0, 0]]]),
      tinyInstance('...\n...\n...', [[[0, 1], [2, 1]], [[1, 0], [1, 2]], [[2, 2], [0, 0]]]),
    ];
    for (const inst of cases) {
      const solved = classicOracle(inst);
      if (solved.kind !== 'solved') throw new Error('oracle found no plan');
      const check = validateClassicPlan(inst, solved.plan);
      expect(check.ok).toBe(true);
      for (const startHeading of ['free', 'N', 'W'] as const) {
        const s = scheduleFromPaths(inst, solved.plan, profile, { startHeading, stretch: 'uniform' });
        expect(s.turnInclusiveMakespanMs).toBe(check.makespan * S);
        expect(s.turnInclusiveSocMs).toBe(check.soc * S);
      }
    }
  });
});
