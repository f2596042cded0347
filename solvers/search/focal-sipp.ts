/**
 * The bounded-suboptimal low level of weighted-split: focal search (Pearl and Kim, IEEE TPAMI
 * 1982) over the SIPP states of sipp.ts (Phillips & Likhachev, ICRA 2011), as ECBS runs focal
 * search at the low level (Barer, Sharon, Stern, Felner, SoCS 2014). Successors, bans and the
 * goal rule are those of sipp.ts; the order differs: among the open nodes with f ≤ w × f_min
 * (FOCAL) the one whose partial plan overlaps the other agents' current occupancy least is
 * expanded first (then least f).
 *
 * Soft intervals: each safe interval of a cell is further cut where another agent's visit of
 * the cell begins or ends, and a state is (cell, heading, soft interval in which its stay
 * began), after the soft-conflict intervals of SCIPP (Cohen, Uras, Kumar, Xu, Ayanian, Koenig,
 * "Optimal and bounded-suboptimal multi-agent motion planning", SoCS 2019; cited from memory).
 * A move is generated at the earliest start in every soft interval of the next cell, so the
 * search can wait for another agent to pass instead of detouring round it; with one key per
 * safe interval a later, conflict-free arrival would be dominated by the earliest one and lost.
 *
 * Bound: the earliest start of every move is still generated (under the key of the soft
 * interval it falls in), a state keeps the node of its earliest arrival, and a strictly earlier
 * arrival makes a new node even when the state was expanded (sipp.ts's rule), so OPEN always
 * holds a node of an optimal plan at its optimal time; f_min (taken with the goal node still
 * open) is therefore a lower bound on the optimal arrival under the bans, and the plan returned
 * costs at most w × it, or at most the query's `ceiling` when that is higher (FOCAL then takes
 * every open node with f up to the ceiling; the lower bound is still f_min). The extra later
 * starts are plans the bans allow, so every plan returned is valid.
 */
import type { ActionKind } from '@shared/plan';
import type { CellVisit } from './ccbs-conflict';
import { ALWAYS_SAFE, earliestOutside, type Windows } from './sipp-constraints';
import { SippHeap } from './sipp-heap';
import { StampedBest } from './stamped-best';
import { forwardTable, type SippPlan, type SippQuery, type SippStep } from './sipp';
import { boundOf } from './suboptimality';

/** The other agents' occupancy: per cell the visits of every agent (the planned agent's own are skipped). */
export type OccupancyIndex = ReadonlyMap<number, readonly CellVisit[]>;

/** Builds the occupancy index of a set of plans' visits. */
export function occupancyIndex(visits: readonly (readonly CellVisit[])[]): OccupancyIndex {
  const out = new Map<number, CellVisit[]>();
  for (const list of visits) for (const v of list) {
    const at = out.get(v.cell);
    if (at === undefined) out.set(v.cell, [v]);
    else at.push(v);
  }
  return out;
}

/** A focal SIPP query: the SIPP query, the factor, the agent and the others' occupancy. */
export interface FocalSippQuery extends SippQuery {
  readonly w: number;
  readonly agent: number;
  readonly occupancy: OccupancyIndex;
  /** Plans costing up to this also enter FOCAL when it exceeds w × f_min (flex, see ccbs.ts); none by default. */
  readonly ceiling?: number;
}

/** Outcome: the plan (cost ≤ max(w × lowerBound, ceiling)) or null, the lower bound proved, expansions, whether stopped. */
export interface FocalSippOutcome {
  readonly plan: SippPlan | null;
  readonly lowerBound: number;
  readonly expansions: number;
  readonly isStopped: boolean;
}

const NONE = -1;

/** The soft intervals of one cell: the safe intervals cut at the other agents' visit bounds, with each one's safe-interval end. */
interface SoftIntervals {
  readonly from: readonly number[];
  readonly to: readonly number[];
  /** The end of the safe (hard) interval each soft interval lies in. */
  readonly hardTo: readonly number[];
}

/** Cuts the safe windows at the given times (sorted or not); empty pieces are dropped. */
export function softIntervals(safe: Windows, cuts: readonly number[]): SoftIntervals {
  const times = [...new Set(cuts)].sort((a, b) => a - b);
  const from: number[] = [];
  const to: number[] = [];
  const hardTo: number[] = [];
  let c = 0;
  for (let k = 0; k < safe.from.length; k++) {
    let lo = safe.from[k];
    const hi = safe.to[k];
    while (c < times.length && times[c] <= lo) c++;
    for (; c < times.length && times[c] < hi; c++) {
      from.push(lo);
      to.push(times[c]);
      hardTo.push(hi);
      lo = times[c];
    }
    from.push(lo);
    to.push(hi);
    hardTo.push(hi);
  }
  return { from, to, hardTo };
}

// Module-local copies of hot imports (a CommonJS build reads imported bindings through getters).
const SAFE_ALWAYS = ALWAYS_SAFE;
const earliestFree = earliestOutside;

/** The best node per search state (its own table: the searches never nest, but stay apart from sipp.ts's). */
const best = new StampedBest();

/** Finds a plan within w of the minimum arrival time, preferring little overlap with the others. */
export function focalSippSearch(q: FocalSippQuery): FocalSippOutcome {
  const { grid, goal, forwardMs: F, quarterTurnMs: T, bans, heuristic } = q;
  const safeOf = (cell: number): Windows => bans.safe.get(cell) ?? SAFE_ALWAYS;
  const soft = new Map<number, SoftIntervals>();
  const softOf = (cell: number): SoftIntervals => {
    let out = soft.get(cell);
    if (out === undefined) {
      const cuts: number[] = [];
      for (const v of q.occupancy.get(cell) ?? []) if (v.agent !== q.agent) cuts.push(v.enter, v.leave);
      out = softIntervals(safeOf(cell), cuts);
      soft.set(cell, out);
    }
    return out;
  };
  // State keys: a cell with neither bans nor visits has one interval, so (cell, heading, flag)
  // suffices; a busy cell gets its own block sized by its soft-interval bound (its safe intervals
  // plus two per visit), so that one crowded cell does not multiply the key space of the whole map.
  const cellCount = grid.width * grid.height;
  const capOf = new Int32Array(cellCount);
  for (const [cell, w] of bans.safe) capOf[cell] = w.from.length;
  for (const [cell, list] of q.occupancy) capOf[cell] = Math.max(1, capOf[cell]) + 2 * list.length;
  const baseOf = new Int32Array(cellCount);
  let keySlots = cellCount * 4;
  for (let cell = 0; cell < cellCount; cell++) {
    if (capOf[cell] <= 1) continue;
    baseOf[cell] = keySlots;
    keySlots += 4 * capOf[cell];
  }
  const slotOf = (cell: number, head: number, iv: number): number => (capOf[cell] <= 1 ? cell * 4 + head : baseOf[cell] + head * capOf[cell] + iv);
  const L = bans.goalNotBefore;
  // Landmarks come only from the exact search's disjoint splits (ccbs.ts); this search has no layers for them.
  if (bans.landmarks.length > 0) throw new Error('focal SIPP does not take landmarks (disjoint splitting is exact mode only)');
  const fwd = forwardTable(grid);
  best.begin(keySlots * 2);
  const seenAt = (key: number): number => best.get(key, NONE);
  const overlaps = (cell: number, from: number, to: number): number => {
    const list = q.occupancy.get(cell);
    if (list === undefined) return 0;
    let k = 0;
    for (const v of list) if (v.agent !== q.agent && v.enter < to && from < v.leave) k++;
    return k;
  };

  const cellA: number[] = [];
  const headA: number[] = [];
  const ivA: number[] = [];
  const flagA: number[] = [];
  const gA: number[] = [];
  const fA: number[] = [];
  const confA: number[] = [];
  const parentA: number[] = [];
  const moveStartA: number[] = [];
  const kindA: ActionKind[] = [];
  const closedA: number[] = [];
  const keyOf = (id: number): number => slotOf(cellA[id], headA[id], ivA[id]) * 2 + flagA[id];
  const isLive = (id: number): boolean => closedA[id] === 0 && seenAt(keyOf(id)) === id;
  const byF = (a: number, b: number): boolean => fA[a] < fA[b] || (fA[a] === fA[b] && (gA[a] > gA[b] || (gA[a] === gA[b] && a < b)));
  const open = new SippHeap(byF);
  const pending = new SippHeap(byF);
  const focal = new SippHeap((a, b) => confA[a] < confA[b] || (confA[a] === confA[b] && byF(a, b)));
  const liveTop = (heap: SippHeap): number | undefined => {
    for (let id = heap.peek(); id !== undefined; id = heap.peek()) {
      if (isLive(id)) return id;
      heap.pop();
    }
    return undefined;
  };

  const add = (cell: number, head: number, iv: number, flag: number, g: number, parent: number, kind: ActionKind, moveStart: number, conf: number): void => {
    const h = heuristic[cell * 4 + head];
    if (h === Infinity) return;
    const key = slotOf(cell, head, iv) * 2 + flag;
    const seen = seenAt(key);
    if (seen !== NONE && gA[seen] <= g) return;
    const id = gA.length;
    cellA.push(cell);
    headA.push(head);
    ivA.push(iv);
    flagA.push(flag);
    gA.push(g);
    fA.push(g + h);
    confA.push(conf + (cell === goal && flag === 1 ? overlaps(cell, g, Infinity) : 0));
    parentA.push(parent);
    kindA.push(kind);
    moveStartA.push(moveStart);
    closedA.push(0);
    best.set(key, id);
    open.push(id);
    pending.push(id);
  };

  const startSafe = softOf(q.start);
  if (startSafe.from[0] === 0 && startSafe.to[0] > 0) {
    const flag = q.start === goal && startSafe.hardTo[0] === Infinity && L <= 0 ? 1 : 0;
    for (const h of q.startHeadings) add(q.start, h, 0, flag, 0, NONE, 'wait', 0, 0);
  }

  let expansions = 0;
  for (;;) {
    if ((expansions & 255) === 255 && q.shouldStop?.()) return { plan: null, lowerBound: 0, expansions, isStopped: true };
    const top = liveTop(open);
    if (top === undefined) break;
    const fMin = fA[top];
    const bound = Math.max(boundOf(fMin, q.w), q.ceiling ?? 0);
    for (let p = liveTop(pending); p !== undefined && fA[p] <= bound; p = liveTop(pending)) {
      focal.push(p);
      pending.pop();
    }
    const id = liveTop(focal) ?? top;
    closedA[id] = 1;
    const cell = cellA[id];
    const head = headA[id];
    const iv = ivA[id];
    const flag = flagA[id];
    const g = gA[id];
    const conf = confA[id];
    const hi = softOf(cell).hardTo[iv];
    if (cell === goal && hi === Infinity && flag === 1) return { plan: rebuild(id), lowerBound: fMin, expansions, isStopped: false };
    expansions++;

    if (g + T <= hi) {
      const c = conf + overlaps(cell, g, g + T);
      add(cell, (head + 3) & 3, iv, flag, g + T, id, 'turn-left', g, c);
      add(cell, (head + 1) & 3, iv, flag, g + T, id, 'turn-right', g, c);
    }

    const next = fwd[cell * 4 + head];
    if (next === NONE) continue;
    const nextSafe = softOf(next);
    const moveWin = bans.moveWindows.get(cell * bans.cellCount + next);
    for (let k = 0; k < nextSafe.from.length; k++) {
      if (nextSafe.to[k] <= g) continue;
      const start = earliestFree(moveWin, Math.max(g, nextSafe.from[k]));
      if (start + F > hi) break;
      // A start past this soft interval is generated under the interval it falls in.
      if (start >= nextSafe.to[k]) continue;
      if (start + F > nextSafe.hardTo[k]) continue;
      const isFinalGoal = next === goal && nextSafe.hardTo[k] === Infinity;
      const c = conf + overlaps(cell, g, start + F) + overlaps(next, start, start + F);
      if (!isFinalGoal || start >= L) {
        add(next, head, k, isFinalGoal ? 1 : 0, start + F, id, 'forward', start, c);
      } else {
        add(next, head, k, 0, start + F, id, 'forward', start, c);
        const late = earliestFree(moveWin, L);
        if (late + F <= hi && late < nextSafe.to[k]) add(next, head, k, 1, late + F, id, 'forward', late, conf + overlaps(cell, g, late + F) + overlaps(next, late, late + F));
      }
    }
  }
  return { plan: null, lowerBound: 0, expansions, isStopped: false };

  function rebuild(last: number): SippPlan {
    const chain: number[] = [];
    for (let n = last; parentA[n] !== NONE; n = parentA[n]) chain.push(n);
    chain.reverse();
    const steps: SippStep[] = [];
    for (const n of chain) {
      const p = parentA[n];
      const s = moveStartA[n];
      if (s > gA[p]) steps.push({ kind: 'wait', from: cellA[p], to: cellA[p], heading: headA[p], start: gA[p], end: s });
      const end = kindA[n] === 'forward' ? s + F : s + T;
      steps.push({ kind: kindA[n], from: cellA[p], to: cellA[n], heading: headA[n], start: s, end });
    }
    return { steps, cost: gA[last] };
  }
}
