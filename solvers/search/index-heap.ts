/**
 * A binary min-heap of integer ids keyed by a number, with decrease-key, on typed arrays:
 * the open list of the low-level search (no objects or closures per node). Equal keys pop
 * the smaller id first, so the order is fully deterministic.
 */
export class IndexHeap {
  private ids = new Int32Array(1024);
  private keys = new Float64Array(1024);
  private pos = new Int32Array(1024).fill(-1);
  private n = 0;

  /** Number of ids in the heap. */
  get size(): number {
    return this.n;
  }

  /** Empties the heap (keeps its buffers). */
  clear(): void {
    for (let i = 0; i < this.n; i++) this.pos[this.ids[i]] = -1;
    this.n = 0;
  }

  /** Whether `id` is in the heap. */
  has(id: number): boolean {
    return id < this.pos.length && this.pos[id] >= 0;
  }

  /** Inserts `id` with `key`, or lowers its key if present and `key` is smaller. */
  push(id: number, key: number): void {
    if (id >= this.pos.length) {
      let len = this.pos.length * 2;
      while (len <= id) len *= 2;
      const p = new Int32Array(len).fill(-1);
      p.set(this.pos);
      this.pos = p;
    }
    let i = this.pos[id];
    if (i >= 0) {
      if (!this.less(key, id, this.keys[i], id)) return;
    } else {
      if (this.n === this.ids.length) {
        const ids = new Int32Array(this.n * 2);
        ids.set(this.ids);
        this.ids = ids;
        const keys = new Float64Array(this.n * 2);
        keys.set(this.keys);
        this.keys = keys;
      }
      i = this.n++;
    }
    this.siftUp(i, id, key);
  }

  /** Inserts `id` with `key`, or moves it to `key` if present (up or down; the focal searches need both). */
  set(id: number, key: number): void {
    if (!this.has(id)) {
      this.push(id, key);
      return;
    }
    const i = this.pos[id];
    if (key < this.keys[i]) this.siftUp(i, id, key);
    else this.siftDown(i, id, key);
  }

  /** The id with the smallest key (undefined behaviour when empty). */
  peek(): number {
    return this.ids[0];
  }

  /** The smallest key (undefined behaviour when empty). */
  peekKey(): number {
    return this.keys[0];
  }

  /** Removes and returns the id with the smallest key; −1 when empty. */
  pop(): number {
    if (this.n === 0) return -1;
    const top = this.ids[0];
    this.pos[top] = -1;
    const last = --this.n;
    if (last > 0) this.siftDown(0, this.ids[last], this.keys[last]);
    return top;
  }

  private less(ka: number, ia: number, kb: number, ib: number): boolean {
    return ka < kb || (ka === kb && ia < ib);
  }

  private siftUp(i: number, id: number, key: number): void {
    const ids = this.ids;
    const keys = this.keys;
    const pos = this.pos;
    while (i > 0) {
      const p = (i - 1) >> 1;
      const pk = keys[p];
      const pid = ids[p];
      if (!(key < pk || (key === pk && id < pid))) break;
      ids[i] = pid;
      keys[i] = pk;
      pos[pid] = i;
      i = p;
    }
    ids[i] = id;
    keys[i] = key;
    pos[id] = i;
  }

  private siftDown(i: number, id: number, key: number): void {
    const ids = this.ids;
    const keys = this.keys;
    const pos = this.pos;
    const n = this.n;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      let ck = keys[c];
      let cid = ids[c];
      const r = c + 1;
      if (r < n) {
        const rk = keys[r];
        const rid = ids[r];
        if (rk < ck || (rk === ck && rid < cid)) { c = r; ck = rk; cid = rid; }
      }
      if (!(ck < key || (ck === key && cid < id))) break;
      ids[i] = cid;
      keys[i] = ck;
      pos[cid] = i;
      i = c;
    }
    ids[i] = id;
    keys[i] = key;
    pos[id] = i;
  }
}
