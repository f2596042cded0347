/**
 * The piece pairs a run of one plan can ever have to test: pieces of two different robots
 * whose cells are within `reach` cells (Chebyshev) of each other, the same bound the sweep of
 * collision-sweep.ts uses. Which cells a piece spans does not depend on timing, so the list is
 * built once per plan and every run only checks which pairs share a time window. Its length
 * grows with how often robots pass the same cells, so a plan whose list would be long (dense
 * maps, long plans) gets none and keeps the sweep.
 */
import type { PreparedPlan } from './prepared-plan';

/** Candidate pairs, grouped by robot pair and in time order (each robot's chain order) within it. */
export interface CandidatePairs {
  readonly count: number;
  /** Per pair: the piece of the lower-numbered robot, and of the higher one. */
  readonly low: Int32Array;
  readonly high: Int32Array;
  /** Per pair: where `high` comes in the scan order of `low`, and `low` in that of `high` (see scanPosition). */
  readonly lowScan: Int32Array;
  readonly highScan: Int32Array;
}

/**
 * The candidate pairs of `p`, or null when there would be more than `limit`. Pieces are
 * numbered as in CollisionSweep: actions, then one goal piece per robot (actionCount + r),
 * and span the cells `cellA[k]`, `cellB[k]`.
 */
export function candidatePairs(p: PreparedPlan, cellA: Int32Array, cellB: Int32Array, reach: number, limit: number): CandidatePairs | null {
  const n = p.actionCount;
  const robots = p.robotCount;
  const pieces = n + robots;
  const cells = p.instance.grid.passable.length;
  const robotOf = (k: number): number => (k >= n ? k - n : p.robotOf[k]);
  // Pieces touching each cell, each piece once per distinct cell.
  const cellStart = new Int32Array(cells + 1);
  for (let k = 0; k < pieces; k++) {
    cellStart[cellA[k] + 1]++;
    if (cellB[k] !== cellA[k]) cellStart[cellB[k] + 1]++;
  }
  for (let c = 0; c < cells; c++) cellStart[c + 1] += cellStart[c];
  const cellPieces = new Int32Array(cellStart[cells]);
  const fill = cellStart.slice(0, cells);
  for (let k = 0; k < pieces; k++) {
    cellPieces[fill[cellA[k]]++] = k;
    if (cellB[k] !== cellA[k]) cellPieces[fill[cellB[k]]++] = k;
  }

  // Pass 1 counts the pairs of each robot pair (group g = rLow · robots + rHigh); pass 2 writes
  // them in place. Both visit each robot's pieces in chain order (its actions, then its goal
  // piece), so within a group the low pieces already come in time order.
  const scan = new ScanOrder(p, cellA, cellB, reach);
  const seen = new Int32Array(pieces).fill(-1);
  const groupStart = new Int32Array(robots * robots + 1);
  let count = 0;
  const visit = (write: ((x: number, y: number, pos: number, g: number) => void) | null): boolean => {
    seen.fill(-1);
    for (let rx = 0; rx < robots; rx++) {
      for (let k = p.first[rx]; k <= p.first[rx + 1]; k++) {
        const x = k < p.first[rx + 1] ? k : n + rx;
        const m = scan.cellsOf(x);
        for (let pos = 0; pos < m; pos++) {
          const cell = scan.cells[pos];
          for (let j = cellStart[cell]; j < cellStart[cell + 1]; j++) {
            const y = cellPieces[j];
            const ry = robotOf(y);
            if (ry <= rx || seen[y] === x) continue;
            seen[y] = x;
            const g = rx * robots + ry;
            if (write) write(x, y, pos, g);
            else if (++count > limit) return false;
            else groupStart[g + 1]++;
          }
        }
      }
    }
    return true;
  };
  if (!visit(null)) return null;
  for (let g = 0; g < robots * robots; g++) groupStart[g + 1] += groupStart[g];
  const out: CandidatePairs = {
    count,
    low: new Int32Array(count),
    high: new Int32Array(count),
    lowScan: new Int32Array(count),
    highScan: new Int32Array(count),
  };
  const at = groupStart.slice(0, robots * robots);
  visit((x, y, pos, g) => {
    const i = at[g]++;
    out.low[i] = x;
    out.high[i] = y;
    out.lowScan[i] = pos;
  });
  // One low piece's partners of one robot come cell by cell: put them in chain order too
  // (insertion sort; the runs are a few entries long).
  const chain = (k: number): number => (k >= n ? p.first[k - n + 1] + (k - n) : k + p.robotOf[k]);
  for (let i = 1; i < count; i++) {
    const x = out.low[i], y = out.high[i], pos = out.lowScan[i];
    let j = i - 1;
    while (j >= 0 && out.low[j] === x && chain(out.high[j]) > chain(y)) {
      out.high[j + 1] = out.high[j];
      out.lowScan[j + 1] = out.lowScan[j];
      j--;
    }
    out.high[j + 1] = y;
    out.lowScan[j + 1] = pos;
  }
  for (let i = 0; i < count; i++) out.highScan[i] = scan.position(out.high[i], out.low[i]);
  return out;
}

/**
 * The order in which CollisionSweep.insert scans cells for piece k: with reach 0 its first
 * cell, then its second; otherwise the box of its cells widened by `reach`, clipped to the
 * map, row by row.
 */
export class ScanOrder {
  /** The cells of the last `cellsOf` call. */
  readonly cells: Int32Array;
  private readonly w: number;
  private readonly h: number;

  constructor(p: PreparedPlan, private readonly cellA: Int32Array, private readonly cellB: Int32Array, private readonly reach: number) {
    this.w = p.instance.grid.width;
    this.h = p.instance.grid.height;
    this.cells = new Int32Array(Math.max(2, (2 * reach + 2) * (2 * reach + 2)));
  }

  /** Fills `cells` with piece k's scan order and returns how many there are. */
  cellsOf(k: number): number {
    const ca = this.cellA[k], cb = this.cellB[k];
    if (this.reach === 0) {
      this.cells[0] = ca;
      if (cb === ca) return 1;
      this.cells[1] = cb;
      return 2;
    }
    const w = this.w, reach = this.reach;
    const ax = ca % w, ay = (ca - ax) / w, bx = cb % w, by = (cb - bx) / w;
    const x0 = Math.max(0, Math.min(ax, bx) - reach), x1 = Math.min(w - 1, Math.max(ax, bx) + reach);
    const y0 = Math.max(0, Math.min(ay, by) - reach), y1 = Math.min(this.h - 1, Math.max(ay, by) + reach);
    let m = 0;
    for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) this.cells[m++] = y * w + x;
    return m;
  }

  /** Index in k's scan order of the first cell piece o spans (o must be within reach of k). */
  position(k: number, o: number): number {
    const m = this.cellsOf(k);
    for (let i = 0; i < m; i++) if (this.cells[i] === this.cellA[o] || this.cells[i] === this.cellB[o]) return i;
    throw new Error(`candidate pairs: piece ${o} is not within reach of piece ${k}`);
  }
}
