/**
 * A MAPF instance: a grid and, per agent, a start and a goal cell (cell indices, see
 * grid/grid.ts). An instance with k agents from a scenario uses its first k rows.
 */
import type { Heading } from '@shared/plan';
import type { Grid } from './grid/grid';

/** One agent's task. `startHeading` is set only when the instance itself fixes it. */
export interface AgentTask {
  readonly start: number;
  readonly goal: number;
  readonly startHeading?: Heading;
}

/** A grid plus the agents' tasks. */
export interface MapfInstance {
  readonly grid: Grid;
  readonly agents: readonly AgentTask[];
}
