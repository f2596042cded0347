/**
 * The small interface a plan model gives the CBS engine (solvers/search/). CBS, the space-time
 * A* low level and the MDDs are written once against it; a model only describes its state
 * graph, its heuristic and its conflict rule.
 *
 * Plan semantics shared by every engineer (decided; keep in sync with solvers/README.md):
 * - Paths (classic, k-robust): per agent an array of cell indices (`y * width + x`), one per
 *   unit time step; `path[0]` is the start; the last entry is the goal and the agent stays there
 *   forever afterwards; the agent's cost is `path.length − 1` (the time of its last arrival at
 *   the goal); SOC = sum of costs, makespan = max. Classic conflicts: vertex (same cell, same t),
 *   swap (exchange cells between t and t+1), and goal (an agent at its goal forever is hit by
 *   another entering that cell later — a vertex conflict at a t beyond the first agent's path
 *   end). Following is allowed by default; with `following: forbidden` (classic,
 *   uniform-duration, orientation-split) no agent may enter at t+1 a cell another agent occupies
 *   at t (the following conflict of Stern et al., SoCS 2019; solvers/search/following-conflicts.ts).
 * - k-robust (Atzmon et al., "Robust multi-agent path finding and executing", JAIR 2020; SoCS
 *   2018): additionally a conflict when two agents occupy the same cell at times t1, t2 with
 *   |t1 − t2| ≤ k (k = 0 is exactly classic, swaps included).
 * - Orientation-split paths: per agent an array of states `(cell, heading)` per unit time step;
 *   each step is exactly one of forward (to the neighbour in the heading direction, same
 *   heading), turn-left / turn-right (same cell, heading rotates 90°), wait (same state).
 *   Headings N (y−1), E (x+1), S (y+1), W (x−1). Start heading given per agent or `free` (any
 *   heading at t = 0 at no cost); goal heading: any. Conflicts on cells whatever the heading:
 *   vertex, swap on forward moves, goal. Cost = arrival step of the final arrival at the goal cell.
 *
 * Inside the engine a path is an Int32Array of *states*; `stateCell` maps a state to the cell
 * it occupies (the identity for classic). Constraints always speak about cells and cell-to-cell
 * moves, so one constraint vocabulary serves every unit-step model.
 */
import type { Grid } from '../grid/grid';
import type { Conflict } from '../search/conflict';

/** The state graph, heuristic and conflict rule of one unit-step plan model on one instance. */
export interface SearchModel {
  /** Model name as used in results (`classic`, `orientation-split`, `k-robust`). */
  readonly name: string;
  /** The grid the states live on (its width decodes move directions; 4-connected). */
  readonly grid: Grid;
  /** Number of grid cells (`width * height`). */
  readonly cellCount: number;
  /** Number of time-free states (classic: one per cell). */
  readonly stateCount: number;
  /**
   * Successors in compressed-row form: the states reachable from `s` in one unit step are
   * `succ[succStart[s]] … succ[succStart[s + 1] − 1]`, the wait (s itself) included. Blocked
   * cells have no successors.
   */
  readonly succStart: Int32Array;
  /** See {@link SearchModel.succStart}. */
  readonly succ: Int32Array;
  /** The cell each state occupies. */
  readonly stateCell: Int32Array;
  /** Number of agents. */
  readonly agentCount: number;
  /** Start state per agent. A `free` start heading is modelled by a zero-cost virtual choice inside the model. */
  readonly startStates: Int32Array;
  /** Goal cell per agent (any state in that cell is a goal state). */
  readonly goalCells: Int32Array;
  /** Exact steps from each state to agent `agent`'s goal cell (UNREACHABLE when none); admissible and consistent. */
  goalDistances(agent: number): Int32Array;
  /** Exact steps from each state to `cell` (used to prune against positive constraints). */
  distancesToCell(cell: number): Int32Array;
  /**
   * Appends every conflict between agents `a` and `b` (paths of states, trimmed at the goal as
   * described above) to `out`. Classic, orientation-split: vertex, swap, goal (and following
   * with `following: forbidden`); k-robust adds the time window.
   */
  findConflicts(a: number, pathA: Int32Array, b: number, pathB: Int32Array, out: Conflict[]): void;
  /**
   * Whether the symmetry reasonings that rely on 4-connected cell paths with Manhattan geometry
   * (corridor, rectangle; Li et al., AIJ 2021) are sound for this model. True only for classic.
   */
  readonly supportsGridSymmetry: boolean;
  /**
   * Whether `findConflicts` reports following conflicts (`following: forbidden`), so that the
   * DG/WDG dependency test (mdd.ts haveConflictFreePair) uses the same rule. Absent = false.
   */
  readonly forbidsFollowing?: boolean;
  /**
   * k-robust: two agents conflict in a cell at times up to this many steps apart (absent = 0).
   * Only the bounded search's conflict avoidance table reads it (to steer focal search away).
   */
  readonly delayWindow?: number;
}
