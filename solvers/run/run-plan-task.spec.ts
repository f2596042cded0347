import PF from 'pathfinding';
import type { RobotProfile } from '@shared/plan';
import { generateMap } from '../generate/generate-map';
import { createRng } from '../random';
import { classicOracle } from '../testing/classic-oracle';
import { tinyInstance } from '../testing/tiny-instance';
import { datasetInstance } from '../execute/testing/dataset-instances';
import type { PlanTask } from './plan-task';
import { isModelAvailable, runPlanTask } from './run-plan-task';
import { taskLowerBound } from './task-lower-bound';
import { fromTaskInstance, toTaskInstance } from './task-instance';
import type { MapfInstance } from '../instance';

const PROFILE: RobotProfile = { forwardMs: 1000, quarterTurnMs: 500, waitMs: 1000, cellPitchMm: 400, robotDiameterMm: 300, timingJitter: 0 };
const NO_REPLAY = { policies: [], stallProbability: 0, stallMs: 0, runs: 1 } as const;
let clock = 0;
const now = (): number => clock;

function task(instance: MapfInstance, model: PlanTask['model'], extra: Partial<PlanTask> = {}): PlanTask {
  return { model, instance: toTaskInstance(instance), profile: PROFILE, timeLimitMs: 10_000, memoryLimitMb: 256, seed: 7, execution: NO_REPLAY, ...extra };
}
const classic = { model: 'classic', startHeading: 'free', switches: {} } as const;

describe('runPlanTask', () => {
  it('round-trips an instance through its transferable form', () => {
    const inst = tinyInstance('..#\n...', [[[0, 0], [2, 1]]]);
    const back = fromTaskInstance(toTaskInstance(inst));
    expect(Array.from(back.grid.passable)).toEqual(Array.from(inst.grid.passable));
    expect(back.agents).toEqual(inst.agents);
  });

  it('solves single agents of the open dataset at the 4-connected BFS distance of the pathfinding library', () => {
    // Outside check: pathfinding@0.4.18 BreadthFirstFinder (4-connected by default) on the
    // empty-16-16 map of the open benchmark set (Stern et al., SoCS 2019), first rows of even-1.
    const full = datasetInstance('empty-16-16', 'empty-16-16-even-1', 5);
    const { width, height } = full.grid;
    const matrix = Array.from({ length: height }, (_, y) => Array.from({ length: width }, (_, x) => (full.grid.passable[y * width + x] ? 0 : 1)));
    for (const agent of full.agents) {
      const one: MapfInstance = { grid: full.grid, agents: [agent] };
      const r = runPlanTask(task(one, classic), { now });
      const ref = new PF.BreadthFirstFinder().findPath(agent.start % width, Math.floor(agent.start / width),
        agent.goal % width, Math.floor(agent.goal / width), new PF.Grid(width, height, matrix)) as number[][];
      expect(r.status).toBe('solved');
      expect(r.soc).toBe(ref.length - 1);
      expect(r.lowerBound).toBe(ref.length - 1);
    }
  });

  it('solves single agents on seeded generated maps with obstacles at the pathfinding library\'s BFS distance, unreachable goals as infeasible', () => {
    // Outside check: pathfinding@0.4.18 BreadthFirstFinder (4-connected by default; an empty path
    // when the goal cannot be reached). Maps: the project's seeded generators, one of each kind
    // with obstacles; random start/goal pairs, so the random map's pockets give unreachable goals.
    const maps = [
      generateMap({ kind: 'random', width: 12, height: 10, density: 0.4, seed: 5 }).map,
      generateMap({ kind: 'rooms', roomsX: 3, roomsY: 3, roomWidth: 4, roomHeight: 3, seed: 6 }).map,
      generateMap({ kind: 'maze', cellsX: 6, cellsY: 5, seed: 7 }).map,
      generateMap({ kind: 'warehouse', shelfColumns: 3, shelfRows: 3, shelfLength: 3, seed: 8 }).map,
    ];
    const rng = createRng(2024);
    let solved = 0;
    let unreachable = 0;
    for (const { grid } of maps) {
      const { width, height } = grid;
      const free = [...grid.passable.keys()].filter((c) => grid.passable[c] === 1);
      expect(free.length).toBeLessThan(width * height); // the map has obstacles
      const matrix = Array.from({ length: height }, (_, y) => Array.from({ length: width }, (_, x) => 1 - grid.passable[y * width + x]));
      for (let k = 0; k < 10; k++) {
        const start = free[rng.int(free.length)];
        let goal = free[rng.int(free.length)];
        while (goal === start) goal = free[rng.int(free.length)];
        const one: MapfInstance = { grid, agents: [{ start, goal }] };
        const r = runPlanTask(task(one, classic), { now });
        const ref = new PF.BreadthFirstFinder().findPath(start % width, Math.floor(start / width),
          goal % width, Math.floor(goal / width), new PF.Grid(width, height, matrix)) as number[][];
        if (ref.length === 0) {
          expect(r.status).toBe('infeasible');
          unreachable++;
        } else {
          expect(r.status).toBe('solved');
          expect(r.soc).toBe(ref.length - 1);
          solved++;
        }
      }
    }
    // The seeded sample is fixed: 40 pairs, 35 reachable and 5 unreachable (in the random map's pockets).
    expect([solved, unreachable]).toEqual([35, 5]);
  });

  it('matches the exhaustive classic oracle on a corridor with a bay and reports turn-inclusive figures', () => {
    // Two agents must pass in a corridor; one steps into the bay. Oracle: solvers/testing/classic-oracle (joint A*).
    const inst = tinyInstance('....\n.#..', [[[0, 0], [3, 0]], [[3, 0], [0, 0]]]);
    const oracle = classicOracle(inst);
    const r = runPlanTask(task(inst, classic), { now });
    expect(oracle.kind).toBe('solved');
    expect(r.status).toBe('solved');
    expect(r.soc).toBe(oracle.kind === 'solved' ? oracle.soc : -1);
    expect(r.turnInclusiveSocMs).not.toBeNull();
    expect(r.turnInclusiveSocMs as number).toBeGreaterThanOrEqual((r.soc as number) * PROFILE.forwardMs);
    expect(r.plan?.kind).toBe('paths');
  });

  it('charges quarter turns in the classic schedule: an L-shaped path of one agent', () => {
    // Hand-worked: start (0,0) facing E (free start faces the first move), 2 forwards E, one
    // quarter turn to S, 1 forward: 3 × 1000 + 500 = 3500 ms; SOC 3 steps.
    const inst = tinyInstance('...\n##.', [[[0, 0], [2, 1]]]);
    const r = runPlanTask(task(inst, classic), { now });
    expect(r.soc).toBe(3);
    expect(r.turnInclusiveSocMs).toBe(3500);
    expect(r.turns).toBe(1);
  });

  it('stretches every step for uniform-duration: makespan × (forward + 2 quarter turns)', () => {
    const inst = tinyInstance('...\n##.', [[[0, 0], [2, 1]]]);
    const r = runPlanTask(task(inst, { model: 'uniform-duration', startHeading: 'free', switches: {} }), { now });
    expect(r.makespan).toBe(3);
    expect(r.turnInclusiveMakespanMs).toBe(3 * (1000 + 2 * 500));
  });

  it('solves weighted-split in ms and passes the schedule validator', () => {
    // Hand-worked: same L path, heading fixed N: turn right to E (500), 2 forwards, turn right to S (500), 1 forward = 4000 ms.
    const inst = tinyInstance('...\n##.', [[[0, 0], [2, 1]]]);
    const r = runPlanTask(task(inst, { model: 'weighted-split', startHeading: 'N' }), { now });
    expect(r.status).toBe('solved');
    expect(r.soc).toBe(4000);
    expect(r.turnInclusiveSocMs).toBe(4000);
    expect(r.plan?.kind).toBe('schedule');
  });

  it('replays the plan under each requested policy with the requested Monte Carlo runs', () => {
    const inst = tinyInstance('....\n.#..', [[[0, 0], [3, 0]], [[3, 0], [0, 0]]]);
    const r = runPlanTask(task(inst, classic, { execution: { policies: ['open-loop', 'lockstep'], stallProbability: 0, stallMs: 0, runs: 5, jitterCv: 0.1 } }), { now });
    expect(r.executions.map((e) => e.policy)).toEqual(['open-loop', 'lockstep']);
    for (const e of r.executions) {
      expect(e.error).toBeUndefined();
      expect(e.runs).toBe(5);
      expect(e.successRate).toBeGreaterThanOrEqual(0);
      expect(e.successRate).toBeLessThanOrEqual(1);
    }
  });

  it('is deterministic for a task and seed', () => {
    const inst = datasetInstance('empty-8-8', 'empty-8-8-even-1', 6);
    const t = task(inst, classic, { execution: { policies: ['open-loop'], stallProbability: 0.05, stallMs: 300, runs: 10, jitterCv: 0.2 } });
    expect(runPlanTask(t, { now })).toEqual(runPlanTask(t, { now }));
  });

  it('solves every plan model, each through its own validator', () => {
    expect(['classic', 'uniform-duration', 'orientation-split', 'weighted-split', 'k-robust'].every((m) => isModelAvailable(m as never))).toBe(true);
    const inst = tinyInstance('....\n.#..', [[[0, 0], [3, 0]], [[3, 0], [0, 0]]]);
    const classicSoc = runPlanTask(task(inst, classic), { now }).soc as number;
    // Hand-worked, start heading N: each agent needs one quarter turn (a step of its own) before 3 forwards.
    const o = runPlanTask(task(inst, { model: 'orientation-split', startHeading: 'N', switches: {} }), { now });
    expect(o.status).toBe('solved');
    expect(o.soc as number).toBeGreaterThanOrEqual(classicSoc + 2);
    // k-robust k = 0 is exactly classic (Atzmon et al., JAIR 2020); k = 1 can only cost more.
    const k0 = runPlanTask(task(inst, { model: 'k-robust', k: 0, startHeading: 'free', switches: {} }), { now });
    const k1 = runPlanTask(task(inst, { model: 'k-robust', k: 1, startHeading: 'free', switches: {} }), { now });
    expect(k0.soc).toBe(classicSoc);
    expect(k1.status).toBe('solved');
    expect(k1.soc as number).toBeGreaterThanOrEqual(classicSoc);
  });

  it('answers error, not a crash, for a malformed instance', () => {
    const inst = tinyInstance('...', [[[0, 0], [2, 0]]]);
    const bad = { ...task(inst, classic), instance: { ...toTaskInstance(inst), cells: '1x1' } };
    const r = runPlanTask(bad);
    expect(r.status).toBe('error');
    expect(r.reason).toMatch(/field "cells" has "x" at 1/);
  });

  it('stops on the time limit by the injected clock and keeps the lower bound', () => {
    // A clock that advances 50 ms per reading: any real search passes a 100 ms limit quickly.
    let t = 0;
    const inst = datasetInstance('random-32-32-20', 'random-32-32-20-even-1', 60);
    const r = runPlanTask(task(inst, classic, { timeLimitMs: 100 }), { now: () => (t += 50) });
    expect(r.status).toBe('timeout');
    expect(r.lowerBound).not.toBeNull();
    expect(r.lowerBound as number).toBeGreaterThanOrEqual(taskLowerBound(task(inst, classic)) as number);
  });

  it('stops when the signal fires', () => {
    const inst = datasetInstance('random-32-32-20', 'random-32-32-20-even-1', 60);
    const r = runPlanTask(task(inst, classic), { now, signal: AbortSignal.abort() });
    expect(r.status).toBe('timeout');
    expect(r.reason).toMatch(/abort/);
  });

  it('gives the sum of single-agent distances as the fallback lower bound', () => {
    const inst = tinyInstance('....\n.#..', [[[0, 0], [3, 0]], [[3, 0], [0, 0]]]);
    expect(taskLowerBound(task(inst, classic))).toBe(6);
    // Weighted-split, heading N fixed (hand-worked): agent 0 turns right to E, agent 1 left to W (500 ms each), then 3 forwards.
    expect(taskLowerBound(task(inst, { model: 'weighted-split', startHeading: 'N' }))).toBe(2 * (3000 + 500));
  });
});
