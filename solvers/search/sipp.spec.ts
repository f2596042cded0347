// Checks the SIPP low level against a general-purpose graph library: graphology 0.26 with
// graphology-shortest-path 2.1 (npm), Dijkstra / BFS over graphs built here from the same rules.
import { DirectedGraph } from 'graphology';
import { dijkstra, unweighted } from 'graphology-shortest-path';
import type { Grid } from '../grid/grid';
import { gridFromText } from '../grid/grid';
import { headingDistancesToGoal } from '../grid/heading-graph-distances';
import { forwardCell, turnedLeft, turnedRight } from '../grid/heading-graph';
import { createRng, type Rng } from '../random';
import { compileBans, type AgentBan } from './sipp-constraints';
import { sippSearch, type SippPlan } from './sipp';

function randomGrid(rng: Rng, width: number, height: number, blockedShare: number): Grid {
  const rows = Array.from({ length: height }, () => Array.from({ length: width }, () => rng.next() >= blockedShare));
  const passable = new Uint8Array(rows.flat().map((v) => (v ? 1 : 0)));
  return { width, height, passable };
}

function freeCells(grid: Grid): number[] {
  return [...grid.passable.keys()].filter((c) => grid.passable[c] === 1);
}

/**
 * One tiny seeded trial of the constrained specs: a 2–4 × 2–4 grid, start, goal, durations 1–3 and
 * free (even trials) or one random start heading; null when the grid has fewer than `minCells` free cells.
 */
function tinyTrial(rng: Rng, trial: number, blockedShare: number, minCells: number) {
  const grid = randomGrid(rng, 2 + rng.int(3), 2 + rng.int(3), blockedShare);
  const cells = freeCells(grid);
  if (cells.length < minCells) return null;
  const start = cells[rng.int(cells.length)];
  const goal = cells[rng.int(cells.length)];
  const F = 1 + rng.int(3);
  const T = 1 + rng.int(3);
  const headings = trial % 2 === 0 ? [0, 1, 2, 3] : [rng.int(4)];
  return { grid, cells, start, goal, F, T, headings };
}

/** The (cell, heading) graph as a graphology graph, with a super source S and super sink G. */
function headingGraph(grid: Grid, F: number, T: number, start: number, startHeadings: readonly number[], goal: number): DirectedGraph {
  const g = new DirectedGraph();
  const node = (c: number, h: number): string => `${c}:${h}`;
  for (const c of freeCells(grid)) for (let h = 0; h < 4; h++) g.addNode(node(c, h));
  g.addNode('S');
  g.addNode('G');
  for (const c of freeCells(grid)) {
    for (let h = 0; h < 4; h++) {
      g.addEdge(node(c, h), node(c, turnedLeft(h)), { weight: T });
      g.addEdge(node(c, h), node(c, turnedRight(h)), { weight: T });
      const n = forwardCell(grid, c, h);
      if (n >= 0) g.addEdge(node(c, h), node(n, h), { weight: F });
    }
  }
  for (const h of startHeadings) g.addEdge('S', node(start, h), { weight: 0 });
  for (let h = 0; h < 4; h++) g.addEdge(node(goal, h), 'G', { weight: 0 });
  return g;
}

function pathWeight(g: DirectedGraph, path: readonly string[] | null | undefined): number {
  if (!path || path.length === 0) return Infinity;
  let sum = 0;
  for (let k = 1; k < path.length; k++) sum += g.getEdgeAttribute(g.edge(path[k - 1], path[k]), 'weight') as number;
  return sum;
}

function plan(grid: Grid, start: number, goal: number, headings: readonly number[], F: number, T: number, bans: readonly AgentBan[] = []): SippPlan | null {
  const heuristic = headingDistancesToGoal(grid, goal, { forwardMs: F, quarterTurnMs: T });
  return sippSearch({ grid, start, goal, startHeadings: headings, forwardMs: F, quarterTurnMs: T, bans: compileBans(bans, grid.width * grid.height), heuristic }).plan;
}

describe('sippSearch without constraints', () => {
  it('matches graphology Dijkstra over the weighted (cell, heading) graph on seeded grids', () => {
    // Arrange: 120 seeded grids, random durations, free and fixed start headings.
    const rng = createRng(20240611);
    let compared = 0;
    let unreachable = 0;
    for (let trial = 0; trial < 120; trial++) {
      const grid = randomGrid(rng, 3 + rng.int(8), 3 + rng.int(8), 0.3);
      const cells = freeCells(grid);
      if (cells.length < 2) continue;
      const start = cells[rng.int(cells.length)];
      const goal = cells[rng.int(cells.length)];
      const F = 1 + rng.int(9);
      const T = 1 + rng.int(9);
      const headings = trial % 2 === 0 ? [0, 1, 2, 3] : [rng.int(4)];
      // Act
      const ours = plan(grid, start, goal, headings, F, T);
      const g = headingGraph(grid, F, T, start, headings, goal);
      // Oracle: graphology-shortest-path 2.1 bidirectional Dijkstra (npm).
      const theirs = pathWeight(g, dijkstra.bidirectional(g, 'S', 'G', 'weight'));
      // Assert
      expect(ours ? ours.cost : Infinity).toBe(theirs);
      if (theirs === Infinity) unreachable++;
      compared++;
    }
    expect(compared).toBeGreaterThan(100);
    expect(unreachable).toBeGreaterThan(0);
    expect(unreachable).toBeLessThan(compared);
  });

  it('with unit durations gives the unit-step orientation-split cost (BFS step count)', () => {
    // Arrange: forward = quarter turn = 1 ms, so the cost is the number of steps.
    const rng = createRng(7);
    for (let trial = 0; trial < 60; trial++) {
      const grid = randomGrid(rng, 3 + rng.int(7), 3 + rng.int(7), 0.25);
      const cells = freeCells(grid);
      if (cells.length < 2) continue;
      const start = cells[rng.int(cells.length)];
      const goal = cells[rng.int(cells.length)];
      const headings = trial % 3 === 0 ? [0, 1, 2, 3] : [rng.int(4)];
      // Act
      const ours = plan(grid, start, goal, headings, 1, 1);
      const g = headingGraph(grid, 1, 1, start, headings, goal);
      // Oracle: graphology-shortest-path 2.1 unweighted BFS (npm); minus the two zero-weight end edges.
      const path = unweighted.bidirectional(g, 'S', 'G');
      // Assert
      expect(ours ? ours.cost : Infinity).toBe(path ? path.length - 3 : Infinity);
    }
  });

  it('costs one forward time per cell and one quarter turn per 90° on a worked L-shaped route', () => {
    // Arrange: from (0,0) facing E to (2,2): E, E, turn right, S, S = 4 F + 1 T (worked by hand).
    const grid = gridFromText('...\n##.\n##.');
    // Act
    const p = plan(grid, 0, 8, [1], 5, 7);
    // Assert
    expect(p?.cost).toBe(4 * 5 + 7);
    expect(p?.steps.map((s) => s.kind)).toEqual(['forward', 'forward', 'turn-right', 'forward', 'forward']);
  });
});

describe('sippSearch with landmarks (positive constraints of disjoint splitting)', () => {
  it('matches graphology Dijkstra over the time-expanded graph layered by landmarks met', () => {
    // Arrange: as above, plus one or two landmarks with disjoint windows, each a set of moves
    // into (or out of) one cell, as the high level makes them.
    const rng = createRng(314);
    let compared = 0;
    let landmarkRaises = 0;
    let unreachable = 0;
    for (let trial = 0; trial < 60; trial++) {
      const setup = tinyTrial(rng, trial, 0.15, 3);
      if (setup === null) continue;
      const { grid, cells, start, goal, F, T, headings } = setup;
      const bans: AgentBan[] = [];
      for (let k = rng.int(4); k > 0; k--) {
        const from = rng.int(20);
        bans.push({ kind: 'occupancy', cell: cells[rng.int(cells.length)], from, to: from + 1 + rng.int(4) });
      }
      let windowStart = rng.int(6);
      for (let k = 1 + rng.int(2); k > 0; k--) {
        const c = cells[rng.int(cells.length)];
        const around = [0, 1, 2, 3].map((h) => forwardCell(grid, c, h)).filter((n) => n >= 0);
        if (around.length === 0) continue;
        const isInto = rng.next() < 0.7;
        const moves = around.map((n) => (isInto ? { fromCell: n, toCell: c } : { fromCell: c, toCell: n }));
        const to = windowStart + 1 + rng.int(8);
        bans.push({ kind: 'landmark', moves, from: windowStart, to });
        windowStart = to + rng.int(6);
      }
      // Act
      const ours = plan(grid, start, goal, headings, F, T, bans);
      const withoutLandmarks = plan(grid, start, goal, headings, F, T, bans.filter((b) => b.kind !== 'landmark'));
      // Oracle: graphology-shortest-path 2.1 Dijkstra on the time-expanded graph (npm).
      const theirs = timeExpandedCost(grid, start, goal, headings, F, T, bans, 70);
      // Assert
      expect(ours === null || ours.cost < 70).toBe(true);
      expect(ours ? ours.cost : Infinity).toBe(theirs);
      compared++;
      if (ours === null) unreachable++;
      else if (withoutLandmarks && ours.cost > withoutLandmarks.cost) landmarkRaises++;
    }
    // The sample is not vacuous: most trials compared, landmarks raised the cost on several, and
    // some landmark sets could not be met at all.
    expect(compared).toBeGreaterThan(40);
    expect(landmarkRaises).toBeGreaterThan(5);
    expect(unreachable).toBeGreaterThan(0);
  });
});

/**
 * The time-expanded graph of one agent under constraints, as an oracle for the constrained
 * search: nodes (cell, heading, t, visit-began-late flag) for t ≤ horizon, edges wait 1 ms,
 * turn T, forward F, each present only if the occupancy it causes avoids every ban.
 */
function timeExpandedCost(grid: Grid, start: number, goal: number, headings: readonly number[], F: number, T: number, bans: readonly AgentBan[], horizon: number): number {
  const occ = bans.filter((b) => b.kind === 'occupancy');
  const moves = bans.filter((b) => b.kind === 'move');
  const L = Math.max(0, ...bans.map((b) => (b.kind === 'late-goal' ? b.notBefore : 0)));
  const free = (c: number, a: number, b: number): boolean => occ.every((o) => o.cell !== c || !(o.from < b && a < o.to));
  // Landmarks met so far, by the plain reading: layer m may advance on a forward move that is one
  // of landmark m's moves and starts in its window (in the order given, which is the time order).
  const marks = bans.flatMap((b) => (b.kind === 'landmark' ? [b] : []));
  const meets = (layer: number, c: number, n: number, t: number): boolean =>
    layer < marks.length && marks[layer].from <= t && t < marks[layer].to && marks[layer].moves.some((m) => m.fromCell === c && m.toCell === n);
  const g = new DirectedGraph();
  const node = (c: number, h: number, t: number, f: number, layer = 0): string => `${c}:${h}:${t}:${f}:${layer}`;
  const ensure = (k: string): string => (g.hasNode(k) ? k : (g.addNode(k), k));
  g.addNode('S');
  g.addNode('G');
  const cells = freeCells(grid);
  for (const c of cells) {
    for (let h = 0; h < 4; h++) {
      for (let t = 0; t <= horizon; t++) {
        for (const f of [0, 1]) {
          for (let layer = 0; layer <= marks.length; layer++) {
            const here = ensure(node(c, h, t, f, layer));
            if (t + 1 <= horizon && free(c, t, t + 1)) g.addEdge(here, ensure(node(c, h, t + 1, f, layer)), { weight: 1 });
            if (t + T <= horizon && free(c, t, t + T)) {
              g.addEdge(here, ensure(node(c, turnedLeft(h), t + T, f, layer)), { weight: T });
              g.addEdge(here, ensure(node(c, turnedRight(h), t + T, f, layer)), { weight: T });
            }
            const n = forwardCell(grid, c, h);
            const isBanned = moves.some((m) => m.fromCell === c && m.toCell === n && m.from <= t && t < m.to);
            if (n >= 0 && t + F <= horizon && !isBanned && free(c, t, t + F) && free(n, t, t + F)) {
              const next = meets(layer, c, n, t) ? layer + 1 : layer;
              g.addEdge(here, ensure(node(n, h, t + F, t >= L ? 1 : 0, next)), { weight: F });
            }
            if (c === goal && f === 1 && layer === marks.length && free(c, t, Infinity)) g.addEdge(here, 'G', { weight: 0 });
          }
        }
      }
    }
  }
  if (free(start, 0, 1)) for (const h of headings) g.addEdge('S', node(start, h, 0, start === goal && L === 0 ? 1 : 0), { weight: 0 });
  return pathWeight(g, dijkstra.bidirectional(g, 'S', 'G', 'weight'));
}

describe('sippSearch under interval constraints', () => {
  it('matches graphology Dijkstra over the time-expanded graph with random bans', () => {
    // Arrange: tiny grids, small durations, random occupancy, move and late-goal bans before t = 30.
    const rng = createRng(99);
    let constrainedDiffers = 0;
    for (let trial = 0; trial < 40; trial++) {
      const setup = tinyTrial(rng, trial, 0.2, 2);
      if (setup === null) continue;
      const { grid, cells, start, goal, F, T, headings } = setup;
      const bans: AgentBan[] = [];
      for (let k = rng.int(7); k > 0; k--) {
        const from = rng.int(25);
        const cell = cells[rng.int(cells.length)];
        if (rng.next() < 0.6) bans.push({ kind: 'occupancy', cell, from, to: from + 1 + rng.int(5) });
        else {
          const h = rng.int(4);
          const to = forwardCell(grid, cell, h);
          if (to >= 0) bans.push({ kind: 'move', fromCell: cell, toCell: to, from, to: from + 1 + rng.int(5) });
        }
      }
      if (rng.next() < 0.3) bans.push({ kind: 'late-goal', notBefore: rng.int(20) });
      // Act
      const ours = plan(grid, start, goal, headings, F, T, bans);
      const free = plan(grid, start, goal, headings, F, T);
      // Oracle: graphology-shortest-path 2.1 Dijkstra on the time-expanded graph (npm).
      const theirs = timeExpandedCost(grid, start, goal, headings, F, T, bans, 70);
      // Assert
      expect(ours === null || ours.cost < 70).toBe(true);
      expect(ours ? ours.cost : Infinity).toBe(theirs);
      if (ours && free && ours.cost !== free.cost) constrainedDiffers++;
    }
    expect(constrainedDiffers).toBeGreaterThan(3);
  });
});
