/**
 * The CBS low level: space-time A* over (state, time) for one agent under its constraint
 * table (Sharon, Stern, Felner, Sturtevant, "Conflict-based search for optimal multi-agent
 * pathfinding", AIJ 2015). The heuristic is the model's exact distance to the goal, raised by
 * positive constraints (landmarks) and by a minimum length; ties between equal f go to fewer
 * conflicts with the other agents' paths (conflict avoidance table), then to deeper nodes.
 *
 * Goal rule: a node is a goal only when it is a fresh arrival at the goal cell (not a wait
 * there), at or after the minimum length, after every time the goal cell is forbidden and
 * after every landmark elsewhere. So a path never ends while a later constraint forbids
 * resting at the goal. Past the last time any constraint or the avoidance table mentions,
 * states no longer depend on time and are merged, which keeps the space finite and lets an
 * impossible constraint set end the search with "no path".
 */
import type { SearchModel } from '../models/model';
import { UNREACHABLE } from '../grid/distance';
import type { Budget } from './budget';
import type { ConflictAvoidanceTable } from './conflict-avoidance-table';
import type { ConstraintTable } from './constraint-table';
import { IndexHeap } from './index-heap';
import { IntMap } from './int-map';

const F_SHIFT = 2 ** 22;
const C_SHIFT = 2 ** 12;

/** A reusable space-time A* for one model (buffers are kept between calls). */
export class SpaceTimeAStar {
  /** Nodes expanded over all calls. */
  expansions = 0;
  private nState = new Int32Array(4096);
  private nTime = new Int32Array(4096);
  private nParent = new Int32Array(4096);
  private nConf = new Int32Array(4096);
  private nH = new Int32Array(4096);
  private nFlag = new Uint8Array(4096);
  private nClosed = new Uint8Array(4096);
  private nodeCount = 0;
  private readonly open = new IndexHeap();
  private readonly index = new IntMap(1 << 14);

  /** Creates a planner over `model`'s state graph; `budget` is checked every 256 expansions. */
  constructor(private readonly model: SearchModel, private readonly budget: Budget) {}

  /**
   * A minimum-cost path of states for `agent` satisfying `table` (fewest avoidance-table
   * conflicts among those found first), or null when none exists.
   */
  plan(agent: number, table: ConstraintTable, cat: ConflictAvoidanceTable | null): Int32Array | null {
    const m = this.model;
    const start = m.startStates[agent];
    const goal = m.goalCells[agent];
    const goalDist = m.goalDistances(agent);
    const stateCell = m.stateCell;
    const succStart = m.succStart;
    const succ = m.succ;
    const S = m.stateCount;
    if (table.isContradictory) return null;
    const lengthMin = table.lengthMin;
    const lengthMax = table.lengthMax;
    if (goalDist[start] >= UNREACHABLE || goalDist[start] > lengthMax) return null;
    const hasRules = table.ruleCount > 0;
    const lmCount = table.landmarkTimes.length;
    const lmTimes = table.landmarkTimes;
    const lmCells = table.landmarkCells;
    const lastLm = lmCount > 0 ? lmTimes[lmCount - 1] : -1;
    // For time t ≤ lastLm: index of the first landmark at or after t, its distance table, and
    // the bound "be at the last landmark on time, then walk to the goal".
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

    // Start node.
    const c0 = stateCell[start];
    if (hasRules && table.isVertexBlocked(c0, 0)) return null;
    if (lmCount > 0 && lmTimes[0] === 0 && lmCells[0] !== c0) return null;
    this.open.clear();
    this.index.clear();
    this.nodeCount = 0;
    let h0 = goalDist[start];
    if (lengthMin > h0) h0 = lengthMin;
    if (lmCount > 0 && lmTail > h0) h0 = lmTail;
    const root = this.newNode(start, 0, -1, 0, h0, 0);
    this.index.set(start * 2, root);
    this.open.push(root, h0 * F_SHIFT + h0);

    let checks = 0;
    while (this.open.size > 0) {
      const n = this.open.pop();
      this.nClosed[n] = 1;
      this.expansions++;
      if ((++checks & 255) === 0) this.budget.check();
      const s = this.nState[n];
      const t = this.nTime[n];
      const c = stateCell[s];
      if (c === goal && this.nFlag[n] !== 1 && t >= lengthMin && t > goalWait && t >= lastMove) {
        // Resting at the goal from t on would hit the agents that pass it later: charge those
        // conflicts and let equally short, less conflicting paths go first (CBSH2-RTC's rule).
        if (this.nFlag[n] === 2 || cat === null) return this.reconstruct(n);
        const later = cat.visitsAfter(goal, t);
        if (later === 0) return this.reconstruct(n);
        this.nFlag[n] = 2;
        this.nConf[n] += later;
        this.nClosed[n] = 0;
        const conf2 = this.nConf[n];
        const h = this.nH[n];
        this.open.push(n, (t + h) * F_SHIFT + (conf2 < 1023 ? conf2 : 1023) * C_SHIFT + (h < 4095 ? h : 4095));
        continue;
      }
      const t2 = t + 1;
      if (t2 > lengthMax) continue;
      const conf = this.nConf[n];
      const lmHere = lmCount > 0 && t2 <= lastLm ? lmCells[(nextLm as Int32Array)[t2]] : -1;
      const lmHereT = lmHere >= 0 ? lmTimes[(nextLm as Int32Array)[t2]] : -1;
      const lmHereDist = lmHere >= 0 ? lmDist[(nextLm as Int32Array)[t2]] : null;
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
        const prio = f2 * F_SHIFT + (conf2 < 1023 ? conf2 : 1023) * C_SHIFT + (h2 < 4095 ? h2 : 4095);
        if (old >= 0) {
          if (this.nClosed[old] === 1) continue;
          const ot = this.nTime[old];
          if (t2 > ot || (t2 === ot && conf2 >= this.nConf[old])) continue;
          this.nTime[old] = t2;
          this.nParent[old] = n;
          this.nConf[old] = conf2;
          this.nH[old] = h2;
          this.open.push(old, prio);
        } else {
          const id = this.newNode(s2, t2, n, conf2, h2, flag);
          this.index.set(key, id);
          this.open.push(id, prio);
        }
      }
    }
    return null;
  }

  /**
   * The earliest t ≤ limit at which `agent` (from its start at time 0) can be in cell
   * `target` under the vertex and edge rules of `table`, or limit + 1. Landmarks and length
   * bounds are ignored, so this is a lower bound on the true earliest arrival (what corridor
   * reasoning needs). The undirected edge {blockA, blockB} is unusable when blockA ≥ 0.
   */
  earliestArrival(agent: number, table: ConstraintTable, target: number, limit: number, blockA = -1, blockB = -1): number {
    const m = this.model;
    const start = m.startStates[agent];
    const dist = m.distancesToCell(target);
    const { stateCell, succStart, succ } = m;
    const S = m.stateCount;
    if (dist[start] >= UNREACHABLE || dist[start] > limit) return limit + 1;
    if (table.isVertexBlocked(stateCell[start], 0)) return limit + 1;
    const hasRules = table.ruleCount > 0;
    const capT = table.horizon + 1;
    this.open.clear();
    this.index.clear();
    this.nodeCount = 0;
    const root = this.newNode(start, 0, -1, 0, dist[start], 0);
    this.index.set(start, root);
    this.open.push(root, dist[start] * F_SHIFT);
    let checks = 0;
    while (this.open.size > 0) {
      const n = this.open.pop();
      this.nClosed[n] = 1;
      if ((++checks & 255) === 0) this.budget.check();
      const st = this.nState[n];
      const t = this.nTime[n];
      const c = stateCell[st];
      if (c === target) return t;
      const t2 = t + 1;
      const tc = t2 < capT ? t2 : capT;
      for (let k = succStart[st], kEnd = succStart[st + 1]; k < kEnd; k++) {
        const s2 = succ[k];
        const h2 = dist[s2];
        if (t2 + h2 > limit) continue;
        const c2 = stateCell[s2];
        if (blockA >= 0 && ((c === blockA && c2 === blockB) || (c === blockB && c2 === blockA))) continue;
        if (hasRules) {
          if (table.isVertexBlocked(c2, t2)) continue;
          if (c2 !== c && table.isEdgeBlocked(c, c2, t2)) continue;
        }
        const key = tc * S + s2;
        const old = this.index.get(key);
        if (old >= 0) {
          if (this.nClosed[old] === 1 || t2 >= this.nTime[old]) continue;
          this.nTime[old] = t2;
          this.open.push(old, (t2 + h2) * F_SHIFT + h2);
        } else {
          const id = this.newNode(s2, t2, n, 0, h2, 0);
          this.index.set(key, id);
          this.open.push(id, (t2 + h2) * F_SHIFT + h2);
        }
      }
    }
    return limit + 1;
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

/** Smallest value of `dist` over the states in `cell` (classic: the cell's own entry). */
export function minOverCell(m: SearchModel, dist: Int32Array, cell: number): number {
  if (m.stateCount === m.cellCount) return dist[cell];
  let best = UNREACHABLE;
  for (let s = 0; s < m.stateCount; s++) if (m.stateCell[s] === cell && dist[s] < best) best = dist[s];
  return best;
}
