/**
 * A binary min-heap of objects under a comparator, with removal by handle: the open list of
 * the CBS high level, where nodes are few but their order has several tie-breakers.
 */

/** An item a {@link BinaryHeap} can hold: the heap keeps its slot in `heapIndex` (−1 when outside). */
export interface HeapItem {
  heapIndex: number;
}

/** A min-heap ordered by `less`. */
export class BinaryHeap<T extends HeapItem> {
  private readonly items: T[] = [];

  /** Creates an empty heap; `less(a, b)` must be a strict total order for deterministic pops. */
  constructor(private readonly less: (a: T, b: T) => boolean) {}

  /** Number of items. */
  get size(): number {
    return this.items.length;
  }

  /** The smallest item, or undefined. */
  peek(): T | undefined {
    return this.items[0];
  }

  /** All items in heap order (not sorted). */
  values(): readonly T[] {
    return this.items;
  }

  /** Inserts an item that is not in the heap. */
  push(item: T): void {
    this.items.push(item);
    this.up(this.items.length - 1);
  }

  /** Removes and returns the smallest item, or undefined. */
  pop(): T | undefined {
    const items = this.items;
    if (items.length === 0) return undefined;
    const top = items[0];
    const last = items.pop() as T;
    if (items.length > 0) {
      items[0] = last;
      last.heapIndex = 0;
      this.down(0);
    }
    top.heapIndex = -1;
    return top;
  }

  private up(i: number): void {
    const items = this.items;
    const x = items[i];
    while (i > 0) {
      const p = (i - 1) >> 1;
      if (!this.less(x, items[p])) break;
      items[i] = items[p];
      items[i].heapIndex = i;
      i = p;
    }
    items[i] = x;
    x.heapIndex = i;
  }

  private down(i: number): void {
    const items = this.items;
    const n = items.length;
    const x = items[i];
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      if (c + 1 < n && this.less(items[c + 1], items[c])) c++;
      if (!this.less(items[c], x)) break;
      items[i] = items[c];
      items[i].heapIndex = i;
      i = c;
    }
    items[i] = x;
    x.heapIndex = i;
  }
}
