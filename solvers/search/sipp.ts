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
 *
 * Landmarks (positive constraints of disjoint splitting, sipp-constraints.ts): the state also
 * holds how many of the agent's landmarks the path has met, in their time order (their windows
 * do not overlap, so every plan meets them in that order); a forward move that is one of the
 * next landmark's moves and starts inside its window may advance that count (taken both ways, so
 * no plan is lost), waiting for the window to open where needed, and only a state that has met
 * them all ends the search. Each count is a separate layer of states, so arriving earlier still
 * dominates within a layer and the search stays exact. The estimate of a state is also at least
 * the earliest arrival the remaining landmarks allow: the next landmark's move ends no earlier
 * than its window allows nor than the agent can reach the landmark's cell (exact cost-to-go to
 * that cell, grid/heading-graph-distances.ts), every later one no earlier than its window, and
 * after each the agent still has to reach its goal from the moved-to state. Each part is a lower
 * bound on the same arrival time, so their maximum stays admissible.
 */
import type { ActionKind } from '@shared/plan';
import type { Grid } from '../grid/grid';
import { forwardCell, HEADING_COUNT } from '../grid/heading-graph';
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import { ALWAYS_SAFE, earliestOutside, type CompiledBans, type Landmark, type Windows } from './sipp-constraints';
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
  layer: new Int32Array(1024),
  g: new Float64Array(1024),
  f: new Float64Array(1024),
  tie: new Float64Array(1024),
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
  pool.layer = grow(pool.layer);
  pool.g = grow(pool.g);
  pool.f = grow(pool.f);
  pool.tie = grow(pool.tie);
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
  const landmarks = bans.landmarks;
  const layers = landmarks.length + 1;
  const towards = landmarks.map((m) => distancesToCell(grid, m.cell, F, T));
  const after = landmarks.map((m) => leastAfter(m, fwd, heuristic));
  const floors = layerFloors(landmarks, after, F);
  const keys = grid.width * grid.height * 4 * maxIntervals * 2 * layers;
  best.begin(keys);
  const seenAt = (key: number): number => best.get(key, NONE);

  // Node storage in the shared pools below; `flag` is 1 for a goal-cell state whose visit began
  // at or after the late-goal bound (always 1 when there is none), 0 otherwise.
  let count = 0;
  // Ties on f go to the state nearer its next landmark (`tie`, 0 with none ahead), then to the
  // later one: without the first, states that could reach a landmark before its window opens
  // would all share f and be expanded as one plateau.
  const heap = new SippHeap((a, b) => pool.f[a] < pool.f[b] || (pool.f[a] === pool.f[b] && (pool.tie[a] < pool.tie[b]
    || (pool.tie[a] === pool.tie[b] && (pool.g[a] > pool.g[b] || (pool.g[a] === pool.g[b] && a < b))))));

  const add = (cell: number, head: number, iv: number, flag: number, layer: number, g: number, parent: number, kind: number, moveStart: number): void => {
    const h = heuristic[cell * 4 + head];
    if (h === Infinity || floors[layer] === Infinity) return;
    let f = g + h;
    let tie = 0;
    if (layer < layers - 1) {
      // The next landmark's move ends no earlier than this (see the module comment).
      const mark = landmarks[layer];
      const reach = g + towards[layer][cell * 4 + head];
      // Too late for the window: this state can't meet the landmark, so no plan goes through it.
      if ((mark.isInto ? reach - F : reach) >= mark.to) return;
      const end = mark.isInto ? Math.max(mark.from + F, reach) : Math.max(mark.from, reach) + F;
      f = Math.max(f, end + after[layer], floors[layer]);
      tie = reach;
      if (f === Infinity) return;
    }
    const key = (((cell * 4 + head) * maxIntervals + iv) * 2 + flag) * layers + layer;
    const seen = seenAt(key);
    if (seen !== NONE && pool.g[seen] <= g) return;
    const id = count++;
    if (id >= pool.g.length) growPool();
    pool.cell[id] = cell;
    pool.head[id] = head;
    pool.iv[id] = iv;
    pool.flag[id] = flag;
    pool.layer[id] = layer;
    pool.g[id] = g;
    pool.f[id] = f;
    pool.tie[id] = tie;
    pool.parent[id] = parent;
    pool.kind[id] = kind;
    pool.moveStart[id] = moveStart;
    best.set(key, id);
    heap.push(id);
  };

  const startSafe = safeOf(q.start);
  if (startSafe.from[0] === 0 && startSafe.to[0] > 0) {
    const flag = q.start === goal && startSafe.to[0] === Infinity && L <= 0 ? 1 : 0;
    for (const h of q.startHeadings) add(q.start, h, 0, flag, 0, 0, NONE, K_WAIT, 0);
  }

  let expansions = 0;
  while (heap.size > 0) {
    if ((expansions & 255) === 255 && q.shouldStop?.()) return { plan: null, expansions, isStopped: true };
    const id = heap.pop() as number;
    const cell = pool.cell[id];
    const head = pool.head[id];
    const iv = pool.iv[id];
    const flag = pool.flag[id];
    const layer = pool.layer[id];
    const g = pool.g[id];
    if (seenAt((((cell * 4 + head) * maxIntervals + iv) * 2 + flag) * layers + layer) !== id) continue;
    const safe = safeOf(cell);
    const hi = safe.to[iv];
    if (cell === goal && hi === Infinity && flag === 1 && layer === layers - 1) return { plan: rebuild(id), expansions, isStopped: false };
    expansions++;

    // Turns keep the cell (and so the safe interval and the goal flag).
    if (g + T <= hi) {
      add(cell, (head + 3) & 3, iv, flag, layer, g + T, id, K_LEFT, g); // a left turn: heading − 1 (mod 4)
      add(cell, (head + 1) & 3, iv, flag, layer, g + T, id, K_RIGHT, g);
    }

    // Forward: one successor per reachable safe interval of the next cell.
    const next = fwd[cell * 4 + head];
    if (next === NONE) continue;
    const nextSafe = safeOf(next);
    const moveKey = cell * bans.cellCount + next;
    const moveWin = bans.moveWindows.get(moveKey);
    // The next landmark, when this move is one of its moves.
    const mark = layer < layers - 1 && landmarks[layer].keys.has(moveKey) ? landmarks[layer] : null;
    for (let k = 0; k < nextSafe.from.length; k++) {
      if (nextSafe.to[k] <= g) continue;
      const start = earliestFree(moveWin, Math.max(g, nextSafe.from[k]));
      if (start + F > hi) break; // later intervals start later still
      if (start + F > nextSafe.to[k]) continue;
      const isFinalGoal = next === goal && nextSafe.to[k] === Infinity;
      forward(next, head, k, isFinalGoal, start, layer, Infinity, hi, moveWin, id);
      if (mark !== null) {
        // The same move meeting the landmark: at the earliest start inside its window.
        const inWindow = earliestFree(moveWin, Math.max(start, mark.from));
        if (inWindow < mark.to && inWindow + F <= hi && inWindow + F <= nextSafe.to[k]) {
          forward(next, head, k, isFinalGoal, inWindow, layer + 1, mark.to, hi, moveWin, id);
        }
      }
    }
  }
  return { plan: null, expansions, isStopped: false };

  /** Adds the forward move started at `start` (and, into the final goal visit before the late-goal bound, its late variant starting before `until`). */
  function forward(next: number, head: number, k: number, isFinalGoal: boolean, start: number, layer: number, until: number, hi: number, moveWin: Windows | undefined, id: number): void {
    if (!isFinalGoal || start >= L) {
      add(next, head, k, isFinalGoal ? 1 : 0, layer, start + F, id, K_FORWARD, start);
      return;
    }
    add(next, head, k, 0, layer, start + F, id, K_FORWARD, start);
    const late = earliestFree(moveWin, L);
    if (late + F <= hi && late < until) add(next, head, k, 1, layer, late + F, id, K_FORWARD, late);
  }

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

/**
 * Per layer (landmarks met so far) a lower bound on the arrival time: every landmark still ahead
 * must be met by a move started no earlier than its window opens, and the agent then still needs
 * at least the cost-to-go of the state that move leads to. Infinity when a landmark can't lead
 * to the goal at all; 0 once every landmark is met.
 */
function layerFloors(landmarks: readonly Landmark[], after: readonly number[], F: number): Float64Array {
  const floors = new Float64Array(landmarks.length + 1);
  for (let k = landmarks.length - 1; k >= 0; k--) floors[k] = Math.max(landmarks[k].from + F + after[k], floors[k + 1]);
  return floors;
}

/** Least cost-to-go of the agent's goal from the states a landmark's moves lead to. */
function leastAfter(mark: Landmark, fwd: Int32Array, heuristic: Float64Array): number {
  let least = Infinity;
  for (const { fromCell, toCell } of mark.moves) {
    for (let h = 0; h < 4; h++) if (fwd[fromCell * 4 + h] === toCell) least = Math.min(least, heuristic[toCell * 4 + h]);
  }
  return least;
}

/** Cost-to-go tables towards landmark cells, per grid and durations; emptied when this many are kept. */
const TOWARDS_LIMIT = 256;
const towardsTables = new WeakMap<Grid, Map<string, Float64Array>>();

/** Exact least time from every (cell, heading) state to stand in `cell` (cached). */
function distancesToCell(grid: Grid, cell: number, F: number, T: number): Float64Array {
  let tables = towardsTables.get(grid);
  if (!tables) {
    tables = new Map();
    towardsTables.set(grid, tables);
  }
  const key = `${cell}:${F}:${T}`;
  let table = tables.get(key);
  if (!table) {
    if (tables.size >= TOWARDS_LIMIT) tables.clear();
    table = headingDistancesToGoal(grid, cell, { forwardMs: F, quarterTurnMs: T });
    tables.set(key, table);
  }
  return table;
}
