/**
 * Multi-valued decision diagrams: for one agent and a cost c, the (state, time) pairs that lie
 * on at least one path of cost exactly c satisfying the agent's constraints (Sharon, Stern,
 * Goldenberg, Felner, "The increasing cost tree search for optimal multi-agent pathfinding",
 * AIJ 2013). A level with a single cell means every such path is there at that time, which is
 * how conflicts are classified as cardinal (Boyarski et al., IJCAI 2015).
 */
import type { SearchModel } from '../models/model';
import type { ConstraintTable } from './constraint-table';

/**
 * Index arrays of an MDD: 16-bit where every value fits (state ids of maps with at most 65 536
 * states, node and edge indices of MDDs with at most 65 535 nodes or edges), else 32-bit. The
 * cached MDDs are most of a search's memory, and 16-bit arrays halve them.
 */
export type MddIndexArray = Int32Array | Uint16Array;

/** The smallest index array holding `values` (all in 0 … `max`). */
function compact(values: Int32Array, max: number): MddIndexArray {
  return max <= 0xffff ? Uint16Array.from(values) : values;
}

/** An MDD laid out level by level on typed arrays. */
export class Mdd {
  /** Cell of the single-cell levels, −1 where a level holds several cells; index = time 0…cost. */
  readonly singletonCell: Int32Array;

  /** Wraps built arrays (use {@link buildMdd}). */
  constructor(
    readonly cost: number,
    readonly goalCell: number,
    /** Nodes of level t are `levelStart[t] … levelStart[t + 1] − 1`. */
    readonly levelStart: Int32Array,
    /** State of each node. */
    readonly states: MddIndexArray,
    /** Children of node i (node indices at the next level) are `children[childStart[i] … childStart[i + 1] − 1]`. */
    readonly childStart: MddIndexArray,
    /** See {@link Mdd.childStart}. */
    readonly children: MddIndexArray,
    stateCell: Int32Array,
  ) {
    this.singletonCell = new Int32Array(cost + 1);
    for (let t = 0; t <= cost; t++) {
      const a = levelStart[t];
      const b = levelStart[t + 1];
      const c = stateCell[states[a]];
      let one = true;
      for (let i = a + 1; i < b && one; i++) if (stateCell[states[i]] !== c) one = false;
      this.singletonCell[t] = one ? c : -1;
    }
  }

  /** Bytes held by the typed arrays (memory accounting). */
  get byteSize(): number {
    return this.levelStart.byteLength + this.states.byteLength + this.childStart.byteLength + this.children.byteLength
      + this.singletonCell.byteLength;
  }

  /** Number of nodes at level t (past the cost the agent rests at its goal: 1). */
  width(t: number): number {
    return t > this.cost ? 1 : this.levelStart[t + 1] - this.levelStart[t];
  }

  /** The cell every cost-c path occupies at time t, or −1 (past the cost: the goal). */
  cellIfSingleton(t: number): number {
    return t > this.cost ? this.goalCell : this.singletonCell[t];
  }

  /** Whether level t (t ≤ cost) holds state `s` (classic: states are cells). */
  levelHasCell(t: number, s: number): boolean {
    for (let i = this.levelStart[t]; i < this.levelStart[t + 1]; i++) if (this.states[i] === s) return true;
    return false;
  }

  /** Whether some cost-c path is in `cell` at time t. */
  hasCell(t: number, cell: number, stateCell: Int32Array): boolean {
    if (t > this.cost) return cell === this.goalCell;
    for (let i = this.levelStart[t]; i < this.levelStart[t + 1]; i++) if (stateCell[this.states[i]] === cell) return true;
    return false;
  }
}

/** Growable scratch buffers shared by every MDD build (builds never nest). */
const scratch = {
  states: new Int32Array(4096) as Int32Array<ArrayBuffer>,
  edgeFrom: new Int32Array(8192),
  edgeTo: new Int32Array(8192),
  slotStamp: new Int32Array(0),
  slotIndex: new Int32Array(0),
  stamp: 0,
  pairStamp: new Int32Array(4096),
  pairGen: 0,
};

function grown(a: Int32Array, need: number): Int32Array<ArrayBuffer> {
  if (need <= a.length) return a as Int32Array<ArrayBuffer>;
  let len = a.length * 2;
  while (len < need) len *= 2;
  const b = new Int32Array(len);
  b.set(a);
  return b;
}

/**
 * Builds the MDD of `agent` for paths of cost exactly `cost` (last arrival at the goal at
 * `cost`) under `table`, or null if there is no such path.
 */
export function buildMdd(model: SearchModel, agent: number, table: ConstraintTable, cost: number): Mdd | null {
  const goalDist = model.goalDistances(agent);
  const goal = model.goalCells[agent];
  const stateCell = model.stateCell;
  const { succStart, succ } = model;
  const start = model.startStates[agent];
  if (goalDist[start] > cost) return null;
  const hasRules = table.ruleCount > 0;
  if (scratch.slotStamp.length < model.stateCount) {
    scratch.slotStamp = new Int32Array(model.stateCount);
    scratch.slotIndex = new Int32Array(model.stateCount);
    scratch.stamp = 0;
  }
  const slotStamp = scratch.slotStamp;
  const slotIndex = scratch.slotIndex;
  // Forward sweep: reachable nodes per level that can still reach the goal on time.
  const levelStart = new Int32Array(cost + 2);
  let states = scratch.states;
  let edgeFrom = scratch.edgeFrom;
  let edgeTo = scratch.edgeTo;
  let n = 1;
  let e = 0;
  states[0] = start;
  levelStart[1] = 1;
  for (let t = 0; t < cost; t++) {
    const t2 = t + 1;
    const lm = table.landmarkAt(t2);
    const remaining = cost - t2;
    const stamp = ++scratch.stamp;
    const a = levelStart[t];
    const b = levelStart[t + 1];
    for (let i = a; i < b; i++) {
      const s = states[i];
      const c = stateCell[s];
      for (let k = succStart[s]; k < succStart[s + 1]; k++) {
        const s2 = succ[k];
        if (goalDist[s2] > remaining) continue;
        const c2 = stateCell[s2];
        if (lm >= 0 && c2 !== lm) continue;
        if (hasRules && (table.isVertexBlocked(c2, t2) || (c2 !== c && table.isEdgeBlocked(c, c2, t2)))) continue;
        if (remaining === 0 && c === goal) continue; // the last step must be a fresh arrival
        let j: number;
        if (slotStamp[s2] === stamp) {
          j = slotIndex[s2];
        } else {
          if (n === states.length) states = scratch.states = grown(states, n + 1);
          j = n++;
          states[j] = s2;
          slotStamp[s2] = stamp;
          slotIndex[s2] = j;
        }
        if (e === edgeFrom.length) {
          edgeFrom = scratch.edgeFrom = grown(edgeFrom, e + 1);
          edgeTo = scratch.edgeTo = grown(edgeTo, e + 1);
        }
        edgeFrom[e] = i;
        edgeTo[e] = j;
        e++;
      }
    }
    levelStart[t + 2] = n;
    if (n === levelStart[t + 1]) return null;
  }
  // Backward sweep: keep nodes with a kept child (every node of the last level is at the goal).
  const kept = new Uint8Array(n);
  for (let i = levelStart[cost]; i < n; i++) kept[i] = 1;
  for (let x = e - 1; x >= 0; x--) if (kept[edgeTo[x]] === 1) kept[edgeFrom[x]] = 1;
  if (kept[0] === 0) return null;
  const newIndex = new Int32Array(n);
  let m = 0;
  const outLevel = new Int32Array(cost + 2);
  for (let t = 0; t <= cost; t++) {
    outLevel[t] = m;
    for (let i = levelStart[t]; i < levelStart[t + 1]; i++) if (kept[i] === 1) newIndex[i] = m++;
  }
  outLevel[cost + 1] = m;
  const outStates = new Int32Array(m);
  for (let i = 0; i < n; i++) if (kept[i] === 1) outStates[newIndex[i]] = states[i];
  const childStart = new Int32Array(m + 1);
  for (let x = 0; x < e; x++) if (kept[edgeFrom[x]] === 1 && kept[edgeTo[x]] === 1) childStart[newIndex[edgeFrom[x]] + 1]++;
  for (let i = 0; i < m; i++) childStart[i + 1] += childStart[i];
  const children = new Int32Array(childStart[m]);
  const fillAt = childStart.slice(0, m);
  for (let x = 0; x < e; x++) {
    if (kept[edgeFrom[x]] === 1 && kept[edgeTo[x]] === 1) children[fillAt[newIndex[edgeFrom[x]]]++] = newIndex[edgeTo[x]];
  }
  // Same values in 16-bit arrays where they fit (state ids < stateCount, node ids < m, edge offsets ≤ edge count).
  return new Mdd(cost, goal, outLevel, compact(outStates, model.stateCount - 1), compact(childStart, childStart[m]),
    compact(children, m - 1), stateCell);
}

/**
 * Whether the two agents have a pair of paths of exactly their MDD costs without a vertex,
 * swap or goal conflict — and, with `forbidsFollowing`, without a following conflict (an agent
 * entering the cell the other occupied one step earlier; Stern et al., SoCS 2019) — a search
 * over the product of the two MDDs. If not, the pair is dependent: their joint optimum exceeds
 * the sum of their costs.
 */
export function haveConflictFreePair(m1: Mdd, m2: Mdd, stateCell: Int32Array, forbidsFollowing = false): boolean {
  if (stateCell[m1.states[0]] === stateCell[m2.states[0]]) return false;
  const end = Math.max(m1.cost, m2.cost);
  const last1 = m1.states.length - 1;
  const last2 = m2.states.length - 1;
  let level = new Int32Array(64);
  let next = new Int32Array(64);
  let len = 2;
  level[0] = 0;
  level[1] = 0;
  for (let t = 0; t < end; t++) {
    // Pairs at level t + 1 are deduplicated with a stamp grid over (node of m1, node of m2) at that level.
    const base1 = t + 1 <= m1.cost ? m1.levelStart[t + 1] : last1;
    const w1 = t + 1 <= m1.cost ? m1.levelStart[t + 2] - base1 : 1;
    const base2 = t + 1 <= m2.cost ? m2.levelStart[t + 1] : last2;
    const w2 = t + 1 <= m2.cost ? m2.levelStart[t + 2] - base2 : 1;
    if (scratch.pairStamp.length < w1 * w2) scratch.pairStamp = new Int32Array(w1 * w2 * 2);
    const pairStamp = scratch.pairStamp;
    const gen = ++scratch.pairGen;
    let nextLen = 0;
    for (let p = 0; p < len; p += 2) {
      const i = level[p];
      const j = level[p + 1];
      const ci = stateCell[m1.states[i]];
      const cj = stateCell[m2.states[j]];
      // Past its cost an agent rests on its (single) last-level node.
      const restI = t >= m1.cost;
      const restJ = t >= m2.cost;
      const iFrom = restI ? 0 : m1.childStart[i];
      const iTo = restI ? 1 : m1.childStart[i + 1];
      const jFrom = restJ ? 0 : m2.childStart[j];
      const jTo = restJ ? 1 : m2.childStart[j + 1];
      for (let x = iFrom; x < iTo; x++) {
        const i2 = restI ? last1 : m1.children[x];
        const ci2 = stateCell[m1.states[i2]];
        for (let y = jFrom; y < jTo; y++) {
          const j2 = restJ ? last2 : m2.children[y];
          const cj2 = stateCell[m2.states[j2]];
          if (ci2 === cj2) continue;
          if (ci2 === cj && cj2 === ci && ci !== ci2) continue;
          if (forbidsFollowing && ((ci2 === cj && ci2 !== ci) || (cj2 === ci && cj2 !== cj))) continue;
          const key = (i2 - base1) * w2 + (j2 - base2);
          if (pairStamp[key] === gen) continue;
          pairStamp[key] = gen;
          if (nextLen + 2 > next.length) next = grown(next, nextLen + 2);
          next[nextLen++] = i2;
          next[nextLen++] = j2;
        }
      }
    }
    if (nextLen === 0) return false;
    const tmp = level;
    level = next;
    next = tmp;
    len = nextLen;
  }
  return true;
}
