/**
 * The WDG pair-weight memo (issue 11): a weight is reused only where it cannot overestimate,
 * that is for the same individual costs and constraint sets that include the ones it was
 * computed under. Constraint sets are named here as in the engine, by CT node, one including
 * another when it is its ancestor; the tree below is
 *
 *   0 ─ 1 ─┬─ 2 (positive constraint of a third agent: implied prohibitions for agents 3 and 7)
 *          └─ 3 (its negative twin: agents 3 and 7 untouched)
 *   and 2 ─ 4
 */
import type { CellXY } from '@shared/plan';
import { ClassicModel } from '../models/classic';
import { tinyInstance } from '../testing/tiny-instance';
import { Budget } from './budget';
import { CbsEngine } from './cbs';
import { DEFAULT_SWITCHES } from './cbs-types';
import { ConflictAvoidanceTable } from './conflict-avoidance-table';
import { PairWeightMemo, type PairWeightKey } from './pair-weight-memo';
import { SpaceTimeAStar } from './space-time-astar';

const PARENT = new Map([[1, 0], [2, 1], [3, 1], [4, 2]]);

/** Whether set `a` is contained in set `b`: node a is node b or one of its ancestors. */
function isAncestorOrSelf(a: number, b: number): boolean {
  for (let n: number | undefined = b; n !== undefined; n = PARENT.get(n)) if (n === a) return true;
  return false;
}

/** The pair (3, 7) at a node whose agents 3 and 7 have constraint sets `set1`, `set2`; both MDDs date from node 1. */
function pairAt(set1: number, set2: number, cost1 = 9, cost2 = 12): PairWeightKey {
  return { mdd1: 1 * 10 + 3, mdd2: 1 * 10 + 7, set1, set2, cost1, cost2 };
}

describe('PairWeightMemo', () => {
  it('does not hand a sibling the weight computed under implied prohibitions it lacks (same MDDs)', () => {
    // Arrange: node 2 is popped first and finds weight 2 under its extra implied prohibitions
    // (the parent's entry is gone: the memo was cleared, or bypass made the pair conflict only now).
    const memo = new PairWeightMemo(100, isAncestorOrSelf);
    memo.set(pairAt(2, 2), 2);

    // Act: node 3 shares the MDD owners (the key the memo used to have) but not the prohibitions.
    const atSibling = memo.get(pairAt(1, 1));

    // Assert: the weight is recomputed there rather than overestimated.
    expect(atSibling).toBeUndefined();
  });

  it('reuses a weight computed under fewer constraints, for a descendant with the same costs', () => {
    // Arrange
    const memo = new PairWeightMemo(100, isAncestorOrSelf);
    memo.set(pairAt(1, 1), 1);

    // Act
    const atSame = memo.get(pairAt(1, 1));
    const atDescendant = memo.get(pairAt(4, 2));
    const atOtherCost = memo.get(pairAt(4, 2, 10, 12));

    // Assert: more constraints only raise the joint optimum, so 1 is still a lower bound at node 4.
    expect(atSame).toBe(1);
    expect(atDescendant).toBe(1);
    expect(atOtherCost).toBeUndefined();
  });

  it('does not reuse a weight when only one agent\'s constraint set includes the stored one', () => {
    // Arrange
    const memo = new PairWeightMemo(100, isAncestorOrSelf);
    memo.set(pairAt(1, 2), 3);

    // Act
    const got = memo.get(pairAt(4, 3));

    // Assert
    expect(got).toBeUndefined();
  });

  it('forgets everything once it is over capacity', () => {
    // Arrange
    const memo = new PairWeightMemo(2, isAncestorOrSelf);
    memo.set({ ...pairAt(1, 1), mdd2: 1 }, 1);
    memo.set({ ...pairAt(1, 1), mdd2: 2 }, 1);

    // Act
    memo.set({ ...pairAt(1, 1), mdd2: 3 }, 4);

    // Assert
    expect(memo.size).toBe(1);
    expect(memo.get({ ...pairAt(1, 1), mdd2: 1 })).toBeUndefined();
    expect(memo.get({ ...pairAt(1, 1), mdd2: 3 })).toBe(4);
  });
});

describe('CbsEngine with the WDG memo cleared at every new weight', () => {
  // Found by a seeded random search over 8 × 8 maps (then two agents removed): while the memo
  // was keyed by the pair's MDD owners alone, with this capacity a node reused a weight that a
  // node of another branch had computed under constraints the first one lacks, and the search
  // returned a plan one step above the optimum (119).
  const MAP = [
    '....@...',
    '@@@..@.@',
    '.@.....@',
    '...@....',
    '...@.@@.',
    '....@@@.',
    '.......@',
    '....@...',
  ].join('\n');
  const TASKS: [CellXY, CellXY][] = [
    [[5, 2], [1, 7]], [[2, 0], [0, 5]], [[0, 7], [4, 2]], [[2, 6], [1, 6]], [[3, 5], [5, 3]],
    [[6, 3], [3, 0]], [[7, 5], [5, 6]], [[0, 6], [2, 0]], [[5, 6], [6, 3]], [[1, 4], [7, 4]],
  ];

  it('still returns the optimal sum of costs', () => {
    // Arrange
    const instance = tinyInstance(MAP, TASKS);
    const model = new ClassicModel(instance.grid, instance);
    const budget = new Budget(undefined, undefined, undefined);
    const engine = new CbsEngine({
      model,
      agents: instance.agents.map((_, i) => i),
      switches: DEFAULT_SWITCHES,
      budget,
      planner: new SpaceTimeAStar(model, budget),
      cat: new ConflictAvoidanceTable(model.cellCount),
      degree: model.degree,
      nodeLimit: 200_000,
      expandLimit: Number.MAX_SAFE_INTEGER,
      isLimitFatal: true,
      memoryLimitBytes: 1024 * 1024 * 1024,
      isSub: false,
      pairWeightCapacity: 1,
    });

    // Act
    const out = engine.run();

    // Assert: 118 is the optimum found by solveClassic without the WDG heuristic (and with it at the default capacity).
    expect(out.kind).toBe('solved');
    expect(out.soc).toBe(118);
  }, 60_000);
});
