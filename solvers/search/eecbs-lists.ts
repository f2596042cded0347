/**
 * The three node lists of the EECBS high level (Li, Ruml, Koenig, "EECBS: A bounded-suboptimal
 * search for multi-agent path finding", AAAI 2021), after explicit estimation search (Thayer,
 * Ruml, "Bounded suboptimal search: a direct approach using inadmissible estimates", IJCAI 2011):
 * - CLEANUP: every open node by its lower bound f_lb (its proven bound on the optimal SOC under
 *   its constraints); its top gives LB, the lower bound on the optimum the search reports;
 * - OPEN: every open node by f̂ = cost + ĥ (ĥ the online-corrected cost-to-go estimate);
 * - FOCAL: the open nodes with f̂ ≤ w × min f̂, by the number of conflicts, then f̂.
 * Selection: FOCAL's top if its cost ≤ w × LB, else OPEN's top if its cost ≤ w × LB, else
 * CLEANUP's top (which raises LB). A node leaves every list when selected; the heaps drop it
 * lazily. FOCAL is allowed to keep nodes that entered it under a larger min f̂: membership only
 * orders the search, the bound comes from the cost check against LB alone.
 */
import { boundOf } from './suboptimality';

/** What the lists read from a high-level node. */
export interface EecbsNode {
  readonly id: number;
  /** Sum of the agents' path costs. */
  g: number;
  /** Proven lower bound on the optimal SOC under the node's constraints. */
  fLb: number;
  /** g + ĥ. */
  fHat: number;
  /** Bumped on every (re)insertion; stale heap entries carry an older one. */
  version: number;
  /** True once selected (until reinserted). */
  isClosed: boolean;
}

/** Which list a selected node came from. */
export type EecbsSource = 'focal' | 'open' | 'cleanup';

/**
 * A heap entry: the node and its figures when pushed. The heap orders by these copies, never by
 * the node's live fields, because a selected node's figures may change (a tightened lower bound,
 * a bypass) while its stale entries still sit in the heaps: ordering by live fields would break
 * the heap property and could hide the least lower bound.
 */
interface Entry<T> {
  readonly node: T;
  readonly version: number;
  readonly fLb: number;
  readonly fHat: number;
  readonly d: number;
  readonly id: number;
}

/** A binary min-heap of entries whose validity is checked when they reach the top. */
class LazyHeap<T extends EecbsNode> {
  private readonly items: Entry<T>[] = [];

  constructor(private readonly less: (a: Entry<T>, b: Entry<T>) => boolean) {}

  push(entry: Entry<T>): void {
    const items = this.items;
    items.push(entry);
    let i = items.length - 1;
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (!this.less(items[i], items[p])) break;
      [items[i], items[p]] = [items[p], items[i]];
      i = p;
    }
  }

  /** The valid top, dropping stale entries; undefined when none. */
  top(): T | undefined {
    while (this.items.length > 0) {
      const e = this.items[0];
      if (!e.node.isClosed && e.node.version === e.version) return e.node;
      this.popEntry();
    }
    return undefined;
  }

  /** The top entry (call after `top()` found a valid one). */
  topEntry(): Entry<T> {
    return this.items[0];
  }

  /** Removes the top entry. */
  popEntry(): void {
    const items = this.items;
    const last = items.pop() as Entry<T>;
    if (items.length === 0) return;
    items[0] = last;
    let i = 0;
    for (;;) {
      const l = 2 * i + 1;
      if (l >= items.length) break;
      const r = l + 1;
      const c = r < items.length && this.less(items[r], items[l]) ? r : l;
      if (!this.less(items[c], items[i])) break;
      [items[i], items[c]] = [items[c], items[i]];
      i = c;
    }
  }

  /** Every valid node (for the lower bound after a limit). */
  *valid(): Iterable<T> {
    for (const e of this.items) if (!e.node.isClosed && e.node.version === e.version) yield e.node;
  }
}

/** CLEANUP, OPEN and FOCAL over one set of open nodes. */
export class EecbsLists<T extends EecbsNode> {
  private readonly cleanup: LazyHeap<T>;
  private readonly open: LazyHeap<T>;
  private readonly focal: LazyHeap<T>;
  /** Open nodes not yet in FOCAL, by f̂. */
  private readonly pending = new LazyHeap<T>((a, b) => a.fHat !== b.fHat ? a.fHat < b.fHat : a.id < b.id);
  private readonly distance: (node: T) => number;

  /**
   * Creates the lists for suboptimality factor `w`; `distance(node)` is the distance-to-go
   * estimate FOCAL orders by (the number of conflicts among the node's paths, or of agent pairs
   * in conflict), read when the node is pushed.
   */
  constructor(private readonly w: number, distance: (node: T) => number) {
    this.distance = distance;
    this.cleanup = new LazyHeap<T>((a, b) => a.fLb !== b.fLb ? a.fLb < b.fLb : a.d !== b.d ? a.d < b.d : a.id < b.id);
    this.open = new LazyHeap<T>((a, b) => a.fHat !== b.fHat ? a.fHat < b.fHat : a.d !== b.d ? a.d < b.d : a.id < b.id);
    this.focal = new LazyHeap<T>((a, b) => a.d !== b.d ? a.d < b.d : a.fHat !== b.fHat ? a.fHat < b.fHat : a.id < b.id);
  }

  /** Adds (or re-adds, with new figures) an open node. */
  push(node: T): void {
    node.version++;
    node.isClosed = false;
    const entry = { node, version: node.version, fLb: node.fLb, fHat: node.fHat, d: this.distance(node), id: node.id };
    this.cleanup.push(entry);
    this.open.push(entry);
    this.pending.push(entry);
  }

  /** The least f_lb over the open nodes (Infinity when none): the proven lower bound LB. */
  lowerBound(): number {
    return this.cleanup.top()?.fLb ?? Infinity;
  }

  /** Exact minimum over every open node (the heaps' tops may be stale; used after a limit). */
  scanLowerBound(): number {
    let lb = Infinity;
    for (const n of this.cleanup.valid()) if (n.fLb < lb) lb = n.fLb;
    return lb;
  }

  /** Selects and closes the next node to expand, with LB at that moment; null when every list is empty. */
  select(): { readonly node: T; readonly lowerBound: number; readonly source: EecbsSource } | null {
    const best = this.cleanup.top();
    if (best === undefined) return null;
    const lb = best.fLb;
    const bound = boundOf(lb, this.w);
    const bestOpen = this.open.top() as T;
    const fHatLimit = this.w * bestOpen.fHat + 1e-9;
    for (let p = this.pending.top(); p !== undefined && p.fHat <= fHatLimit; p = this.pending.top()) {
      this.focal.push(this.pending.topEntry());
      this.pending.popEntry();
    }
    const bestFocal = this.focal.top();
    let chosen: T;
    let source: EecbsSource;
    if (bestFocal !== undefined && bestFocal.g <= bound) {
      chosen = bestFocal;
      source = 'focal';
    } else if (bestOpen.g <= bound) {
      chosen = bestOpen;
      source = 'open';
    } else {
      chosen = best;
      source = 'cleanup';
    }
    chosen.isClosed = true;
    return { node: chosen, lowerBound: lb, source };
  }
}
