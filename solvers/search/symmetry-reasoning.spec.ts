/**
 * Conflict classification and the three symmetry reasonings on hand-made cases: a corridor,
 * a rectangle and a target conflict. Expected optima come from the independent classic
 * oracle in solvers/testing (an exhaustive joint search sharing no code with the engine).
 */
import { gridFromText } from '../grid/grid';
import type { MapfInstance } from '../instance';
import { ClassicModel, solveClassic } from '../models/classic';
import { classicOracle } from '../testing/classic-oracle';
import { validateClassicPlan } from '../validate/classic';
import { Budget } from './budget';
import { CbsEngine } from './cbs';
import { type CbsSwitches, DEFAULT_SWITCHES, PLAIN_CBS_SWITCHES } from './cbs-types';
import { ConflictAvoidanceTable } from './conflict-avoidance-table';
import { C_RANGE, C_VERTEX, type Constraint } from './constraint';
import { ConstraintTable } from './constraint-table';
import { type Conflict, K_CORRIDOR, K_RECTANGLE, K_TARGET, K_VERTEX, makeConflict, P_CARDINAL, P_NON, P_SEMI } from './conflict';
import { classifyByMdds } from './conflict-priority';
import { findCorridorConflict } from './corridor-reasoning';
import { buildMdd, type Mdd } from './mdd';
import { findRectangleConflict } from './rectangle-reasoning';
import { SpaceTimeAStar } from './space-time-astar';

const at = (w: number, x: number, y: number): number => y * w + x;

/** Root paths, tables and MDDs of an instance (no constraints), plus its first conflict. */
function root(inst: MapfInstance) {
  const model = new ClassicModel(inst.grid, inst);
  const planner = new SpaceTimeAStar(model, new Budget(undefined, undefined, undefined));
  const tables = inst.agents.map((a, i) => new ConstraintTable(i, a.goal, model.cellCount, inst.grid.width, []));
  const paths = tables.map((t, i) => planner.plan(i, t, null) as Int32Array);
  const mdds = paths.map((p, i) => buildMdd(model, i, tables[i], p.length - 1) as Mdd);
  const conflicts: Conflict[] = [];
  model.findConflicts(0, paths[0], 1, paths[1], conflicts);
  return { model, planner, tables, paths, mdds, conflicts };
}

/**
 * The CBS engine's own classification of a raw conflict between two root paths: its private
 * `refine` step (target relabelling, MDD priority, rectangle), reached through element access
 * because the engine exposes it only inside a search.
 */
function classifyByEngine(inst: MapfInstance, switches: CbsSwitches, raw: Conflict, r: ReturnType<typeof root>): Conflict {
  const budget = new Budget(undefined, undefined, undefined);
  const engine = new CbsEngine({
    model: r.model,
    agents: inst.agents.map((_, i) => i),
    switches,
    budget,
    planner: new SpaceTimeAStar(r.model, budget),
    cat: new ConflictAvoidanceTable(r.model.cellCount),
    degree: r.model.degree,
    nodeLimit: 1_000,
    expandLimit: 1_000,
    isLimitFatal: true,
    memoryLimitBytes: 64 * 1024 * 1024,
    isSub: false,
  });
  return engine['refine'](raw, r.paths[raw.a1], r.paths[raw.a2], r.mdds[raw.a1], r.mdds[raw.a2]);
}

function expectOptimal(inst: MapfInstance, expectedSoc: number): void {
  for (const switches of [DEFAULT_SWITCHES, PLAIN_CBS_SWITCHES]) {
    const r = solveClassic(inst, { switches, nodeLimit: 200_000 });
    expect(r.status).toBe('solved');
    expect(r.soc).toBe(expectedSoc);
    expect(validateClassicPlan(inst, r.paths).ok).toBe(true);
  }
}

describe('conflict classification by MDDs', () => {
  it('calls a head-on meeting in a one-wide passage cardinal, an open crossing non-cardinal', () => {
    const line = gridFromText('.....');
    const r1 = root({ grid: line, agents: [{ start: 0, goal: 4 }, { start: 4, goal: 0 }] });
    const c1 = makeConflict(K_VERTEX, 0, 1, 2, -1, 2);
    classifyByMdds(c1, r1.mdds[0], r1.mdds[1]);
    expect(c1.priority).toBe(P_CARDINAL);
    expect(c1.isMddCardinal).toBe(true);
    const open = gridFromText('...\n...\n...');
    const r2 = root({ grid: open, agents: [{ start: at(3, 0, 0), goal: at(3, 2, 2) }, { start: at(3, 2, 0), goal: at(3, 0, 2) }] });
    const c2 = makeConflict(K_VERTEX, 0, 1, at(3, 1, 1), -1, 2);
    classifyByMdds(c2, r2.mdds[0], r2.mdds[1]);
    expect(c2.priority).toBe(P_NON);
  });

  it('calls a conflict semi-cardinal when only one agent is pinned, and puts that agent first', () => {
    // Agent 0 walks the bottom row of a 3 × 3 room straight; agent 1 crosses diagonally with choices.
    const g = gridFromText('...\n...\n...');
    const r = root({ grid: g, agents: [{ start: at(3, 0, 1), goal: at(3, 2, 1) }, { start: at(3, 1, 0), goal: at(3, 1, 2) }] });
    const c = makeConflict(K_VERTEX, 1, 0, at(3, 1, 1), -1, 1);
    classifyByMdds(c, r.mdds[1], r.mdds[0]);
    expect(c.priority).toBe(P_CARDINAL); // both straight lines: each MDD is one path
    const r2 = root({ grid: g, agents: [{ start: at(3, 0, 1), goal: at(3, 2, 1) }, { start: at(3, 0, 0), goal: at(3, 2, 2) }] });
    const c2 = makeConflict(K_VERTEX, 1, 0, at(3, 1, 1), -1, 2);
    classifyByMdds(c2, r2.mdds[1], r2.mdds[0]);
    expect(c2.priority).toBe(P_NON); // agent 0 is at (2,1) at t = 2, never (1,1): neither level pinned there
    const c3 = makeConflict(K_VERTEX, 1, 0, at(3, 1, 1), -1, 1);
    classifyByMdds(c3, r2.mdds[1], r2.mdds[0]);
    expect(c3.priority).toBe(P_SEMI);
    expect(c3.a1).toBe(0); // the pinned agent (straight walker) now leads, for disjoint splitting
  });
});

describe('corridor reasoning', () => {
  // A corridor of five degree-2 cells between two open ends.
  const grid = gridFromText('.#####.\n.......\n.#####.');
  const inst: MapfInstance = { grid, agents: [{ start: at(7, 0, 0), goal: at(7, 6, 2) }, { start: at(7, 6, 0), goal: at(7, 0, 2) }] };

  it('turns the head-on conflict into range constraints on the corridor ends', () => {
    const r = root(inst);
    const first = r.conflicts[0];
    const corridor = findCorridorConflict(r.planner, r.model.degree, first, (a) => r.paths[a], (a) => r.tables[a]) as Conflict;
    expect(corridor).not.toBeNull();
    expect(corridor.kind).toBe(K_CORRIDOR);
    const [c1] = corridor.constraints1 as Constraint[];
    const [c2] = corridor.constraints2 as Constraint[];
    expect(c1.kind).toBe(C_RANGE);
    expect(c2.kind).toBe(C_RANGE);
    // Each agent is kept off the far end of the corridor until the other could have crossed it.
    expect(new Set([c1.a, c2.a])).toEqual(new Set([at(7, 0, 1), at(7, 6, 1)]));
    expect(c1.t0).toBe(0);
    expect(c1.t1).toBeGreaterThanOrEqual(6);
  });

  it('keeps the optimum and needs far fewer CT nodes than plain CBS', () => {
    const oracle = classicOracle(inst);
    if (oracle.kind !== 'solved') throw new Error('oracle');
    expectOptimal(inst, oracle.soc);
    const withCorridor = solveClassic(inst, { switches: { ...PLAIN_CBS_SWITCHES, corridorReasoning: true } });
    const plain = solveClassic(inst, { switches: PLAIN_CBS_SWITCHES });
    expect(withCorridor.soc).toBe(oracle.soc);
    expect(withCorridor.nodesGenerated * 4).toBeLessThan(plain.nodesGenerated);
  });
});

describe('rectangle reasoning', () => {
  // Two agents crossing an open room, one left-to-right and one top-to-bottom, both down-right:
  // every pair of shortest paths meets (both are on the same anti-diagonal at each time).
  const grid = gridFromText('......\n......\n......\n......\n......\n......');
  const inst: MapfInstance = { grid, agents: [{ start: at(6, 0, 1), goal: at(6, 5, 4) }, { start: at(6, 1, 0), goal: at(6, 4, 5) }] };

  it('finds a cardinal rectangle with barrier constraints on MDD nodes only', () => {
    const r = root(inst);
    const v = r.conflicts.find((c) => c.kind === K_VERTEX) as Conflict;
    const rect = findRectangleConflict(6, v.a1, v.a2, r.paths[v.a1], r.paths[v.a2], v.t, r.mdds[v.a1], r.mdds[v.a2]) as Conflict;
    expect(rect).not.toBeNull();
    expect(rect.kind).toBe(K_RECTANGLE);
    expect(rect.priority).toBe(P_CARDINAL);
    for (const [agent, list] of [[rect.a1, rect.constraints1], [rect.a2, rect.constraints2]] as const) {
      expect(list!.length).toBeGreaterThan(1);
      for (const c of list!) {
        expect(c.kind).toBe(C_VERTEX);
        expect(c.agent).toBe(agent);
        expect(r.mdds[agent].levelHasCell(c.t1, c.a)).toBe(true);
      }
    }
  });

  it('keeps the optimum (one agent waits once) with fewer CT nodes than plain CBS', () => {
    const oracle = classicOracle(inst);
    if (oracle.kind !== 'solved') throw new Error('oracle');
    expect(oracle.soc).toBe(8 + 8 + 1);
    expectOptimal(inst, oracle.soc);
    const rect = solveClassic(inst, { switches: { ...PLAIN_CBS_SWITCHES, prioritizeConflicts: true, rectangleReasoning: true } });
    const plain = solveClassic(inst, { switches: { ...PLAIN_CBS_SWITCHES, prioritizeConflicts: true } });
    expect(rect.soc).toBe(oracle.soc);
    expect(rect.nodesGenerated).toBeLessThan(plain.nodesGenerated);
  });
});

describe('target reasoning', () => {
  // Agent 0 reaches its goal (2, 0) at t = 1; agent 1 must cross that cell at t = 2.
  const grid = gridFromText('.....\n.....');
  const inst: MapfInstance = { grid, agents: [{ start: at(5, 2, 1), goal: at(5, 2, 0) }, { start: at(5, 0, 0), goal: at(5, 4, 0) }] };

  it('classifies the goal conflict as a target conflict and keeps the optimum', () => {
    // Arrange: the real root paths and the conflict the model finds between them.
    const r = root(inst);
    expect(r.conflicts).toHaveLength(1);
    const v = r.conflicts[0];
    expect(v.kind).toBe(K_VERTEX);
    expect(v.a1).toBe(0); // the agent resting at its goal comes first
    expect(v.cell).toBe(at(5, 2, 0));
    expect(v.t).toBeGreaterThan(r.paths[0].length - 1);
    // Act: the engine classifies it, with target reasoning and MDD priorities on, and with target reasoning off.
    const target = classifyByEngine(inst, DEFAULT_SWITCHES, v, r);
    const plain = classifyByEngine(inst, { ...DEFAULT_SWITCHES, targetReasoning: false }, v, r);
    // Assert: a target conflict on agent 0's goal, cardinal because agent 1's only shortest route
    // runs through (2, 0) at that time and agent 0 cannot finish later without paying more.
    expect(target.kind).toBe(K_TARGET);
    expect([target.a1, target.a2, target.cell, target.t]).toEqual([0, 1, at(5, 2, 0), v.t]);
    expect(target.priority).toBe(P_CARDINAL);
    expect(plain.kind).toBe(K_VERTEX);
    const oracle = classicOracle(inst);
    if (oracle.kind !== 'solved') throw new Error('oracle');
    expectOptimal(inst, oracle.soc);
    const t = solveClassic(inst, { switches: { ...PLAIN_CBS_SWITCHES, targetReasoning: true } });
    expect(t.soc).toBe(oracle.soc);
  });
});
