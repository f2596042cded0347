import fc from 'fast-check';
import type { Heading } from '@shared/plan';
import { createRng } from '../random';
import { tinyInstance } from '../testing/tiny-instance';
import { validateOrientationPlan, type OrientedState } from './orientation-split';

const G = tinyInstance('....\n....\n....', []).grid;
/** States from [x, y, heading] triples on the 4 × 3 grid G. */
const seq = (...xs: readonly [number, number, Heading][]): OrientedState[] => xs.map(([x, y, h]) => ({ cell: y * 4 + x, heading: h }));
const MAP = '....\n....\n....';

describe('validateOrientationPlan', () => {
  it('accepts forward, turn and wait steps, charging the last arrival at the goal cell', () => {
    const inst = tinyInstance(MAP, [[[0, 0], [1, 1]]]);
    // Forward E, turn right to S, wait, forward S: arrival at t = 4; the turn at the goal is free.
    const plan = [seq([0, 0, 'E'], [1, 0, 'E'], [1, 0, 'S'], [1, 0, 'S'], [1, 1, 'S'], [1, 1, 'W'])];
    expect(validateOrientationPlan(inst, plan, 'E')).toEqual({ ok: true, soc: 4, makespan: 4 });
  });

  it('enforces the start heading: the rule, a per-agent override, and free', () => {
    const plan = [seq([0, 0, 'N'], [0, 0, 'E'], [1, 0, 'E'])];
    const inst = tinyInstance(MAP, [[[0, 0], [1, 0]]]);
    expect(validateOrientationPlan(inst, plan, 'free').ok).toBe(true);
    expect(validateOrientationPlan(inst, plan, 'N').ok).toBe(true);
    expect(validateOrientationPlan(inst, plan, 'E').violation).toEqual({
      kind: 'bad-heading',
      agents: [0],
      time: 0,
      cell: [0, 0],
      message: 'agent 0 starts facing N, but it must start facing E',
    });
    const fixed = tinyInstance(MAP, [[[0, 0], [1, 0], 'S']]);
    expect(validateOrientationPlan(fixed, plan, 'free').violation).toMatchObject({ kind: 'bad-heading', time: 0 });
  });

  it('rejects a sideways move, a half turn, a move with a turn and a heading that is no heading', () => {
    const inst = tinyInstance(MAP, [[[0, 0], [1, 1]]]);
    const sideways = [seq([0, 0, 'E'], [1, 0, 'E'], [1, 1, 'E'])];
    expect(validateOrientationPlan(inst, sideways, 'E').violation).toMatchObject({ kind: 'bad-move', agents: [0], time: 1, cell: [1, 0] });
    const halfTurn = [seq([0, 0, 'E'], [1, 0, 'E'], [1, 0, 'W'], [1, 0, 'S'], [1, 1, 'S'])];
    expect(validateOrientationPlan(inst, halfTurn, 'E').violation).toMatchObject({ kind: 'bad-move', time: 1 });
    const moveAndTurn = [seq([0, 0, 'E'], [1, 0, 'S'], [1, 1, 'S'])];
    expect(validateOrientationPlan(inst, moveAndTurn, 'E').violation).toMatchObject({ kind: 'bad-move', time: 0 });
    const backwards = [seq([1, 0, 'E'], [0, 0, 'E'])];
    expect(validateOrientationPlan(tinyInstance(MAP, [[[1, 0], [0, 0]]]), backwards, 'E').violation).toMatchObject({ kind: 'bad-move', time: 0 });
    const junk = [[{ cell: 0, heading: 'E' as Heading }, { cell: 1, heading: 'X' as Heading }]];
    expect(validateOrientationPlan(tinyInstance(MAP, [[[0, 0], [1, 0]]]), junk, 'E').violation).toMatchObject({ kind: 'bad-heading', time: 1 });
  });

  it('applies start, goal, grid and count rules', () => {
    const walled = tinyInstance('.#..', [[[0, 0], [2, 0]]]);
    expect(validateOrientationPlan(walled, [[{ cell: 0, heading: 'E' }, { cell: 1, heading: 'E' }, { cell: 2, heading: 'E' }]], 'E').violation).toMatchObject({
      kind: 'blocked-cell',
      time: 1,
      cell: [1, 0],
    });
    const inst = tinyInstance(MAP, [[[0, 0], [1, 0]]]);
    expect(validateOrientationPlan(inst, [seq([1, 0, 'E'])], 'E').violation).toMatchObject({ kind: 'wrong-start' });
    expect(validateOrientationPlan(inst, [seq([0, 0, 'E'])], 'E').violation).toMatchObject({ kind: 'wrong-goal', time: 0 });
    expect(validateOrientationPlan(inst, [[{ cell: 0, heading: 'E' }, { cell: 40, heading: 'E' }]], 'E').violation).toMatchObject({ kind: 'off-grid', time: 1 });
    expect(validateOrientationPlan(inst, [[]], 'E').violation).toMatchObject({ kind: 'empty-path' });
    expect(validateOrientationPlan(inst, [], 'E').violation).toMatchObject({ kind: 'agent-count' });
  });

  it('finds conflicts on cells whatever the headings: vertex, swap, goal; following is fine', () => {
    const two = tinyInstance(MAP, [[[0, 0], [2, 0]], [[1, 1], [1, 0]]]);
    const vertex = [seq([0, 0, 'E'], [1, 0, 'E'], [2, 0, 'E']), seq([1, 1, 'N'], [1, 0, 'N'])];
    expect(validateOrientationPlan(two, vertex, 'free').violation).toEqual({
      kind: 'vertex',
      agents: [0, 1],
      time: 1,
      cell: [1, 0],
      message: 'agents 0 and 1 both at (1, 0) at t = 1',
    });
    const facing = tinyInstance(MAP, [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
    const swap = [seq([0, 0, 'E'], [1, 0, 'E']), seq([1, 0, 'W'], [0, 0, 'W'])];
    expect(validateOrientationPlan(facing, swap, 'free').violation).toMatchObject({ kind: 'swap', agents: [0, 1], time: 0, cell: [0, 0] });
    const train = tinyInstance(MAP, [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const following = [seq([1, 0, 'E'], [2, 0, 'E']), seq([0, 0, 'E'], [1, 0, 'E'])];
    expect(validateOrientationPlan(train, following, 'E')).toEqual({ ok: true, soc: 2, makespan: 1 });
    // Agent 0 rests at (1, 0) from t = 1 (turning there does not matter); agent 1 enters it at t = 3.
    const rest = tinyInstance(MAP, [[[0, 0], [1, 0]], [[3, 0], [0, 0]]]);
    const goal = [seq([0, 0, 'E'], [1, 0, 'E'], [1, 0, 'S']), seq([3, 0, 'W'], [3, 0, 'W'], [2, 0, 'W'], [1, 0, 'W'], [0, 0, 'W'])];
    expect(validateOrientationPlan(rest, goal, 'free').violation).toMatchObject({ kind: 'goal', agents: [0, 1], time: 3, cell: [1, 0] });
  });

  describe('properties', () => {
    /** A random legal walk of `len` steps on the 4 × 3 grid, returned with its states. */
    const walk = (seed: number, len: number): OrientedState[] => {
      const rng = createRng(seed);
      const heads: Heading[] = ['N', 'E', 'S', 'W'];
      let cell = rng.int(12);
      let h = heads[rng.int(4)];
      const out: OrientedState[] = [{ cell, heading: h }];
      for (let t = 0; t < len; t++) {
        const r = rng.int(4);
        if (r === 1) h = heads[(heads.indexOf(h) + 1) % 4];
        if (r === 2) h = heads[(heads.indexOf(h) + 3) % 4];
        if (r === 3) {
          const x = (cell % 4) + { N: 0, E: 1, S: 0, W: -1 }[h];
          const y = Math.floor(cell / 4) + { N: -1, E: 0, S: 1, W: 0 }[h];
          if (x >= 0 && y >= 0 && x < 4 && y < 3) cell = y * 4 + x;
        }
        out.push({ cell, heading: h });
      }
      return out;
    };
    const xy = (c: number): [number, number] => [c % 4, Math.floor(c / 4)];

    it('accepts any legal single-agent walk with a free start, with cost = its last arrival at the goal cell', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 0, max: 25 }), (seed, len) => {
          const s = walk(seed, len);
          const inst = tinyInstance(MAP, [[xy(s[0].cell), xy(s[len].cell)]]);
          let t = len;
          while (t > 0 && s[t - 1].cell === s[len].cell) t--;
          const check = validateOrientationPlan(inst, [s], 'free');
          return check.ok && check.soc === t;
        }),
      );
    });

    it('catches a wait or forward step whose heading is changed to the opposite one', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 1, max: 25 }), fc.nat(), (seed, len, pick) => {
          const s = walk(seed, len);
          const t = 1 + (pick % len);
          // (After a turn the opposite heading is the other legal turn, so only flip waits and moves.)
          fc.pre(s[t - 1].heading === s[t].heading);
          const opposite = { N: 'S', S: 'N', E: 'W', W: 'E' } as const;
          const bad = s.map((st, i) => (i === t ? { ...st, heading: opposite[st.heading] } : st));
          const inst = tinyInstance(MAP, [[xy(s[0].cell), xy(s[len].cell)]]);
          const check = validateOrientationPlan(inst, [bad], 'free');
          // Reaching the flipped state from s[t − 1] needs a half turn or a move against
          // the heading, so the step into t is illegal.
          return !check.ok && check.violation!.kind === 'bad-move' && check.violation!.time === t - 1;
        }),
      );
    });
  });
});
