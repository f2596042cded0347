/**
 * The orientation-split plan model as the CBS engine sees it: states (cell, heading) packed as
 * `cell * 4 + heading` (N 0, E 1, S 2, W 3; grid/heading-graph.ts), each unit step one of
 * forward, turn left, turn right or wait; conflicts on cells whatever the heading (vertex,
 * swap — only forward moves change cells — and goal), so the classic unit-step rule applies
 * through `stateCell`.
 *
 * A `free` start heading is a zero-cost virtual choice: one extra state per cell,
 * `4 * cellCount + cell`, "in the cell, heading not chosen yet". It may wait (stay undecided)
 * or move forward in any of the four directions, taking that heading; it never needs to turn,
 * because choosing the final heading at time 0 costs nothing. It is only ever a start state.
 */
import { cellDegrees, UNREACHABLE } from '../grid/distance';
import type { Grid } from '../grid/grid';
import { forwardCell, HEADING_COUNT, HEADING_DX, HEADING_DY, headingIndex, turnedLeft, turnedRight } from '../grid/heading-graph';
import type { MapfInstance } from '../instance';
import type { Conflict } from '../search/conflict';
import { findFollowingConflicts } from '../search/following-conflicts';
import { findUnitStepConflicts } from '../search/unit-step-conflicts';
import type { FollowingRule, StartHeading } from '@shared/plan';
import type { SearchModel } from './model';

/** The orientation-split model of one instance. */
export class OrientationSplitModel implements SearchModel {
  readonly name = 'orientation-split';
  readonly cellCount: number;
  readonly stateCount: number;
  readonly succStart: Int32Array;
  readonly succ: Int32Array;
  readonly stateCell: Int32Array;
  readonly agentCount: number;
  readonly startStates: Int32Array;
  readonly goalCells: Int32Array;
  /** Corridor and rectangle reasoning assume Manhattan cell paths without turn steps: off. */
  readonly supportsGridSymmetry = false;
  /** Passable 4-neighbour count per cell (the engine's config wants it; unused without grid symmetry). */
  readonly degree: Uint8Array;
  private readonly distances = new Map<number, Int32Array>();

  /**
   * Whether following conflicts are conflicts (`following: forbidden`; Stern et al., SoCS 2019).
   * They are read on cells whatever the heading: an agent waiting or turning in a cell occupies
   * it, so no agent may enter a cell at t that another occupied (in any heading) at t − 1.
   */
  readonly forbidsFollowing: boolean;

  /** Builds the state graph; agents without a start heading of their own use `startHeading`. */
  constructor(readonly grid: Grid, instance: MapfInstance, startHeading: StartHeading, following: FollowingRule = 'allowed') {
    this.forbidsFollowing = following === 'forbidden';
    const { passable } = grid;
    const n = grid.width * grid.height;
    this.cellCount = n;
    this.stateCount = 5 * n;
    this.stateCell = new Int32Array(5 * n);
    for (let s = 0; s < 4 * n; s++) this.stateCell[s] = s >> 2;
    for (let c = 0; c < n; c++) this.stateCell[4 * n + c] = c;
    this.succStart = new Int32Array(5 * n + 1);
    const succ: number[] = [];
    for (let s = 0; s < 4 * n; s++) {
      this.succStart[s] = succ.length;
      const c = s >> 2;
      if (passable[c] !== 1) continue;
      const h = s & 3;
      const f = forwardCell(grid, c, h);
      if (f >= 0) succ.push(f * HEADING_COUNT + h);
      succ.push(c * HEADING_COUNT + turnedLeft(h), c * HEADING_COUNT + turnedRight(h), s);
    }
    for (let c = 0; c < n; c++) {
      const v = 4 * n + c;
      this.succStart[v] = succ.length;
      if (passable[c] !== 1) continue;
      for (let h = 0; h < HEADING_COUNT; h++) {
        const f = forwardCell(grid, c, h);
        if (f >= 0) succ.push(f * HEADING_COUNT + h);
      }
      succ.push(v);
    }
    this.succStart[5 * n] = succ.length;
    this.succ = Int32Array.from(succ);
    this.agentCount = instance.agents.length;
    this.startStates = Int32Array.from(instance.agents.map((a) => {
      const rule = a.startHeading ?? startHeading;
      return rule === 'free' ? 4 * n + a.start : a.start * HEADING_COUNT + headingIndex(rule);
    }));
    this.goalCells = Int32Array.from(instance.agents.map((a) => a.goal));
    this.degree = cellDegrees(grid);
  }

  /** Whether `state` is the undecided-heading start state of its cell. */
  isVirtual(state: number): boolean {
    return state >= 4 * this.cellCount;
  }

  /** Exact steps (moves and quarter turns) from each state to any heading in the agent's goal cell. */
  goalDistances(agent: number): Int32Array {
    return this.distancesToCell(this.goalCells[agent]);
  }

  /** Exact steps from each state to any heading in `cell` (cached per cell). */
  distancesToCell(cell: number): Int32Array {
    let d = this.distances.get(cell);
    if (d === undefined) {
      d = this.backwardBfs(cell);
      this.distances.set(cell, d);
    }
    return d;
  }

  /** Vertex, swap and goal conflicts on cells; following conflicts too when forbidden. */
  findConflicts(a: number, pathA: Int32Array, b: number, pathB: Int32Array, out: Conflict[]): void {
    findUnitStepConflicts(this.stateCell, a, pathA, b, pathB, out);
    if (this.forbidsFollowing) findFollowingConflicts(this.stateCell, a, pathA, b, pathB, out);
  }

  /** Breadth-first search over reversed unit-cost actions from every heading of `target`. */
  private backwardBfs(target: number): Int32Array {
    const { grid } = this;
    const n = this.cellCount;
    const dist = new Int32Array(5 * n).fill(UNREACHABLE);
    if (target < 0 || target >= n || grid.passable[target] !== 1) return dist;
    const queue = new Int32Array(4 * n);
    let head = 0;
    let tail = 0;
    for (let h = 0; h < HEADING_COUNT; h++) {
      dist[target * HEADING_COUNT + h] = 0;
      queue[tail++] = target * HEADING_COUNT + h;
    }
    const relax = (s: number, d: number): void => {
      if (dist[s] === UNREACHABLE) {
        dist[s] = d;
        queue[tail++] = s;
      }
    };
    while (head < tail) {
      const s = queue[head++];
      const c = s >> 2;
      const h = s & 3;
      const d = dist[s] + 1;
      // Turns are reversible; a forward move into (c, h) comes from the cell behind, same heading.
      relax(c * HEADING_COUNT + turnedLeft(h), d);
      relax(c * HEADING_COUNT + turnedRight(h), d);
      const x = (c % grid.width) - HEADING_DX[h];
      const y = Math.floor(c / grid.width) - HEADING_DY[h];
      if (x >= 0 && y >= 0 && x < grid.width && y < grid.height && grid.passable[y * grid.width + x] === 1) {
        relax((y * grid.width + x) * HEADING_COUNT + h, d);
      }
    }
    // Undecided heading: the best of the four (choosing at time 0 is free).
    for (let c = 0; c < n; c++) {
      let best = UNREACHABLE;
      for (let h = 0; h < HEADING_COUNT; h++) if (dist[c * HEADING_COUNT + h] < best) best = dist[c * HEADING_COUNT + h];
      dist[4 * n + c] = best;
    }
    return dist;
  }
}
