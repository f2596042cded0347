import { createRng } from '../random';
import type { MapfInstance } from '../instance';
import { validateKRobustPlan } from '../validate/k-robust';
import { classicOracle } from './classic-oracle';
import { kRobustOracle } from './k-robust-oracle';
import { tinyInstance } from './tiny-instance';

/** The oracle's optimal SOC, after checking its own plan validates for k and costs exactly that. */
function optimum(instance: MapfInstance, k: number): number | 'unsolvable' {
  const out = kRobustOracle(instance, k);
  if (out.kind === 'unsolvable') return 'unsolvable';
  const check = validateKRobustPlan(instance, out.plan, k);
  expect(check.violation).toBeUndefined();
  expect(check.soc).toBe(out.soc);
  return out.soc;
}

const CHAIN = tinyInstance('....', [[[2, 0], [3, 0]], [[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
const CROSS = tinyInstance('...\n...\n...', [[[0, 1], [2, 1]], [[1, 0], [1, 2]]]);

describe('kRobustOracle: hand-worked optima', () => {
  it('a chain of three agents each moving one cell right', () => {
    // k = 0: all move at once, 1 + 1 + 1. k = 1: each may enter a cell only two steps after
    // its last occupant was there, so arrivals 1, 2, 3 → 6. k = 2: three steps apart, and
    // the middle agent is at (1, 0) until t = 2, so arrivals 1, 3, 5 → 9.
    expect(optimum(CHAIN, 0)).toBe(3);
    expect(optimum(CHAIN, 1)).toBe(6);
    expect(optimum(CHAIN, 2)).toBe(9);
  });

  it('two agents crossing at the centre of a 3×3 grid', () => {
    // k = 0: one waits a step, 2 + 3 = 5. k = 1: the centre visits must be ≥ 2 apart
    // (2 + 4), or one detours round a corner (also 4 steps): 6.
    expect(optimum(CROSS, 0)).toBe(5);
    expect(optimum(CROSS, 1)).toBe(6);
  });

  it('two agents on two cells exchanging places: unsolvable for every k', () => {
    const inst = tinyInstance('..', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
    expect(optimum(inst, 0)).toBe('unsolvable');
    expect(optimum(inst, 2)).toBe('unsolvable');
  });
});

describe('kRobustOracle against the classic oracle (written separately)', () => {
  it('k = 0 gives the classic optimum, and the optimum never falls as k grows', () => {
    const rng = createRng(4242);
    let compared = 0;
    for (let trial = 0; trial < 25; trial++) {
      const rows = Array.from({ length: 3 }, () => Array.from({ length: 4 }, () => (rng.next() < 0.2 ? '#' : '.')).join(''));
      const free = rows.flatMap((r, y) => [...r].map((ch, x) => (ch === '.' ? ([x, y] as const) : null))).filter((c) => c !== null);
      if (free.length < 5) continue;
      const pick = (pool: (readonly [number, number])[]) => pool.splice(rng.int(pool.length), 1)[0];
      const s = [...free];
      const g = [...free];
      const inst = tinyInstance(rows.join('\n'), [
        [pick(s), pick(g)],
        [pick(s), pick(g)],
      ]);
      const classic = classicOracle(inst);
      const k0 = optimum(inst, 0);
      expect(k0).toBe(classic.kind === 'solved' ? classic.soc : 'unsolvable');
      const k1 = optimum(inst, 1);
      const k2 = optimum(inst, 2);
      if (k0 !== 'unsolvable' && k1 !== 'unsolvable') expect(k1).toBeGreaterThanOrEqual(k0);
      if (k1 !== 'unsolvable' && k2 !== 'unsolvable') expect(k2).toBeGreaterThanOrEqual(k1);
      // A harder window can only remove plans.
      if (k0 === 'unsolvable') expect(k1).toBe('unsolvable');
      compared++;
    }
    expect(compared).toBeGreaterThan(10);
  });
});
