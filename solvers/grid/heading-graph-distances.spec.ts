// Checks the cost-to-go table against graphology 0.26 + graphology-shortest-path 2.1 (npm).
import { DirectedGraph } from 'graphology';
import { dijkstra } from 'graphology-shortest-path';
import type { Grid } from './grid';
import { headingDistancesToGoal } from './heading-graph-distances';
import { forwardCell, headingBetween, turnedLeft, turnedRight } from './heading-graph';
import { createRng } from '../random';

describe('headingDistancesToGoal', () => {
  it('equals graphology single-source Dijkstra lengths to the goal cell for every state', () => {
    // Arrange
    const rng = createRng(5);
    for (let trial = 0; trial < 12; trial++) {
      const width = 3 + rng.int(4);
      const height = 3 + rng.int(4);
      const passable = new Uint8Array(width * height).map(() => (rng.next() < 0.25 ? 0 : 1));
      const grid: Grid = { width, height, passable };
      const free = [...passable.keys()].filter((c) => passable[c] === 1);
      if (free.length === 0) continue;
      const goal = free[rng.int(free.length)];
      const F = 1 + rng.int(5);
      const T = 1 + rng.int(5);
      // Reversed graph, so one single-source run from a sink G gives every state's distance to the goal.
      const g = new DirectedGraph();
      g.addNode('G');
      for (const c of free) for (let h = 0; h < 4; h++) g.addNode(`${c}:${h}`);
      for (const c of free) {
        for (let h = 0; h < 4; h++) {
          g.addEdge(`${c}:${turnedLeft(h)}`, `${c}:${h}`, { w: T });
          g.addEdge(`${c}:${turnedRight(h)}`, `${c}:${h}`, { w: T });
          const n = forwardCell(grid, c, h);
          if (n >= 0) g.addEdge(`${n}:${h}`, `${c}:${h}`, { w: F });
        }
      }
      for (let h = 0; h < 4; h++) g.addEdge('G', `${goal}:${h}`, { w: 0 });
      // Act
      const ours = headingDistancesToGoal(grid, goal, { forwardMs: F, quarterTurnMs: T });
      // Oracle: graphology-shortest-path 2.1 dijkstra.singleSource (npm); path weights summed here.
      const paths = dijkstra.singleSource(g, 'G', 'w');
      // Assert
      for (const c of free) {
        for (let h = 0; h < 4; h++) {
          const path = paths[`${c}:${h}`];
          let cost = Infinity;
          if (path) {
            cost = 0;
            for (let k = 1; k < path.length; k++) cost += g.getEdgeAttribute(g.edge(path[k - 1], path[k]), 'w') as number;
          }
          expect(ours[c * 4 + h]).toBe(cost);
        }
      }
      for (let c = 0; c < width * height; c++) if (!passable[c]) expect(ours[c * 4]).toBe(Infinity);
    }
  });

  it('prices a right turn then two cells by hand', () => {
    // Arrange: 3 × 1 corridor, goal at the east end; facing N at the west end: turn right + 2 forwards.
    const grid: Grid = { width: 3, height: 1, passable: new Uint8Array([1, 1, 1]) };
    // Act
    const d = headingDistancesToGoal(grid, 2, { forwardMs: 10, quarterTurnMs: 4 });
    // Assert
    expect(d[0 * 4 + 0]).toBe(4 + 20);
    expect(d[0 * 4 + 3]).toBe(8 + 20);
    expect(headingBetween(grid, 0, 1)).toBe(1);
  });
});
