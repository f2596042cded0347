/**
 * The branching rule of the weighted-split CBS: from the earliest conflict, two constraint
 * sets, one per agent, in the spirit of continuous-time CBS (Andreychuk, Yakovlev, Surynek,
 * Atzmon, Stern, "Multi-agent pathfinding with continuous time", Artificial Intelligence 2022),
 * whose published unsafe-interval branching is not sound in general (Combrink, Roselli,
 * Fabian, "Sound and solution-complete CCBS", arXiv 2508.16410, 2025). The rule below is our
 * own and is proved sound for this model.
 *
 * Setting. F = forward time. Agent j (the `late` visit) starts the forward move m_j = p → c at
 * time s_j = t*, the first instant at which both agents occupy cell c; agent i (the `early`
 * visit) is in c at t*. Every time is an integer; every visit of a cell lasts ≥ F because the
 * move into or out of it takes F and occupies it throughout.
 *
 * Soundness means: every conflict-free joint plan satisfies at least one child's constraint.
 * It suffices that any plan violating BOTH constraints has i and j in c at a common instant.
 * Progress means: each agent's current plan violates its own new constraint, so each child's
 * low level must return a different plan; with integer times, finitely many constraints fit
 * under any cost bound, so best-first CBS terminates and its first conflict-free node is
 * optimal (node cost = sum of per-agent optima under the node's constraints, a lower bound).
 *
 * Case MOVE-MOVE: i is in c at t* during its own forward move m_i (into or out of c) started at
 * s_i, s_i ≤ t* < s_i + F. Child i: i may not start m_i in [s_i, s_j + F). Child j: j may not
 * start m_j in [s_j, s_i + F). Proof: if i starts m_i at a ∈ [s_i, s_j + F) and j starts m_j
 * at b ∈ [s_j, s_i + F), then a < s_j + F ≤ b + F and b < s_i + F ≤ a + F, so [a, a + F) and
 * [b, b + F) overlap, and both moves occupy c over them. Progress: s_i and s_j lie in the windows.
 *
 * Case MOVE-OCCUPANCY (applies to every conflict): let ℓ = the end of i's visit of c (> t*)
 * and δ = min(F, ℓ − t*) ≥ 1. Child j: j may not start m_j in [t*, t* + δ). Child i: i may
 * not occupy c during [t* + δ − 1, t* + F). Proof: m_j started at b ∈ [t*, t* + δ) occupies c
 * over [b, b + F) ⊇ [t* + δ − 1, t* + F), so i in c at any instant of its banned interval
 * meets j. Progress: j starts m_j at t*, and i is in c at t* + δ − 1 ∈ [t*, ℓ).
 *
 * Case MOVE-GOAL: i is in c from before t* forever (c is its goal, its final visit began ≤ t*).
 * Child j: j may not start m_j at any time ≥ t*. Child i: i's final visit of its goal must
 * begin at ≥ t* + 1. Proof: if i's final visit began at v ≤ t*, i is in c at every instant
 * ≥ v; a start of m_j at b ≥ t* puts j in c at b ≥ v. Progress: i's current final visit began
 * ≤ t*, and j starts m_j at t*. This cuts the long chain of one-move-time delays of j that
 * MOVE-OCCUPANCY would produce in front of a parked agent.
 *
 * Every case is sound on its own, so the high level may evaluate several cases and several
 * conflicts of a node and branch on whichever split raises the children's costs most
 * (a generalisation of choosing cardinal conflicts first, Boyarski et al., "ICBS: improved
 * conflict-based search algorithm for multi-agent pathfinding", IJCAI 2015).
 */
import type { OccupancyConflict } from './ccbs-conflict';
import type { AgentBan, LandmarkBan } from './sipp-constraints';

/** One child of a CBS split: the agent whose plan it constrains and the new constraints. */
export interface BranchChild {
  readonly agent: number;
  readonly bans: readonly AgentBan[];
}

/** Which case of the rule a split comes from (see the module comment). */
export type BranchCase = 'move-move' | 'move-occupancy' | 'move-goal';

/** A sound split of one conflict into two children. */
export interface BranchOption {
  readonly kind: BranchCase;
  readonly children: readonly [BranchChild, BranchChild];
}

/**
 * Every sound split of a conflict the rule offers; `forwardMs` is the forward move time F.
 * `neighbours(c)` lists the cells with a forward move into and out of c; when given, each move
 * ban covers every move into c (or, for a move out of c, every move out of c) in its window:
 * the proofs above only use that the banned move occupies c over [start, start + F), which holds
 * for any such move, so the wider bans stay sound and cut the detours that would dodge the ban by
 * entering or leaving c through another side at the same time (issue 15). Without it, as first
 * written, each ban names the one move of the conflict.
 */
export function branchOptions(conflict: OccupancyConflict, forwardMs: number, neighbours?: (cell: number) => readonly number[]): BranchOption[] {
  const F = forwardMs;
  const { time: t, cell: c, early: vi, late: vj } = conflict;
  const i = vi.agent;
  const j = vj.agent;
  /** Move bans on the moves into c (or out of c) over [from, to); `via` is the conflict's own other cell. */
  const moveBans = (isInto: boolean, via: number, from: number, to: number): AgentBan[] =>
    (neighbours ? neighbours(c) : [via]).map((n) => ({ kind: 'move' as const, fromCell: isInto ? n : c, toCell: isInto ? c : n, from, to }));
  const out: BranchOption[] = [];
  let mi: { isInto: boolean; via: number; start: number } | undefined;
  if (vi.inFrom >= 0 && t < vi.enter + F) mi = { isInto: true, via: vi.inFrom, start: vi.enter };
  else if (vi.outStart >= 0 && t >= vi.outStart) mi = { isInto: false, via: vi.outTo, start: vi.outStart };
  if (mi) {
    out.push({
      kind: 'move-move',
      children: [
        { agent: i, bans: moveBans(mi.isInto, mi.via, mi.start, t + F) },
        { agent: j, bans: moveBans(true, vj.inFrom, t, mi.start + F) },
      ],
    });
  } else if (vi.leave === Infinity) {
    // Child j here: no occupancy of c from t* on (with neighbours), or no move into c from t* on
    // (as first written). Either is sound: i is in c at every instant ≥ t* when its final visit
    // began at ≤ t*, and j's plan, entering c at t*, breaks both (progress).
    out.push({
      kind: 'move-goal',
      children: [
        { agent: i, bans: [{ kind: 'late-goal', notBefore: t + 1 }] },
        { agent: j, bans: neighbours ? [{ kind: 'occupancy', cell: c, from: t, to: Infinity }] : moveBans(true, vj.inFrom, t, Infinity) },
      ],
    });
  }
  const delta = Math.min(F, vi.leave - t);
  out.push({
    kind: 'move-occupancy',
    children: [
      { agent: i, bans: [{ kind: 'occupancy', cell: c, from: t + delta - 1, to: t + F }] },
      { agent: j, bans: moveBans(true, vj.inFrom, t, t + delta) },
    ],
  });
  return out;
}

/**
 * Disjoint splitting (Li, Harabor, Stuckey, Felner, Ma, Koenig, "Disjoint splitting for
 * multi-agent path finding with conflict-based search", ICAPS 2019; for continuous time as in
 * Andreychuk, Yakovlev, Boyarski, Stern, "Improving continuous-time conflict based search",
 * AAAI 2021): when one child's new constraint is a single move ban ¬P_x ("agent x starts none of
 * these moves in [from, to)"), the other child may also require P_x, the landmark "x starts one
 * of them in [from, to)". Sound: every plan satisfies ¬P_x or P_x; and a conflict-free plan with
 * P_x satisfies the other child's own constraint, because each proof in the module comment
 * derives exactly that constraint from x's move starting in that window (MOVE-MOVE: x = i, any
 * move into or out of c started in [s_i, t* + F) overlaps j's banned starts; MOVE-OCCUPANCY:
 * x = j, a move into c started in [t*, t* + δ) holds c over i's banned interval). So the two
 * children's plan sets are disjoint and together hold every plan of the parent: no plan is
 * explored twice, and x's later replans below the second child must keep the move.
 * Progress: x's current plan breaks ¬P_x, so it meets P_x, and the second child keeps it.
 *
 * Returns the landmark and which child (0 or 1) takes it, or null when neither child's constraint
 * is a single move window (MOVE-GOAL). The child of the move ban is preferred in offer order:
 * MOVE-MOVE puts i's landmark into j's child, MOVE-OCCUPANCY j's landmark into i's child.
 */
export function disjointLandmark(children: readonly [BranchChild, BranchChild]): { agent: number; ban: LandmarkBan; into: 0 | 1 } | null {
  for (const x of [0, 1] as const) {
    const bans = children[x].bans;
    if (bans.length === 0 || !bans.every((b) => b.kind === 'move')) continue;
    const first = bans[0] as Extract<AgentBan, { kind: 'move' }>;
    const moves = bans as readonly Extract<AgentBan, { kind: 'move' }>[];
    if (!moves.every((b) => b.from === first.from && b.to === first.to)) continue;
    return {
      agent: children[x].agent,
      ban: { kind: 'landmark', moves: moves.map(({ fromCell, toCell }) => ({ fromCell, toCell })), from: first.from, to: first.to },
      into: x === 0 ? 1 : 0,
    };
  }
  return null;
}
