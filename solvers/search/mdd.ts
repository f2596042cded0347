/**
 * Multi-valued decision diagrams: for one agent and a cost c, the (state, time) pairs that lie
 * on at least one path of cost exactly c satisfying the agent's constraints (Sharon, Stern,
 * Goldenberg, Felner, "The increasing cost tree search for optimal multi-agent pathfinding",
 * AIJ 2013). A level with a single cell means every such path is there at that time, which is
 * how conflicts are classified as cardinal (Boyarski et al., IJCAI 2015).
 */
import type { SearchModel } from '../models/model';
import type { ConstraintTable } from './constraint-table';

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
    readonly states: Int32Array,
    /** Children of node i (node indices at the next level) are `children[childStart[i] … childStart[i + 1] − 1]`. */
    readonly childStart: Int32Array,
    /** See {@link Mdd.childStart}. */
    readonly children: Int32Array,
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
  // Forward sweep: reachable nodes per level that can still reach the goal on time.
  const levelStart: number[] = [0, 1];
  const states: number[] = [start];
  const edgeFrom: number[] = [];
  const edgeTo: number[] = [];
  const slot = new Map<number, number>();
  for (let t = 0; t < cost; t++) {
    const t2 = t + 1;
    const lm = table.landmarkAt(t2);
    const remaining = cost - t2;
    slot.clear();
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
        let j = slot.get(s2);
        if (j === undefined) {
          j = states.length;
          states.push(s2);
          slot.set(s2, j);
        }
        edgeFrom.push(i);
        edgeTo.push(j);
      }
    }
    levelStart.push(states.length);
    if (states.length === levelStart[t + 1]) return null;
  }
  // Backward sweep: keep nodes with a kept child (every node of the last level is at the goal).
  const n = states.length;
  const kept = new Uint8Array(n);
  for (let i = levelStart[cost]; i < n; i++) kept[i] = 1;
  for (let e = edgeFrom.length - 1; e >= 0; e--) if (kept[edgeTo[e]] === 1) kept[edgeFrom[e]] = 1;
  if (kept[0] === 0) return null;
  const newIndex = new Int32Array(n).fill(-1);
  const outStates: number[] = [];
  const outLevel = new Int32Array(cost + 2);
  for (let t = 0; t <= cost; t++) {
    outLevel[t] = outStates.length;
    for (let i = levelStart[t]; i < levelStart[t + 1]; i++) {
      if (kept[i] === 1) {
        newIndex[i] = outStates.length;
        outStates.push(states[i]);
      }
    }
  }
  outLevel[cost + 1] = outStates.length;
  const m = outStates.length;
  const childCount = new Int32Array(m + 1);
  for (let e = 0; e < edgeFrom.length; e++) {
    if (kept[edgeFrom[e]] === 1 && kept[edgeTo[e]] === 1) childCount[newIndex[edgeFrom[e]] + 1]++;
  }
  for (let i = 0; i < m; i++) childCount[i + 1] += childCount[i];
  const children = new Int32Array(childCount[m]);
  const fillAt = childCount.slice(0, m);
  for (let e = 0; e < edgeFrom.length; e++) {
    if (kept[edgeFrom[e]] === 1 && kept[edgeTo[e]] === 1) children[fillAt[newIndex[edgeFrom[e]]]++] = newIndex[edgeTo[e]];
  }
  return new Mdd(cost, goal, outLevel, Int32Array.from(outStates), childCount, children, stateCell);
}

/**
 * Whether the two agents have a pair of paths of exactly their MDD costs without a vertex,
 * swap or goal conflict (a search over the product of the two MDDs). If not, the pair is
 * dependent: their joint optimum exceeds the sum of their costs.
 */
export function haveConflictFreePair(m1: Mdd, m2: Mdd, stateCell: Int32Array): boolean {
  const end = Math.max(m1.cost, m2.cost);
  const n2 = m2.states.length;
  let level: number[] = [0, 0];
  const seen = new Set<number>();
  if (stateCell[m1.states[0]] === stateCell[m2.states[0]]) return false;
  const last1 = m1.states.length - 1;
  const last2 = m2.states.length - 1;
  for (let t = 0; t < end; t++) {
    const next: number[] = [];
    seen.clear();
    for (let p = 0; p < level.length; p += 2) {
      const i = level[p];
      const j = level[p + 1];
      const ci = stateCell[m1.states[i]];
      const cj = stateCell[m2.states[j]];
      // Past its cost an agent rests on its (single) last-level node.
      const ia = t >= m1.cost ? i : -1;
      const ja = t >= m2.cost ? j : -1;
      const iFrom = ia >= 0 ? 0 : m1.childStart[i];
      const iTo = ia >= 0 ? 1 : m1.childStart[i + 1];
      for (let x = iFrom; x < iTo; x++) {
        const i2 = ia >= 0 ? last1 : m1.children[x];
        const ci2 = stateCell[m1.states[i2]];
        const jFrom = ja >= 0 ? 0 : m2.childStart[j];
        const jTo = ja >= 0 ? 1 : m2.childStart[j + 1];
        for (let y = jFrom; y < jTo; y++) {
          const j2 = ja >= 0 ? last2 : m2.children[y];
          const cj2 = stateCell[m2.states[j2]];
          if (ci2 === cj2) continue;
          if (ci2 === cj && cj2 === ci && ci !== ci2) continue;
          const key = i2 * n2 + j2;
          if (seen.has(key)) continue;
          seen.add(key);
          next.push(i2, j2);
        }
      }
    }
    if (next.length === 0) return false;
    level = next;
  }
  return true;
}
