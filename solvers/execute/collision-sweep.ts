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
 *
 * Most plans instead take the pairs within reach from a list built once per plan
 * (candidate-pairs.ts) and test those whose time windows meet: the same tests with the same
 * arguments as the sweep, so the same overlaps, merged per robot pair in time order as the
 * sweep does; `found` is then put into the sweep's order, which decides ties in the stop rule.
 */
import { candidatePairs, type CandidatePairs } from './candidate-pairs';
import { overlapInterval } from './closest-approach';
import type { Collision } from './execution-types';
import type { PreparedPlan } from './prepared-plan';
import type { RunTimes } from './realise-times';

/** Slack below the diameter: touching disks (distance = diameter up to rounding) do not count. */
const CONTACT_SLACK_MM = 1e-6;
/** Overlaps of one robot pair closer than this in time are one collision. */
const MERGE_MS = 1e-6;
/**
 * Longest candidate list, per piece, that a plan gets. A list entry costs a few loads per run, a
 * sweep event a heap update and a bucket scan; on the benchmark's random walks the list stays
 * cheaper up to roughly 30 pairs per piece, and 16 leaves margin and bounds its memory.
 */
const PAIRS_PER_PIECE = 16;

/** How CollisionSweep finds the pairs to test: `auto` takes the list when it is short enough (tests force one). */
export type BroadphaseStrategy = 'auto' | 'pairs' | 'sweep';

/** A collision while its pair's overlaps are still being merged (its end may grow). */
type OpenCollision = { -readonly [K in keyof Collision]: Collision[K] };

/** Reusable collision detector for one prepared plan. */
export class CollisionSweep {
  private readonly p: PreparedPlan;
  private readonly radius: number;
  private readonly reach: number;
  /** Per piece its cells: cellA[piece] and cellB[piece] (equal for a piece that stays in one cell). */
  private readonly cellA: Int32Array;
  private readonly cellB: Int32Array;
  /** Per piece the action whose end opens its window (−1: the window opens at 0). */
  private readonly windowFrom: Int32Array;
  /** Sweep only: see liveChains (empty when the plan uses the candidate list). */
  private readonly nextLive: Int32Array;
  private readonly head: Int32Array;
  private readonly next: Int32Array;
  private readonly prev: Int32Array;
  private readonly stamp: Int32Array;
  private stampValue = 0;
  /** Per robot its linked piece (−1 none) and the next live piece to enter (−1 none). */
  private readonly current: Int32Array;
  private readonly pending: Int32Array;
  private readonly heapRobot: Int32Array;
  private readonly heapKey: Float64Array;
  private readonly pairEnd: Float64Array;
  private readonly pairIndex: Int32Array;
  private readonly touchedPairs: number[] = [];
  private readonly tmp = new Float64Array(2);
  private readonly cuts = new Float64Array(6);
  private times!: RunTimes;
  private duration!: Float64Array;
  private found: OpenCollision[] = [];
  private readonly pairs: CandidatePairs | null;
  /**
   * Pair-list detection: per found collision, five numbers placing it in the sweep's order:
   * the later piece's window start and robot, the other piece's position in its scan, the
   * other piece's window start and robot (later inserted comes first in a bucket).
   */
  private readonly created: number[] = [];
  private readonly testKey = new Float64Array(5);
  private isPairList = false;
  /** Pair-list detection: piece k's window in the current run is [windows[2k], windows[2k + 1]), side by side for locality. */
  private readonly windows: Float64Array;

  constructor(p: PreparedPlan, strategy: BroadphaseStrategy = 'auto') {
    this.p = p;
    const n = p.actionCount;
    const robots = p.robotCount;
    const pieces = n + robots;
    this.radius = p.profile.robotDiameterMm - CONTACT_SLACK_MM;
    this.reach = Math.max(0, Math.ceil(p.profile.robotDiameterMm / p.profile.cellPitchMm) - 1);
    this.cellA = new Int32Array(pieces);
    this.cellB = new Int32Array(pieces);
    this.cellA.set(p.fromCell);
    this.cellB.set(p.toCell);
    this.cellA.set(p.goalCell, n);
    this.cellB.set(p.goalCell, n);
    this.windowFrom = new Int32Array(pieces);
    for (let r = 0; r < robots; r++) {
      for (let k = p.first[r]; k < p.first[r + 1]; k++) this.windowFrom[k] = k > p.first[r] ? k - 1 : -1;
      this.windowFrom[n + r] = p.first[r + 1] > p.first[r] ? p.first[r + 1] - 1 : -1;
    }
    this.pairs = strategy === 'sweep' ? null
      : candidatePairs(p, this.cellA, this.cellB, this.reach, strategy === 'pairs' ? Infinity : PAIRS_PER_PIECE * pieces);
    this.nextLive = this.pairs ? new Int32Array(0) : this.liveChains();
    this.windows = new Float64Array(2 * pieces).fill(Infinity);
    this.head = new Int32Array(p.instance.grid.passable.length).fill(-1);
    this.next = new Int32Array(2 * pieces);
    this.prev = new Int32Array(2 * pieces);
    this.stamp = new Int32Array(pieces);
    this.current = new Int32Array(robots);
    this.pending = new Int32Array(robots);
    this.heapRobot = new Int32Array(robots);
    this.heapKey = new Float64Array(robots);
    this.pairEnd = new Float64Array(robots * robots).fill(-Infinity);
    this.pairIndex = new Int32Array(robots * robots);
  }

  /** Whether this plan's runs test the candidate list rather than sweeping. */
  get usesPairList(): boolean {
    return this.pairs !== null;
  }

  /**
   * Per piece (and per robot, at index pieces + r, for its start) the next piece of the same
   * robot that some other robot's piece comes within `reach` cells of, or −1. The others can
   * never touch anything (they find nothing and nobody finds them), so the sweep skips them.
   */
  private liveChains(): Int32Array {
    const p = this.p;
    const n = p.actionCount;
    const robots = p.robotCount;
    const pieces = n + robots;
    const cells = p.instance.grid.passable.length;
    // Per cell: the one robot whose pieces touch it (−1 none, −2 several).
    const owner = new Int32Array(cells).fill(-1);
    const claim = (cell: number, r: number): void => {
      const o = owner[cell];
      if (o === -1) owner[cell] = r;
      else if (o !== r) owner[cell] = -2;
    };
    const robotOf = (k: number): number => (k >= n ? k - n : p.robotOf[k]);
    for (let k = 0; k < pieces; k++) {
      claim(this.cellA[k], robotOf(k));
      claim(this.cellB[k], robotOf(k));
    }
    const w = p.instance.grid.width;
    const h = p.instance.grid.height;
    const isLive = (k: number): boolean => {
      const r = robotOf(k);
      const ca = this.cellA[k], cb = this.cellB[k];
      const ax = ca % w, ay = (ca - ax) / w, bx = cb % w, by = (cb - bx) / w;
      const x0 = Math.max(0, Math.min(ax, bx) - this.reach), x1 = Math.min(w - 1, Math.max(ax, bx) + this.reach);
      const y0 = Math.max(0, Math.min(ay, by) - this.reach), y1 = Math.min(h - 1, Math.max(ay, by) + this.reach);
      for (let y = y0; y <= y1; y++) {
        for (let x = x0; x <= x1; x++) {
          const o = owner[y * w + x];
          if (o !== -1 && o !== r) return true;
        }
      }
      return false;
    };
    const next = new Int32Array(pieces + robots).fill(-1);
    for (let r = 0; r < robots; r++) {
      let live = isLive(n + r) ? n + r : -1;
      next[n + r] = -1;
      for (let k = p.first[r + 1] - 1; k >= p.first[r]; k--) {
        next[k] = live;
        if (isLive(k)) live = k;
      }
      next[pieces + r] = live;
    }
    return next;
  }

  /** Every collision of the run described by `times` and `duration`, in the order the sweep finds them (callers sort). */
  detect(times: RunTimes, duration: Float64Array): Collision[] {
    this.times = times;
    this.duration = duration;
    this.found = [];
    const found = this.pairs ? this.detectByPairs(this.pairs) : this.detectBySweep();
    for (const key of this.touchedPairs) this.pairEnd[key] = -Infinity;
    this.touchedPairs.length = 0;
    return found;
  }

  private detectByPairs(pairs: CandidatePairs): Collision[] {
    const p = this.p;
    const n = p.actionCount;
    const end = this.times.end;
    const windowFrom = this.windowFrom;
    const { low, high, lowScan, highScan, count } = pairs;
    const key = this.testKey;
    // Every piece's time window, so that the pair loop reads four numbers per pair.
    const windows = this.windows;
    for (let k = 0; k < n; k++) {
      const f = windowFrom[k];
      windows[2 * k] = f === -1 ? 0 : end[f];
      windows[2 * k + 1] = end[k];
    }
    for (let k = n; k < windowFrom.length; k++) {
      const f = windowFrom[k];
      windows[2 * k] = f === -1 ? 0 : end[f]; // goal pieces end at Infinity
    }
    this.isPairList = true;
    for (let k = 0; k < count; k++) {
      const x = low[k];
      const y = high[k];
      const sx = windows[2 * x];
      const ex = windows[2 * x + 1];
      const sy = windows[2 * y];
      const ey = windows[2 * y + 1];
      const lo = sx > sy ? sx : sy;
      const hi = ex < ey ? ex : ey;
      if (!(hi > lo)) continue;
      // The sweep tests a pair when the later piece enters; on equal starts the higher robot enters later.
      const rx = x >= n ? x - n : p.robotOf[x];
      const ry = y >= n ? y - n : p.robotOf[y];
      if (sx > sy) {
        key[0] = sx; key[1] = rx; key[2] = lowScan[k]; key[3] = sy; key[4] = ry;
        this.testPair(x, rx, y, lo);
      } else {
        key[0] = sy; key[1] = ry; key[2] = highScan[k]; key[3] = sx; key[4] = rx;
        this.testPair(y, ry, x, lo);
      }
    }
    this.isPairList = false;
    const found = this.found;
    const c = this.created;
    if (found.length > 1) {
      const order = Array.from(found, (_, i) => i).sort((i, j) => {
        const a = 5 * i, b = 5 * j;
        return c[a] - c[b] || c[a + 1] - c[b + 1] || c[a + 2] - c[b + 2] || c[b + 3] - c[a + 3] || c[b + 4] - c[a + 4];
      });
      this.found = order.map((i) => found[i]);
    }
    c.length = 0;
    return this.found;
  }

  private detectBySweep(): Collision[] {
    const p = this.p;
    const n = p.actionCount;
    const pieces = n + p.robotCount;
    const robots = p.robotCount;
    const end = this.times.end;
    const windowFrom = this.windowFrom;
    const nextLive = this.nextLive;
    const current = this.current;
    const pending = this.pending;
    const heapKey = this.heapKey;
    const heapRobot = this.heapRobot;
    this.head.fill(-1);
    // Each robot's first piece enters at t = 0 in robot order, as in a sweep over every piece;
    // then a binary min-heap of (time its next live piece enters, robot) orders the robots.
    // A skipped piece's predecessor is unlinked late, when the next live one enters: tests
    // against it in between find no common window, so nothing changes.
    for (let r = 0; r < robots; r++) {
      let live = nextLive[pieces + r];
      current[r] = -1;
      if (live !== -1 && windowFrom[live] === -1) {
        this.insert(live, r, 0);
        current[r] = live;
        live = nextLive[live];
      }
      pending[r] = live;
      const wf = live === -1 ? -1 : windowFrom[live];
      const key = live === -1 ? Infinity : wf === -1 ? 0 : end[wf];
      let i = r;
      while (i > 0) {
        const parent = (i - 1) >> 1;
        const pk = heapKey[parent];
        if (!(key < pk || (key === pk && r < heapRobot[parent]))) break;
        heapKey[i] = pk;
        heapRobot[i] = heapRobot[parent];
        i = parent;
      }
      heapKey[i] = key;
      heapRobot[i] = r;
    }
    while (robots > 0 && heapKey[0] < Infinity) {
      const r = heapRobot[0];
      const t = heapKey[0];
      const old = current[r];
      if (old !== -1) this.remove(old);
      const piece = pending[r];
      current[r] = piece;
      this.insert(piece, r, t);
      const live = nextLive[piece];
      pending[r] = live;
      const key = live === -1 ? Infinity : end[windowFrom[live]];
      // Replace the root by the robot's new key and sift it down: the same order of robots as
      // popping and pushing, since (time, robot) keys are all distinct.
      let i = 0;
      for (;;) {
        let c = 2 * i + 1;
        if (c >= robots) break;
        let ck = heapKey[c];
        let cr = heapRobot[c];
        if (c + 1 < robots) {
          const k2 = heapKey[c + 1];
          const r2 = heapRobot[c + 1];
          if (k2 < ck || (k2 === ck && r2 < cr)) {
            c++;
            ck = k2;
            cr = r2;
          }
        }
        if (!(ck < key || (ck === key && cr < r))) break;
        heapKey[i] = ck;
        heapRobot[i] = cr;
        i = c;
      }
      heapKey[i] = key;
      heapRobot[i] = r;
    }
    return this.found;
  }

  /** Adds `piece` (robot r, window starting at t) to the buckets after testing it against active pieces nearby. */
  private insert(piece: number, r: number, t: number): void {
    const stampValue = ++this.stampValue;
    const cellA = this.cellA[piece];
    const cellB = this.cellB[piece];
    if (this.reach === 0) {
      this.scan(cellA, piece, r, t, stampValue);
      if (cellB !== cellA) this.scan(cellB, piece, r, t, stampValue);
    } else {
      const w = this.p.instance.grid.width;
      const h = this.p.instance.grid.height;
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
    const next = this.next;
    const stamp = this.stamp;
    for (let node = this.head[cell]; node !== -1; node = next[node]) {
      const other = node >> 1;
      if (stamp[other] === stampValue) continue;
      stamp[other] = stampValue;
      this.testPair(piece, r, other, t);
    }
  }

  private remove(piece: number): void {
    const cellA = this.cellA[piece];
    const cellB = this.cellB[piece];
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
    const end = this.times.end;
    const hiA = a >= p.actionCount ? Infinity : end[a];
    const hiB = b >= p.actionCount ? Infinity : end[b];
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
      if (t1 > c.untilMs) c.untilMs = t1;
      this.pairEnd[key] = Math.max(this.pairEnd[key], t1);
      return;
    }
    if (this.pairEnd[key] === -Infinity) this.touchedPairs.push(key);
    this.pairEnd[key] = t1;
    this.pairIndex[key] = this.found.length;
    const x = (this.posX(a, t0) + this.posX(b, t0)) / 2;
    const y = (this.posY(a, t0) + this.posY(b, t0)) / 2;
    const pitch = this.p.profile.cellPitchMm;
    if (this.isPairList) {
      const k = this.testKey;
      this.created.push(k[0], k[1], k[2], k[3], k[4]);
    }
    this.found.push({ robots: [lo, hi], timeMs: t0, untilMs: t1, at: [x, y], cell: [Math.round(x / pitch), Math.round(y / pitch)] });
  }
}
