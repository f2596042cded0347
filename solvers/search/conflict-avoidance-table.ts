/**
 * The conflict avoidance table: where the other agents are, per time step, so the low level
 * can break ties between equally short paths toward fewer conflicts (common practice since
 * Sharon et al., AIJ 2015). It only orders equal-cost paths; it never changes a cost.
 */
import { NO_TIME } from './constraint-table';

/** Occupancy counts of the other agents' current paths. */
export class ConflictAvoidanceTable {
  private counts = new Uint8Array(0);
  private readonly restFrom: Int32Array;
  private written = new Int32Array(1024);
  private writtenCount = 0;
  private restCells: number[] = [];
  /** Number of time steps covered by `counts` (beyond it only resting agents matter). */
  length = 0;

  /**
   * Creates an empty table over `cellCount` cells; with `countsFollowing` (models with
   * `following: forbidden`) entering a cell someone occupied one step earlier counts too; with
   * `window` k > 0 (the bounded search of k-robust) a visit counts against every time within k
   * steps of it, as k-delay conflicts do.
   */
  constructor(private readonly cellCount: number, private readonly countsFollowing = false, private readonly window = 0) {
    this.restFrom = new Int32Array(cellCount).fill(NO_TIME);
  }

  /** Fills the table with the cells of `paths` (state paths; `stateCell` maps states to cells), skipping `skip`. */
  fill(stateCell: Int32Array, paths: readonly (Int32Array | null)[], skip: number): void {
    this.reset();
    const n = this.cellCount;
    let len = 0;
    for (let i = 0; i < paths.length; i++) {
      const p = paths[i];
      if (i !== skip && p !== null && p.length > len) len = p.length;
    }
    this.length = len;
    if (this.counts.length < len * n) this.counts = new Uint8Array(Math.max(len * n, this.counts.length * 2));
    const counts = this.counts;
    for (let i = 0; i < paths.length; i++) {
      const p = paths[i];
      if (i === skip || p === null) continue;
      const last = p.length - 1;
      for (let t = 0; t < last; t++) {
        const k = t * n + stateCell[p[t]];
        if (counts[k] === 0) {
          if (this.writtenCount === this.written.length) {
            const w = new Int32Array(this.written.length * 2);
            w.set(this.written);
            this.written = w;
          }
          this.written[this.writtenCount++] = k;
        }
        if (counts[k] < 255) counts[k]++;
      }
      const g = stateCell[p[last]];
      if (last < this.restFrom[g]) {
        if (this.restFrom[g] === NO_TIME) this.restCells.push(g);
        this.restFrom[g] = last;
      }
    }
  }

  /** Empties the table. */
  reset(): void {
    for (let i = 0; i < this.writtenCount; i++) this.counts[this.written[i]] = 0;
    this.writtenCount = 0;
    for (const c of this.restCells) this.restFrom[c] = NO_TIME;
    this.restCells = [];
    this.length = 0;
  }

  /** Number of times other agents are in `cell` after time t (what resting there from t on would hit). */
  visitsAfter(cell: number, t: number): number {
    const n = this.cellCount;
    let k = 0;
    for (let u = t + 1 + this.window; u < this.length; u++) k += this.counts[u * n + cell];
    return k;
  }

  /** Number of conflicts caused by moving from cell `from` (at t − 1) to cell `to` (at t). */
  moveCost(from: number, to: number, t: number): number {
    const n = this.cellCount;
    if (this.window > 0) return this.windowCost(to, t);
    let k = this.restFrom[to] <= t ? 1 : 0;
    if (t < this.length) {
      const c = this.counts;
      k += c[t * n + to];
      // Swap: someone was at `to` and is now at `from` (counts only say someone, which is close enough for tie-breaking).
      // Following (when forbidden): someone was at `to` one step earlier; a swap is one of those.
      if (from !== to && c[(t - 1) * n + to] !== 0 && (this.countsFollowing || c[t * n + from] !== 0)) k++;
    }
    return k;
  }

  /** k-delay conflicts of being in `to` at t: visits within `window` steps, and agents resting there by t + window. */
  private windowCost(to: number, t: number): number {
    const n = this.cellCount;
    let k = this.restFrom[to] <= t + this.window ? 1 : 0;
    const last = Math.min(this.length - 1, t + this.window);
    for (let u = Math.max(0, t - this.window); u <= last; u++) k += this.counts[u * n + to];
    return k;
  }
}
