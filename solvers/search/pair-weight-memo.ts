/**
 * The memo of WDG pair weights (Li, Felner, Boyarski, Ma, Koenig, "Improved heuristics for
 * multi-agent path finding with conflict-based search", IJCAI 2019) of one CBS run (issue 11).
 *
 * A pair's weight is the cost its two agents need above the sum of their individual costs,
 * found by a two-agent sub-search under the two agents' constraint sets as that sub-search sees
 * them (each agent's own constraints plus the prohibitions implied by every agent's positive and
 * length constraints). An entry is reused only for a pair with the same individual costs whose
 * constraint sets each include the ones the entry was computed under: extra constraints can only
 * raise the pair's joint optimum (and every bound on it) while the individual costs stay, so a
 * reused weight never exceeds the true one. An entry computed under constraints the asking node
 * lacks (a sibling's, say) is not reused: that weight may be too high, and h would overestimate.
 */

/** What a pair weight is (or was) computed under; agents 1 and 2 are the pair in a fixed order. */
export interface PairWeightKey {
  /** Identity of agent 1's MDD (its cost and optimal paths); entries are filed under the two MDDs. */
  readonly mdd1: number;
  /** Identity of agent 2's MDD. */
  readonly mdd2: number;
  /** Identity of the constraint set the sub-search sees for agent 1. */
  readonly set1: number;
  /** Identity of the constraint set the sub-search sees for agent 2. */
  readonly set2: number;
  /** Agent 1's individual cost (the weight is measured above cost1 + cost2). */
  readonly cost1: number;
  /** Agent 2's individual cost. */
  readonly cost2: number;
}

interface Entry {
  readonly set1: number;
  readonly set2: number;
  readonly cost1: number;
  readonly cost2: number;
  readonly weight: number;
}

/** Pair weights of one CBS run, reused only where they are a lower bound (see the file comment). */
export class PairWeightMemo {
  private readonly entries = new Map<number, Map<number, Entry>>();
  private count = 0;

  /**
   * An empty memo that forgets everything once it holds more than `capacity` entries;
   * `includes(a, b)` says whether constraint set `a` is contained in constraint set `b`.
   */
  constructor(private readonly capacity: number, private readonly includes: (a: number, b: number) => boolean) {}

  /** Number of weights held. */
  get size(): number {
    return this.count;
  }

  /** The weight filed under `key`'s MDDs if it was computed under the same costs and constraints included in `key`'s. */
  get(key: PairWeightKey): number | undefined {
    const e = this.entries.get(key.mdd1)?.get(key.mdd2);
    if (e === undefined || e.cost1 !== key.cost1 || e.cost2 !== key.cost2) return undefined;
    if (e.set1 !== key.set1 && !this.includes(e.set1, key.set1)) return undefined;
    if (e.set2 !== key.set2 && !this.includes(e.set2, key.set2)) return undefined;
    return e.weight;
  }

  /** Files `weight`, computed under exactly `key`, replacing whatever the two MDDs held. */
  set(key: PairWeightKey, weight: number): void {
    let inner = this.entries.get(key.mdd1);
    if (inner === undefined || !inner.has(key.mdd2)) {
      if (this.count >= this.capacity) {
        this.entries.clear();
        this.count = 0;
        inner = undefined;
      }
      this.count++;
    }
    if (inner === undefined) {
      inner = new Map();
      this.entries.set(key.mdd1, inner);
    }
    inner.set(key.mdd2, { set1: key.set1, set2: key.set2, cost1: key.cost1, cost2: key.cost2, weight });
  }
}
