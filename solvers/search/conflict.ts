/**
 * Conflicts between two agents' paths, as found by a model's conflict rule and refined by the
 * CBS improvements (target, corridor and rectangle reasoning replace a plain conflict by one
 * whose two constraint sets prune more).
 */
import type { Constraint } from './constraint';

/** Two agents in one cell at one time (also the goal conflict when target reasoning is off). */
export const K_VERTEX = 0;
/** Two agents exchanging cells in one step: a1 moves cell → cell2 arriving at t, a2 the reverse. */
export const K_EDGE = 1;
/** a1 sits at its goal `cell` since before t and a2 is there at t (resolved by length constraints). */
export const K_TARGET = 2;
/** Corridor symmetry (Li et al., AIJ 2021): resolved by range constraints from `constraints1/2`. */
export const K_CORRIDOR = 3;
/** Rectangle symmetry (Li et al., AIJ 2021): resolved by barrier constraints from `constraints1/2`. */
export const K_RECTANGLE = 4;

/** Priority classes (Boyarski et al., IJCAI 2015): lower is chosen first. */
export const P_CARDINAL = 0;
/** Exactly one child is known to increase its agent's cost. */
export const P_SEMI = 1;
/** Neither child is known to increase a cost. */
export const P_NON = 2;
/** Not classified yet. */
export const P_UNKNOWN = 3;

/** One conflict; `constraints1` / `constraints2` are set for the reasoning kinds (corridor, rectangle). */
export interface Conflict {
  kind: number;
  a1: number;
  a2: number;
  /** Vertex, target: the cell; edge: a1's from-cell. */
  cell: number;
  /** Edge: a1's to-cell; else −1. */
  cell2: number;
  /** Vertex, target: the time; edge: the arrival time of the move. */
  t: number;
  priority: number;
  /** Whether MDDs prove both agents' costs rise whichever way it is resolved (a sound +1 on the pair's cost). */
  isMddCardinal: boolean;
  constraints1: Constraint[] | null;
  constraints2: Constraint[] | null;
}

/** Builds a plain conflict (unclassified). */
export function makeConflict(kind: number, a1: number, a2: number, cell: number, cell2: number, t: number): Conflict {
  return { kind, a1, a2, cell, cell2, t, priority: P_UNKNOWN, isMddCardinal: false, constraints1: null, constraints2: null };
}
