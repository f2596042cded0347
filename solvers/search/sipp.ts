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
import { forwardCell, HEADING_COUNT, turnedLeft, turnedRight } from '../grid/heading-graph';
import { ALWAYS_SAFE, earliestOutside, type CompiledBans, type Windows } from './sipp-constraints';
import { SippHeap } from './sipp-heap';

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

/** Finds a minimum-arrival-time plan for one agent under its constraints. */
export function sippSearch(q: SippQuery): SippOutcome {
  const { grid, goal, forwardMs: F, quarterTurnMs: T, bans, heuristic } = q;
  const safeOf = (cell: number): Windows => bans.safe.get(cell) ?? ALWAYS_SAFE;
  let maxIntervals = 1;
  for (const w of bans.safe.values()) maxIntervals = Math.max(maxIntervals, w.from.length);
  const L = bans.goalNotBefore;

  // Node storage in parallel arrays; `flag` is 1 for a goal-cell state whose visit began at or
  // after the late-goal bound (always 1 when there is none), 0 otherwise.
  const cellA: number[] = [];
  const headA: number[] = [];
  const ivA: number[] = [];
  const flagA: number[] = [];
  const gA: number[] = [];
  const fA: number[] = [];
  const parentA: number[] = [];
  const moveStartA: number[] = [];
  const kindA: ActionKind[] = [];
  const best = new Map<number, number>();
  const heap = new SippHeap((a, b) => fA[a] < fA[b] || (fA[a] === fA[b] && (gA[a] > gA[b] || (gA[a] === gA[b] && a < b))));

  const add = (cell: number, head: number, iv: number, flag: number, g: number, parent: number, kind: ActionKind, moveStart: number): void => {
    const h = heuristic[cell * HEADING_COUNT + head];
    if (h === Infinity) return;
    const key = ((cell * HEADING_COUNT + head) * maxIntervals + iv) * 2 + flag;
    const seen = best.get(key);
    if (seen !== undefined && gA[seen] <= g) return;
    const id = gA.length;
    cellA.push(cell);
    headA.push(head);
    ivA.push(iv);
    flagA.push(flag);
    gA.push(g);
    fA.push(g + h);
    parentA.push(parent);
    kindA.push(kind);
    moveStartA.push(moveStart);
    best.set(key, id);
    heap.push(id);
  };

  const startSafe = safeOf(q.start);
  if (startSafe.from[0] === 0 && startSafe.to[0] > 0) {
    const flag = q.start === goal && startSafe.to[0] === Infinity && L <= 0 ? 1 : 0;
    for (const h of q.startHeadings) add(q.start, h, 0, flag, 0, NONE, 'wait', 0);
  }

  let expansions = 0;
  while (heap.size > 0) {
    if ((expansions & 255) === 255 && q.shouldStop?.()) return { plan: null, expansions, isStopped: true };
    const id = heap.pop() as number;
    const cell = cellA[id];
    const head = headA[id];
    const iv = ivA[id];
    const flag = flagA[id];
    const g = gA[id];
    if (best.get(((cell * HEADING_COUNT + head) * maxIntervals + iv) * 2 + flag) !== id) continue;
    const safe = safeOf(cell);
    const hi = safe.to[iv];
    if (cell === goal && hi === Infinity && flag === 1) return { plan: rebuild(id), expansions, isStopped: false };
    expansions++;

    // Turns keep the cell (and so the safe interval and the goal flag).
    if (g + T <= hi) {
      add(cell, turnedLeft(head), iv, flag, g + T, id, 'turn-left', g);
      add(cell, turnedRight(head), iv, flag, g + T, id, 'turn-right', g);
    }

    // Forward: one successor per reachable safe interval of the next cell.
    const next = forwardCell(grid, cell, head);
    if (next === NONE) continue;
    const nextSafe = safeOf(next);
    const moveWin = bans.moveWindows.get(cell * bans.cellCount + next);
    for (let k = 0; k < nextSafe.from.length; k++) {
      if (nextSafe.to[k] <= g) continue;
      const start = earliestOutside(moveWin, Math.max(g, nextSafe.from[k]));
      if (start + F > hi) break; // later intervals start later still
      if (start + F > nextSafe.to[k]) continue;
      const isFinalGoal = next === goal && nextSafe.to[k] === Infinity;
      if (!isFinalGoal || start >= L) {
        add(next, head, k, isFinalGoal ? 1 : 0, start + F, id, 'forward', start);
      } else {
        add(next, head, k, 0, start + F, id, 'forward', start);
        const late = earliestOutside(moveWin, L);
        if (late + F <= hi) add(next, head, k, 1, late + F, id, 'forward', late);
      }
    }
  }
  return { plan: null, expansions, isStopped: false };

  function rebuild(last: number): SippPlan {
    const chain: number[] = [];
    for (let n = last; parentA[n] !== NONE; n = parentA[n]) chain.push(n);
    chain.reverse();
    const steps: SippStep[] = [];
    for (const n of chain) {
      const p = parentA[n];
      const s = moveStartA[n];
      if (s > gA[p]) {
        steps.push({ kind: 'wait', from: cellA[p], to: cellA[p], heading: headA[p], start: gA[p], end: s });
      }
      const end = kindA[n] === 'forward' ? s + F : s + T;
      steps.push({ kind: kindA[n], from: cellA[p], to: cellA[n], heading: headA[n], start: s, end });
    }
    return { steps, cost: gA[last] };
  }
}
