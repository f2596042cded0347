/**
 * An open-addressing hash map from non-negative 31-bit integers to integers on typed arrays,
 * cleared in O(1) by a generation stamp: the closed/open index of the low-level search.
 */
export class IntMap {
  private keys: Int32Array;
  private vals: Int32Array;
  private stamps: Uint32Array;
  private gen = 1;
  private mask: number;
  private count = 0;

  /** Creates a map with room for about `capacity / 2` entries before it grows. */
  constructor(capacity = 4096) {
    let cap = 16;
    while (cap < capacity) cap <<= 1;
    this.keys = new Int32Array(cap);
    this.vals = new Int32Array(cap);
    this.stamps = new Uint32Array(cap);
    this.mask = cap - 1;
  }

  /** Number of entries. */
  get size(): number {
    return this.count;
  }

  /** Removes every entry. */
  clear(): void {
    this.count = 0;
    this.gen++;
    if (this.gen === 0xffffffff) {
      this.stamps.fill(0);
      this.gen = 1;
    }
  }

  /** The value stored for `key`, or −1. */
  get(key: number): number {
    const mask = this.mask;
    let i = Math.imul(key, 0x9e3779b1) >>> 0 & mask;
    for (;;) {
      if (this.stamps[i] !== this.gen) return -1;
      if (this.keys[i] === key) return this.vals[i];
      i = (i + 1) & mask;
    }
  }

  /** Stores `value` for `key`. */
  set(key: number, value: number): void {
    if ((this.count + 1) * 2 > this.mask) this.grow();
    const mask = this.mask;
    let i = Math.imul(key, 0x9e3779b1) >>> 0 & mask;
    for (;;) {
      if (this.stamps[i] !== this.gen) {
        this.stamps[i] = this.gen;
        this.keys[i] = key;
        this.vals[i] = value;
        this.count++;
        return;
      }
      if (this.keys[i] === key) {
        this.vals[i] = value;
        return;
      }
      i = (i + 1) & mask;
    }
  }

  private grow(): void {
    const oldKeys = this.keys;
    const oldVals = this.vals;
    const oldStamps = this.stamps;
    const gen = this.gen;
    const cap = (this.mask + 1) * 2;
    this.keys = new Int32Array(cap);
    this.vals = new Int32Array(cap);
    this.stamps = new Uint32Array(cap);
    this.mask = cap - 1;
    this.gen = 1;
    this.count = 0;
    for (let i = 0; i < oldKeys.length; i++) if (oldStamps[i] === gen) this.set(oldKeys[i], oldVals[i]);
  }
}
