import fc from 'fast-check';
import type { ActionKind, CellXY, Heading, RobotProfile, ScheduledAction } from '@shared/plan';
import { createRng } from '../random';
import { tinyInstance } from '../testing/tiny-instance';
import { validateSchedule } from './schedule';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 500, waitMs: 400, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0 };
const FREE = { startHeading: 'free' } as const;

/** Builds a contiguous action list from (kind, ms, to, heading) starting at `from` at time 0. */
function acts(from: CellXY, ...xs: readonly [ActionKind, number, CellXY, Heading][]): ScheduledAction[] {
  let t = 0;
  let at = from;
  return xs.map(([action, ms, to, heading], step) => {
    const a: ScheduledAction = { action, from: at, to, heading, start: t, end: t + ms, step };
    t += ms;
    at = to;
    return a;
  });
}

describe('validateSchedule', () => {
  const L = tinyInstance('...\n...', [[[0, 0], [1, 1]]]);

  it('accepts a valid schedule and reports the arrival time in ms', () => {
    const s = [acts([0, 0], ['forward', 1000, [1, 0], 'E'], ['turn-right', 500, [1, 0], 'S'], ['forward', 1000, [1, 1], 'S'], ['turn-left', 500, [1, 1], 'E'])];
    // Arrival = end of the last forward into the goal, 2500 ms; the turn after it is free.
    expect(validateSchedule(L, s, PROFILE, { startHeading: 'E' })).toEqual({ ok: true, soc: 2500, makespan: 2500 });
  });

  it('lets waits last any positive length, or exactly waitMs with waits: profile', () => {
    const s = [acts([0, 0], ['wait', 137, [0, 0], 'S'], ['forward', 1000, [0, 1], 'S'], ['turn-left', 500, [0, 1], 'E'], ['forward', 1000, [1, 1], 'E'])];
    expect(validateSchedule(L, s, PROFILE, FREE)).toEqual({ ok: true, soc: 2637, makespan: 2637 });
    expect(validateSchedule(L, s, PROFILE, { startHeading: 'free', waits: 'profile' }).violation).toMatchObject({ kind: 'bad-duration', agents: [0], time: 0 });
    const zero = [acts([0, 0], ['wait', 0, [0, 0], 'S'], ['forward', 1000, [0, 1], 'S'], ['turn-left', 500, [0, 1], 'E'], ['forward', 1000, [1, 1], 'E'])];
    expect(validateSchedule(L, zero, PROFILE, FREE).violation).toMatchObject({ kind: 'bad-duration' });
  });

  it('accepts an empty list only when start = goal', () => {
    const same = tinyInstance('..', [[[1, 0], [1, 0]]]);
    expect(validateSchedule(same, [[]], PROFILE, FREE)).toEqual({ ok: true, soc: 0, makespan: 0 });
    expect(validateSchedule(L, [[]], PROFILE, FREE).violation).toMatchObject({ kind: 'wrong-goal', agents: [0], time: 0 });
  });

  it('reports gaps and overlaps between an agent’s own actions', () => {
    const s = acts([0, 0], ['forward', 1000, [1, 0], 'E'], ['turn-right', 500, [1, 0], 'S'], ['forward', 1000, [1, 1], 'S']);
    const late = [[s[0], { ...s[1], start: 1001, end: 1501 }, { ...s[2], start: 1501, end: 2501 }]];
    expect(validateSchedule(L, late, PROFILE, FREE).violation).toEqual({
      kind: 'gap',
      agents: [0],
      time: 1000,
      cell: [1, 0],
      message: 'action 1 (turn-right) of agent 0 starts at 1001 ms, but the previous action ended at 1000 ms',
    });
    const notAtZero = [s.map((a) => ({ ...a, start: a.start + 5, end: a.end + 5 }))];
    expect(validateSchedule(L, notAtZero, PROFILE, FREE).violation).toMatchObject({ kind: 'gap', time: 0 });
  });

  it('reports wrong durations, headings, moves, start, goal, cells and steps', () => {
    const good = acts([0, 0], ['forward', 1000, [1, 0], 'E'], ['turn-right', 500, [1, 0], 'S'], ['forward', 1000, [1, 1], 'S']);
    const check = (plan: ScheduledAction[], startHeading: Heading | 'free' = 'free', inst = L) => validateSchedule(inst, [plan], PROFILE, { startHeading }).violation;
    expect(check([{ ...good[0], end: 999 }, ...good.slice(1)])).toMatchObject({ kind: 'bad-duration', time: 0 });
    expect(check(good, 'N')).toMatchObject({ kind: 'bad-heading', time: 0, message: 'action 0 (forward) of agent 0 ends facing E, but it must end facing N (facing N before it)' });
    expect(check([good[0], { ...good[1], heading: 'N' }, good[2]])).toMatchObject({ kind: 'bad-heading', time: 1000 });
    expect(check([good[0], good[1], { ...good[2], heading: 'E' }])).toMatchObject({ kind: 'bad-heading', time: 1500 });
    expect(check([good[0], good[1], { ...good[2], to: [2, 0] }])).toMatchObject({ kind: 'bad-move', time: 1500, cell: [1, 0] });
    expect(check([good[0], { ...good[1], to: [1, 1] }, good[2]])).toMatchObject({ kind: 'bad-move', time: 1000 });
    expect(check([good[0], good[1], { ...good[2], from: [0, 0] }])).toMatchObject({ kind: 'bad-move', time: 1500, cell: [0, 0] });
    expect(check(good.map((a) => ({ ...a, from: a.from[0] === 0 ? [0, 1] as CellXY : a.from })))).toMatchObject({ kind: 'wrong-start', time: 0 });
    expect(check(good.slice(0, 2))).toMatchObject({ kind: 'wrong-goal', time: 1500, cell: [1, 0] });
    expect(check([good[0], good[1], { ...good[2], step: 0 }])).toMatchObject({ kind: 'bad-step', time: 1500 });
    expect(check([{ ...good[0], action: 'jump' as ActionKind }])).toMatchObject({ kind: 'bad-move', time: 0 });
    expect(check([good[0], { ...good[1], to: [7, 0] }])).toMatchObject({ kind: 'off-grid', time: 1000 });
    const walled = tinyInstance('.#.\n...', [[[0, 0], [1, 1]]]);
    expect(check(good, 'free', walled)).toMatchObject({ kind: 'blocked-cell', time: 0, cell: [1, 0] });
    expect(validateSchedule(L, [], PROFILE, FREE).violation).toMatchObject({ kind: 'agent-count' });
  });

  describe('occupancy', () => {
    // Agent 0 leaves (1, 0) eastwards over [0, 1000); agent 1 waits at (0, 0), then enters (1, 0).
    const ROW = tinyInstance('...', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const leader = acts([1, 0], ['forward', 1000, [2, 0], 'E']);
    const follower = (waitMs: number) => acts([0, 0], ['wait', waitMs, [0, 0], 'E'], ['forward', 1000, [1, 0], 'E']);

    it('accepts touching intervals: entering a cell the moment the other has fully left it', () => {
      expect(validateSchedule(ROW, [leader, follower(1000)], PROFILE, { startHeading: 'E' })).toEqual({ ok: true, soc: 3000, makespan: 2000 });
    });

    it('rejects an overlap of one millisecond, naming agents, instant and cell', () => {
      expect(validateSchedule(ROW, [leader, follower(999)], PROFILE, { startHeading: 'E' }).violation).toEqual({
        kind: 'overlap',
        agents: [0, 1],
        time: 999,
        cell: [1, 0],
        message: 'agents 0 and 1 both occupy (1, 0) from 999 ms (agent 0 over [0, 1000) ms, agent 1 over [999, ∞) ms)',
      });
    });

    it('rejects classic following (both moving at once), a swap, and crossing a goal after arrival', () => {
      const together = acts([0, 0], ['forward', 1000, [1, 0], 'E']);
      expect(validateSchedule(ROW, [leader, together], PROFILE, { startHeading: 'E' }).violation).toMatchObject({ kind: 'overlap', time: 0, cell: [1, 0] });
      const pair = tinyInstance('..', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
      const swap = [acts([0, 0], ['forward', 1000, [1, 0], 'E']), acts([1, 0], ['forward', 1000, [0, 0], 'W'])];
      expect(validateSchedule(pair, swap, PROFILE, FREE).violation).toMatchObject({ kind: 'overlap', agents: [0, 1], time: 0 });
      // Agent 0 holds (1, 0) from 0 ms (driving in, then resting at its goal); agent 1 drives
      // through it from 3000 ms.
      const through = tinyInstance('....', [[[0, 0], [1, 0]], [[3, 0], [0, 0]]]);
      const plan = [
        acts([0, 0], ['forward', 1000, [1, 0], 'E']),
        acts([3, 0], ['wait', 2000, [3, 0], 'W'], ['forward', 1000, [2, 0], 'W'], ['forward', 1000, [1, 0], 'W'], ['forward', 1000, [0, 0], 'W']),
      ];
      expect(validateSchedule(through, plan, PROFILE, FREE).violation).toMatchObject({
        kind: 'overlap',
        agents: [0, 1],
        time: 3000,
        cell: [1, 0],
        message: 'agents 0 and 1 both occupy (1, 0) from 3000 ms (agent 0 over [0, ∞) ms, agent 1 over [3000, 5000) ms)',
      });
    });

    it('treats an agent with nothing to do as occupying its start forever', () => {
      const inst = tinyInstance('...', [[[1, 0], [1, 0]], [[0, 0], [2, 0]]]);
      const plan = [[], acts([0, 0], ['wait', 5000, [0, 0], 'E'], ['forward', 1000, [1, 0], 'E'], ['forward', 1000, [2, 0], 'E'])];
      expect(validateSchedule(inst, plan, PROFILE, FREE).violation).toMatchObject({ kind: 'overlap', agents: [0, 1], time: 5000, cell: [1, 0] });
    });
  });

  describe('properties', () => {
    const SMALL: RobotProfile = { ...PROFILE, forwardMs: 3, quarterTurnMs: 2 };
    const MAP = '....\n....\n....';
    const heads: Heading[] = ['N', 'E', 'S', 'W'];
    /** A random legal schedule on the 4 × 3 grid with the SMALL profile. */
    const randomSchedule = (rng: ReturnType<typeof createRng>, len: number): { start: CellXY; list: ScheduledAction[] } => {
      let cell: CellXY = [rng.int(4), rng.int(3)];
      const start = cell;
      let h = heads[rng.int(4)];
      let t = 0;
      const list: ScheduledAction[] = [];
      for (let j = 0; j < len; j++) {
        const r = rng.int(4);
        const from = cell;
        let action: ActionKind = 'wait';
        let ms = 1 + rng.int(4);
        if (r === 1 || r === 2) {
          action = r === 1 ? 'turn-right' : 'turn-left';
          h = heads[(heads.indexOf(h) + (r === 1 ? 1 : 3)) % 4];
          ms = 2;
        } else if (r === 3) {
          const d = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] }[h];
          const to: CellXY = [cell[0] + d[0], cell[1] + d[1]];
          if (to[0] >= 0 && to[1] >= 0 && to[0] < 4 && to[1] < 3) {
            action = 'forward';
            cell = to;
            ms = 3;
          }
        }
        list.push({ action, from, to: cell, heading: h, start: t, end: t + ms, step: j });
        t += ms;
      }
      return { start, list };
    };
    /** Brute force: the first integer ms at which two agents hold a common cell, or undefined. */
    const firstShared = (lists: ScheduledAction[][], starts: CellXY[]): number | undefined => {
      const horizon = Math.max(0, ...lists.map((l) => (l.length ? l[l.length - 1].end : 0))) + 1;
      const held = (k: number, t: number): string[] => {
        const l = lists[k];
        const a = l.find((x) => x.start <= t && t < x.end);
        if (a) return a.action === 'forward' ? [String(a.from), String(a.to)] : [String(a.from)];
        return [String(l.length ? l[l.length - 1].to : starts[k])];
      };
      for (let t = 0; t <= horizon; t++) {
        const a = held(0, t);
        if (held(1, t).some((c) => a.includes(c))) return t;
      }
      return undefined;
    };

    it('accepts random legal single-agent schedules, with cost = end of the last forward into the goal', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 0, max: 20 }), (seed, len) => {
          const { start, list } = randomSchedule(createRng(seed), len);
          const goal = list.length ? list[list.length - 1].to : start;
          const inst = tinyInstance(MAP, [[start, goal]]);
          const check = validateSchedule(inst, [list], SMALL, FREE);
          const lastIn = [...list].reverse().find((a) => a.action === 'forward' && String(a.to) === String(goal));
          const returned = list.some((a) => String(a.from) !== String(goal));
          return check.ok && check.soc === (returned && lastIn ? lastIn.end : 0);
        }),
      );
    });

    it('finds the first overlap exactly where a millisecond-by-millisecond scan does', () => {
      fc.assert(
        fc.property(fc.integer(), (seed) => {
          const rng = createRng(seed);
          const a = randomSchedule(rng, 1 + rng.int(8));
          const b = randomSchedule(rng, 1 + rng.int(8));
          const end = (x: { start: CellXY; list: ScheduledAction[] }) => x.list[x.list.length - 1].to;
          const inst = tinyInstance(MAP, [[a.start, end(a)], [b.start, end(b)]]);
          const check = validateSchedule(inst, [a.list, b.list], SMALL, FREE);
          const expected = firstShared([a.list, b.list], [a.start, b.start]);
          return expected === undefined ? check.ok : check.violation?.kind === 'overlap' && check.violation.time === expected;
        }),
        { numRuns: 400 },
      );
    });

    it('catches any action pushed one millisecond late as a gap at the previous end', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 2, max: 15 }), fc.nat(), (seed, len, pick) => {
          const { start, list } = randomSchedule(createRng(seed), len);
          const j = 1 + (pick % (len - 1));
          const bad = list.map((a, k) => (k >= j ? { ...a, start: a.start + 1, end: a.end + 1 } : a));
          const inst = tinyInstance(MAP, [[start, list[list.length - 1].to]]);
          const v = validateSchedule(inst, [bad], SMALL, FREE).violation;
          return v?.kind === 'gap' && v.time === list[j - 1].end;
        }),
      );
    });
  });
});
