import fc from 'fast-check';
import { createRng } from '../random';
import { cellsOf, tinyInstance } from '../testing/tiny-instance';
import { validateClassicPlan } from './classic';

// Open corridor with a side pocket under its middle cell; see also the oracle examples.
const POCKET = '...\n#.#';

describe('validateClassicPlan', () => {
  it('accepts a valid plan with following and recomputes SOC and makespan', () => {
    // Agent 1 moves into (2, 0) at t = 1 while agent 0 leaves it: following, allowed.
    const inst = tinyInstance('....', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const g = inst.grid;
    const check = validateClassicPlan(inst, [cellsOf(g, [[1, 0], [2, 0]]), cellsOf(g, [[0, 0], [1, 0]])]);
    expect(check).toEqual({ ok: true, soc: 2, makespan: 1 });
  });

  it('charges the last arrival at the goal, not padding, and counts leaving and returning', () => {
    const inst = tinyInstance(POCKET, [[[1, 0], [1, 0]], [[0, 0], [2, 0]]]);
    const g = inst.grid;
    // Agent 0 sits on agent 1's way: it steps into the pocket and returns at t = 2.
    const a0 = cellsOf(g, [[1, 0], [1, 1], [1, 0], [1, 0], [1, 0]]);
    const a1 = cellsOf(g, [[0, 0], [1, 0], [2, 0]]);
    const check = validateClassicPlan(inst, [a0, a1]);
    expect(check).toEqual({ ok: true, soc: 4, makespan: 2 });
  });

  it('accepts agents whose start is their goal with a one-cell path', () => {
    const inst = tinyInstance('..', [[[0, 0], [0, 0]]]);
    expect(validateClassicPlan(inst, [[0]])).toEqual({ ok: true, soc: 0, makespan: 0 });
  });

  it('reports a vertex conflict with agents, time, cell and a readable message', () => {
    const inst = tinyInstance('...\n...', [[[0, 0], [2, 0]], [[1, 1], [1, 0]]]);
    const g = inst.grid;
    const check = validateClassicPlan(inst, [cellsOf(g, [[0, 0], [1, 0], [2, 0]]), cellsOf(g, [[1, 1], [1, 0]])]);
    expect(check.ok).toBe(false);
    // Agent 1 reaches its goal (1, 0) at t = 1 at the same time as agent 0 passes.
    expect(check.violation).toEqual({
      kind: 'vertex',
      agents: [0, 1],
      time: 1,
      cell: [1, 0],
      message: 'agents 0 and 1 both at (1, 0) at t = 1',
    });
    expect(check.soc).toBe(3);
  });

  it('reports a swap, and tells it from following', () => {
    const inst = tinyInstance('...', [[[0, 0], [1, 0]], [[1, 0], [0, 0]]]);
    const g = inst.grid;
    const check = validateClassicPlan(inst, [cellsOf(g, [[0, 0], [1, 0]]), cellsOf(g, [[1, 0], [0, 0]])]);
    expect(check.violation).toMatchObject({ kind: 'swap', agents: [0, 1], time: 0, cell: [0, 0] });
    expect(check.violation?.message).toBe('agents 0 and 1 swap (0, 0) and (1, 0) between t = 0 and t = 1');
  });

  it('reports a goal conflict after an agent’s path has ended', () => {
    const inst = tinyInstance('....', [[[0, 0], [1, 0]], [[3, 0], [0, 0]]]);
    const g = inst.grid;
    // Agent 0 is at its goal (1, 0) from t = 1 on; agent 1 passes through it at t = 2.
    const check = validateClassicPlan(inst, [cellsOf(g, [[0, 0], [1, 0]]), cellsOf(g, [[3, 0], [2, 0], [1, 0], [0, 0]])]);
    expect(check.violation).toMatchObject({ kind: 'goal', agents: [0, 1], time: 2, cell: [1, 0] });
    expect(check.violation?.message).toBe('agent 1 enters (1, 0) at t = 2, where agent 0 has stayed at its goal since t = 1');
  });

  it('reports the wrong start, the wrong goal, an empty path and the agent count', () => {
    const inst = tinyInstance('...', [[[0, 0], [2, 0]]]);
    expect(validateClassicPlan(inst, [[1, 2]]).violation).toMatchObject({ kind: 'wrong-start', agents: [0], time: 0, cell: [1, 0] });
    expect(validateClassicPlan(inst, [[0, 1]]).violation).toMatchObject({ kind: 'wrong-goal', agents: [0], time: 1, cell: [1, 0] });
    expect(validateClassicPlan(inst, [[]]).violation).toMatchObject({ kind: 'empty-path', agents: [0], time: 0 });
    expect(validateClassicPlan(inst, [[0, 1, 2], [2]]).violation).toMatchObject({ kind: 'agent-count', agents: [] });
  });

  it('reports a jump, a blocked cell and a cell off the grid', () => {
    const inst = tinyInstance('...\n.#.', [[[0, 0], [2, 0]]]);
    const g = inst.grid;
    // (2, 0) to (0, 1) is index 2 to 3: adjacent indices, but not neighbours (row wrap).
    const wrap = tinyInstance('...\n...', [[[2, 0], [0, 1]]]);
    expect(validateClassicPlan(wrap, [[2, 3]]).violation).toMatchObject({ kind: 'bad-move', agents: [0], time: 0, cell: [2, 0] });
    expect(validateClassicPlan(inst, [cellsOf(g, [[0, 0], [2, 0]])]).violation).toMatchObject({ kind: 'bad-move', time: 0 });
    expect(validateClassicPlan(inst, [cellsOf(g, [[0, 0], [1, 0], [1, 1], [1, 0], [2, 0]])]).violation).toMatchObject({
      kind: 'blocked-cell',
      agents: [0],
      time: 2,
      cell: [1, 1],
    });
    expect(validateClassicPlan(inst, [[0, 1, 7, 2]]).violation).toMatchObject({ kind: 'off-grid', time: 2 });
    expect(validateClassicPlan(inst, [[0, 1.5, 2]]).violation).toMatchObject({ kind: 'off-grid', time: 1 });
  });

  it('reports the earliest violation, and the lowest agents on a tie', () => {
    const inst = tinyInstance('.....\n.....', [
      [[0, 0], [4, 0]],
      [[4, 0], [0, 0]],
      [[0, 1], [2, 1]],
      [[4, 1], [2, 1]],
    ]);
    const g = inst.grid;
    // Agents 2 and 3 meet at (2, 1) at t = 2; agents 0 and 1 meet at (2, 0) at t = 2 too;
    // the tie at t = 2 goes to agents 0 and 1.
    const plan = [
      cellsOf(g, [[0, 0], [1, 0], [2, 0], [3, 0], [4, 0]]),
      cellsOf(g, [[4, 0], [3, 0], [2, 0], [1, 0], [0, 0]]),
      cellsOf(g, [[0, 1], [1, 1], [2, 1]]),
      cellsOf(g, [[4, 1], [3, 1], [2, 1]]),
    ];
    expect(validateClassicPlan(inst, plan).violation).toMatchObject({ kind: 'vertex', agents: [0, 1], time: 2, cell: [2, 0] });
    // An illegal jump of agent 3 from t = 0 beats every conflict at t = 2.
    const early = [plan[0], plan[1], cellsOf(g, [[0, 1], [1, 1], [2, 1]]), cellsOf(g, [[4, 1], [1, 1], [2, 1]])];
    expect(validateClassicPlan(inst, early).violation).toMatchObject({ kind: 'bad-move', agents: [3], time: 0 });
  });

  it('orders a vertex conflict at t before a swap starting at t', () => {
    const inst = tinyInstance('....\n....', [
      [[0, 0], [1, 0]],
      [[1, 0], [0, 0]],
      [[2, 1], [3, 1]],
      [[3, 0], [3, 1]],
    ]);
    const g = inst.grid;
    // Agents 0 and 1 swap from t = 0; agents 2 and 3 meet at (3, 1) at t = 1, later.
    const plan = [cellsOf(g, [[0, 0], [1, 0]]), cellsOf(g, [[1, 0], [0, 0]]), cellsOf(g, [[2, 1], [3, 1]]), cellsOf(g, [[3, 0], [3, 1]])];
    expect(validateClassicPlan(inst, plan).violation).toMatchObject({ kind: 'swap', agents: [0, 1], time: 0 });
    const later = [cellsOf(g, [[0, 0], [0, 0], [1, 0]]), cellsOf(g, [[1, 0], [1, 0], [0, 0]]), plan[2], plan[3]];
    // Now the swap starts at t = 1, after the vertex conflict at t = 1 between agents 2 and 3.
    expect(validateClassicPlan(inst, later).violation).toMatchObject({ kind: 'vertex', agents: [2, 3], time: 1, cell: [3, 1] });
  });

  describe('properties', () => {
    const W = 6;
    const H = 5;
    const MAP = Array.from({ length: H }, () => '.'.repeat(W)).join('\n');

    /** A random walk of `len` steps (waits included) on the empty W × H grid. */
    const walk = (seed: number, len: number): number[] => {
      const rng = createRng(seed);
      let x = rng.int(W);
      let y = rng.int(H);
      const cells = [y * W + x];
      for (let t = 0; t < len; t++) {
        const [dx, dy] = [[0, 0], [1, 0], [-1, 0], [0, 1], [0, -1]][rng.int(5)];
        if (x + dx >= 0 && x + dx < W && y + dy >= 0 && y + dy < H) {
          x += dx;
          y += dy;
        }
        cells.push(y * W + x);
      }
      return cells;
    };

    it('accepts any single-agent walk, with cost = its last arrival', () => {
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 0, max: 30 }), (seed, len) => {
          const path = walk(seed, len);
          const inst = tinyInstance(MAP, [[[path[0] % W, Math.floor(path[0] / W)], [path[len] % W, Math.floor(path[len] / W)]]]);
          const check = validateClassicPlan(inst, [path]);
          let t = len;
          while (t > 0 && path[t - 1] === path[len]) t--;
          return check.ok && check.soc === t && check.makespan === t;
        }),
      );
    });

    it('catches any one-cell change of a valid 2-agent plan that puts the agents together', () => {
      // Agent 0 walks along row 1 and agent 1 along row 2 (moves along the row and waits):
      // never a conflict. Moving one entry of agent 1 onto agent 0's cell at that time must
      // be caught at or before that time, and exactly as a vertex (or goal) conflict there when the
      // changed path still makes legal steps and keeps its start and goal.
      const rowWalk = (seed: number, row: number, len: number): number[] => {
        const rng = createRng(seed);
        let x = rng.int(W);
        const cells = [row * W + x];
        for (let t = 0; t < len; t++) {
          x = Math.min(W - 1, Math.max(0, x + rng.int(3) - 1));
          cells.push(row * W + x);
        }
        return cells;
      };
      fc.assert(
        fc.property(fc.integer(), fc.integer({ min: 1, max: 12 }), fc.nat(), (seed, len, pick) => {
          const a0 = rowWalk(seed, 1, len);
          const a1 = rowWalk(seed + 1, 2, len);
          const xy = (c: number): [number, number] => [c % W, Math.floor(c / W)];
          const inst = tinyInstance(MAP, [[xy(a0[0]), xy(a0[len])], [xy(a1[0]), xy(a1[len])]]);
          if (!validateClassicPlan(inst, [a0, a1]).ok) return false;
          const t = pick % (len + 1);
          const bad = a1.slice();
          bad[t] = a0[t];
          const check = validateClassicPlan(inst, [a0, bad]);
          if (check.ok || check.violation!.time > t) return false;
          const legal = (u: number, v: number) => u === v || Math.abs(u - v) === W || (Math.abs(u - v) === 1 && Math.floor(u / W) === Math.floor(v / W));
          const keepsRules = t > 0 && t < len && legal(bad[t - 1], bad[t]) && legal(bad[t], bad[t + 1]);
          if (!keepsRules) return true;
          const v = check.violation!;
          // Agent 0 resting at its goal since before t makes it a goal conflict.
          let rest = len;
          while (rest > 0 && a0[rest - 1] === a0[len]) rest--;
          const kind = a0[t] === a0[len] && rest < t ? 'goal' : 'vertex';
          return v.kind === kind && v.time === t && v.agents.join() === '0,1' && v.cell.join() === xy(a0[t]).join();
        }),
        { numRuns: 300 },
      );
    });

    it('accepts a conflict-free plan of 60 agents × 200 steps', () => {
      const size = 40;
      const inst = tinyInstance(Array.from({ length: size }, () => '.'.repeat(size)).join('\n'), []);
      // Each agent walks its own row back and forth: conflict-free, 200 steps.
      const paths = Array.from({ length: 60 }, (_, i) =>
        Array.from({ length: 201 }, (_, t) => {
          const row = i % size;
          const col = (i < size ? 0 : 20) + (t % 20 < 10 ? t % 10 : 10 - (t % 10));
          return row * size + col;
        }),
      );
      const agents = paths.map((p) => ({ start: p[0], goal: p[p.length - 1] }));
      // Rows 0..19 hold two agents each, in columns 0..10 and 20..30: never in one cell.
      // No timing assertion here (speed figures belong in benchmarks/); Jest's 5 s test
      // timeout is the only guard, and this takes well under 0.2 s.
      const check = validateClassicPlan({ grid: inst.grid, agents }, paths);
      expect(check).toEqual({ ok: true, soc: 60 * 200, makespan: 200 });
    });
  });
});
