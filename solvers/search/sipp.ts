/**
 * Safe Interval Path Planning (Phillips & Likhachev, "SIPP: Safe interval path planning for
 * dynamic environments", ICRA 2011) over (cell, heading) states with integer durations, the
 * low level of the weighted-split CBS (solvers/search/ccbs.ts).
 *
 * Occupancy rule (weighted-split): an agent occupies its cell while turning or waiting, and
 * BOTH cells for the whole of a forward move; before its first action it occupies its start,
 * after its last action its goal cell forever. Intervals are half-open [start, end).
 *
 * A search state is (cell, heading, safe interval of the cell); its g is the earliest time the
 * agent can stand in that cell with that heading inside that interval. Because a robot may wait
 * for any positive integer number of ms, arriving earlier dominates arriving later in the same
 * interval (every later departure stays possible), so one node per state is exact without
 * enumerating milliseconds. A forward move started at t occupies the current cell and the next
 * one over [t, t + forwardMs): it is taken at the earliest t ≥ g that lies outside the move's
 * forbidden start windows and keeps both cells inside their safe intervals; turns occupy the
 * current cell over [g, g + quarterTurnMs). The goal is reached in a state of the goal cell
 * whose safe interval is unbounded (the agent stays forever) and whose visit began no earlier
 * than the late-goal constraint allows.
 */
import type { ActionKind } from '@shared/plan';
import type { Grid } from '../grid/grid';
import { forwardCell, HEADING_COUNT } from '../grid/heading-graph';
import { ALWAYS_SAFE, earliestOutside, type CompiledBans, type Windows } from './sipp-constraints';
import { SippHeap } from './sipp-heap';
import { StampedBest } from './stamped-best';

/** One timed action of a low-level plan; cells are indices, heading is the index after the action. */
export interface SippStep {
  readonly kind: ActionKind;
  readonly from: number;
  readonly to: number;
  readonly heading: number;
  readonly start: number;
  readonly end: number;
}

/** A single-agent plan: contiguous timed actions from time 0; `cost` = arrival time at the goal (ms). */
export interface SippPlan {
  readonly steps: readonly SippStep[];
  readonly cost: number;
}

/** What one low-level search needs. */
export interface SippQuery {
  readonly grid: Grid;
  readonly start: number;
  readonly goal: number;
  /** Heading indices the agent may have at time 0 (all four for a `free` start heading). */
  readonly startHeadings: readonly number[];
  readonly forwardMs: number;
  readonly quarterTurnMs: number;
  readonly bans: CompiledBans;
  /** Cost-to-go per packed state (grid/heading-graph-distances.ts). */
  readonly heuristic: Float64Array;
  /** Polled every few hundred expansions; true stops the search. */
  readonly shouldStop?: () => boolean;
}

/** The outcome of one low-level search. */
export interface SippOutcome {
  /** The optimal plan, or null when none exists (or the search was stopped). */
  readonly plan: SippPlan | null;
  /** Nodes expanded. */
  readonly expansions: number;
  /** Whether `shouldStop` ended the search early. */
  readonly isStopped: boolean;
}

const NONE = -1;

// Module-local copies of hot imports (a CommonJS build reads imported bindings through getters).
const SAFE_ALWAYS = ALWAYS_SAFE;
const earliestFree = earliestOutside;

/** Per grid the forward neighbour of every packed (cell, heading) state, NONE off the grid or blocked. */
const forwardTables = new WeakMap<Grid, Int32Array>();

/** The forward-neighbour table of a grid (built once per grid). */
export function forwardTable(grid: Grid): Int32Array {
  let table = forwardTables.get(grid);
  if (!table) {
    table = new Int32Array(grid.width * grid.height * HEADING_COUNT);
    for (let cell = 0; cell < grid.width * grid.height; cell++) {
      for (let h = 0; h < HEADING_COUNT; h++) table[cell * HEADING_COUNT + h] = grid.passable[cell] === 1 ? forwardCell(grid, cell, h) : NONE;
    }
    forwardTables.set(grid, table);
  }
  return table;
}

/** The best node per search state, shared by all searches (SIPP is never re-entered). */
const best = new StampedBest();

/** Action kinds of the node pool. */
const K_WAIT = 0;
const K_FORWARD = 1;
const K_LEFT = 2;
const K_RIGHT = 3;
const KINDS: readonly ActionKind[] = ['wait', 'forward', 'turn-left', 'turn-right'];

/** The search nodes, in parallel typed arrays shared by all searches (reused, so no garbage per search). */
const pool = {
  cell: new Int32Array(1024),
  head: new Uint8Array(1024),
  iv: new Int32Array(1024),
  flag: new Uint8Array(1024),
  g: new Float64Array(1024),
  f: new Float64Array(1024),
  parent: new Int32Array(1024),
  kind: new Uint8Array(1024),
  moveStart: new Float64Array(1024),
};

/** Doubles every pool array, keeping its contents. */
function growPool(): void {
  const grow = <A extends Int32Array | Uint8Array | Float64Array>(a: A): A => {
    const b = new (a.constructor as new (n: number) => A)(a.length * 2);
    b.set(a);
    return b;
  };
  pool.cell = grow(pool.cell);
  pool.head = grow(pool.head);
  pool.iv = grow(pool.iv);
  pool.flag = grow(pool.flag);
  pool.g = grow(pool.g);
  pool.f = grow(pool.f);
  pool.parent = grow(pool.parent);
  pool.kind = grow(pool.kind);
  pool.moveStart = grow(pool.moveStart);
}

/** Finds a minimum-arrival-time plan for one agent under its constraints. */
export function sippSearch(q: SippQuery): SippOutcome {
  const { grid, goal, forwardMs: F, quarterTurnMs: T, bans, heuristic } = q;
  const safeOf = (cell: number): Windows => bans.safe.get(cell) ?? SAFE_ALWAYS;
  let maxIntervals = 1;
  for (const w of bans.safe.values()) maxIntervals = Math.max(maxIntervals, w.from.length);
  const L = bans.goalNotBefore;
  const fwd = forwardTable(grid);
  const keys = grid.width * grid.height * 4 * maxIntervals * 2;
  best.begin(keys);
  const seenAt = (key: number): number => best.get(key, NONE);

  // Node storage in the shared pools below; `flag` is 1 for a goal-cell state whose visit began
  // at or after the late-goal bound (always 1 when there is none), 0 otherwise.
  let count = 0;
  const heap = new SippHeap((a, b) => pool.f[a] < pool.f[b] || (pool.f[a] === pool.f[b] && (pool.g[a] > pool.g[b] || (pool.g[a] === pool.g[b] && a < b))));

  const add = (cell: number, head: number, iv: number, flag: number, g: number, parent: number, kind: number, moveStart: number): void => {
    const h = heuristic[cell * 4 + head];
    if (h === Infinity) return;
    const key = ((cell * 4 + head) * maxIntervals + iv) * 2 + flag;
    const seen = seenAt(key);
    if (seen !== NONE && pool.g[seen] <= g) return;
    const id = count++;
    if (id >= pool.g.length) growPool();
    pool.cell[id] = cell;
    pool.head[id] = head;
    pool.iv[id] = iv;
    pool.flag[id] = flag;
    pool.g[id] = g;
    pool.f[id] = g + h;
    pool.parent[id] = parent;
    pool.kind[id] = kind;
    pool.moveStart[id] = moveStart;
    best.set(key, id);
    heap.push(id);
  };

  const startSafe = safeOf(q.start);
  if (startSafe.from[0] === 0 && startSafe.to[0] > 0) {
    const flag = q.start === goal && startSafe.to[0] === Infinity && L <= 0 ? 1 : 0;
    for (const h of q.startHeadings) add(q.start, h, 0, flag, 0, NONE, K_WAIT, 0);
  }

  let expansions = 0;
  while (heap.size > 0) {
    if ((expansions & 255) === 255 && q.shouldStop?.()) return { plan: null, expansions, isStopped: true };
    const id = heap.pop() as number;
    const cell = pool.cell[id];
    const head = pool.head[id];
    const iv = pool.iv[id];
    const flag = pool.flag[id];
    const g = pool.g[id];
    if (seenAt(((cell * 4 + head) * maxIntervals + iv) * 2 + flag) !== id) continue;
    const safe = safeOf(cell);
    const hi = safe.to[iv];
    if (cell === goal && hi === Infinity && flag === 1) return { plan: rebuild(id), expansions, isStopped: false };
    expansions++;

    // Turns keep the cell (and so the safe interval and the goal flag).
    if (g + T <= hi) {
      add(cell, (head + 3) & 3, iv, flag, g + T, id, K_LEFT, g); // a left turn: heading − 1 (mod 4)
      add(cell, (head + 1) & 3, iv, flag, g + T, id, K_RIGHT, g);
    }

    // Forward: one successor per reachable safe interval of the next cell.
    const next = fwd[cell * 4 + head];
    if (next === NONE) continue;
    const nextSafe = safeOf(next);
    const moveWin = bans.moveWindows.get(cell * bans.cellCount + next);
    for (let k = 0; k < nextSafe.from.length; k++) {
      if (nextSafe.to[k] <= g) continue;
      const start = earliestFree(moveWin, Math.max(g, nextSafe.from[k]));
      if (start + F > hi) break; // later intervals start later still
      if (start + F > nextSafe.to[k]) continue;
      const isFinalGoal = next === goal && nextSafe.to[k] === Infinity;
      if (!isFinalGoal || start >= L) {
        add(next, head, k, isFinalGoal ? 1 : 0, start + F, id, K_FORWARD, start);
      } else {
        add(next, head, k, 0, start + F, id, K_FORWARD, start);
        const late = earliestFree(moveWin, L);
        if (late + F <= hi) add(next, head, k, 1, late + F, id, K_FORWARD, late);
      }
    }
  }
  return { plan: null, expansions, isStopped: false };

  function rebuild(last: number): SippPlan {
    const chain: number[] = [];
    for (let n = last; pool.parent[n] !== NONE; n = pool.parent[n]) chain.push(n);
    chain.reverse();
    const steps: SippStep[] = [];
    for (const n of chain) {
      const p = pool.parent[n];
      const s = pool.moveStart[n];
      if (s > pool.g[p]) {
        steps.push({ kind: 'wait', from: pool.cell[p], to: pool.cell[p], heading: pool.head[p], start: pool.g[p], end: s });
      }
      const kind = KINDS[pool.kind[n]];
      const end = kind === 'forward' ? s + F : s + T;
      steps.push({ kind, from: pool.cell[p], to: pool.cell[n], heading: pool.head[n], start: s, end });
    }
    return { steps, cost: pool.g[last] };
  }
}
