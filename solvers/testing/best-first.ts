/**
 * A plain A* search (Hart, Nilsson and Raphael, "A Formal Basis for the Heuristic
 * Determination of Minimum Cost Paths", IEEE Trans. SSC 4(2), 1968) over an explicit state
 * space, for the exhaustive test oracles only. With a consistent heuristic the first goal
 * state taken off the queue is optimal; states are deduplicated by key with lazy deletion.
 * It shares nothing with `solvers/search` on purpose: the oracles must be able to catch it.
 */

/** The state space to search: cost-0 start states, keyed states, weighted successors, a consistent heuristic. */
export interface StateSpace<S> {
  /** States the search may start from, each at cost 0. */
  readonly starts: readonly S[];
  /** A string identifying a state (equal keys = the same state). */
  key(s: S): string;
  /** The successors of a state with their (non-negative) transition costs. */
  successors(s: S): Iterable<readonly [S, number]>;
  /** A consistent lower bound on the cost from `s` to a goal; Infinity prunes the state. */
  heuristic(s: S): number;
  /** Whether `s` is a goal state. */
  isGoal(s: S): boolean;
}

/** The outcome of a search: the cheapest path to a goal (start first), or none when the space is exhausted. */
export type SearchOutcome<S> =
  | { readonly kind: 'found'; readonly cost: number; readonly states: readonly S[]; readonly expanded: number }
  | { readonly kind: 'exhausted'; readonly expanded: number };

/** Thrown when a search needs more expansions than allowed: the instance is too big for an oracle. */
export class OracleLimitError extends Error {
  constructor(limit: number) {
    super(`exhaustive search stopped after ${limit} expansions: the instance is too big for a test oracle`);
    this.name = 'OracleLimitError';
  }
}

interface Entry<S> {
  readonly f: number;
  readonly g: number;
  readonly state: S;
  readonly key: string;
  readonly serial: number;
}

/** Finds a cheapest path from any start to a goal with A*; throws OracleLimitError beyond `maxExpansions`. */
export function cheapestPath<S>(space: StateSpace<S>, maxExpansions: number): SearchOutcome<S> {
  const heap: Entry<S>[] = [];
  const best = new Map<string, number>();
  const parent = new Map<string, { key: string; state: S } | null>();
  let serial = 0;
  const push = (state: S, g: number, from: { key: string; state: S } | null): void => {
    const h = space.heuristic(state);
    if (!Number.isFinite(h)) return;
    const key = space.key(state);
    const known = best.get(key);
    if (known !== undefined && known <= g) return;
    best.set(key, g);
    parent.set(key, from);
    heapPush(heap, { f: g + h, g, state, key, serial: serial++ });
  };
  for (const s of space.starts) push(s, 0, null);
  const closed = new Set<string>();
  let expanded = 0;
  while (heap.length > 0) {
    const e = heapPop(heap);
    if (closed.has(e.key) || best.get(e.key)! < e.g) continue;
    if (space.isGoal(e.state)) {
      const states: S[] = [];
      let cur: { key: string; state: S } | null | undefined = { key: e.key, state: e.state };
      while (cur) {
        states.push(cur.state);
        cur = parent.get(cur.key);
      }
      return { kind: 'found', cost: e.g, states: states.reverse(), expanded };
    }
    closed.add(e.key);
    if (++expanded > maxExpansions) throw new OracleLimitError(maxExpansions);
    for (const [next, cost] of space.successors(e.state)) push(next, e.g + cost, { key: e.key, state: e.state });
  }
  return { kind: 'exhausted', expanded };
}

// Binary heap ordered by f, then larger g (deeper first), then insertion order: ties only
// affect speed and which optimal plan is returned, never the cost.
function less<S>(a: Entry<S>, b: Entry<S>): boolean {
  if (a.f !== b.f) return a.f < b.f;
  if (a.g !== b.g) return a.g > b.g;
  return a.serial < b.serial;
}

function heapPush<S>(heap: Entry<S>[], e: Entry<S>): void {
  heap.push(e);
  let i = heap.length - 1;
  while (i > 0) {
    const p = (i - 1) >> 1;
    if (!less(heap[i], heap[p])) break;
    [heap[i], heap[p]] = [heap[p], heap[i]];
    i = p;
  }
}

function heapPop<S>(heap: Entry<S>[]): Entry<S> {
  const top = heap[0];
  const last = heap.pop()!;
  if (heap.length > 0) {
    heap[0] = last;
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      const r = l + 1;
      let m = i;
      if (l < heap.length && less(heap[l], heap[m])) m = l;
      if (r < heap.length && less(heap[r], heap[m])) m = r;
      if (m === i) break;
      [heap[i], heap[m]] = [heap[m], heap[i]];
      i = m;
    }
  }
  return top;
}
