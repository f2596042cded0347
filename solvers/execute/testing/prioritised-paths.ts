/**
 * Test helper: valid classic plans by prioritised planning (agents in index order, each by
 * breadth-first search in space-time around the reservations of the earlier ones: vertex,
 * swap and goal). Not optimal and may fail (returns null); used only to feed the simulator's
 * tests with many valid multi-agent plans while the CBS engine lives elsewhere.
 * Prioritised planning: M. Erdmann, T. Lozano-Pérez, "On multiple moving objects",
 * Algorithmica 2, 1987.
 */
import type { MapfInstance } from '../../instance';

/** Paths for every agent, or null when some agent finds none within `horizon` steps. */
export function prioritisedPaths(instance: MapfInstance, horizon = 4 * instance.grid.passable.length): number[][] | null {
  const { grid, agents } = instance;
  const cells = grid.passable.length;
  const w = grid.width;
  const occupied = new Set<number>(); // t * cells + cell
  const moving = new Set<string>(); // `${t}:${from}:${to}`
  const goalFrom = new Map<number, number>(); // cell → time from which an earlier agent sits there forever
  const lastVisit = new Int32Array(cells).fill(-1);
  const paths: number[][] = [];
  const neighbours = (c: number): number[] => {
    const x = c % w;
    const out = [c];
    if (c - w >= 0) out.push(c - w);
    if (x + 1 < w) out.push(c + 1);
    if (c + w < cells) out.push(c + w);
    if (x > 0) out.push(c - 1);
    return out.filter((n) => grid.passable[n] === 1);
  };
  for (const { start, goal } of agents) {
    const parent = new Map<number, number>();
    const key = (t: number, c: number): number => t * cells + c;
    let frontier = [start];
    parent.set(key(0, start), -1);
    let found = -1;
    for (let t = 0; t <= horizon && found < 0; t++) {
      const next: number[] = [];
      for (const c of frontier) {
        if (c === goal && lastVisit[goal] <= t) {
          found = t;
          break;
        }
        for (const n of neighbours(c)) {
          const k = key(t + 1, n);
          if (parent.has(k) || occupied.has(k)) continue;
          if ((goalFrom.get(n) ?? Infinity) <= t + 1) continue;
          if (n !== c && moving.has(`${t}:${n}:${c}`)) continue;
          parent.set(k, c);
          next.push(n);
        }
      }
      if (found >= 0) break;
      frontier = next;
    }
    if (found < 0) return null;
    const path = [goal];
    for (let t = found, c = goal; t > 0; t--) {
      c = parent.get(key(t, c)) as number;
      path.unshift(c);
    }
    path.forEach((c, t) => {
      occupied.add(t * cells + c);
      lastVisit[c] = Math.max(lastVisit[c], t);
      if (t > 0) moving.add(`${t - 1}:${path[t - 1]}:${c}`);
    });
    goalFrom.set(goal, path.length - 1);
    paths.push(path);
  }
  return paths;
}
