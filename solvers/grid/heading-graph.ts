/**
 * The (cell, heading) state graph of the orientation-aware plan models. A state packs a cell
 * index and a heading into one integer `cell * 4 + heading`, headings numbered N = 0, E = 1,
 * S = 2, W = 3 (clockwise, so a right turn is +1 and a left turn is +3 modulo 4). Actions:
 * forward (to the neighbour in the heading direction, same heading), turn-left / turn-right
 * (same cell, heading rotates 90°) and wait (same state).
 */
import { HEADINGS, type Heading } from '@shared/plan';
import type { Grid } from './grid';

/** Number of headings per cell. */
export const HEADING_COUNT = 4;

/** x offset of one forward step per heading index (N, E, S, W). */
export const HEADING_DX: readonly number[] = [0, 1, 0, -1];

/** y offset of one forward step per heading index (N is towards row 0). */
export const HEADING_DY: readonly number[] = [-1, 0, 1, 0];

/** The heading index (N = 0, E = 1, S = 2, W = 3) of a heading letter. */
export function headingIndex(heading: Heading): number {
  return HEADINGS.indexOf(heading);
}

/** The heading letter of a heading index. */
export function headingLetter(index: number): Heading {
  return HEADINGS[index & 3];
}

/** The heading after a 90° turn to the left (counter-clockwise). */
export function turnedLeft(heading: number): number {
  return (heading + 3) & 3;
}

/** The heading after a 90° turn to the right (clockwise). */
export function turnedRight(heading: number): number {
  return (heading + 1) & 3;
}

/** The packed state of (cell, heading). */
export function headingState(cell: number, heading: number): number {
  return cell * HEADING_COUNT + heading;
}

/** The cell of a packed state. */
export function stateCell(state: number): number {
  return Math.floor(state / HEADING_COUNT);
}

/** The heading index of a packed state. */
export function stateHeading(state: number): number {
  return state % HEADING_COUNT;
}

/** The cell one step ahead of `cell` in direction `heading`, or -1 when off the grid or blocked. */
export function forwardCell(grid: Grid, cell: number, heading: number): number {
  const x = (cell % grid.width) + HEADING_DX[heading];
  const y = Math.floor(cell / grid.width) + HEADING_DY[heading];
  if (x < 0 || y < 0 || x >= grid.width || y >= grid.height) return -1;
  const next = y * grid.width + x;
  return grid.passable[next] === 1 ? next : -1;
}

/** The heading index that leads from `from` to its 4-neighbour `to`, or -1 when they are not neighbours. */
export function headingBetween(grid: Grid, from: number, to: number): number {
  const dx = (to % grid.width) - (from % grid.width);
  const dy = Math.floor(to / grid.width) - Math.floor(from / grid.width);
  for (let h = 0; h < HEADING_COUNT; h++) if (HEADING_DX[h] === dx && HEADING_DY[h] === dy) return h;
  return -1;
}
