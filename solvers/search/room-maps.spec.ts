/**
 * Room maps: small rooms joined by one-cell doors, where goals often lie in a door and target
 * conflicts arise (cbs.ts splits them before every other kind). Every improvement on must give
 * the optimal SOC that plain CBS (every improvement off, Sharon et al., AIJ 2015) proves, on
 * many seeded random room maps and on room-32-32-4 instances small enough for plain CBS; and two
 * 30-agent room instances that used to run out of time are solved within fixed node budgets.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { gridFromText } from '../grid/grid';
import type { MapfInstance } from '../instance';
import { instanceFromScenario } from '../io/instance-from-scenario';
import { parseMap } from '../io/parse-map';
import { parseScenario } from '../io/parse-scenario';
import { solveClassic } from '../models/classic';
import { createRng } from '../random';
import { validateClassicPlan } from '../validate/classic';
import { CbsEngine } from './cbs';
import { DEFAULT_SWITCHES, PLAIN_CBS_SWITCHES } from './cbs-types';
import { type Conflict, K_TARGET } from './conflict';
import { OPEN_GRID_BENCHMARKS_DIR } from '../../benchmarks/datasets/open-grid-benchmarks';

/**
 * A map of `rows` × `cols` rooms of 3 × 3 cells behind one-cell walls, one door at a random
 * place in each wall between neighbouring rooms; agents' goals lie in a door half of the time.
 */
function roomInstance(seed: number): MapfInstance | null {
  const rng = createRng(seed * 104729);
  const rows = 2;
  const cols = 2 + rng.int(2);
  const width = cols * 4 - 1;
  const height = rows * 4 - 1;
  const cells: string[][] = Array.from({ length: height }, (_, y) => Array.from({ length: width }, (_, x) => (x % 4 === 3 || y % 4 === 3 ? '@' : '.')));
  const doors: number[] = [];
  for (let ry = 0; ry < rows; ry++) {
    for (let rx = 0; rx < cols; rx++) {
      if (rx + 1 < cols) { const y = ry * 4 + rng.int(3); cells[y][rx * 4 + 3] = '.'; doors.push(y * width + rx * 4 + 3); }
      if (ry + 1 < rows) { const x = rx * 4 + rng.int(3); cells[ry * 4 + 3][x] = '.'; doors.push((ry * 4 + 3) * width + x); }
    }
  }
  const grid = gridFromText(cells.map((r) => r.join('')).join('\n'));
  const free: number[] = [];
  for (let c = 0; c < width * height; c++) if (grid.passable[c]) free.push(c);
  const k = 4 + rng.int(4);
  const starts = new Set<number>();
  const goals = new Set<number>();
  const agents = [];
  for (let i = 0; i < k; i++) {
    let start = free[rng.int(free.length)];
    while (starts.has(start)) start = free[rng.int(free.length)];
    starts.add(start);
    const pool = rng.next() < 0.5 ? doors.filter((d) => !goals.has(d)) : [];
    let goal = pool.length > 0 ? pool[rng.int(pool.length)] : free[rng.int(free.length)];
    while (goals.has(goal)) goal = free[rng.int(free.length)];
    goals.add(goal);
    agents.push({ start, goal });
  }
  // Doors are cut vertices, but every room stays reachable: all tasks are feasible on this map.
  return { grid, agents };
}

describe('room maps', () => {
  it('every improvement on gives the SOC plain CBS proves, on 80 seeded random room maps', () => {
    // Watch the engine's (private) conflict choice to count the instances whose search splits a target conflict.
    const choose = jest.spyOn(CbsEngine.prototype as unknown as { selectConflict(node: unknown): Conflict }, 'selectConflict');
    let compared = 0;
    let plainOut = 0;
    let withTargetSplit = 0;
    for (let seed = 1; seed <= 80; seed++) {
      const inst = roomInstance(seed) as MapfInstance;
      choose.mockClear();
      const full = solveClassic(inst, { switches: DEFAULT_SWITCHES, nodeLimit: 100_000 });
      if (choose.mock.results.some((r) => (r.value as Conflict).kind === K_TARGET)) withTargetSplit++;
      expect(full.status).toBe('solved');
      expect(validateClassicPlan(inst, full.paths).ok).toBe(true);
      const plain = solveClassic(inst, { switches: PLAIN_CBS_SWITCHES, nodeLimit: 30_000 });
      if (plain.status !== 'solved') {
        // Plain CBS may run out of nodes; its bound must still not exceed the optimum found.
        expect(plain.lowerBound as number).toBeLessThanOrEqual(full.soc as number);
        plainOut++;
        continue;
      }
      expect(full.soc).toBe(plain.soc);
      compared++;
    }
    choose.mockRestore();
    // The seeded sample is fixed: how many plain CBS finished within its node limit, and how many
    // searches (or their WDG sub-searches) split a target conflict: the target-first order was exercised.
    expect([compared, plainOut]).toEqual([75, 5]);
    expect(withTargetSplit).toBe(55);
  });

  describe('room-32-32-4 (open benchmark set: Stern et al., SoCS 2019)', () => {
    const dir = OPEN_GRID_BENCHMARKS_DIR;
    const map = parseMap(readFileSync(join(dir, 'room-32-32-4.map'), 'utf8'));
    const load = (scen: number, agents: number): MapfInstance => {
      const s = parseScenario(readFileSync(join(dir, `room-32-32-4-even-${scen}.scen`), 'utf8'));
      if (!map.ok || !s.ok) throw new Error('room-32-32-4 files do not parse');
      const inst = instanceFromScenario(map.value, s.value, agents);
      if (!inst.ok) throw new Error('room-32-32-4 instance');
      return inst.value;
    };

    it('gives the optimum plain CBS proves on instances plain CBS can solve', () => {
      let compared = 0;
      for (const [scen, agents] of [[1, 12], [3, 16]]) {
        const inst = load(scen, agents);
        const plain = solveClassic(inst, { switches: PLAIN_CBS_SWITCHES, nodeLimit: 20_000 });
        const full = solveClassic(inst, { switches: DEFAULT_SWITCHES, nodeLimit: 20_000 });
        expect(plain.status).toBe('solved');
        expect(full.status).toBe('solved');
        expect(full.soc).toBe(plain.soc);
        expect(validateClassicPlan(inst, full.paths).ok).toBe(true);
        compared++;
      }
      expect(compared).toBe(2);
    });

    it('solves even-1 with 30 agents within 15,000 CT nodes (it ran out of 30 s before targets were split first)', () => {
      const inst = load(1, 30);
      const r = solveClassic(inst, { nodeLimit: 15_000 });
      expect(r.status).toBe('solved');
      expect(validateClassicPlan(inst, r.paths).ok).toBe(true);
      // The optimum is not known from an independent source; the lower bound the search proved equals it.
      expect(r.soc).toBe(r.lowerBound);
      expect(r.soc).toBe(786);
    }, 120_000);

    it('solves even-2 with 30 agents within 20,000 generated CT nodes (62,099 expanded before narrow cells were split first)', () => {
      const inst = load(2, 30);
      const r = solveClassic(inst, { nodeLimit: 20_000 });
      expect(r.status).toBe('solved');
      expect(validateClassicPlan(inst, r.paths).ok).toBe(true);
      // As above: the proved lower bound equals the SOC found, 44 above the root's sum of single-agent optima.
      expect([r.soc, r.lowerBound]).toEqual([992, 992]);
      expect(r.nodesExpanded).toBe(8152);
    }, 240_000);
  });
});
