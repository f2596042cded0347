/**
 * solveModel over the five plan models: one result shape, every plan through its independent
 * validator, and the relations between the models that must hold (uniform-duration's
 * turn-inclusive makespan = classic makespan × (forward + 2 × quarter turn); a weighted-split
 * schedule at nominal durations overlaps no occupancy, checked here by a separate scan).
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { PLAN_MODELS, type RobotProfile, type Schedule } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import { referenceTurnCost } from '../testing/heading-graph-reference';
import { tinyInstance } from '../testing/tiny-instance';
import { solveModel } from './solve-model';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 450, waitMs: 600, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0 };

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

/**
 * Occupancy overlaps of a schedule, written here apart from the schedule validator: an agent
 * holds its cell while turning or waiting and both cells during a forward move, its start
 * before its first action and its last cell forever after; intervals are half-open.
 */
function occupancyOverlaps(schedule: Schedule, starts: readonly [number, number][]): string[] {
  const held: { agent: number; cell: string; from: number; to: number }[] = [];
  schedule.forEach((acts, agent) => {
    let last = `${starts[agent][0]},${starts[agent][1]}`;
    let t = 0;
    if (acts.length > 0) held.push({ agent, cell: last, from: 0, to: acts[0].start });
    for (const a of acts) {
      held.push({ agent, cell: `${a.from[0]},${a.from[1]}`, from: a.start, to: a.end });
      if (a.action === 'forward') held.push({ agent, cell: `${a.to[0]},${a.to[1]}`, from: a.start, to: a.end });
      last = `${a.to[0]},${a.to[1]}`;
      t = a.end;
    }
    held.push({ agent, cell: last, from: t, to: Infinity });
  });
  const out: string[] = [];
  for (let i = 0; i < held.length; i++) {
    for (let j = i + 1; j < held.length; j++) {
      const p = held[i];
      const q = held[j];
      if (p.agent !== q.agent && p.cell === q.cell && p.from < q.to && q.from < p.to) out.push(`${p.agent}/${q.agent} at ${p.cell}`);
    }
  }
  return out;
}

describe('solveModel', () => {
  const inst = dataset(6);
  const results = Object.fromEntries(PLAN_MODELS.map((m) => [m, solveModel(m, inst, { profile: PROFILE, startHeading: 'free', k: m === 'k-robust' ? 1 : undefined })]));

  it('solves every model, validated, with one result shape carrying the model, parameters and profile', () => {
    for (const m of PLAN_MODELS) {
      const r = results[m];
      expect(r.status).toBe('solved');
      expect(r.isValidated).toBe(true);
      expect(r.model).toBe(m);
      expect(r.profile).toBe(PROFILE);
      expect(r.parameters.startHeading).toBe('free');
      expect(r.lowerBound).toBe(r.soc);
      expect(r.schedule).toHaveLength(6);
      expect(r.turnInclusiveSocMs as number).toBeGreaterThan(0);
      expect(r.turns).toBe(r.schedule.flat().filter((a) => a.action === 'turn-left' || a.action === 'turn-right').length);
      expect(r.units).toBe(m === 'weighted-split' ? 'ms' : 'steps');
    }
    expect(results['k-robust'].parameters.k).toBe(1);
    expect(results['orientation-split'].plan?.kind).toBe('states');
  });

  it('uniform-duration: turn-inclusive makespan = classic makespan × (forward + 2 × quarter turn)', () => {
    const step = PROFILE.forwardMs + 2 * PROFILE.quarterTurnMs;
    for (const agents of [3, 6, 10]) {
      const i = dataset(agents);
      const classic = solveModel('classic', i, { profile: PROFILE });
      const uniform = solveModel('uniform-duration', i, { profile: PROFILE });
      expect(uniform.makespan).toBe(classic.makespan);
      expect(uniform.turnInclusiveMakespanMs).toBe((classic.makespan as number) * step);
      // Every robot's action in a step fits inside the step's slot.
      for (const acts of uniform.schedule) for (const a of acts) expect(a.end).toBeLessThanOrEqual((a.step + 1) * step);
    }
  });

  it('weighted-split: the schedule at nominal durations overlaps no occupancy (separate scan)', () => {
    const r = results['weighted-split'];
    const starts = inst.agents.map((a): [number, number] => [a.start % inst.grid.width, Math.floor(a.start / inst.grid.width)]);
    expect(occupancyOverlaps(r.schedule, starts)).toEqual([]);
    // The scan has teeth: a classic follower plan run back to back at nominal times breaks the occupancy
    // rule (the follower enters (1, 0) while the leader still holds it), while weighted-split waits.
    const follow = tinyInstance('...', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    expect(occupancyOverlaps(solveModel('classic', follow, { profile: PROFILE, startHeading: 'E' }).schedule, [[1, 0], [0, 0]])).not.toEqual([]);
    expect(occupancyOverlaps(solveModel('weighted-split', follow, { profile: PROFILE, startHeading: 'E' }).schedule, [[1, 0], [0, 0]])).toEqual([]);
  });

  it('orders the models as the rules imply: turn-aware and robust plans never beat their relaxations', () => {
    // Orientation-split and k-robust only add rules to classic; weighted-split cannot beat the sum of each
    // robot's single-agent turn-aware optimum (graphology-shortest-path reference, heading-graph-reference.ts).
    expect(results['orientation-split'].soc as number).toBeGreaterThanOrEqual(results.classic.soc as number);
    expect(results['k-robust'].soc as number).toBeGreaterThanOrEqual(results.classic.soc as number);
    const alone = inst.agents.reduce((sum, a) => sum + (referenceTurnCost(inst.grid, a.start, a.goal, 'free', PROFILE.forwardMs, PROFILE.quarterTurnMs) as number), 0);
    expect(results['weighted-split'].soc as number).toBeGreaterThanOrEqual(alone);
  });

  it('reports instance problems as the same statuses for every model', () => {
    const shared = tinyInstance('...', [[[0, 0], [2, 0]], [[1, 0], [2, 0]]]);
    const blocked = tinyInstance('..#', [[[0, 0], [2, 0]]]);
    for (const m of PLAN_MODELS) {
      const k = m === 'k-robust' ? 1 : undefined;
      expect(solveModel(m, shared, { k }).status).toBe('infeasible');
      const b = solveModel(m, blocked, { k });
      expect(b.status).toBe('error');
      expect(b.reason).toMatch(/blocked/);
      expect(b.schedule).toEqual([]);
    }
  });

  it('throws on bad options with the field named', () => {
    const one = tinyInstance('...', [[[0, 0], [2, 0]]]);
    expect(() => solveModel('k-robust', one)).toThrow(/option k is required/);
    expect(() => solveModel('classic', one, { profile: { ...PROFILE, quarterTurnMs: 0 } })).toThrow(/quarterTurnMs must be a positive integer/);
    expect(() => solveModel('diagonal' as never, one)).toThrow(/unknown plan model/);
    expect(() => solveModel('orientation-split', one, { startHeading: 'NE' as never })).toThrow(/startHeading must be/);
  });

  it('passes limits through: a node limit gives timeout with a lower bound for the unit-step models', () => {
    // 16 agents on empty-8-8: every unit-step model's root has conflicts, so a limit of one node
    // always stops the search (no model may "solve" here and skip the checks).
    const big = dataset(16);
    const stopped: string[] = [];
    for (const m of ['classic', 'orientation-split', 'k-robust'] as const) {
      const r = solveModel(m, big, { nodeLimit: 1, k: m === 'k-robust' ? 3 : undefined, startHeading: 'N' });
      expect(r.status).toBe('timeout');
      expect(r.lowerBound).not.toBeNull();
      expect(r.plan).toBeNull();
      stopped.push(m);
    }
    expect(stopped).toEqual(['classic', 'orientation-split', 'k-robust']);
  });
});
