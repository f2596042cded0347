/**
 * The constraints the continuous-time CBS high level places on one agent, and their
 * compilation into what Safe Interval Path Planning needs: per cell the sorted safe intervals
 * (complement of the forbidden occupancy), per move the forbidden start windows, and the
 * earliest admissible start of the agent's final stay at its goal. Times are integer ms and
 * every interval is half-open [from, to); `to` may be Infinity.
 */

/** The agent must not occupy `cell` at any instant of [from, to) (see the occupancy rule in sipp.ts). */
export interface OccupancyBan {
  readonly kind: 'occupancy';
  readonly cell: number;
  readonly from: number;
  readonly to: number;
}

/** The agent must not START the forward move `fromCell` → `toCell` at any time in [from, to). */
export interface MoveBan {
  readonly kind: 'move';
  readonly fromCell: number;
  readonly toCell: number;
  readonly from: number;
  readonly to: number;
}

/** The agent's final visit of its goal (the one it never leaves) must begin at or after `notBefore`. */
export interface LateGoalBan {
  readonly kind: 'late-goal';
  readonly notBefore: number;
}

/**
 * A positive constraint (a landmark of disjoint splitting, issue 15): the agent MUST start one
 * of `moves` at some time in [from, to). It is the complement of a move ban over the same moves
 * and window, given to the other child of a split (see ccbs-branch.ts, disjointSplit).
 */
export interface LandmarkBan {
  readonly kind: 'landmark';
  readonly moves: readonly { readonly fromCell: number; readonly toCell: number }[];
  readonly from: number;
  readonly to: number;
}

/** Any constraint of the weighted-split CBS on one agent. */
export type AgentBan = OccupancyBan | MoveBan | LateGoalBan | LandmarkBan;

/** One compiled landmark: the move keys (`fromCell * cellCount + toCell`) and the start window. */
export interface Landmark {
  readonly keys: ReadonlySet<number>;
  /** The cell every move enters (`isInto`) or every move leaves. */
  readonly cell: number;
  readonly isInto: boolean;
  readonly moves: readonly { readonly fromCell: number; readonly toCell: number }[];
  readonly from: number;
  readonly to: number;
}

/** Sorted, disjoint, non-touching half-open windows as two parallel arrays. */
export interface Windows {
  readonly from: readonly number[];
  readonly to: readonly number[];
}

/** Constraints of one agent compiled for the low-level search. */
export interface CompiledBans {
  /** Safe intervals of the cells that have occupancy bans; absent cells are safe over [0, ∞). */
  readonly safe: ReadonlyMap<number, Windows>;
  /** Forbidden start windows per move, keyed `fromCell * cellCount + toCell`. */
  readonly moveWindows: ReadonlyMap<number, Windows>;
  /** Earliest start of the final goal visit (0 = unconstrained). */
  readonly goalNotBefore: number;
  /** The grid's cell count, for move keys. */
  readonly cellCount: number;
  /**
   * The landmarks in time order; their windows never overlap (the high level adds a landmark only
   * then), so any plan meets them in this order and the low level passes them one by one.
   */
  readonly landmarks: readonly Landmark[];
}

/** The single safe interval of a cell without occupancy bans. */
export const ALWAYS_SAFE: Windows = { from: [0], to: [Infinity] };

/** Sorts and merges windows; touching windows merge too, because their union has no gap. */
export function mergeWindows(raw: readonly { from: number; to: number }[]): Windows {
  const sorted = raw.filter((w) => w.to > w.from).sort((a, b) => a.from - b.from || a.to - b.to);
  const from: number[] = [];
  const to: number[] = [];
  for (const w of sorted) {
    const last = to.length - 1;
    if (last >= 0 && w.from <= to[last]) to[last] = Math.max(to[last], w.to);
    else {
      from.push(w.from);
      to.push(w.to);
    }
  }
  return { from, to };
}

/** The complement of merged unsafe windows within [0, ∞): the safe intervals. */
export function complementWindows(unsafe: Windows): Windows {
  const from: number[] = [];
  const to: number[] = [];
  let cursor = 0;
  for (let k = 0; k < unsafe.from.length; k++) {
    if (unsafe.from[k] > cursor) {
      from.push(cursor);
      to.push(unsafe.from[k]);
    }
    cursor = Math.max(cursor, unsafe.to[k]);
  }
  if (cursor < Infinity) {
    from.push(cursor);
    to.push(Infinity);
  }
  return { from, to };
}

/** The earliest time ≥ t outside every window (windows merged and sorted, so one pass suffices). */
export function earliestOutside(windows: Windows | undefined, t: number): number {
  if (!windows) return t;
  let time = t;
  for (let k = 0; k < windows.from.length; k++) {
    if (windows.to[k] <= time) continue;
    if (windows.from[k] > time) break;
    time = windows.to[k];
  }
  return time;
}

/** Compiles one agent's constraints. */
export function compileBans(bans: readonly AgentBan[], cellCount: number): CompiledBans {
  const occupancy = new Map<number, { from: number; to: number }[]>();
  const moves = new Map<number, { from: number; to: number }[]>();
  let goalNotBefore = 0;
  const landmarks: Landmark[] = [];
  for (const ban of bans) {
    if (ban.kind === 'occupancy') {
      const list = occupancy.get(ban.cell) ?? [];
      list.push(ban);
      occupancy.set(ban.cell, list);
    } else if (ban.kind === 'move') {
      const key = ban.fromCell * cellCount + ban.toCell;
      const list = moves.get(key) ?? [];
      list.push(ban);
      moves.set(key, list);
    } else if (ban.kind === 'landmark') {
      const isInto = ban.moves.every((m) => m.toCell === ban.moves[0].toCell);
      const cell = isInto ? ban.moves[0].toCell : ban.moves[0].fromCell;
      if (ban.moves.length === 0 || (!isInto && !ban.moves.every((m) => m.fromCell === cell))) {
        throw new Error('a landmark lists moves into one cell or moves out of one cell');
      }
      landmarks.push({ keys: new Set(ban.moves.map((m) => m.fromCell * cellCount + m.toCell)), cell, isInto, moves: ban.moves, from: ban.from, to: ban.to });
    } else {
      goalNotBefore = Math.max(goalNotBefore, ban.notBefore);
    }
  }
  landmarks.sort((a, b) => a.from - b.from);
  for (let k = 1; k < landmarks.length; k++) {
    if (landmarks[k].from < landmarks[k - 1].to) throw new Error(`landmark windows overlap: [${landmarks[k - 1].from}, ${landmarks[k - 1].to}) and [${landmarks[k].from}, ${landmarks[k].to})`);
  }
  const safe = new Map<number, Windows>();
  for (const [cell, list] of occupancy) safe.set(cell, complementWindows(mergeWindows(list)));
  const moveWindows = new Map<number, Windows>();
  for (const [key, list] of moves) moveWindows.set(key, mergeWindows(list));
  return { safe, moveWindows, goalNotBefore, cellCount, landmarks };
}
