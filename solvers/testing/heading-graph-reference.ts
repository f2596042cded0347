/**
 * An outside reference for single-agent costs with turns: builds the (cell, heading) graph
 * in the general-purpose graph library graphology (0.26.0) and asks its Dijkstra
 * (graphology-shortest-path 2.1.0, `dijkstra.bidirectional`) for the cheapest route from the
 * start state(s) to any heading at the goal. Test-only; used to check the oracles.
 */
import { DirectedGraph } from 'graphology';
import { dijkstra } from 'graphology-shortest-path';
import type { Heading, StartHeading } from '@shared/plan';
import type { Grid } from '../grid/grid';

const HEADS: readonly Heading[] = ['N', 'E', 'S', 'W'];
const DELTA: Readonly<Record<Heading, readonly [number, number]>> = { N: [0, -1], E: [1, 0], S: [0, 1], W: [-1, 0] };

/** The cheapest single-agent cost from `start` (heading rule) to `goal` with the given move and turn costs, or undefined. */
export function referenceTurnCost(
  grid: Grid,
  start: number,
  goal: number,
  startHeading: StartHeading,
  forwardCost: number,
  quarterTurnCost: number,
): number | undefined {
  const g = new DirectedGraph<Record<string, never>, { w: number }>();
  g.addNode('source');
  g.addNode('sink');
  for (let c = 0; c < grid.width * grid.height; c++) {
    if (grid.passable[c] !== 1) continue;
    for (const h of HEADS) g.addNode(`${c}${h}`);
  }
  for (let c = 0; c < grid.width * grid.height; c++) {
    if (grid.passable[c] !== 1) continue;
    const x = c % grid.width;
    const y = Math.floor(c / grid.width);
    HEADS.forEach((h, k) => {
      g.addEdge(`${c}${h}`, `${c}${HEADS[(k + 1) % 4]}`, { w: quarterTurnCost });
      g.addEdge(`${c}${h}`, `${c}${HEADS[(k + 3) % 4]}`, { w: quarterTurnCost });
      const nx = x + DELTA[h][0];
      const ny = y + DELTA[h][1];
      if (nx >= 0 && ny >= 0 && nx < grid.width && ny < grid.height && grid.passable[ny * grid.width + nx] === 1) {
        g.addEdge(`${c}${h}`, `${ny * grid.width + nx}${h}`, { w: forwardCost });
      }
    });
  }
  for (const h of startHeading === 'free' ? HEADS : [startHeading]) g.addEdge('source', `${start}${h}`, { w: 0 });
  for (const h of HEADS) g.addEdge(`${goal}${h}`, 'sink', { w: 0 });
  const path = dijkstra.bidirectional(g, 'source', 'sink', 'w');
  if (!path || path.length === 0) return undefined;
  let cost = 0;
  for (let i = 0; i + 1 < path.length; i++) cost += g.getEdgeAttribute(g.edge(path[i], path[i + 1])!, 'w');
  return cost;
}
