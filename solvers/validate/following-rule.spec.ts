/**
 * The validators' following rule (following-rule.ts; following conflict of Stern et al., SoCS
 * 2019): rejected only when the plan was made with `following: forbidden`; a vertex or swap
 * keeps its own name; on orientation-split plans a cell counts as occupied while its agent
 * waits or turns in it. Hand-written plans; the rule agrees with the k-robust validator for
 * k = 1 (the same rule on unit steps, Atzmon et al., JAIR 2020) on random walks.
 */
import type { Heading } from '@shared/plan';
import { createRng } from '../random';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import { validateClassicPlan } from './classic';
import { validateKRobustPlan } from './k-robust';
import { type OrientedState, validateOrientationPlan } from './orientation-split';

const seq = (...xs: readonly [number, number, Heading][]): OrientedState[] => xs.map(([x, y, heading]) => ({ cell: y * 4 + x, heading }));

describe('following rule in the validators', () => {
  it('classic: following passes when allowed and is a following violation when forbidden', () => {
    const inst = tinyInstance('....', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const g = inst.grid;
    const plan = [cellsOf(g, [[1, 0], [2, 0]]), cellsOf(g, [[0, 0], [1, 0]])];
    expect(validateClassicPlan(inst, plan)).toEqual({ ok: true, soc: 2, makespan: 1 });
    expect(validateClassicPlan(inst, plan, { following: 'allowed' })).toEqual({ ok: true, soc: 2, makespan: 1 });
    expect(validateClassicPlan(inst, plan, { following: 'forbidden' })).toEqual({
      ok: false,
      soc: 2,
      makespan: 1,
      violation: {
        kind: 'following', agents: [0, 1], time: 0, cell: [1, 0],
        message: 'agent 1 enters (1, 0) at t = 1, which agent 0 occupies at t = 0 (following is forbidden)',
      },
    });
    // Waiting one step makes it legal under the forbidden rule.
    const waited = [cellsOf(g, [[1, 0], [2, 0]]), cellsOf(g, [[0, 0], [0, 0], [1, 0]])];
    expect(validateClassicPlan(inst, waited, { following: 'forbidden' })).toEqual({ ok: true, soc: 3, makespan: 2 });
  });

  it('the right-angle case: entering a cell its occupant leaves sideways', () => {
    const inst = tinyInstance('...\n...\n...', [[[1, 1], [1, 2]], [[0, 1], [1, 1]]]);
    const g = inst.grid;
    const plan = [cellsOf(g, [[1, 1], [1, 2]]), cellsOf(g, [[0, 1], [1, 1]])];
    expect(validateClassicPlan(inst, plan).ok).toBe(true);
    expect(validateClassicPlan(inst, plan, { following: 'forbidden' }).violation).toMatchObject({ kind: 'following', agents: [0, 1], time: 0, cell: [1, 1] });
  });

  it('keeps vertex, goal and swap violations under their own names', () => {
    const line = tinyInstance('...', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
    const g = line.grid;
    const swap = [cellsOf(g, [[0, 0], [1, 0]]), cellsOf(g, [[1, 0], [0, 0]])];
    expect(validateClassicPlan(line, swap, { following: 'forbidden' }).violation).toMatchObject({ kind: 'swap', time: 0 });
    // Agent 1 moves into (1, 0) where agent 0 stays: a vertex conflict at t = 1, not following at t = 0.
    const stay = tinyInstance('...', [[[1, 0], [1, 0]], [[0, 0], [2, 0]]]);
    const vertex = [cellsOf(g, [[1, 0], [1, 0]]), cellsOf(g, [[0, 0], [1, 0], [2, 0]])];
    expect(validateClassicPlan(stay, vertex, { following: 'forbidden' }).violation).toMatchObject({ kind: 'goal', time: 1 });
  });

  it('orientation-split: an agent turning in a cell occupies it', () => {
    const inst = tinyInstance('....\n....', [[[1, 0], [1, 1]], [[0, 0], [1, 0]]]);
    // Agent 0 turns from E to S at t = 1 (still in (1, 0)), drives to (1, 1) at t = 2; agent 1
    // enters (1, 0) at t = 2: following agent 0, which occupied it at t = 1 while turning.
    const plan = [seq([1, 0, 'E'], [1, 0, 'S'], [1, 1, 'S']), seq([0, 0, 'E'], [0, 0, 'E'], [1, 0, 'E'])];
    expect(validateOrientationPlan(inst, plan, 'E')).toEqual({ ok: true, soc: 4, makespan: 2 });
    expect(validateOrientationPlan(inst, plan, 'E', { following: 'forbidden' }).violation).toEqual({
      kind: 'following', agents: [0, 1], time: 1, cell: [1, 0],
      message: 'agent 1 enters (1, 0) at t = 2, which agent 0 occupies at t = 1 (following is forbidden)',
    });
    const later = [plan[0], seq([0, 0, 'E'], [0, 0, 'E'], [0, 0, 'E'], [1, 0, 'E'])];
    expect(validateOrientationPlan(inst, later, 'E', { following: 'forbidden' })).toEqual({ ok: true, soc: 5, makespan: 3 });
  });

  it('agrees with the k-robust validator for k = 1 on random walks (the same rule on unit steps)', () => {
    const grid = tinyInstance('....\n....\n....', []).grid;
    const rng = createRng(12);
    const starts = [[0, 0], [3, 0], [1, 1]] as const;
    let compared = 0;
    let accepted = 0;
    let followingFound = 0;
    for (let trial = 0; trial < 400; trial++) {
      // Legal random walks; each agent's goal is where its walk ends, so only conflicts can fail.
      const paths = starts.map(([sx, sy]) => {
        const p = [sy * grid.width + sx];
        for (let t = 0; t < 5; t++) {
          const c = p[p.length - 1];
          const x = c % grid.width;
          const y = Math.floor(c / grid.width);
          const options = [[x, y], [x + 1, y], [x - 1, y], [x, y + 1], [x, y - 1]].filter(([u, v]) => u >= 0 && v >= 0 && u < grid.width && v < grid.height);
          const [u, v] = options[rng.int(options.length)];
          p.push(v * grid.width + u);
        }
        return p;
      });
      const inst = { grid, agents: paths.map((p) => ({ start: p[0], goal: p[p.length - 1] })) };
      const classic = validateClassicPlan(inst, paths, { following: 'forbidden' });
      const robust = validateKRobustPlan(inst, paths, 1);
      expect(classic.ok).toBe(robust.ok);
      if (!classic.ok) expect(['vertex', 'goal', 'swap', 'following']).toContain(classic.violation?.kind);
      if (classic.ok) accepted++;
      if (classic.violation?.kind === 'following') followingFound++;
      compared++;
    }
    expect(compared).toBe(400);
    expect(accepted).toBeGreaterThanOrEqual(10);
    expect(followingFound).toBeGreaterThanOrEqual(10);
  });
});
