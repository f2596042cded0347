import fc from 'fast-check';
import { createRng } from '../random';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import { validateClassicPlan } from './classic';
import { validateKRobustPlan } from './k-robust';

const TWO_ROWS = '......\n......';

/** Agent 0 runs along row 0 from (0, 0) to (5, 0); agent 1 waits under (2, 0) and steps up into it at `enterAt`. */
function crossing(enterAt: number) {
  const inst = tinyInstance(TWO_ROWS, [[[0, 0], [5, 0]], [[2, 1], [2, 0]]]);
  const a0 = cellsOf(inst.grid, [[0, 0], [1, 0], [2, 0], [3, 0], [4, 0], [5, 0]]);
  const a1 = [...cellsOf(inst.grid, Array.from({ length: enterAt }, () => [2, 1] as const)), ...cellsOf(inst.grid, [[2, 0]])];
  return { inst, plan: [a0, a1] };
}

describe('validateKRobustPlan', () => {
  it('rejects a second occupancy exactly k steps after the first, and accepts k + 1', () => {
    // Agent 0 is at (2, 0) at t = 2 only.
    for (const k of [1, 2, 3]) {
      const bad = crossing(2 + k);
      expect(validateKRobustPlan(bad.inst, bad.plan, k).violation).toEqual({
        kind: 'k-robust',
        agents: [0, 1],
        time: 2 + k,
        cell: [2, 0],
        message: `agent 1 is at (2, 0) at t = ${2 + k}, only ${k} step${k === 1 ? '' : 's'} after agent 0 was there at t = 2 (k = ${k})`,
      });
      const good = crossing(3 + k);
      expect(validateKRobustPlan(good.inst, good.plan, k)).toEqual({ ok: true, soc: 5 + 3 + k, makespan: Math.max(5, 3 + k) });
    }
  });

  it('forbids following for k ≥ 1 and allows it for k = 0', () => {
    const inst = tinyInstance('...', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const plan = [cellsOf(inst.grid, [[1, 0], [2, 0]]), cellsOf(inst.grid, [[0, 0], [1, 0]])];
    expect(validateKRobustPlan(inst, plan, 0).ok).toBe(true);
    expect(validateKRobustPlan(inst, plan, 1).violation).toMatchObject({ kind: 'k-robust', agents: [0, 1], time: 1, cell: [1, 0] });
  });

  it('reports a swap as a swap for k = 0 and as a k-robust conflict at the arrival for k = 1', () => {
    const inst = tinyInstance('..', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
    const plan = [[0, 1], [1, 0]];
    expect(validateKRobustPlan(inst, plan, 0).violation).toMatchObject({ kind: 'swap', agents: [0, 1], time: 0 });
    // At t = 1 each is where the other was at t = 0; the cell named is agent 0's, (1, 0).
    expect(validateKRobustPlan(inst, plan, 1).violation).toMatchObject({ kind: 'k-robust', agents: [0, 1], time: 1, cell: [1, 0] });
  });

  it('catches an agent passing through a goal up to k steps before its owner arrives there', () => {
    // Agent 0 arrives at its goal (3, 0) at t = 3 and stays; agent 1 crosses (3, 0) at t = 1.
    const inst = tinyInstance('.....\n.....', [[[0, 0], [3, 0]], [[3, 1], [4, 0]]]);
    const a0 = cellsOf(inst.grid, [[0, 0], [1, 0], [2, 0], [3, 0]]);
    const a1 = cellsOf(inst.grid, [[3, 1], [3, 0], [4, 0]]);
    expect(validateKRobustPlan(inst, [a0, a1], 2).violation).toMatchObject({ kind: 'k-robust', agents: [0, 1], time: 3, cell: [3, 0] });
    expect(validateKRobustPlan(inst, [a0, a1], 1).ok).toBe(true);
  });

  it('reports a goal conflict when an agent later enters a resting agent’s goal', () => {
    const inst = tinyInstance('....', [[[0, 0], [1, 0]], [[3, 0], [0, 0]]]);
    const plan = [cellsOf(inst.grid, [[0, 0], [1, 0]]), cellsOf(inst.grid, [[3, 0], [3, 0], [3, 0], [3, 0], [2, 0], [1, 0], [0, 0]])];
    expect(validateKRobustPlan(inst, plan, 2).violation).toMatchObject({ kind: 'goal', agents: [0, 1], time: 5, cell: [1, 0] });
  });

  it('applies the per-agent path rules', () => {
    const inst = tinyInstance('.#.', [[[0, 0], [2, 0]]]);
    expect(validateKRobustPlan(inst, [[0, 1, 2]], 1).violation).toMatchObject({ kind: 'blocked-cell', agents: [0], time: 1 });
    expect(() => validateKRobustPlan(inst, [[0]], -1)).toThrow(RangeError);
  });

  describe('properties', () => {
    const W = 4;
    const MAP = '....\n....\n....';
    const walk = (rng: ReturnType<typeof createRng>, len: number): number[] => {
      let c = rng.int(12);
      const out = [c];
      for (let t = 0; t < len; t++) {
        const x = c % W;
        const y = Math.floor(c / W);
        const options = [c, x > 0 ? c - 1 : c, x < W - 1 ? c + 1 : c, y > 0 ? c - W : c, y < 2 ? c + W : c];
        c = options[rng.int(5)];
        out.push(c);
      }
      return out;
    };
    /** Brute force over all pairs of occupancies: the first time a k-robust conflict shows, or undefined. */
    const bruteFirst = (plan: number[][], k: number): number | undefined => {
      const H = Math.max(...plan.map((p) => p.length - 1));
      const at = (p: number[], t: number) => p[Math.min(t, p.length - 1)];
      let first: number | undefined;
      for (let a = 0; a < plan.length; a++)
        for (let b = a + 1; b < plan.length; b++)
          for (let t1 = 0; t1 <= H; t1++)
            for (let t2 = 0; t2 <= H; t2++) {
              const hit = at(plan[a], t1) === at(plan[b], t2) && Math.abs(t1 - t2) <= k;
              if (hit && (first === undefined || Math.max(t1, t2) < first)) first = Math.max(t1, t2);
            }
      return first;
    };

    it('finds the first conflict exactly when a brute-force pair scan does (k = 1..3)', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 1, max: 3 }), fc.integer({ min: 2, max: 3 }), (seed, k, n) => {
          const rng = createRng(seed);
          const plan = Array.from({ length: n }, () => walk(rng, 1 + rng.int(6)));
          const xy = (c: number): [number, number] => [c % W, Math.floor(c / W)];
          const inst = tinyInstance(MAP, plan.map((p) => [xy(p[0]), xy(p[p.length - 1])] as const));
          const check = validateKRobustPlan(inst, plan, k);
          const expected = bruteFirst(plan, k);
          return expected === undefined ? check.ok : !check.ok && check.violation!.time === expected;
        }),
        { numRuns: 400 },
      );
    });

    it('agrees with the classic validator for k = 0', () => {
      fc.assert(
        fc.property(fc.integer(), (seed) => {
          const rng = createRng(seed);
          const plan = Array.from({ length: 3 }, () => walk(rng, 1 + rng.int(6)));
          const xy = (c: number): [number, number] => [c % W, Math.floor(c / W)];
          const inst = tinyInstance(MAP, plan.map((p) => [xy(p[0]), xy(p[p.length - 1])] as const));
          expect(validateKRobustPlan(inst, plan, 0)).toEqual(validateClassicPlan(inst, plan));
        }),
        { numRuns: 100 },
      );
    });
  });
});
