/**
 * One agent's view of the constraints of a CBS node, in the form the low level queries in its
 * hot loop: vertex and edge prohibitions, cells closed forever from some time on, landmarks
 * (positive constraints) and bounds on the final arrival time.
 */
import {
  C_EDGE, C_GT_LENGTH, C_LEQ_LENGTH, C_POS_EDGE, C_POS_VERTEX, C_RANGE, C_VERTEX, type Constraint,
} from './constraint';

/** An unbounded time. */
export const NO_TIME = 0x3fffffff;

/** Direction index of the move from → to on a grid of width `w` (0 N, 1 E, 2 S, 3 W of the target), or −1. */
function moveDir(from: number, to: number, w: number): number {
  const d = from - to;
  if (d === -w) return 0;
  if (d === 1) return 1;
  if (d === w) return 2;
  if (d === -1) return 3;
  return -1;
}

/** Shared by every table without landmarks (never written). */
const NO_LANDMARK_TIMES = new Int32Array(0);

/**
 * The constraints that bind one agent, resolved for fast queries. A search keeps thousands of
 * these (one per CT node and constrained agent), so the per-cell marks are two bit sets (a
 * 1,024-cell map: 256 bytes instead of a byte per cell) and the key sets exist only once used.
 */
export class ConstraintTable {
  /** The final arrival at the goal must be at a time ≥ this. */
  lengthMin = 0;
  /** The final arrival at the goal must be at a time ≤ this. */
  lengthMax = NO_TIME;
  /** One past the largest finite time any rule mentions: from then on nothing depends on time. */
  horizon = 0;
  /** Whether the rules contradict each other outright (two landmarks at one time). */
  isContradictory = false;
  /** Latest time the agent may not be at its own goal (NO_TIME if closed forever); −1 if none. */
  goalBlockedUntil = -1;
  /** Latest landmark time that forces the agent away from resting at its goal (−1 if none). */
  lastMoveLandmark = -1;
  /** Landmarks sorted by time: cells and times. */
  readonly landmarkCells: number[] = [];
  /** See {@link ConstraintTable.landmarkCells}. */
  readonly landmarkTimes: number[] = [];
  /** Number of vertex/edge/closed-cell rules (0 lets the low level skip all lookups). */
  ruleCount = 0;
  private vertexKeys: Set<number> | null = null;
  private edgeKeys: Set<number> | null = null;
  /**
   * Two bit sets in one buffer: from word 0, a bit per cell with a vertex or closing rule; from
   * word `edgeBase`, a bit per cell with an edge rule into it.
   */
  private readonly marks: Uint32Array;
  private readonly edgeBase: number;
  private closedFrom: Map<number, number> | null = null;
  private landmarkAtTime: Int32Array = NO_LANDMARK_TIMES;

  /**
   * Resolves `constraints` (any agents') for `agent` with goal cell `goal` on a grid of
   * `cellCount` cells and width `width`: its own constraints apply as stated, the others'
   * positive and length-at-most constraints as the prohibitions they imply.
   */
  constructor(readonly agent: number, readonly goal: number, readonly cellCount: number, private readonly width: number,
    constraints: Iterable<Constraint>) {
    this.edgeBase = (cellCount + 31) >>> 5;
    this.marks = new Uint32Array(2 * this.edgeBase);
    let maxT = -1;
    const marks: [number, number][] = [];
    for (const c of constraints) {
      if (c.agent === agent) {
        switch (c.kind) {
          case C_VERTEX: this.forbidVertex(c.a, c.t1); break;
          case C_EDGE: this.forbidEdge(c.a, c.b, c.t1); break;
          case C_RANGE: for (let t = c.t0; t <= c.t1; t++) this.forbidVertex(c.a, t); break;
          case C_POS_VERTEX: marks.push([c.t1, c.a]); break;
          case C_POS_EDGE: marks.push([c.t1 - 1, c.a], [c.t1, c.b]); break;
          case C_LEQ_LENGTH: this.lengthMax = Math.min(this.lengthMax, c.t1); break;
          case C_GT_LENGTH: this.lengthMin = Math.max(this.lengthMin, c.t1 + 1); break;
          default: throw new Error(`unknown constraint kind ${c.kind}`);
        }
      } else {
        switch (c.kind) {
          case C_POS_VERTEX: this.forbidVertex(c.a, c.t1); break;
          case C_POS_EDGE:
            this.forbidVertex(c.b, c.t1);
            this.forbidVertex(c.a, c.t1 - 1);
            this.forbidEdge(c.b, c.a, c.t1);
            break;
          case C_LEQ_LENGTH: this.closeFrom(c.a, c.t1); break;
          default: break; // the other kinds bind only their own agent
        }
      }
      if (c.t1 > maxT) maxT = c.t1;
    }
    marks.sort((p, q) => p[0] - q[0] || p[1] - q[1]);
    for (const [t, cell] of marks) {
      const k = this.landmarkTimes.length;
      if (k > 0 && this.landmarkTimes[k - 1] === t) {
        if (this.landmarkCells[k - 1] !== cell) this.isContradictory = true;
        continue;
      }
      this.landmarkTimes.push(t);
      this.landmarkCells.push(cell);
      if (cell !== goal) this.lastMoveLandmark = t;
    }
    if (this.lengthMin > maxT) maxT = this.lengthMin;
    this.horizon = maxT + 1;
    if (this.landmarkTimes.length > 0) {
      this.landmarkAtTime = new Int32Array(this.horizon + 1).fill(-1);
      for (let i = 0; i < this.landmarkTimes.length; i++) this.landmarkAtTime[this.landmarkTimes[i]] = this.landmarkCells[i];
    }
    const closed = this.closedFrom?.get(goal);
    if (closed !== undefined) this.goalBlockedUntil = NO_TIME;
    else if (this.vertexKeys !== null && (this.marks[goal >>> 5] & (1 << (goal & 31))) !== 0) {
      for (let t = maxT; t >= 0; t--) if (this.vertexKeys.has(t * cellCount + goal)) { this.goalBlockedUntil = t; break; }
    }
  }

  private forbidVertex(cell: number, t: number): void {
    if (t < 0) return;
    (this.vertexKeys ??= new Set<number>()).add(t * this.cellCount + cell);
    this.marks[cell >>> 5] |= 1 << (cell & 31);
    this.ruleCount++;
  }

  private forbidEdge(from: number, to: number, t: number): void {
    const d = moveDir(from, to, this.width);
    if (d < 0) throw new Error(`edge constraint between non-adjacent cells ${from} and ${to}`);
    (this.edgeKeys ??= new Set<number>()).add((t * this.cellCount + to) * 4 + d);
    this.marks[this.edgeBase + (to >>> 5)] |= 1 << (to & 31);
    this.ruleCount++;
  }

  private closeFrom(cell: number, t: number): void {
    const closedFrom = (this.closedFrom ??= new Map<number, number>());
    const prev = closedFrom.get(cell);
    if (prev === undefined || t < prev) closedFrom.set(cell, t);
    this.marks[cell >>> 5] |= 1 << (cell & 31);
    this.ruleCount++;
  }

  /** Whether the agent may not be in `cell` at time `t`. */
  isVertexBlocked(cell: number, t: number): boolean {
    if ((this.marks[cell >>> 5] & (1 << (cell & 31))) === 0) return false;
    if (this.closedFrom !== null) {
      const from = this.closedFrom.get(cell);
      if (from !== undefined && t >= from) return true;
    }
    return this.vertexKeys !== null && this.vertexKeys.has(t * this.cellCount + cell);
  }

  /** Whether the agent may not move from cell `from` to the different cell `to` arriving at `t`. */
  isEdgeBlocked(from: number, to: number, t: number): boolean {
    if ((this.marks[this.edgeBase + (to >>> 5)] & (1 << (to & 31))) === 0) return false;
    return (this.edgeKeys as Set<number>).has((t * this.cellCount + to) * 4 + moveDir(from, to, this.width));
  }

  /** The cell the agent must occupy at time `t`, or −1. */
  landmarkAt(t: number): number {
    return t < this.landmarkAtTime.length ? this.landmarkAtTime[t] : -1;
  }

  /** Whether a whole path of states (trimmed at the goal, resting there afterwards) satisfies every rule. */
  admitsPath(path: Int32Array, stateCell: Int32Array): boolean {
    const last = path.length - 1;
    if (last < this.lengthMin || last > this.lengthMax) return false;
    if (this.goalBlockedUntil >= last) return false;
    if (this.ruleCount > 0) {
      let prev = -1;
      for (let t = 0; t <= last; t++) {
        const c = stateCell[path[t]];
        if (this.isVertexBlocked(c, t)) return false;
        if (t > 0 && prev !== c && this.isEdgeBlocked(prev, c, t)) return false;
        prev = c;
      }
      // Resting at the goal after the path ends must respect cells closed from some time on.
      if (this.isVertexBlocked(stateCell[path[last]], NO_TIME - 1)) return false;
    }
    for (let i = 0; i < this.landmarkTimes.length; i++) {
      const t = this.landmarkTimes[i];
      if (stateCell[path[t <= last ? t : last]] !== this.landmarkCells[i]) return false;
    }
    if (last > 0 && this.lengthMin > 0 && stateCell[path[last - 1]] === stateCell[path[last]]) return false;
    return true;
  }
}
