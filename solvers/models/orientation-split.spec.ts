/**
 * solveOrientationSplit against an independent in-project oracle (the exhaustive joint-state
 * search of solvers/testing/orientation-oracle.ts, test-only, sharing no code with the engine),
 * one outside reference for single agents (shortest paths in the (cell, heading) graph from the
 * general-purpose graph library graphology, solvers/testing/heading-graph-reference.ts:
 * graphology 0.26 + graphology-shortest-path 2.1), the independent validator, and the relation
 * orientation-split SOC ≥ classic SOC.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import type { StartHeading } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import { createRng } from '../random';
import { PLAIN_CBS_SWITCHES, SWITCH_NAMES, type CbsSwitches } from '../search/cbs-types';
import { referenceTurnCost } from '../testing/heading-graph-reference';
import { orientationOracle } from '../testing/orientation-oracle';
import { tinyInstance, type TinyTask } from '../testing/tiny-instance';
import { validateOrientationPlan } from '../validate/orientation-split';
import { solveClassic } from './classic';
import { solveOrientationSplit } from './orientation-split';
import { solveModel } from './solve-model';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const HEADING_RULES: readonly StartHeading[] = ['free', 'N', 'E', 'S', 'W'];

function tinyRandom(seed: number, w: number, h: number, agents: number, walls = 0.15): MapfInstance | null {
  const rng = createRng(seed);
  const rows = Array.from({ length: h }, () => Array.from({ length: w }, () => (rng.next() < walls ? '#' : '.')).join(''));
  const free = rows.flatMap((r, y) => [...r].map((ch, x) => (ch === '.' ? ([x, y] as const) : null))).filter((c) => c !== null);
  if (free.length < agents + 2) return null;
  const starts = [...free];
  const goals = [...free];
  const pick = (pool: (readonly [number, number])[]) => pool.splice(rng.int(pool.length), 1)[0];
  const tasks: TinyTask[] = Array.from({ length: agents }, () => [pick(starts), pick(goals)]);
  return tinyInstance(rows.join('\n'), tasks);
}

function dataset(agents: number): MapfInstance {
  // Open dataset (Stern et al., SoCS 2019; Sturtevant, IEEE TCIAIG 2012), read in place.
  const dir = OPEN_GRID_BENCHMARKS_DIR;
  const map = parseMap(readFileSync(join(dir, 'empty-8-8.map'), 'utf8'));
  const sc = parseScenario(readFileSync(join(dir, 'empty-8-8-even-1.scen'), 'utf8'));
  if (!map.ok || !sc.ok) throw new Error('dataset files did not parse');
  const inst = instanceFromScenario(map.value, sc.value, agents);
  if (!inst.ok) throw new Error('instance');
  return inst.value;
}

describe('solveOrientationSplit', () => {
  it('matches the exhaustive orientation oracle on tiny seeded instances under every start-heading rule, plans valid', () => {
    // Independent in-project oracle: orientationOracle (exhaustive A* over joint (cell, heading) states).
    let compared = 0;
    let unsolvable = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const inst = tinyRandom(seed * 53, 3 + (seed % 2), 3, seed % 4 === 0 ? 3 : 2);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const rule = HEADING_RULES[seed % HEADING_RULES.length];
      const oracle = orientationOracle(inst, rule, { maxExpansions: 200_000 });
      const r = solveOrientationSplit(inst, { startHeading: rule, nodeLimit: oracle.kind === 'unsolvable' ? 300 : 20_000 });
      if (oracle.kind === 'unsolvable') {
        expect(r.status === 'timeout' || r.status === 'infeasible').toBe(true);
        unsolvable++;
        continue;
      }
      compared++;
      expect(r.status).toBe('solved');
      expect(r.soc).toBe(oracle.soc);
      const check = validateOrientationPlan(inst, r.states, rule);
      expect(check.violation).toBeUndefined();
      expect(check.soc).toBe(r.soc);
      expect(check.makespan).toBe(r.makespan);
    }
    // The 40 seeded cases are fixed: 36 with a plan, 4 that the oracle proves have none.
    expect([compared, unsolvable]).toEqual([36, 4]);
  });

  it('single agent, unit costs: equals the graphology shortest path in the (cell, heading) graph on seeded grids', () => {
    // Reference: referenceTurnCost = graphology-shortest-path dijkstra.bidirectional with forward 1, quarter turn 1.
    let compared = 0;
    let unreachable = 0;
    for (let seed = 1; seed <= 40; seed++) {
      const inst = tinyRandom(seed * 7 + 3, 4 + (seed % 4), 3 + (seed % 3), 1, 0.25);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const rule = HEADING_RULES[seed % HEADING_RULES.length];
      const a = inst.agents[0];
      const expected = referenceTurnCost(inst.grid, a.start, a.goal, rule, 1, 1);
      const r = solveOrientationSplit(inst, { startHeading: rule });
      if (expected === undefined) {
        expect(r.status).toBe('infeasible');
        unreachable++;
        continue;
      }
      compared++;
      expect(r.soc).toBe(expected);
      expect(validateOrientationPlan(inst, r.states, rule).ok).toBe(true);
    }
    // The 40 seeded cases are fixed: 36 reachable goals, 4 unreachable ones.
    expect([compared, unreachable]).toEqual([36, 4]);
  });

  it('single agent, real durations: weighted-split equals the graphology shortest path priced in ms', () => {
    // Reference: referenceTurnCost (graphology) with forward F and quarter turn T ms.
    let compared = 0;
    let unreachable = 0;
    for (let seed = 1; seed <= 30; seed++) {
      const inst = tinyRandom(seed * 11 + 5, 4 + (seed % 4), 3 + (seed % 3), 1, 0.25);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const rng = createRng(seed);
      const profile = { forwardMs: 100 + rng.int(900), quarterTurnMs: 50 + rng.int(900), waitMs: 500, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };
      const rule = HEADING_RULES[seed % HEADING_RULES.length];
      const a = inst.agents[0];
      const expected = referenceTurnCost(inst.grid, a.start, a.goal, rule, profile.forwardMs, profile.quarterTurnMs);
      const r = solveModel('weighted-split', inst, { profile, startHeading: rule });
      if (expected === undefined) {
        expect(r.status).toBe('infeasible');
        unreachable++;
        continue;
      }
      compared++;
      expect(r.status).toBe('solved');
      expect(r.soc).toBe(expected);
      expect(r.turnInclusiveSocMs).toBe(expected);
    }
    // The 30 seeded cases are fixed: 26 reachable goals, 4 unreachable ones.
    expect([compared, unreachable]).toEqual([26, 4]);
  });

  it('never beats classic: orientation-split SOC ≥ classic SOC on seeded and dataset instances', () => {
    let compared = 0;
    let notBothSolved = 0;
    for (let seed = 1; seed <= 15; seed++) {
      const inst = tinyRandom(seed * 31, 5, 5, 4);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const classic = solveClassic(inst, { nodeLimit: 20_000 });
      const oriented = solveOrientationSplit(inst, { startHeading: 'free', nodeLimit: 20_000 });
      if (classic.status !== 'solved' || oriented.status !== 'solved') {
        // Neither may claim a plan the other proves impossible; a timeout is no claim.
        expect(classic.status === 'infeasible' && oriented.status === 'solved').toBe(false);
        notBothSolved++;
        continue;
      }
      compared++;
      expect(oriented.soc as number).toBeGreaterThanOrEqual(classic.soc as number);
    }
    expect([compared, notBothSolved]).toEqual([14, 1]);
    const inst = dataset(10);
    expect(solveOrientationSplit(inst, { startHeading: 'N' }).soc as number).toBeGreaterThanOrEqual(solveClassic(inst).soc as number);
  });

  it('gives the same optimum with every combination of the five switches that apply', () => {
    const names = SWITCH_NAMES.filter((n) => n !== 'corridorReasoning' && n !== 'rectangleReasoning');
    let runs = 0;
    for (const seed of [3, 8]) {
      const inst = tinyRandom(seed * 97, 5, 4, 3);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const expected = solveOrientationSplit(inst, { startHeading: 'E', switches: PLAIN_CBS_SWITCHES, nodeLimit: 50_000 });
      expect(expected.status).toBe('solved');
      for (let mask = 0; mask < 1 << names.length; mask++) {
        const switches = Object.fromEntries(names.map((n, i) => [n, (mask & (1 << i)) !== 0])) as Partial<CbsSwitches>;
        const r = solveOrientationSplit(inst, { startHeading: 'E', switches, nodeLimit: 50_000 });
        expect(r.soc).toBe(expected.soc);
        expect(validateOrientationPlan(inst, r.states, 'E').ok).toBe(true);
        runs++;
      }
    }
    expect(runs).toBe(2 * (1 << names.length));
  });

  it('prices a free start heading at nothing and a fixed one by its turns (hand-worked)', () => {
    // L-shaped route (0, 0) → (2, 0) → (2, 1): free: face E, 2 forwards, turn right, 1 forward = 4 steps;
    // facing N: one more turn first = 5; facing W: two turns first = 6.
    const inst = tinyInstance('...\n##.', [[[0, 0], [2, 1]]]);
    expect(solveOrientationSplit(inst, { startHeading: 'free' }).soc).toBe(4);
    expect(solveOrientationSplit(inst, { startHeading: 'N' }).soc).toBe(5);
    expect(solveOrientationSplit(inst, { startHeading: 'W' }).soc).toBe(6);
    const free = solveOrientationSplit(inst, { startHeading: 'free' });
    expect(free.states[0].map((s) => s.heading)).toEqual(['E', 'E', 'E', 'S', 'S']);
    // Default profile (forward 1000, quarter turn 800): 3 × 1000 + 800.
    expect(free.turnInclusiveSocMs).toBe(3800);
    expect(free.turns).toBe(1);
  });

  it('lets a task-level start heading win over the rule', () => {
    const inst = tinyInstance('...\n##.', [[[0, 0], [2, 1], 'W']]);
    const r = solveOrientationSplit(inst, { startHeading: 'free' });
    expect(r.soc).toBe(6);
    expect(r.states[0][0].heading).toBe('W');
  });

  it('resolves a head-on meeting in a corridor with a side pocket, valid and optimal', () => {
    // Two robots facing each other in a 4-cell corridor with one pocket below (1, 0): the in-project oracle is the reference.
    const inst = tinyInstance('....\n.#.#', [[[0, 0], [3, 0], 'E'], [[3, 0], [0, 0], 'W']]);
    const r = solveOrientationSplit(inst);
    const oracle = orientationOracle(inst, 'free');
    expect(oracle.kind).toBe('solved');
    expect(r.soc).toBe(oracle.kind === 'solved' ? oracle.soc : NaN);
    expect(validateOrientationPlan(inst, r.states, 'free').ok).toBe(true);
  });

  it('rejects a bad start heading and reports instance problems as statuses', () => {
    const inst = tinyInstance('..#..', [[[0, 0], [4, 0]]]);
    expect(() => solveOrientationSplit(inst, { startHeading: 'up' as StartHeading })).toThrow(/startHeading must be N, E, S, W or free/);
    expect(solveOrientationSplit(inst).status).toBe('infeasible');
  });

  it('stops at the node limit with a lower bound and on an aborted signal; is deterministic', () => {
    const inst = dataset(16);
    const cut = solveOrientationSplit(inst, { nodeLimit: 2, startHeading: 'N' });
    expect(cut.status).toBe('timeout');
    expect(cut.lowerBound).not.toBeNull();
    expect(solveOrientationSplit(inst, { signal: AbortSignal.abort() }).reason).toMatch(/abort/);
    const small = dataset(6);
    expect(solveOrientationSplit(small, { startHeading: 'S' })).toEqual(solveOrientationSplit(small, { startHeading: 'S' }));
  });
});
