/**
 * The high-level lists of a focal CBS with an exact low level (the high level of ECBS, Barer,
 * Sharon, Stern, Felner, "Suboptimal variants of the conflict-based search algorithm for the
 * multi-agent pathfinding problem", SoCS 2014): OPEN by node lower bound, FOCAL = the open nodes
 * whose cost is at most w × LB (LB = least lower bound in OPEN) ordered by a secondary heuristic
 * (fewer conflicts first), then cost, then id. Nodes are integer ids; a selected node leaves every
 * list (the heaps drop it lazily). Used by the bounded weighted-split search (ccbs.ts).
 */
import { SippHeap } from './sipp-heap';
import { boundOf } from './suboptimality';

/** OPEN and FOCAL over node ids. */
export class FocalLists {
  private readonly open: SippHeap;
  private readonly pending: SippHeap;
  private readonly focal: SippHeap;
  private readonly closed = new Set<number>();

  /**
   * `lowerBound(id)`: a proven lower bound on the optimum of the plans the node admits (integer);
   * `cost(id)`: the node's plan cost; `secondary(id)`: the focal order.
   */
  constructor(private readonly w: number, private readonly lb: (id: number) => number, private readonly cost: (id: number) => number,
    secondary: (id: number) => number) {
    const byCost = (a: number, b: number): boolean => cost(a) < cost(b) || (cost(a) === cost(b) && a < b);
    this.open = new SippHeap((a, b) => lb(a) < lb(b) || (lb(a) === lb(b) && byCost(a, b)));
    this.pending = new SippHeap(byCost);
    this.focal = new SippHeap((a, b) => secondary(a) < secondary(b) || (secondary(a) === secondary(b) && byCost(a, b)));
  }

  /** Adds an open node. */
  push(id: number): void {
    this.open.push(id);
    this.pending.push(id);
  }

  /** LB: the least lower bound in OPEN (Infinity when empty). */
  lowerBound(): number {
    const top = this.top(this.open);
    return top === undefined ? Infinity : this.lb(top);
  }

  /** Selects and closes FOCAL's best node, with LB at that moment; null when OPEN is empty. */
  select(): { readonly id: number; readonly lowerBound: number } | null {
    const lb = this.lowerBound();
    if (lb === Infinity) return null;
    const bound = boundOf(lb, this.w);
    for (let p = this.top(this.pending); p !== undefined && this.cost(p) <= bound; p = this.top(this.pending)) {
      this.focal.push(p);
      this.pending.pop();
    }
    // With every agent's cost within w of its bound, OPEN's top is within the bound too; its fallback is for safety.
    const id = this.top(this.focal) ?? (this.top(this.open) as number);
    this.closed.add(id);
    return { id, lowerBound: lb };
  }

  private top(heap: SippHeap): number | undefined {
    for (let id = heap.peek(); id !== undefined; id = heap.peek()) {
      if (!this.closed.has(id)) return id;
      heap.pop();
    }
    return undefined;
  }
}
