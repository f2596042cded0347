import type { Grid } from '../grid/grid';
import type { MapfInstance } from '../instance';
import type { Rng } from '../random';

/**
 * A seeded random instance for tests: a width × height grid whose cells are each blocked with
 * probability `blockedShare`, then up to `agentCount` agents (at most half the free cells), each
 * drawn start then goal, starts distinct and goals distinct. A function `agentCount` is called
 * after the grid is drawn (so callers that draw the count there keep their samples).
 */
export function randomGridInstance(rng: Rng, width: number, height: number, agentCount: number | (() => number), blockedShare: number): MapfInstance {
  const passable = new Uint8Array(width * height).map(() => (rng.next() < blockedShare ? 0 : 1));
  const grid: Grid = { width, height, passable };
  const free = [...passable.keys()].filter((c) => passable[c] === 1);
  const pick = (taken: Set<number>): number => {
    const left = free.filter((c) => !taken.has(c));
    const c = left[rng.int(left.length)];
    taken.add(c);
    return c;
  };
  const count = Math.min(typeof agentCount === 'number' ? agentCount : agentCount(), Math.floor(free.length / 2));
  const starts = new Set<number>();
  const goals = new Set<number>();
  return { grid, agents: Array.from({ length: count }, () => ({ start: pick(starts), goal: pick(goals) })) };
}
