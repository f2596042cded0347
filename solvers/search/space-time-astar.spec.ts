/**
 * The low level and the MDDs against a reference written here from the rules alone: layered
 * reachability in time over the grid (no shared code with the engine), on random constraint
 * sets of every kind, including constraints after the goal arrival.
 */
import { gridFromText } from '../grid/grid';
import { ClassicModel } from '../models/classic';
import { createRng } from '../random';
import { Budget } from './budget';
import {
  C_EDGE, C_GT_LENGTH, C_LEQ_LENGTH, C_POS_EDGE, C_POS_VERTEX, C_RANGE, C_VERTEX, constraint, type Constraint,
} from './constraint';
import { ConstraintTable } from './constraint-table';
import { buildMdd } from './mdd';
import { SpaceTimeAStar } from './space-time-astar';

const MAP = '....\n.#..\n....';
const W = 4;
const T_MAX = 16;

/** Whether agent 0 may be in `cell` at t, by the rules of the constraint kinds (own and others'). */
function cellAllowed(cons: Constraint[], cell: number, t: number): boolean {
  for (const c of cons) {
    const own = c.agent === 0;
    if (own && c.kind === C_VERTEX && c.a === cell && c.t1 === t) return false;
    if (own && c.kind === C_RANGE && c.a === cell && t >= c.t0 && t <= c.t1) return false;
    if (own && c.kind === C_POS_VERTEX && c.t1 === t && c.a !== cell) return false;
    if (own && c.kind === C_POS_EDGE && ((c.t1 === t && c.b !== cell) || (c.t1 - 1 === t && c.a !== cell))) return false;
    if (!own && c.kind === C_POS_VERTEX && c.a === cell && c.t1 === t) return false;
    if (!own && c.kind === C_POS_EDGE && ((c.b === cell && c.t1 === t) || (c.a === cell && c.t1 - 1 === t))) return false;
    if (!own && c.kind === C_LEQ_LENGTH && c.a === cell && t >= c.t1) return false;
  }
  return true;
}

function moveAllowed(cons: Constraint[], from: number, to: number, t: number): boolean {
  for (const c of cons) {
    if (c.agent === 0 && c.kind === C_EDGE && c.a === from && c.b === to && c.t1 === t) return false;
    if (c.agent !== 0 && c.kind === C_POS_EDGE && c.b === from && c.a === to && c.t1 === t) return false;
  }
  return true;
}

/** Whether a last arrival at `goal` at time T is allowed, including resting there for ever after. */
function finishAllowed(cons: Constraint[], goal: number, T: number): boolean {
  for (const c of cons) {
    if (c.agent === 0 && c.kind === C_LEQ_LENGTH && T > c.t1) return false;
    if (c.agent === 0 && c.kind === C_GT_LENGTH && T <= c.t1) return false;
  }
  for (let t = T; t <= T_MAX + 8; t++) if (!cellAllowed(cons, goal, t)) return false;
  return true;
}

function around(grid: { width: number; height: number; passable: Uint8Array }, c: number): number[] {
  const out = [c];
  const x = c % grid.width;
  if (c >= grid.width && grid.passable[c - grid.width]) out.push(c - grid.width);
  if (x + 1 < grid.width && grid.passable[c + 1]) out.push(c + 1);
  if (c + grid.width < grid.width * grid.height && grid.passable[c + grid.width]) out.push(c + grid.width);
  if (x > 0 && grid.passable[c - 1]) out.push(c - 1);
  return out;
}

/** Layers of (cell, t) on valid paths of cost exactly T (fresh arrival at T), or null. */
function referenceLayers(cons: Constraint[], start: number, goal: number, T: number): Set<number>[] | null {
  const grid = gridFromText(MAP);
  if (!finishAllowed(cons, goal, T)) return null;
  const fwd: Set<number>[] = [new Set(cellAllowed(cons, start, 0) ? [start] : [])];
  for (let t = 1; t <= T; t++) {
    const next = new Set<number>();
    for (const c of fwd[t - 1]) for (const n of around(grid, c)) {
      if (t === T && (n !== goal || c === goal)) continue;
      if (cellAllowed(cons, n, t) && (n === c || moveAllowed(cons, c, n, t))) next.add(n);
    }
    fwd.push(next);
  }
  if (!fwd[T].has(goal)) return null;
  const layers: Set<number>[] = new Array(T + 1);
  layers[T] = new Set([goal]);
  for (let t = T - 1; t >= 0; t--) {
    layers[t] = new Set([...fwd[t]].filter((c) => around(grid, c).some((n) => layers[t + 1].has(n)
      && (n === c || moveAllowed(cons, c, n, t + 1)) && !(t + 1 === T && c === goal))));
  }
  return layers;
}

function randomConstraints(seed: number): Constraint[] {
  const rng = createRng(seed);
  const free = [0, 1, 2, 3, 4, 6, 7, 8, 9, 10, 11];
  const cell = (): number => free[rng.int(free.length)];
  const out: Constraint[] = [];
  const count = 1 + rng.int(6);
  for (let i = 0; i < count; i++) {
    const t = 1 + rng.int(9);
    switch (rng.int(8)) {
      case 0: case 1: out.push(constraint(C_VERTEX, 0, cell(), -1, t, t)); break;
      case 2: {
        const a = cell();
        const grid = gridFromText(MAP);
        const ns = around(grid, a).filter((n) => n !== a);
        out.push(constraint(C_EDGE, 0, a, ns[rng.int(ns.length)], t, t));
        break;
      }
      case 3: out.push(constraint(C_RANGE, 0, cell(), -1, Math.max(0, t - 3), t)); break;
      case 4: if (rng.next() < 0.4) out.push(constraint(C_POS_VERTEX, 0, cell(), -1, t, t)); break;
      case 5: out.push(constraint(C_POS_VERTEX, 1, cell(), -1, t, t)); break;
      case 6: out.push(constraint(rng.next() < 0.5 ? C_GT_LENGTH : C_LEQ_LENGTH, 0, 11, -1, t, t)); break;
      default: out.push(constraint(C_LEQ_LENGTH, 1, cell(), -1, t, t)); break;
    }
  }
  return out;
}

describe('SpaceTimeAStar and buildMdd', () => {
  const grid = gridFromText(MAP);
  const start = 0;
  const goal = 11;
  const model = new ClassicModel(grid, { grid, agents: [{ start, goal }, { start: 3, goal: 8 }] });
  const planner = new SpaceTimeAStar(model, new Budget(undefined, undefined, undefined));

  it('finds the minimum cost under 300 random constraint sets (or none) exactly as the reference', () => {
    let solvable = 0;
    for (let seed = 1; seed <= 300; seed++) {
      const cons = randomConstraints(seed).filter((c) => c.a !== start || c.agent !== 1);
      const table = new ConstraintTable(0, goal, model.cellCount, W, cons);
      const path = planner.plan(0, table, null);
      let best = -1;
      for (let T = 0; T <= T_MAX && best < 0; T++) if (referenceLayers(cons, start, goal, T)) best = T;
      if (best < 0) {
        // The reference only looks up to T_MAX; a longer plan is fine, a shorter one is a bug.
        if (path !== null) expect(path.length - 1).toBeGreaterThan(T_MAX);
        continue;
      }
      solvable++;
      expect(path).not.toBeNull();
      expect((path as Int32Array).length - 1).toBe(best);
      expect(table.admitsPath(path as Int32Array, model.stateCell)).toBe(true);
      // The MDD of that cost holds exactly the reference's (cell, time) pairs.
      const mdd = buildMdd(model, 0, table, best);
      const layers = referenceLayers(cons, start, goal, best) as Set<number>[];
      expect(mdd).not.toBeNull();
      for (let t = 0; t <= best; t++) {
        const got = Array.from(mdd!.states.subarray(mdd!.levelStart[t], mdd!.levelStart[t + 1])).sort((a, b) => a - b);
        expect(got).toEqual([...layers[t]].sort((a, b) => a - b));
      }
    }
    expect(solvable).toBeGreaterThan(200);
  });

  it('does not stop at the goal while a later constraint forbids resting there', () => {
    // Shortest route is 5 steps; the goal is forbidden at t = 8, so the agent must still be away then.
    const table = new ConstraintTable(0, goal, model.cellCount, W, [constraint(C_VERTEX, 0, goal, -1, 8, 8)]);
    const path = planner.plan(0, table, null) as Int32Array;
    expect(path.length - 1).toBe(9);
    expect(path[8]).not.toBe(goal);
  });

  it('treats a length-greater-than constraint as "last arrival after t" (leave and come back)', () => {
    const table = new ConstraintTable(0, goal, model.cellCount, W, [constraint(C_GT_LENGTH, 0, goal, -1, 6, 6)]);
    const path = planner.plan(0, table, null) as Int32Array;
    expect(path.length - 1).toBe(7);
    expect(path[6]).not.toBe(goal);
  });

  it('returns null when the constraints leave no plan', () => {
    const leq = new ConstraintTable(0, goal, model.cellCount, W, [constraint(C_LEQ_LENGTH, 0, goal, -1, 3, 3)]);
    expect(planner.plan(0, leq, null)).toBeNull();
    const closed = new ConstraintTable(0, goal, model.cellCount, W, [constraint(C_LEQ_LENGTH, 1, 7, -1, 0, 0), constraint(C_LEQ_LENGTH, 1, 10, -1, 0, 0)]);
    expect(planner.plan(0, closed, null)).toBeNull();
  });

  it('passes a positive edge constraint as two timed landmarks', () => {
    const table = new ConstraintTable(0, goal, model.cellCount, W, [constraint(C_POS_EDGE, 0, 4, 8, 3, 3)]);
    const path = planner.plan(0, table, null) as Int32Array;
    expect(path[2]).toBe(4);
    expect(path[3]).toBe(8);
    expect(path.length - 1).toBe(6);
  });

  it('gives earliest arrivals that match the reference reachability, with and without a removed edge', () => {
    const cons = [constraint(C_VERTEX, 0, 1, -1, 1, 1), constraint(C_VERTEX, 0, 4, -1, 1, 1)];
    const table = new ConstraintTable(0, goal, model.cellCount, W, cons);
    // Reference: first layer of the time-expanded reachability that contains the target.
    const first = (target: number, block: [number, number] | null): number => {
      let layer = new Set([start]);
      for (let t = 0; t <= 30; t++) {
        if (layer.has(target)) return t;
        const next = new Set<number>();
        for (const c of layer) for (const n of around(grid, c)) {
          if (block && ((c === block[0] && n === block[1]) || (c === block[1] && n === block[0]))) continue;
          if (cellAllowed(cons, n, t + 1)) next.add(n);
        }
        layer = next;
      }
      return 31;
    };
    for (const target of [3, 7, 10, 11]) {
      expect(planner.earliestArrival(0, table, target, 30)).toBe(first(target, null));
      expect(planner.earliestArrival(0, table, target, 30, 2, 3)).toBe(first(target, [2, 3]));
    }
  });
});

describe('buildMdd index arrays', () => {
  it('stores 16-bit arrays on small maps and falls back to 32-bit when state ids pass 65 535, with the same nodes', () => {
    const small = gridFromText(MAP);
    const smallModel = new ClassicModel(small, { grid: small, agents: [{ start: 0, goal: 11 }] });
    const none = new ConstraintTable(0, 11, smallModel.cellCount, W, []);
    const m = buildMdd(smallModel, 0, none, 5);
    expect(m).not.toBeNull();
    expect(m!.states).toBeInstanceOf(Uint16Array);
    expect(m!.children).toBeInstanceOf(Uint16Array);
    // One row of 66 000 free cells: the agent walks from cell 65 990 to 65 995 (5 steps, a single path).
    const width = 66000;
    const row = gridFromText('.'.repeat(width));
    const rowModel = new ClassicModel(row, { grid: row, agents: [{ start: 65990, goal: 65995 }] });
    const big = buildMdd(rowModel, 0, new ConstraintTable(0, 65995, rowModel.cellCount, width, []), 5);
    expect(big).not.toBeNull();
    expect(big!.states).toBeInstanceOf(Int32Array);
    expect(Array.from(big!.states)).toEqual([65990, 65991, 65992, 65993, 65994, 65995]);
    expect(big!.cellIfSingleton(3)).toBe(65993);
  });
});
