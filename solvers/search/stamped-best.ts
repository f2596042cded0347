/**
 * The best node per search state of one search at a time, reused by every search of its owner:
 * an entry is valid only when its stamp is the current search's, so nothing is cleared between
 * searches (only when the stamp wraps around).
 */
export class StampedBest {
  private stamps = new Int32Array(0);
  private nodes = new Int32Array(0);
  private stamp = 0;

  /** Starts a search over state keys 0 … keys − 1, none of them seen. */
  begin(keys: number): void {
    if (this.stamps.length < keys) {
      this.stamps = new Int32Array(keys);
      this.nodes = new Int32Array(keys);
      this.stamp = 0;
    }
    this.stamp = this.stamp === 0x7fffffff ? 1 : this.stamp + 1;
    if (this.stamp === 1) this.stamps.fill(0);
  }

  /** The node recorded for `key` in this search, or `none`. */
  get(key: number, none: number): number {
    return this.stamps[key] === this.stamp ? this.nodes[key] : none;
  }

  /** Records `node` as the best for `key` in this search. */
  set(key: number, node: number): void {
    this.stamps[key] = this.stamp;
    this.nodes[key] = node;
  }
}
