/**
 * A binary min-heap of cells on typed arrays for the octile searches: ordered by key, ties
 * broken towards the larger secondary value (A* then prefers nodes deeper on their path, which
 * cuts the many equal-f expansions on open maps; any tie order keeps the result optimal).
 * Entries are never updated in place: a cell may be pushed again with a better key and its
 * stale entries are skipped by the caller (lazy deletion).
 */

/** Min-heap of (key, tie, cell) entries. */
export class OctileQueue {
  private keys = new Float64Array(64);
  private ties = new Float64Array(64);
  private cells = new Int32Array(64);
  private count = 0;

  /** The number of entries in the queue. */
  get size(): number {
    return this.count;
  }

  /** Removes every entry (keeps the storage for the next search). */
  clear(): void {
    this.count = 0;
  }

  /** Adds a cell with its key and tie value. */
  push(key: number, tie: number, cell: number): void {
    if (this.count === this.keys.length) this.grow();
    let i = this.count++;
    const { keys, ties, cells } = this;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (keys[parent] < key || (keys[parent] === key && ties[parent] >= tie)) break;
      keys[i] = keys[parent];
      ties[i] = ties[parent];
      cells[i] = cells[parent];
      i = parent;
    }
    keys[i] = key;
    ties[i] = tie;
    cells[i] = cell;
  }

  /** The key of the smallest entry (the queue must not be empty). */
  peekKey(): number {
    return this.keys[0];
  }

  /** The tie value of the smallest entry (the queue must not be empty). */
  peekTie(): number {
    return this.ties[0];
  }

  /** Removes the smallest entry and returns its cell (the queue must not be empty). */
  pop(): number {
    const { keys, ties, cells } = this;
    const top = cells[0];
    const last = --this.count;
    const key = keys[last];
    const tie = ties[last];
    const cell = cells[last];
    let i = 0;
    for (;;) {
      let child = 2 * i + 1;
      if (child >= last) break;
      const right = child + 1;
      if (right < last && (keys[right] < keys[child] || (keys[right] === keys[child] && ties[right] > ties[child]))) {
        child = right;
      }
      if (key < keys[child] || (key === keys[child] && tie >= ties[child])) break;
      keys[i] = keys[child];
      ties[i] = ties[child];
      cells[i] = cells[child];
      i = child;
    }
    keys[i] = key;
    ties[i] = tie;
    cells[i] = cell;
    return top;
  }

  private grow(): void {
    const n = this.keys.length * 2;
    const keys = new Float64Array(n);
    keys.set(this.keys);
    const ties = new Float64Array(n);
    ties.set(this.ties);
    const cells = new Int32Array(n);
    cells.set(this.cells);
    this.keys = keys;
    this.ties = ties;
    this.cells = cells;
  }
}
