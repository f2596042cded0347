/**
 * The following rule (`following: forbidden`: no agent enters at t + 1 a cell another agent
 * occupies at t — the following conflict of Stern et al., "Multi-Agent Pathfinding:
 * Definitions, Variants, and Benchmarks", SoCS 2019) on classic, uniform-duration and
 * orientation-split, solved by CBS with its own conflict kind.
 *
 * Checks: (1) classic forbidden has the optimal SOC of k-robust with k = 1 (Atzmon et al., JAIR
 * 2020), which is the same rule on unit steps reached by another code path (k-delay range
 * conflicts); (2) classic forbidden against the exhaustive k = 1 oracle of solvers/testing and
 * orientation-split forbidden against an exhaustive joint-state search written below, sharing
 * no code with the engine; (3) hand-worked cases per model; (4) every CBS switch combination
 * tried gives the same optimum; (5) solveModel records and refuses the option.
 */
import type { PlanModel } from '@shared/plan';
import type { MapfInstance } from '../instance';
import { createRng } from '../random';
import { DEFAULT_SWITCHES, PLAIN_CBS_SWITCHES, SWITCH_NAMES } from '../search/cbs-types';
import { ConstraintTable } from '../search/constraint-table';
import { buildMdd, haveConflictFreePair } from '../search/mdd';
import { cheapestPath, type StateSpace } from '../testing/best-first';
import { ahead, CLOCKWISE, distancesTo } from '../testing/grid-moves';
import { kRobustOracle } from '../testing/k-robust-oracle';
import { tinyInstance, type TinyTask } from '../testing/tiny-instance';
import { validateClassicPlan } from '../validate/classic';
import { validateKRobustPlan } from '../validate/k-robust';
import { validateOrientationPlan } from '../validate/orientation-split';
import { ClassicModel, solveClassic } from './classic';
import { solveKRobust } from './k-robust';
import { solveOrientationSplit } from './orientation-split';
import { solveModel } from './solve-model';

/** A seeded w × h map with ~`walls` blocked cells and `agents` distinct starts and goals. */
function randomInstance(seed: number, w: number, h: number, agents: number, walls = 0.2): MapfInstance | null {
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

/**
 * Exhaustive optimal SOC of an orientation-split instance with following forbidden: A* over
 * joint (cell, heading, done) states, a step costing 1 per agent not done (the commit trick of
 * solvers/testing/classic-oracle.ts: "done" = stays at its goal forever from now on). A joint
 * step is rejected when two agents share a cell afterwards (vertex, goal), or an agent moves
 * into a cell another agent stood in before the step (following; a swap is one of those).
 */
function orientationFollowingOracle(inst: MapfInstance, maxExpansions = 200_000): number | null {
  type Joint = { at: number[]; facing: number[]; done: boolean[] };
  const { grid, agents } = inst;
  const n = agents.length;
  const dist = agents.map((a) => distancesTo(grid, a.goal));
  const step = (cell: number, h: number): [number, number][] => {
    const out: [number, number][] = [[cell, h], [cell, (h + 3) % 4], [cell, (h + 1) % 4]];
    const f = ahead(grid, cell, CLOCKWISE[h]);
    if (f >= 0) out.push([f, h]);
    return out;
  };
  const commits = (j: Joint): Joint[] => {
    let out = [j];
    for (let i = 0; i < n; i++) {
      if (j.done[i] || j.at[i] !== agents[i].goal) continue;
      out = out.flatMap((s) => [s, { ...s, done: s.done.map((d, x) => d || x === i) }]);
    }
    return out;
  };
  let starts: Joint[] = [{ at: agents.map((a) => a.start), facing: [], done: agents.map(() => false) }];
  for (let i = 0; i < n; i++) starts = starts.flatMap((s) => [0, 1, 2, 3].map((h) => ({ ...s, facing: [...s.facing, h] })));
  const space: StateSpace<Joint> = {
    starts: starts.flatMap(commits),
    key: (s) => `${s.at.join(',')}|${s.facing.join('')}|${s.done.map(Number).join('')}`,
    heuristic: (s) => s.at.reduce((sum, c, i) => (s.done[i] ? sum : sum + dist[i][c]), 0),
    isGoal: (s) => s.done.every((d) => d),
    *successors(s) {
      const cost = s.done.filter((d) => !d).length;
      const at: number[] = [];
      const facing: number[] = [];
      function* assign(i: number): Generator<Joint> {
        if (i === n) {
          yield* commits({ at: [...at], facing: [...facing], done: s.done });
          return;
        }
        const choices: [number, number][] = s.done[i] ? [[s.at[i], s.facing[i]]] : step(s.at[i], s.facing[i]);
        for (const [c, h] of choices) {
          let clash = false;
          for (let j = 0; j < i && !clash; j++) {
            const entersJ = c !== s.at[i] && c === s.at[j];
            const jEntersMine = at[j] !== s.at[j] && at[j] === s.at[i];
            clash = at[j] === c || entersJ || jEntersMine;
          }
          if (clash) continue;
          at[i] = c;
          facing[i] = h;
          yield* assign(i + 1);
        }
      }
      for (const j of assign(0)) yield [j, cost] as const;
    },
  };
  const found = cheapestPath(space, maxExpansions);
  return found.kind === 'found' ? found.cost : null;
}

describe('following: forbidden', () => {
  it('classic has the optimal SOC of k-robust k = 1 on 48 random instances with obstacles, and the rule bites on some', () => {
    let compared = 0;
    let bites = 0;
    for (let seed = 1; seed <= 48; seed++) {
      const inst = randomInstance(seed * 7919, 5 + (seed % 2), 5, 3 + (seed % 4), 0.2);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const allowed = solveClassic(inst, { nodeLimit: 50_000 });
      if (allowed.status === 'infeasible') continue;
      const forbidden = solveClassic(inst, { following: 'forbidden', nodeLimit: 50_000 });
      const robust = solveKRobust(inst, { k: 1, nodeLimit: 50_000 });
      if (forbidden.status === 'infeasible' || robust.status === 'infeasible') {
        // CBS proves infeasibility only by exhausting the tree; both paths must agree on it.
        expect([forbidden.status, robust.status]).toEqual(['infeasible', 'infeasible']);
        continue;
      }
      expect([forbidden.status, robust.status]).toEqual(['solved', 'solved']);
      expect(forbidden.soc).toBe(robust.soc);
      // The two rules are one rule: each plan passes the other model's validator.
      expect(validateClassicPlan(inst, forbidden.paths, { following: 'forbidden' }).violation).toBeUndefined();
      expect(validateKRobustPlan(inst, forbidden.paths, 1).violation).toBeUndefined();
      expect(validateClassicPlan(inst, robust.paths, { following: 'forbidden' }).violation).toBeUndefined();
      expect(forbidden.soc as number).toBeGreaterThanOrEqual(allowed.soc as number);
      if ((forbidden.soc as number) > (allowed.soc as number)) bites++;
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(40);
    expect(bites).toBeGreaterThanOrEqual(5);
  });

  it('classic matches the exhaustive k = 1 oracle (joint-state search, no engine code) on tiny instances', () => {
    let compared = 0;
    let noPlan = 0;
    for (let seed = 1; seed <= 30; seed++) {
      const inst = randomInstance(seed * 104729, 3 + (seed % 2), 3, 2 + (seed % 3 === 0 ? 1 : 0), 0.15);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const oracle = kRobustOracle(inst, 1, { maxExpansions: 200_000 });
      const r = solveClassic(inst, { following: 'forbidden', nodeLimit: oracle.kind === 'unsolvable' ? 300 : 20_000 });
      if (oracle.kind === 'unsolvable') {
        expect(r.status === 'timeout' || r.status === 'infeasible').toBe(true);
        noPlan++;
        continue;
      }
      expect(r.status).toBe('solved');
      expect(r.soc).toBe(oracle.soc);
      compared++;
    }
    expect(compared + noPlan).toBe(30);
    expect(compared).toBeGreaterThanOrEqual(24);
  });

  it('orientation-split matches an exhaustive joint-state search with following forbidden on tiny instances', () => {
    let compared = 0;
    let bites = 0;
    for (let seed = 1; seed <= 16; seed++) {
      const inst = randomInstance(seed * 15485863, 3, 3, 2, 0.1);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const best = orientationFollowingOracle(inst);
      const r = solveOrientationSplit(inst, { following: 'forbidden', nodeLimit: best === null ? 300 : 20_000 });
      if (best === null) {
        expect(r.status === 'timeout' || r.status === 'infeasible').toBe(true);
        continue;
      }
      expect(r.status).toBe('solved');
      expect(r.soc).toBe(best);
      expect(validateOrientationPlan(inst, r.states, 'free', { following: 'forbidden' }).violation).toBeUndefined();
      const allowed = solveOrientationSplit(inst, {});
      if ((r.soc as number) > (allowed.soc as number)) bites++;
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(12);
    expect(bites).toBeGreaterThanOrEqual(1);
  });

  it('hand-worked: the right-angle case of issue 12 and a straight chain, per model', () => {
    // 3 × 3 empty map; agent 0 (1,1) → (1,2), agent 1 (0,1) → (1,1). Allowed: both move at t = 1,
    // SOC 1 + 1 = 2. Forbidden: agent 1 may enter (1,1) only at t = 2, after agent 0 left it at
    // t = 1 (it occupied it at t = 0): SOC 1 + 2 = 3.
    const corner = tinyInstance('...\n...\n...', [[[1, 1], [1, 2]], [[0, 1], [1, 1]]]);
    // 4 × 1 corridor, three agents each one cell right: allowed 1 + 1 + 1 = 3; forbidden the
    // head moves at t = 1, the next at t = 2, the last at t = 3: 1 + 2 + 3 = 6.
    const chain = tinyInstance('....', [[[2, 0], [3, 0]], [[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const soc = (model: PlanModel, inst: MapfInstance, forbid: boolean): number | null => {
      const r = solveModel(model, inst, { startHeading: 'E', ...(forbid ? { following: 'forbidden' as const } : {}) });
      expect(r.status).toBe('solved');
      return r.soc;
    };
    for (const model of ['classic', 'uniform-duration'] as const) {
      expect([soc(model, corner, false), soc(model, corner, true)]).toEqual([2, 3]);
      expect([soc(model, chain, false), soc(model, chain, true)]).toEqual([3, 6]);
    }
    // Orientation-split, all facing E: agent 1 drives straight in; agent 0 must turn S first
    // (1 step) then drive (arrival 2). Allowed: agent 1 enters (1,1) at t = 1 while agent 0,
    // turning there, still occupies it — a vertex conflict, so it waits: 2 + 2 = 4. Forbidden:
    // agent 0 leaves at t = 2 (it occupied the cell at t = 1), so agent 1 enters at t = 3: 2 + 3 = 5.
    expect([soc('orientation-split', corner, false), soc('orientation-split', corner, true)]).toEqual([4, 5]);
    expect([soc('orientation-split', chain, false), soc('orientation-split', chain, true)]).toEqual([3, 6]);
    // Uniform-duration stretches each step to forward + 2 quarter turns: the makespan in steps is
    // the classic one (chain forbidden: 3 steps).
    const u = solveModel('uniform-duration', chain, { startHeading: 'E', following: 'forbidden' });
    expect(u.makespan).toBe(3);
    expect(u.turnInclusiveMakespanMs).toBe(3 * (u.profile.forwardMs + 2 * u.profile.quarterTurnMs));
  });

  it('gives one optimum under every CBS switch combination tried (each off alone, all off)', () => {
    let compared = 0;
    let solvedVariants = 0;
    let timeouts = 0;
    let orientationCompared = 0;
    for (let seed = 1; seed <= 10; seed++) {
      const inst = randomInstance(seed * 31337, 5, 5, 4, 0.2);
      if (inst === null) throw new Error(`seed ${seed}: too few free cells`);
      const ref = solveClassic(inst, { following: 'forbidden', nodeLimit: 50_000 });
      if (ref.status !== 'solved') continue;
      const variants = [PLAIN_CBS_SWITCHES, ...SWITCH_NAMES.map((name) => ({ ...DEFAULT_SWITCHES, [name]: false }))];
      for (const switches of variants) {
        const r = solveClassic(inst, { following: 'forbidden', switches, nodeLimit: 5_000 });
        // Weak variants (plain CBS; no disjoint splitting) may run out of nodes on the hardest
        // instances (seed 4: optimum 30 with following forbidden vs 19 allowed); never another cost.
        if (r.status === 'timeout') {
          expect(r.lowerBound as number).toBeLessThanOrEqual(ref.soc as number);
          timeouts++;
          continue;
        }
        expect(r.status).toBe('solved');
        expect(r.soc).toBe(ref.soc);
        solvedVariants++;
      }
      const o = solveOrientationSplit(inst, { following: 'forbidden', nodeLimit: 5_000 });
      const oPlain = solveOrientationSplit(inst, { following: 'forbidden', switches: PLAIN_CBS_SWITCHES, nodeLimit: 5_000 });
      if (o.status === 'solved' && oPlain.status === 'solved') {
        expect(o.soc).toBe(oPlain.soc);
        orientationCompared++;
      }
      compared++;
    }
    expect(compared).toBeGreaterThanOrEqual(8);
    // Orientation-split is compared only where both it and its plain-CBS run solved within the node
    // limit (6 of these instances, deterministic for the fixed seeds): never let that drop silently.
    expect(orientationCompared).toBeGreaterThanOrEqual(6);
    // 8 variants per instance; only a few weak-variant runs may hit the node limit.
    expect(solvedVariants + timeouts).toBe(8 * compared);
    expect(timeouts).toBeLessThanOrEqual(compared);
  });

  it('the DG/WDG dependency test applies the rule: a two-agent chain is dependent only when following is forbidden', () => {
    // 3 × 1 corridor, agent 0 (1,0) → (2,0), agent 1 (0,0) → (1,0): each MDD of cost 1 is one
    // path; together they are a following move, fine when allowed, a conflict when forbidden.
    const inst = tinyInstance('...', [[[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    const model = new ClassicModel(inst.grid, inst, 'forbidden');
    const mdd = (agent: number) => buildMdd(model, agent, new ConstraintTable(agent, model.goalCells[agent], model.cellCount, inst.grid.width, []), 1);
    const [m0, m1] = [mdd(0), mdd(1)];
    if (m0 === null || m1 === null) throw new Error('both agents have a cost-1 path');
    expect(haveConflictFreePair(m0, m1, model.stateCell)).toBe(true);
    expect(haveConflictFreePair(m0, m1, model.stateCell, true)).toBe(false);
    expect(model.forbidsFollowing).toBe(true);
  });

  it('solveModel records the rule, validates plans under it, and refuses it for k-robust and weighted-split', () => {
    const chain = tinyInstance('....', [[[2, 0], [3, 0]], [[1, 0], [2, 0]], [[0, 0], [1, 0]]]);
    expect(solveModel('classic', chain).parameters.following).toBe('allowed');
    const r = solveModel('orientation-split', chain, { following: 'forbidden' });
    expect(r.parameters.following).toBe('forbidden');
    expect(r.isValidated).toBe(true);
    expect(() => solveModel('k-robust', chain, { k: 1, following: 'forbidden' })).toThrow(/k-robust with k ≥ 1 already forbids following/);
    expect(() => solveModel('weighted-split', chain, { following: 'allowed' })).toThrow(/following applies to classic, uniform-duration, orientation-split only/);
    expect(() => solveModel('classic', chain, { following: 'sometimes' as never })).toThrow(/following must be one of allowed, forbidden/);
    expect(solveModel('k-robust', chain, { k: 1 }).parameters.following).toBeUndefined();
  });
});
