/**
 * The bounded-suboptimal CBS low level: focal search over (state, time) (Pearl and Kim,
 * "Studies in semi-admissible heuristics", IEEE TPAMI 1982), as ECBS uses it (Barer, Sharon,
 * Stern, Felner, "Suboptimal variants of the conflict-based search algorithm for the multi-agent
 * pathfinding problem", SoCS 2014) and EECBS keeps it (Li, Ruml, Koenig, AAAI 2021).
 *
 * OPEN holds every generated, unexpanded node, bucketed by f = t + h (h the same admissible
 * heuristic as space-time-astar.ts: exact distance raised by landmarks and the minimum length).
 * FOCAL holds the OPEN nodes with f ≤ w × f_min and is ordered by the number of conflicts with
 * the other agents' current paths (the conflict avoidance table), then by f, then by h. Goal
 * rule, constraint handling and time merging are those of space-time-astar.ts.
 *
 * Bound: a node whose time improves is reopened even when expanded, so OPEN always holds a
 * node of an optimal path at its optimal time; hence f_min never exceeds the optimal cost
 * under the constraints, and the returned path's cost is at most w × f_min. `lastLowerBound`
 * is that f_min (taken with the goal node still in OPEN), a proven lower bound on the agent's
 * optimal cost under the constraints. With w = 1 the returned path is optimal.
 */
import type { SearchModel } from '../models/model';
import { UNREACHABLE } from '../grid/distance';
import type { Budget } from './budget';
import type { ConflictAvoidanceTable } from './conflict-avoidance-table';
import type { ConstraintTable } from './constraint-table';
import { IndexHeap } from './index-heap';
import { IntMap } from './int-map';
import { minOverCell } from './space-time-astar';
import { boundOf } from './suboptimality';

/** FOCAL key: conflicts, then f, then h (each field below the next one's shift). */
const CONF_SHIFT = 2 ** 32;
const F_SHIFT = 2 ** 16;

/** A reusable focal space-time search for one model (buffers are kept between calls). */
export class FocalSpaceTimeAStar {
  /** Nodes expanded over all calls. */
  expansions = 0;
  /** Lower bound on the optimal cost proved by the last successful `plan` call. */
  lastLowerBound = 0;
  private nState = new Int32Array(4096);
  private nTime = new Int32Array(4096);
  private nParent = new Int32Array(4096);
  private nConf = new Int32Array(4096);
  private nH = new Int32Array(4096);
  private nFlag = new Uint8Array(4096);
  private nClosed = new Uint8Array(4096);
  private nodeCount = 0;
  private readonly focal = new IndexHeap();
  private readonly index = new IntMap(1 << 14);
  /** OPEN by f: the node ids per f (stale entries skipped) and the live count per f. */
  private buckets: number[][] = [];
  private live = new Int32Array(256);
  private maxF = 0;

  /** Creates a planner over `model`'s state graph; `budget` is checked every 256 expansions. */
  constructor(private readonly model: SearchModel, private readonly budget: Budget) {}

  /**
   * A path of states for `agent` satisfying `table` whose cost is at most w × the optimal cost
   * under `table` (fewest avoidance-table conflicts first among the nodes within the bound), or
   * null when none exists. Sets {@link lastLowerBound}.
   */
  plan(agent: number, table: ConstraintTable, cat: ConflictAvoidanceTable | null, w: number): Int32Array | null {
    const m = this.model;
    const start = m.startStates[agent];
    const goal = m.goalCells[agent];
    const goalDist = m.goalDistances(agent);
    const { stateCell, succStart, succ } = m;
    const S = m.stateCount;
    if (table.isContradictory) return null;
    const { lengthMin, lengthMax } = table;
    if (goalDist[start] >= UNREACHABLE || goalDist[start] > lengthMax) return null;
    const hasRules = table.ruleCount > 0;
    const lmCount = table.landmarkTimes.length;
    const lmTimes = table.landmarkTimes;
    const lmCells = table.landmarkCells;
    const lastLm = lmCount > 0 ? lmTimes[lmCount - 1] : -1;
    let nextLm: Int32Array | null = null;
    let lmDist: Int32Array[] = [];
    let lmTail = 0;
    if (lmCount > 0) {
      nextLm = new Int32Array(lastLm + 1);
      let j = lmCount - 1;
      for (let t = lastLm; t >= 0; t--) {
        while (j > 0 && lmTimes[j - 1] >= t) j--;
        nextLm[t] = j;
      }
      lmDist = lmCells.map((c) => m.distancesToCell(c));
      lmTail = lastLm + minOverCell(m, goalDist, lmCells[lmCount - 1]);
    }
    const goalWait = table.goalBlockedUntil;
    const lastMove = table.lastMoveLandmark;
    const catLen = cat ? cat.length : 0;
    const capT = Math.max(table.horizon, catLen, lengthMin, lastLm + 1) + 1;
    if ((capT + 1) * S * 2 >= 0x7fffffff) throw new Error('state space too large for the time-expanded index');

    const c0 = stateCell[start];
    if (hasRules && table.isVertexBlocked(c0, 0)) return null;
    if (lmCount > 0 && lmTimes[0] === 0 && lmCells[0] !== c0) return null;
    this.reset();
    let h0 = goalDist[start];
    if (lengthMin > h0) h0 = lengthMin;
    if (lmCount > 0 && lmTail > h0) h0 = lmTail;
    let fMin = h0;
    let bound = boundOf(fMin, w);
    const root = this.newNode(start, 0, -1, 0, h0, 0);
    this.index.set(start * 2, root);
    this.addOpen(root, bound);

    let checks = 0;
    for (;;) {
      // f_min is the least f in OPEN (successors never have a smaller f: h is consistent); when it
      // rises the bound widens and FOCAL takes the OPEN nodes now within it.
      if (this.live[fMin] === 0) {
        while (fMin <= this.maxF && this.live[fMin] === 0) fMin++;
        if (fMin > this.maxF) break;
        const wider = boundOf(fMin, w);
        for (let f = bound + 1; f <= wider && f <= this.maxF; f++) this.moveToFocal(f);
        if (wider > bound) bound = wider;
      }
      if (this.focal.size === 0) break;
      const n = this.focal.pop();
      const lbHere = fMin;
      this.nClosed[n] = 1;
      const fn = this.nTime[n] + this.nH[n];
      this.live[fn]--;
      this.expansions++;
      if ((++checks & 255) === 0) this.budget.check();
      const s = this.nState[n];
      const t = this.nTime[n];
      const c = stateCell[s];
      if (c === goal && this.nFlag[n] !== 1 && t >= lengthMin && t > goalWait && t >= lastMove) {
        // As in space-time-astar.ts: charge the conflicts of resting at the goal, then retry.
        const later = this.nFlag[n] === 2 || cat === null ? 0 : cat.visitsAfter(goal, t);
        if (later === 0) {
          this.lastLowerBound = lbHere;
          return this.reconstruct(n);
        }
        this.nFlag[n] = 2;
        this.nConf[n] += later;
        this.nClosed[n] = 0;
        this.addOpen(n, bound);
        continue;
      }
      const t2 = t + 1;
      if (t2 > lengthMax) continue;
      const conf = this.nConf[n];
      const lmIdx = lmCount > 0 && t2 <= lastLm ? (nextLm as Int32Array)[t2] : -1;
      const lmHere = lmIdx >= 0 ? lmCells[lmIdx] : -1;
      const lmHereT = lmIdx >= 0 ? lmTimes[lmIdx] : -1;
      const lmHereDist = lmIdx >= 0 ? lmDist[lmIdx] : null;
      const tc = t2 < capT ? t2 : capT;
      for (let k = succStart[s], kEnd = succStart[s + 1]; k < kEnd; k++) {
        const s2 = succ[k];
        let h2 = goalDist[s2];
        if (h2 >= UNREACHABLE) continue;
        const c2 = stateCell[s2];
        if (hasRules) {
          if (table.isVertexBlocked(c2, t2)) continue;
          if (c2 !== c && table.isEdgeBlocked(c, c2, t2)) continue;
        }
        if (lmHere >= 0) {
          if (lmHereT === t2 ? c2 !== lmHere : (lmHereDist as Int32Array)[s2] > lmHereT - t2) continue;
          if (lmTail - t2 > h2) h2 = lmTail - t2;
        }
        if (lengthMin - t2 > h2) h2 = lengthMin - t2;
        if (t2 + h2 > lengthMax) continue;
        const conf2 = cat !== null ? conf + cat.moveCost(c, c2, t2) : conf;
        const flag = c2 === goal && c === goal ? 1 : 0;
        const key = (tc * S + s2) * 2 + flag;
        const old = this.index.get(key);
        const f2 = t2 + h2;
        if (old >= 0) {
          const ot = this.nTime[old];
          const wasClosed = this.nClosed[old] === 1;
          // Reopen only on a better time (keeps an optimal path's node in OPEN); fewer conflicts update open nodes only.
          if (t2 > ot || (t2 === ot && (wasClosed || conf2 >= this.nConf[old]))) continue;
          if (!wasClosed) this.live[ot + this.nH[old]]--;
          this.nTime[old] = t2;
          this.nParent[old] = n;
          this.nConf[old] = conf2;
          this.nH[old] = h2;
          this.nClosed[old] = 0;
          if (f2 < fMin) fMin = f2;
          this.addOpen(old, bound);
        } else {
          const id = this.newNode(s2, t2, n, conf2, h2, flag);
          this.index.set(key, id);
          if (f2 < fMin) fMin = f2;
          this.addOpen(id, bound);
        }
      }
    }
    return null;
  }

  private reset(): void {
    this.focal.clear();
    this.index.clear();
    this.nodeCount = 0;
    for (let f = 0; f <= this.maxF && f < this.buckets.length; f++) {
      if (this.buckets[f] !== undefined) this.buckets[f].length = 0;
      this.live[f] = 0;
    }
    this.maxF = 0;
  }

  /** Puts node `n` (not closed) into OPEN's bucket of its f, and into FOCAL when f ≤ bound. */
  private addOpen(n: number, bound: number): void {
    const f = this.nTime[n] + this.nH[n];
    if (f >= this.live.length) {
      let len = this.live.length * 2;
      while (len <= f) len *= 2;
      const grown = new Int32Array(len);
      grown.set(this.live);
      this.live = grown;
    }
    if (f > this.maxF) this.maxF = f;
    (this.buckets[f] ??= []).push(n);
    this.live[f]++;
    if (f <= bound) this.focal.set(n, this.focalKey(n, f));
  }

  /** Moves the live OPEN nodes of f into FOCAL (stale bucket entries are skipped). */
  private moveToFocal(f: number): void {
    const list = this.buckets[f];
    if (list === undefined) return;
    for (const n of list) {
      if (this.nClosed[n] === 0 && this.nTime[n] + this.nH[n] === f && !this.focal.has(n)) this.focal.set(n, this.focalKey(n, f));
    }
  }

  private focalKey(n: number, f: number): number {
    const conf = this.nConf[n];
    const h = this.nH[n];
    return (conf < 1048575 ? conf : 1048575) * CONF_SHIFT + (f < 65535 ? f : 65535) * F_SHIFT + (h < 65535 ? h : 65535);
  }

  private newNode(state: number, t: number, parent: number, conf: number, h: number, flag: number): number {
    if (this.nodeCount === this.nState.length) this.grow();
    const id = this.nodeCount++;
    this.nState[id] = state;
    this.nTime[id] = t;
    this.nParent[id] = parent;
    this.nConf[id] = conf;
    this.nH[id] = h;
    this.nFlag[id] = flag;
    this.nClosed[id] = 0;
    return id;
  }

  private grow(): void {
    const len = this.nState.length * 2;
    const g32 = (a: Int32Array): Int32Array<ArrayBuffer> => { const b = new Int32Array(len); b.set(a); return b; };
    const g8 = (a: Uint8Array): Uint8Array<ArrayBuffer> => { const b = new Uint8Array(len); b.set(a); return b; };
    this.nState = g32(this.nState);
    this.nTime = g32(this.nTime);
    this.nParent = g32(this.nParent);
    this.nConf = g32(this.nConf);
    this.nH = g32(this.nH);
    this.nFlag = g8(this.nFlag);
    this.nClosed = g8(this.nClosed);
  }

  private reconstruct(n: number): Int32Array {
    const path = new Int32Array(this.nTime[n] + 1);
    for (let i = n; i >= 0; i = this.nParent[i]) path[this.nTime[i]] = this.nState[i];
    return path;
  }
}
