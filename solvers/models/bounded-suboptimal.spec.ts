/**
 * Bounded-suboptimal search for the five plan models (issue 15, item 1; ECBS, Barer et al.,
 * SoCS 2014; EECBS, Li, Ruml, Koenig, AAAI 2021): on seeded random small instances every bounded
 * plan passes the model's independent validator (solveModel only calls it solved then), its
 * SOC is at most w × the reported lower bound, and that lower bound never exceeds the exact
 * optimum (from the w = 1 solve, itself checked against exhaustive oracles in solvers/testing).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { gridFromText } from '../grid/grid';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import { createRng } from '../random';
import { solveModel, type ModelResult, type ModelSolveOptions } from './solve-model';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

/** A random map of the given size and obstacle density with distinct random starts and goals on free cells. */
function randomInstance(seed: number, width: number, height: number, agents: number, density: number): MapfInstance {
  const rng = createRng(seed);
  const rows: string[] = [];
  for (let y = 0; y < height; y++) {
    let row = '';
    for (let x = 0; x < width; x++) row += rng.next() < density ? '#' : '.';
    rows.push(row);
  }
  const grid = gridFromText(rows.join('\n'));
  const free: number[] = [];
  for (let c = 0; c < width * height; c++) if (grid.passable[c] === 1) free.push(c);
  const pick = (taken: Set<number>): number => {
    for (;;) {
      const c = free[rng.int(free.length)];
      if (!taken.has(c)) { taken.add(c); return c; }
    }
  };
  const starts = new Set<number>();
  const goals = new Set<number>();
  const n = Math.min(agents, free.length);
  return { grid, agents: Array.from({ length: n }, () => ({ start: pick(starts), goal: pick(goals) })) };
}

/** Agents per random 6 × 6 instance: as many as the exact reference solves quickly (k-robust's windows make it slowest). */
const AGENTS: Readonly<Record<PlanModel, number>> = { 'classic': 8, 'uniform-duration': 8, 'orientation-split': 7, 'weighted-split': 3, 'k-robust': 6 };

/** Options per model: k-robust needs k; weighted-split keeps its instances smaller (ms search). */
function optionsOf(model: PlanModel): ModelSolveOptions {
  return { nodeLimit: 20000, ...(model === 'k-robust' ? { k: 1 } : {}) };
}

/** Checks one bounded result against the exact one; returns whether it was compared. */
function expectBounded(r: ModelResult, exact: ModelResult, w: number): boolean {
  if (exact.status !== 'solved') return false;
  expect([r.status, r.reason]).toEqual(['solved', undefined]);
  expect(r.isValidated).toBe(true);
  const soc = r.soc as number;
  const lb = r.lowerBound as number;
  expect(soc).toBeLessThanOrEqual(w * lb + 1e-9);
  expect(lb).toBeLessThanOrEqual(exact.soc as number);
  expect(soc).toBeGreaterThanOrEqual(exact.soc as number);
  expect(r.gap).toBeCloseTo(lb === 0 ? 0 : (soc - lb) / lb, 12);
  expect(r.parameters.suboptimality).toBe(w);
  return true;
}

describe('bounded-suboptimal solveModel', () => {
  it.each(PLAN_MODELS)('%s: random small instances with w = 1.1 and 1.5 validate, stay within w × lower bound, and the bound never exceeds the optimum', (model) => {
    const isWeighted = model === 'weighted-split';
    let compared = 0;
    let belowOptimum = 0;
    for (let seed = 1; seed <= 20; seed++) {
      const inst = isWeighted ? randomInstance(seed * 13, 4, 4, 3, 0.15) : randomInstance(seed * 13, 6, 6, AGENTS[model], 0.2);
      const exact = solveModel(model, inst, optionsOf(model));
      expect('suboptimality' in exact.parameters).toBe(false);
      if (exact.status === 'solved') expect([exact.gap, exact.lowerBound]).toEqual([0, exact.soc]);
      for (const w of [1.1, 1.5]) {
        const r = solveModel(model, inst, { ...optionsOf(model), suboptimality: w });
        if (expectBounded(r, exact, w)) compared++;
        if (r.status === 'solved' && (r.lowerBound as number) < (exact.soc as number)) belowOptimum++;
      }
    }
    // Most seeds are solvable (goals reachable); both factors compared on each of those.
    expect(compared).toBeGreaterThanOrEqual(24);
    // Not a vacuous check: some bounds are strictly below the optimum, i.e. the search really was bounded.
    expect(belowOptimum).toBeGreaterThan(0);
  });

  it('weighted-split: the root pair bound lifts the lower bound above the sum of single-agent optima, never above the optimum', () => {
    // Arrange: seeded 5 × 5 instances with 4 agents; each agent's optimum alone from a one-agent solve.
    let compared = 0;
    let lifted = 0;
    for (let seed = 1; seed <= 15; seed++) {
      const inst = randomInstance(seed * 31, 5, 5, 4, 0.15);
      const exact = solveModel('weighted-split', inst, optionsOf('weighted-split'));
      if (exact.status !== 'solved') continue;
      const alone = inst.agents.reduce((sum, a) => sum + (solveModel('weighted-split', { grid: inst.grid, agents: [a] }, optionsOf('weighted-split')).soc as number), 0);
      // Act: the full search, and one stopped before its first expansion (its bound is the root's).
      const r = solveModel('weighted-split', inst, { ...optionsOf('weighted-split'), suboptimality: 1.2 });
      const atRoot = solveModel('weighted-split', inst, { ...optionsOf('weighted-split'), suboptimality: 1.2, nodeLimit: 0 });
      // Assert
      expect(expectBounded(r, exact, 1.2)).toBe(true);
      expect(atRoot.status).not.toBe('solved');
      expect(atRoot.lowerBound as number).toBeLessThanOrEqual(exact.soc as number);
      compared++;
      if ((atRoot.lowerBound as number) > alone) lifted++;
    }
    expect(compared).toBeGreaterThanOrEqual(10);
    expect(lifted).toBeGreaterThan(0);
  });

  it.each([
    ['classic with following forbidden', 'classic' as PlanModel, { following: 'forbidden' as const }],
    ['uniform-duration with following forbidden', 'uniform-duration' as PlanModel, { following: 'forbidden' as const }],
    ['orientation-split with following forbidden', 'orientation-split' as PlanModel, { following: 'forbidden' as const }],
    ['k-robust with k = 2', 'k-robust' as PlanModel, { k: 2 }],
  ])('%s: bounded plans validate under that rule and stay within w × a bound at most the optimum', (_name, model, extra) => {
    let compared = 0;
    // Small enough for the exact reference under the extra rule to stay quick (7 agents took minutes here).
    for (let seed = 1; seed <= 12; seed++) {
      const inst = randomInstance(seed * 17, 6, 6, model === 'classic' || model === 'uniform-duration' ? 6 : 5, 0.2);
      const options: ModelSolveOptions = { nodeLimit: 5000, ...extra };
      const exact = solveModel(model, inst, options);
      for (const w of [1.2, 1.5]) {
        const r = solveModel(model, inst, { ...options, suboptimality: w });
        if (expectBounded(r, exact, w)) compared++;
      }
    }
    expect(compared).toBeGreaterThanOrEqual(12);
  });

  // The exact path pinned: SOC and node counts of w = 1 solves, byte-identical to the solver before
  // bounded search existed (commit 9020ae7, compared on 200 seeded instances of these five shapes).
  // weighted-split's counts changed on purpose since (issue 15, item 2: heuristic, pair bounds,
  // bypass; it was 932 / 498 / 39620 with the same SOC; then disjoint splitting: 78 / 41 / 122745);
  // its optimum is checked against the exhaustive oracle in weighted-split-oracle.spec.ts.
  // classic's, uniform-duration's and orientation-split's counts changed on purpose since (issue 15,
  // item 3: target conflicts are split first, semi-cardinal ones next; they were 176 / 84 / 8236 and
  // 232 / 115 / 28820 with the same SOC; they were 130 / 55 / 6677 and 220 / 105 / 25877 before
  // conflicts in cells with two open neighbours were split first, with the same SOC).
  it.each([
    ['classic' as PlanModel, 27, 8, [51, 127, 54, 6390]],
    ['uniform-duration' as PlanModel, 27, 8, [51, 127, 54, 6390]],
    ['orientation-split' as PlanModel, 25, 8, [48, 197, 97, 27155]],
    ['k-robust' as PlanModel, 35, 6, [29, 268, 129, 13795]],
    ['weighted-split' as PlanModel, 32, 3, [20000, 21, 12, 22155]],
  ])('%s: w = 1 is the exact search of before (seed %i, %i agents: SOC, nodes generated, expanded, low-level expansions)', (model, seed, agents, pinned) => {
    const inst = model === 'weighted-split' ? randomInstance(seed * 13, 4, 4, agents, 0.15) : randomInstance(seed * 13, 6, 6, agents, 0.2);
    const r = solveModel(model, inst, optionsOf(model));
    expect([r.status, r.soc, r.nodesGenerated, r.nodesExpanded, r.lowLevelExpansions]).toEqual(['solved', ...pinned]);
  });

  it('refuses a factor below 1, above 10 or not finite, naming the option', () => {
    const inst = randomInstance(3, 4, 4, 2, 0);
    let refused = 0;
    for (const w of [0.99, 10.5, Number.NaN, Number.POSITIVE_INFINITY]) {
      expect(() => solveModel('classic', inst, { suboptimality: w })).toThrow(/^option suboptimality must be a number from 1 to 10/);
      refused++;
    }
    expect(refused).toBe(4);
  });

  it('keeps w = 1 exactly the exact result (same plan, no suboptimality parameter)', () => {
    let compared = 0;
    for (const model of PLAN_MODELS) {
      const inst = randomInstance(41, 5, 5, 4, 0.1);
      const a = solveModel(model, inst, optionsOf(model));
      const b = solveModel(model, inst, { ...optionsOf(model), suboptimality: 1 });
      expect({ ...b, runtimeMs: 0 }).toEqual({ ...a, runtimeMs: 0 });
      compared++;
    }
    expect(compared).toBe(5);
  });

  it('scales: classic w = 1.5 solves 60 agents of random-32-32-20 within a node limit, and every unit-step model 30', () => {
    // Open dataset (Stern et al., SoCS 2019; Sturtevant, IEEE TCIAIG 2012), read in place.
    const dir = OPEN_GRID_BENCHMARKS_DIR;
    const map = parseMap(readFileSync(join(dir, 'random-32-32-20.map'), 'utf8'));
    const scen = parseScenario(readFileSync(join(dir, 'random-32-32-20-even-1.scen'), 'utf8'));
    if (!map.ok || !scen.ok) throw new Error('dataset files did not parse');
    let solved = 0;
    for (const [model, agents] of [['classic', 60], ['uniform-duration', 30], ['orientation-split', 30], ['k-robust', 30]] as const) {
      const inst = instanceFromScenario(map.value, scen.value, agents);
      if (!inst.ok) throw new Error('instance');
      const r = solveModel(model, inst.value, { suboptimality: 1.5, nodeLimit: 2000, ...(model === 'k-robust' ? { k: 1 } : {}) });
      expect([model, r.status]).toEqual([model, 'solved']);
      expect(r.soc as number).toBeLessThanOrEqual(1.5 * (r.lowerBound as number));
      solved++;
    }
    expect(solved).toBe(4);
  });
});
