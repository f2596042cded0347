/**
 * Exact disk collision detection for one run. Each robot's motion is a chain of pieces: piece a
 * covers [end of the previous action, end of action a) — standing at the action's start cell
 * while idle, then moving in a straight line at constant speed (forward) or standing (turn,
 * wait) — and a final piece holds the robot at its goal forever. A sweep over time keeps each
 * robot's current piece in buckets of the cells it spans; a new piece is tested only against
 * active pieces of other robots within `reach` cells (Chebyshev).
 *
 * Broadphase bound: a piece lies on the segment between the centres of its (≤ 2, adjacent)
 * cells; two such segments whose cell sets are g ≥ 1 cells apart (Chebyshev) are at least
 * g · pitch apart, so disks can overlap only when g · pitch < diameter: reach = ⌈d / pitch⌉ − 1
 * (0 when pitch ≥ diameter, wider when cells are closer than a robot is wide).
 * Overlap means centre distance < diameter − 1 nm, so robots exactly touching are fine.
 */
import { overlapInterval } from './closest-approach';
import type { Collision } from './execution-types';
import type { PreparedPlan } from './prepared-plan';
import type { RunTimes } from './realise-times';

/** Slack below the diameter: touching disks (distance = diameter up to rounding) do not count. */
const CONTACT_SLACK_MM = 1e-6;
/** Overlaps of one robot pair closer than this in time are one collision. */
const MERGE_MS = 1e-6;

/** Reusable collision detector for one prepared plan. */
export class CollisionSweep {
  private readonly p: PreparedPlan;
  private readonly pieceCount: number;
  private readonly radius: number;
  private readonly reach: number;
  private readonly head: Int32Array;
  private readonly next: Int32Array;
  private readonly prev: Int32Array;
  private readonly stamp: Int32Array;
  private stampValue = 0;
  private readonly current: Int32Array;
  private readonly heapRobot: Int32Array;
  private readonly heapKey: Float64Array;
  private heapSize = 0;
  private readonly pairEnd: Float64Array;
  private readonly pairIndex: Int32Array;
  private readonly touchedPairs: number[] = [];
  private readonly tmp = new Float64Array(2);
  private readonly cuts = new Float64Array(6);
  private times!: RunTimes;
  private duration!: Float64Array;
  private found: Collision[] = [];

  constructor(p: PreparedPlan) {
    this.p = p;
    const n = p.actionCount;
    const robots = p.robotCount;
    this.pieceCount = n + robots;
    this.radius = p.profile.robotDiameterMm - CONTACT_SLACK_MM;
    this.reach = Math.max(0, Math.ceil(p.profile.robotDiameterMm / p.profile.cellPitchMm) - 1);
    this.head = new Int32Array(p.instance.grid.passable.length).fill(-1);
    this.next = new Int32Array(2 * this.pieceCount);
    this.prev = new Int32Array(2 * this.pieceCount);
    this.stamp = new Int32Array(this.pieceCount);
    this.current = new Int32Array(robots);
    this.heapRobot = new Int32Array(robots);
    this.heapKey = new Float64Array(robots);
    this.pairEnd = new Float64Array(robots * robots).fill(-Infinity);
    this.pairIndex = new Int32Array(robots * robots);
  }

  /** Every collision of the run described by `times` and `duration`, in the order found (callers sort). */
  detect(times: RunTimes, duration: Float64Array): Collision[] {
    this.times = times;
    this.duration = duration;
    this.found = [];
    const p = this.p;
    const robots = p.robotCount;
    this.head.fill(-1);
    this.heapSize = 0;
    for (let r = 0; r < robots; r++) {
      const piece = p.first[r] < p.first[r + 1] ? p.first[r] : p.actionCount + r;
      this.current[r] = piece;
      this.insert(piece, r, 0);
      this.push(r, this.windowEnd(piece));
    }
    while (this.heapSize > 0 && this.heapKey[0] < Infinity) {
      const r = this.heapRobot[0];
      const t = this.heapKey[0];
      this.pop();
      const old = this.current[r];
      this.remove(old);
      const piece = old + 1 < p.first[r + 1] ? old + 1 : p.actionCount + r;
      this.current[r] = piece;
      this.insert(piece, r, t);
      this.push(r, this.windowEnd(piece));
    }
    for (const key of this.touchedPairs) this.pairEnd[key] = -Infinity;
    this.touchedPairs.length = 0;
    return this.found;
  }

  private windowEnd(piece: number): number {
    return piece >= this.p.actionCount ? Infinity : this.times.end[piece];
  }

  /** Adds `piece` (robot r, window starting at t) to the buckets after testing it against active pieces nearby. */
  private insert(piece: number, r: number, t: number): void {
    const p = this.p;
    const stampValue = ++this.stampValue;
    const cellA = piece >= p.actionCount ? p.goalCell[piece - p.actionCount] : p.fromCell[piece];
    const cellB = piece >= p.actionCount ? cellA : p.toCell[piece];
    if (this.reach === 0) {
      this.scan(cellA, piece, r, t, stampValue);
      if (cellB !== cellA) this.scan(cellB, piece, r, t, stampValue);
    } else {
      const w = p.instance.grid.width;
      const h = p.instance.grid.height;
      const ax = cellA % w, ay = (cellA - ax) / w, bx = cellB % w, by = (cellB - bx) / w;
      const x0 = Math.max(0, Math.min(ax, bx) - this.reach), x1 = Math.min(w - 1, Math.max(ax, bx) + this.reach);
      const y0 = Math.max(0, Math.min(ay, by) - this.reach), y1 = Math.min(h - 1, Math.max(ay, by) + this.reach);
      for (let y = y0; y <= y1; y++) for (let x = x0; x <= x1; x++) this.scan(y * w + x, piece, r, t, stampValue);
    }
    this.link(piece * 2, cellA);
    if (cellB !== cellA) this.link(piece * 2 + 1, cellB);
  }

  /** Tests `piece` against every active piece in `cell` not tested yet in this insertion. */
  private scan(cell: number, piece: number, r: number, t: number, stampValue: number): void {
    for (let node = this.head[cell]; node !== -1; node = this.next[node]) {
      const other = node >> 1;
      if (this.stamp[other] === stampValue) continue;
      this.stamp[other] = stampValue;
      this.testPair(piece, r, other, t);
    }
  }

  private remove(piece: number): void {
    const p = this.p;
    const cellA = piece >= p.actionCount ? p.goalCell[piece - p.actionCount] : p.fromCell[piece];
    const cellB = piece >= p.actionCount ? cellA : p.toCell[piece];
    this.unlink(piece * 2, cellA);
    if (cellB !== cellA) this.unlink(piece * 2 + 1, cellB);
  }

  private link(node: number, cell: number): void {
    const h = this.head[cell];
    this.next[node] = h;
    this.prev[node] = -1;
    if (h !== -1) this.prev[h] = node;
    this.head[cell] = node;
  }

  private unlink(node: number, cell: number): void {
    const pv = this.prev[node];
    const nx = this.next[node];
    if (pv === -1) this.head[cell] = nx;
    else this.next[pv] = nx;
    if (nx !== -1) this.prev[nx] = pv;
  }

  /** Exact test of two pieces over their common time window, split where either starts or stops moving. */
  private testPair(a: number, ra: number, b: number, lo: number): void {
    const p = this.p;
    const rb = b >= p.actionCount ? b - p.actionCount : p.robotOf[b];
    if (rb === ra) return;
    const hiA = this.windowEnd(a);
    const hiB = this.windowEnd(b);
    const hi = hiA < hiB ? hiA : hiB;
    if (!(hi > lo)) return;
    const cuts = this.cuts;
    let m = 0;
    cuts[m++] = lo;
    m = this.addMotionCuts(a, lo, hi, m);
    m = this.addMotionCuts(b, lo, hi, m);
    cuts[m++] = hi;
    for (let i = 1; i < m; i++) {
      const v = cuts[i];
      let j = i - 1;
      while (j >= 0 && cuts[j] > v) {
        cuts[j + 1] = cuts[j];
        j--;
      }
      cuts[j + 1] = v;
    }
    const out = this.tmp;
    for (let i = 0; i + 1 < m; i++) {
      const u = cuts[i];
      const v = cuts[i + 1];
      if (!(v > u)) continue;
      const mid = v === Infinity ? Infinity : (u + v) / 2;
      const ax = this.posX(a, u), ay = this.posY(a, u), bx = this.posX(b, u), by = this.posY(b, u);
      const wx = this.velX(b, mid) - this.velX(a, mid);
      const wy = this.velY(b, mid) - this.velY(a, mid);
      if (overlapInterval(bx - ax, by - ay, wx, wy, v - u, this.radius, out)) {
        this.record(a, ra, b, rb, u + out[0], u + out[1]);
      }
    }
  }

  /** Adds the start and stop of a forward piece's motion that fall inside (lo, hi). */
  private addMotionCuts(piece: number, lo: number, hi: number, m: number): number {
    const p = this.p;
    if (piece >= p.actionCount || p.kind[piece] !== 0) return m;
    const s = this.times.start[piece];
    if (s === Infinity) return m;
    const e = this.moveEnd(piece);
    if (s > lo && s < hi) this.cuts[m++] = s;
    if (e > lo && e < hi) this.cuts[m++] = e;
    return m;
  }

  private moveEnd(piece: number): number {
    const e = this.times.start[piece] + this.duration[piece];
    const cut = this.times.cutAt[piece];
    return cut < e ? cut : e;
  }

  /** Fraction of the forward move done at time t (0 before it starts, frozen after a cut). */
  private progress(piece: number, t: number): number {
    const s = this.times.start[piece];
    if (this.p.kind[piece] !== 0 || !(t > s)) return 0;
    const e = this.moveEnd(piece);
    return ((t < e ? t : e) - s) / this.duration[piece];
  }

  private posX(piece: number, t: number): number {
    const p = this.p;
    if (piece >= p.actionCount) return p.goalX[piece - p.actionCount];
    return p.fromX[piece] + (p.toX[piece] - p.fromX[piece]) * this.progress(piece, t);
  }

  private posY(piece: number, t: number): number {
    const p = this.p;
    if (piece >= p.actionCount) return p.goalY[piece - p.actionCount];
    return p.fromY[piece] + (p.toY[piece] - p.fromY[piece]) * this.progress(piece, t);
  }

  private isMovingAt(piece: number, t: number): boolean {
    const p = this.p;
    if (piece >= p.actionCount || p.kind[piece] !== 0) return false;
    const s = this.times.start[piece];
    return t > s && t < this.moveEnd(piece);
  }

  private velX(piece: number, t: number): number {
    return this.isMovingAt(piece, t) ? (this.p.toX[piece] - this.p.fromX[piece]) / this.duration[piece] : 0;
  }

  private velY(piece: number, t: number): number {
    return this.isMovingAt(piece, t) ? (this.p.toY[piece] - this.p.fromY[piece]) / this.duration[piece] : 0;
  }

  /** Records an overlap, merging it with the pair's previous one when they touch in time. */
  private record(a: number, ra: number, b: number, rb: number, t0: number, t1: number): void {
    const lo = ra < rb ? ra : rb;
    const hi = ra < rb ? rb : ra;
    const key = lo * this.p.robotCount + hi;
    if (this.pairEnd[key] >= t0 - MERGE_MS) {
      const c = this.found[this.pairIndex[key]];
      if (t1 > c.untilMs) this.found[this.pairIndex[key]] = { ...c, untilMs: t1 };
      this.pairEnd[key] = Math.max(this.pairEnd[key], t1);
      return;
    }
    if (this.pairEnd[key] === -Infinity) this.touchedPairs.push(key);
    this.pairEnd[key] = t1;
    this.pairIndex[key] = this.found.length;
    const x = (this.posX(a, t0) + this.posX(b, t0)) / 2;
    const y = (this.posY(a, t0) + this.posY(b, t0)) / 2;
    const pitch = this.p.profile.cellPitchMm;
    this.found.push({ robots: [lo, hi], timeMs: t0, untilMs: t1, at: [x, y], cell: [Math.round(x / pitch), Math.round(y / pitch)] });
  }

  private push(r: number, key: number): void {
    let i = this.heapSize++;
    while (i > 0) {
      const parent = (i - 1) >> 1;
      if (!this.less(key, r, this.heapKey[parent], this.heapRobot[parent])) break;
      this.heapKey[i] = this.heapKey[parent];
      this.heapRobot[i] = this.heapRobot[parent];
      i = parent;
    }
    this.heapKey[i] = key;
    this.heapRobot[i] = r;
  }

  private pop(): void {
    const n = --this.heapSize;
    if (n === 0) return;
    const key = this.heapKey[n];
    const r = this.heapRobot[n];
    let i = 0;
    for (;;) {
      let c = 2 * i + 1;
      if (c >= n) break;
      if (c + 1 < n && this.less(this.heapKey[c + 1], this.heapRobot[c + 1], this.heapKey[c], this.heapRobot[c])) c++;
      if (!this.less(this.heapKey[c], this.heapRobot[c], key, r)) break;
      this.heapKey[i] = this.heapKey[c];
      this.heapRobot[i] = this.heapRobot[c];
      i = c;
    }
    this.heapKey[i] = key;
    this.heapRobot[i] = r;
  }

  /** Heap order: earlier time first, then lower robot index (deterministic ties). */
  private less(k1: number, r1: number, k2: number, r2: number): boolean {
    return k1 < k2 || (k1 === k2 && r1 < r2);
  }
}
