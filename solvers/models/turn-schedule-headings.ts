/**
 * Headings and quarter turns on the grid. Sign conventions: x grows to the right (E), y grows
 * downwards (S), so N is (0, −1). Turning right is clockwise as seen on screen: N → E → S → W.
 */
import type { ActionKind, Heading } from '@shared/plan';
import { HEADINGS } from '@shared/plan';
import type { Grid } from '../grid/grid';

/** Unit cell offset [dx, dy] of one forward move in each heading (y grows downwards). */
export const HEADING_OFFSET: Readonly<Record<Heading, readonly [dx: number, dy: number]>> = {
  N: [0, -1],
  E: [1, 0],
  S: [0, 1],
  W: [-1, 0],
};

/** The heading of a forward move between two 4-adjacent cells, or null when they are not 4-adjacent. */
export function headingBetween(grid: Grid, from: number, to: number): Heading | null {
  const fx = from % grid.width;
  const fy = (from - fx) / grid.width;
  const tx = to % grid.width;
  const ty = (to - tx) / grid.width;
  const dx = tx - fx;
  const dy = ty - fy;
  if (dx === 0 && dy === -1) return 'N';
  if (dx === 1 && dy === 0) return 'E';
  if (dx === 0 && dy === 1) return 'S';
  if (dx === -1 && dy === 0) return 'W';
  return null;
}

/** The heading after one quarter turn. */
export function turnedHeading(heading: Heading, turn: 'turn-left' | 'turn-right'): Heading {
  const i = HEADINGS.indexOf(heading);
  return HEADINGS[(i + (turn === 'turn-right' ? 1 : 3)) % 4];
}

/**
 * The quarter turns that rotate `from` into `to`: none, one right, one left, or — for a
 * reversal — two right turns. The U-turn direction is fixed to clockwise so that schedules are
 * deterministic; both directions take the same time, so the choice never changes a cost.
 */
export function quarterTurnsBetween(from: Heading, to: Heading): readonly Extract<ActionKind, 'turn-left' | 'turn-right'>[] {
  const diff = (HEADINGS.indexOf(to) - HEADINGS.indexOf(from) + 4) % 4;
  if (diff === 0) return [];
  if (diff === 1) return ['turn-right'];
  if (diff === 3) return ['turn-left'];
  return ['turn-right', 'turn-right'];
}
