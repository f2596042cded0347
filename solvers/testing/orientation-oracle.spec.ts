import { createRng } from '../random';
import type { StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { validateOrientationPlan } from '../validate/orientation-split';
import { referenceTurnCost } from './heading-graph-reference';
import { orientationOracle } from './orientation-oracle';
import { tinyInstance } from './tiny-instance';

/** The oracle's optimal SOC, after checking its own plan validates and costs exactly that. */
function optimum(instance: MapfInstance, rule: StartHeading): number | 'unsolvable' {
  const out = orientationOracle(instance, rule);
  if (out.kind === 'unsolvable') return 'unsolvable';
  const check = validateOrientationPlan(instance, out.plan, rule);
  expect(check.violation).toBeUndefined();
  expect(check.soc).toBe(out.soc);
  return out.soc;
}

describe('orientationOracle: hand-worked optima', () => {
  const ROW = tinyInstance('...\n...', [[[0, 0], [2, 0]]]);

  it('one agent two cells east: 2 facing E, 3 facing N or S (one turn), 4 facing W (two), 2 when free', () => {
    expect(optimum(ROW, 'E')).toBe(2);
    expect(optimum(ROW, 'N')).toBe(3);
    expect(optimum(ROW, 'S')).toBe(3);
    expect(optimum(ROW, 'W')).toBe(4);
    expect(optimum(ROW, 'free')).toBe(2);
  });

  it('a per-agent start heading in the instance wins over the plan-wide rule', () => {
    const inst = tinyInstance('...', [[[0, 0], [2, 0], 'W']]);
    expect(optimum(inst, 'free')).toBe(4);
  });

  it('one diagonal cell facing E: forward, turn right, forward = 3', () => {
    expect(optimum(tinyInstance('..\n..', [[[0, 0], [1, 1]]]), 'E')).toBe(3);
  });

  it('two agents passing with one side pocket, facing each other: 4 + 8 = 12', () => {
    // Map "..." over "#.#"; A at (0, 0) facing E → (2, 0), B at (2, 0) facing W → (0, 0).
    // The dodging agent needs forward, turn, forward into the pocket (in at t = 3), two turns,
    // forward out, turn, forward: 8 steps at least. The other may enter (1, 0) only when the
    // dodger has gone into the pocket (t ≥ 3) and needs no turn: arrival 4. Both roles are
    // symmetric, so 12.
    const inst = tinyInstance('...\n#.#', [[[0, 0], [2, 0], 'E'], [[2, 0], [0, 0], 'W']]);
    expect(optimum(inst, 'free')).toBe(12);
  });

  it('two agents on a two-cell corridor exchanging places: unsolvable', () => {
    expect(optimum(tinyInstance('..', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]), 'free')).toBe('unsolvable');
  });
});

describe('orientationOracle against an outside reference', () => {
  it('single-agent optima equal Dijkstra on the (cell, heading) graph built in graphology', () => {
    // Reference: graphology 0.26.0 + graphology-shortest-path 2.1.0 (see heading-graph-reference.ts).
    const rng = createRng(777);
    for (let trial = 0; trial < 30; trial++) {
      const w = 3 + rng.int(3);
      const h = 3 + rng.int(3);
      const rows = Array.from({ length: h }, () => Array.from({ length: w }, () => (rng.next() < 0.25 ? '#' : '.')).join(''));
      const free = rows.flatMap((r, y) => [...r].map((ch, x) => (ch === '.' ? ([x, y] as const) : null))).filter((c) => c !== null);
      if (free.length < 2) continue;
      const s = free[rng.int(free.length)];
      const g = free[rng.int(free.length)];
      const rule = (['N', 'E', 'S', 'W', 'free'] as const)[rng.int(5)];
      const inst = tinyInstance(rows.join('\n'), [[s, g]]);
      const ref = referenceTurnCost(inst.grid, inst.agents[0].start, inst.agents[0].goal, rule, 1, 1);
      expect(optimum(inst, rule)).toBe(ref ?? 'unsolvable');
    }
  });
});
