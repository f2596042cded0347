/**
 * A binary min-heap of integer ids ordered by a caller-supplied comparison. Private to the
 * weighted-split search (SIPP, its heuristic and the CCBS high level), so that module has no
 * dependency on the discrete-time engine's data structures.
 */

/** Min-heap of ids; `less(a, b)` says whether id a must come out before id b. */
export class SippHeap {
  private readonly items: number[] = [];

  constructor(private readonly less: (a: number, b: number) => boolean) {}

  /** Number of ids in the heap. */
  get size(): number {
    return this.items.length;
  }

  /** Adds an id. */
  push(id: number): void {
    const items = this.items;
    let i = items.length;
    items.push(id);
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (!this.less(id, items[parent])) break;
      items[i] = items[parent];
      i = parent;
    }
    items[i] = id;
  }

  /** The smallest id without removing it; undefined when empty. */
  peek(): number | undefined {
    return this.items[0];
  }

  /** Removes and returns the smallest id; undefined when empty. */
  pop(): number | undefined {
    const items = this.items;
    if (items.length === 0) return undefined;
    const top = items[0];
    const last = items.pop() as number;
    if (items.length > 0) {
      let i = 0;
      const n = items.length;
      for (;;) {
        const l = 2 * i + 1;
        if (l >= n) break;
        const r = l + 1;
        const child = r < n && this.less(items[r], items[l]) ? r : l;
        if (!this.less(items[child], last)) break;
        items[i] = items[child];
        i = child;
      }
      items[i] = last;
    }
    return top;
  }
}
