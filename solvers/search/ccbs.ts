/**
 * The high level of the weighted-split solver: Conflict-Based Search (Sharon, Stern, Felner,
 * Sturtevant, "Conflict-based search for optimal multi-agent pathfinding", Artificial
 * Intelligence 2015) over time-interval constraints, as in continuous-time CBS (Andreychuk
 * et al., Artificial Intelligence 2022), with the sound splits of ccbs-branch.ts and the SIPP
 * low level of sipp.ts. Best-first on sum of arrival times; ties prefer fewer conflicting
 * agent pairs, then the older node, so runs are deterministic.
 *
 * Split choice: for the first few conflicts of a node (exact mode: and the earliest conflict of
 * every other conflicting agent pair; bounded mode: only its earliest conflict), every sound
 * split is priced by replanning both children, and the node branches on the split whose cheaper
 * child costs most (then whose dearer child costs most), as ICBS prefers cardinal conflicts
 * (Boyarski et al., IJCAI 2015); bounded mode takes the cheapest instead (BestSplit). Any sound
 * split keeps optimality and the bound, so this choice only affects speed; the children's plans
 * are kept, so no low-level search is repeated.
 *
 * Exact mode, further (issue 15; each keeps the first conflict-free node popped optimal):
 * - Best-first on f, a lower bound on every plan the node admits: f = cost + h with h from
 *   the node's priced splits and pairwise sub-searches (pricedHeuristic; admissible, argued in
 *   ccbs-heuristic.ts and there), computed when the node is first popped (a node whose f rises
 *   goes back into OPEN), and at least the parent's f (the child admits fewer plans).
 * - Bypass (ICBS): an equally cheap child plan that meets fewer agents replaces the node's plan
 *   before branching (the node's constraints, cost and admitted plans do not change).
 * - Replans and pair bounds are memoised across the tree by the agents' latest constraining
 *   nodes, since a plan depends only on its agent's bans (SIPP is deterministic).
 * - Disjoint splitting (ccbs-branch.ts, disjointLandmark): where the chosen split allows it, one
 *   child also gets the other agent's landmark, so the children share no plan; the landmark
 *   joins that agent's bans (and its owner node) without replanning it, as its plan meets it.
 *
 * Bounded-suboptimal mode (`suboptimality` w > 1): the EECBS high level (Li, Ruml, Koenig,
 * "EECBS: A bounded-suboptimal search for multi-agent path finding", AAAI 2021;
 * eecbs-lists.ts, eecbs-estimate.ts) over the focal SIPP low level of ECBS (Barer, Sharon,
 * Stern, Felner, SoCS 2014; focal-sipp.ts): each agent's plan costs at most w' × lb_i with
 * w' = min(w, LOW_LEVEL_FACTOR_CAP) (or its flex ceiling, below), lb_i a proven lower bound on
 * its optimal arrival under its constraints (kept at least its parent's, as constraints only
 * grow), and the node's lower bound is Σ lb_i (or more: pathmax and the root pair bound, below).
 * Of CLEANUP (by lower bound), OPEN (by cost + learnt cost-to-go) and FOCAL (the fewest
 * conflicting agent pairs among the nearly best of OPEN), the node expanded is FOCAL's top if it
 * costs at most w × LB (LB = the least open lower bound), else OPEN's top if it does, else
 * CLEANUP's top, which raises LB.
 * Soundness: the splits are sound, so some open node admits an optimal plan, whose cost is at
 * least that node's Σ lb_i, so LB never exceeds the optimum; a conflict-free node is returned
 * only when its cost ≤ w × LB; one that costs more (only CLEANUP's top can be chosen so) gets
 * optimal plans for its agents (tighten: lb_i = cost_i) and goes back to the lists.
 * Also in this mode:
 * - bypass as in exact mode (a child plan of the same cost meeting fewer agents replaces the
 *   node's; the node's bans, cost and lower bounds do not change);
 * - root repair: after the root's plans are made one by one (each avoiding those before it),
 *   ROOT_REPAIR_ROUNDS times every agent still in conflict is replanned against all other plans
 *   and keeps the new plan if it meets fewer agents (each plan stays within w of its own bound);
 * - flex, after flex distribution (Chan, Li, Gange, Harabor, Stuckey, Koenig, "Flex distribution
 *   for bounded-suboptimal multi-agent path finding", AAAI 2022; cited from memory): the node's
 *   slack, w × (its lower bound) − (its cost), is shared equally among its conflicting agent
 *   pairs (our own rule), and a child's low level may also put into FOCAL plans costing up to the
 *   agent's current cost plus one share, when that exceeds w × its own f_min, so an agent with a
 *   short route can wait long enough for another to pass. The bounds are unchanged: the agent's
 *   lb_i is still its f_min, and a node is returned only when its cost ≤ w × LB. Handing a child
 *   the whole slack instead spent it on the first conflicts (each replanned agent took the plan
 *   with the fewest overlaps however dear) and left none for the last ones.
 * - root pair bound (rootPairBound): the root's lower bound is lifted by two-agent sub-searches
 *   of the pairs that meet in the root's plans or in the agents' own optimal plans, combined by a
 *   fractional matching, and every node keeps at least its parent's bound (pathmax);
 * - detour trim (trimDetours): a node selected with little slack left gets, agent by agent,
 *   the cheapest plan that meets no other agent, where that is cheaper than its own;
 * - splits priced cheap first (BestSplit): the split whose children cost least is taken.
 * Measured on random-32-32-20 at w = 1.2 (issue 15, CPU time, the 5 even scenarios): with the
 * ECBS high level alone, 2 of 5 at 80 agents within 30 s; with EECBS, bypass, root repair and
 * the soft intervals of focal-sipp.ts, 4 of 5; with the whole slack as flex, the same 4 in 1–2 s
 * each; with the shared flex above 5 of 5 (1–2 s each), at 90 agents 4 of 5 and at 100 1 of 5;
 * with the root pair bound too, 5 of 5 at 90 within 3 s each, 100 still out of reach (60 s):
 * the search cut conflicts down to a handful while spending the slack, then stalled with its
 * FOCAL nodes at w × LB and LB pinned at the root's bound. With the detour trim, the split
 * priced cheap first and the wider root pair bound, 5 of 5 at 100 within 10 s each.
 */
import type { Grid } from '../grid/grid';
import { branchOptions, disjointLandmark, type BranchChild } from './ccbs-branch';
import { cellVisits, conflictPartners, findConflicts, visitsByCell, type CellVisit, type OccupancyConflict } from './ccbs-conflict';
import { compileBans, type AgentBan, type LandmarkBan } from './sipp-constraints';
import { forwardTable, sippSearch, type SippPlan } from './sipp';
import { SippHeap } from './sipp-heap';
import { EecbsLists, type EecbsNode } from './eecbs-lists';
import { CostToGoEstimate } from './eecbs-estimate';
import { boundOf } from './suboptimality';
import { disjunctiveCover, type SplitDisjunction } from './ccbs-heuristic';
import { focalSippSearch, occupancyIndex, type OccupancyIndex } from './focal-sipp';
import { fractionalMatchingBound, type PairBound } from './fractional-matching';

/** One agent as the search sees it. */
export interface CcbsAgent {
  readonly start: number;
  readonly goal: number;
  /** Heading indices allowed at time 0. */
  readonly startHeadings: readonly number[];
  /** Cost-to-go per packed (cell, heading) state towards this agent's goal. */
  readonly heuristic: Float64Array;
}

/** Input of one search. */
export interface CcbsQuery {
  readonly grid: Grid;
  readonly agents: readonly CcbsAgent[];
  readonly forwardMs: number;
  readonly quarterTurnMs: number;
  /** Maximum number of high-level nodes to expand. */
  readonly nodeLimit: number;
  /** True when the search must stop (time limit or abort); polled often. */
  readonly shouldStop: () => boolean;
  /** Suboptimality factor w (default 1 = optimal); w > 1 runs the bounded search of the file comment. */
  readonly suboptimality?: number;
  /** Bans each agent starts with (the pair sub-searches of the heuristic); none by default. */
  readonly initialBans?: readonly (readonly AgentBan[])[];
  /** Exact mode: whether nodes use the pairwise sub-search bound (off inside those sub-searches). */
  readonly isPairBound?: boolean;
  /** Exact mode: disjoint splitting (ccbs-branch.ts, disjointLandmark); on unless false. */
  readonly disjointSplitting?: boolean;
}

/** How a search ended. */
export type CcbsStatus = 'solved' | 'infeasible' | 'stopped' | 'node-limit';

/** The outcome of one search. */
export interface CcbsOutcome {
  readonly status: CcbsStatus;
  /** One plan per agent when solved. */
  readonly plans: readonly SippPlan[] | null;
  /** Sum of arrival times when solved. */
  readonly soc: number | null;
  /** A proven lower bound on the optimum: exact mode the least open f (= soc when solved); bounded mode LB, the least open f_lb (soc ≤ w × it when solved). */
  readonly lowerBound: number | null;
  readonly generated: number;
  readonly expanded: number;
  readonly lowLevelExpansions: number;
  /** Exact mode: expansions whose split was made disjoint by a landmark. */
  readonly disjointSplits: number;
  /** Bounded mode: detour trims that lowered a node's cost (trimDetours; a node may be trimmed again after a bypass). */
  readonly detourTrims: number;
}

interface CtNode {
  readonly id: number;
  readonly parent: CtNode | null;
  /** The agent this node's new bans apply to (-1 at the root). */
  readonly agent: number;
  readonly bans: readonly AgentBan[];
  /** Disjoint splitting: the agent given a landmark by this node (-1: none), its plan unchanged. */
  readonly markAgent: number;
  readonly mark: AgentBan | null;
  /** Per agent its plan; bypass may swap one for an equally cheap plan with fewer conflicts before expansion (tighten: for an optimal one; the detour trim: for cheaper ones, lowering cost). */
  plans: readonly SippPlan[];
  visits: readonly (readonly CellVisit[])[];
  cost: number;
  conflicts: readonly OccupancyConflict[];
  conflictingPairs: number;
  /** Per agent a proven lower bound on its optimal arrival under the node's constraints (= its plan's cost when exact). */
  lbs: readonly number[];
  /** Σ lbs: a lower bound on the optimum of the plans the node admits. */
  lb: number;
  /** Per agent the id of the latest node on the path from the root whose bans apply to it (-1: none). */
  readonly owner: Int32Array;
  /** Exact mode: a lower bound on every plan the node admits (cost + heuristic, at least the parent's f). */
  f: number;
  /** Exact mode: the split chosen when the node was first popped (its heuristic is then in f); null before and after expansion. */
  split: PricedChild[] | null;
}

/** A node's figures in the EECBS lists (bounded mode). */
interface EesEntry extends EecbsNode {
  readonly id: number;
}

/** One child of a priced split, with its replanned agent's plan (null: none exists) and that plan's lower bound. */
interface PricedChild {
  readonly child: BranchChild;
  readonly plan: SippPlan | null;
  readonly lb: number;
}

/** How many of a node's earliest conflicts are priced when choosing the split. */
const CANDIDATE_CONFLICTS = 4;

/** At most this many bypasses per node before it branches. */
const BYPASS_ROUNDS = 8;

/** Node expansions of one pairwise sub-search before its lower bound is taken instead of its optimum. */
const PAIR_NODE_LIMIT = 16;

/**
 * At most this many landmarks per agent: each is a layer of the low level's state space (its
 * best-node table grows with their count), and a split without one stays sound.
 */
const LANDMARKS_PER_AGENT = 8;

/**
 * Bounded mode: the focal low level's own factor is min(w, this). Sound for any value ≥ 1: lb_i is
 * still f_min and the high level checks cost ≤ w × LB. A wide low-level FOCAL (w = 1.5) searched
 * far for plans with fewer overlaps: measured (60 s CPU) warehouse-10-20-10-2-1 even-4 × 160 at
 * w = 1.5 timed out with the low level at 1.5 and was solved in 18 s at 1.2 (19 s at 1.1), and
 * room-32-32-4 × 80 at w = 1.5 went from a timeout to 5 of 5 within 16 s.
 */
const LOW_LEVEL_FACTOR_CAP = 1.2;

/** Bounded mode: rounds of replanning the root's conflicting agents against all other plans. */
const ROOT_REPAIR_ROUNDS = 2;

/**
 * Bounded mode: a node selected with less than this share of its slack w × LB − LB left gets its
 * detours trimmed (trimDetours; n optimal replans, so only where slack is scarce).
 */
const TRIM_SLACK_SHARE = 0.03;

/** Replans kept in the exact search's memo before it is emptied (bounds its memory). */
const REPLAN_MEMO_LIMIT = 200_000;

/** Runs CBS with interval constraints; optimal in sum of arrival times when it returns `solved`. */
export function ccbsSearch(q: CcbsQuery): CcbsOutcome {
  const cellCount = q.grid.width * q.grid.height;
  let generated = 0;
  let expanded = 0;
  let lowLevelExpansions = 0;
  let disjointSplits = 0;
  let detourTrims = 0;
  let isStopped = false;

  const w = q.suboptimality ?? 1;
  /** The cells with a forward move into and out of each cell (the grid is 4-connected, moves go both ways). */
  const fwd = forwardTable(q.grid);
  const around: number[][] = [];
  const neighbours = (cell: number): readonly number[] => {
    let list = around[cell];
    if (list === undefined) {
      list = [];
      for (let h = 0; h < 4; h++) if (fwd[cell * 4 + h] >= 0) list.push(fwd[cell * 4 + h]);
      around[cell] = list;
    }
    return list;
  };
  /** Bounded mode: the node's proven lower bound used for its flex (set by searchBounded). */
  let flexBound = (node: CtNode): number => node.lb;
  /** The lower bound the last `plan` call proved (its plan's cost when exact). */
  let lastLb = 0;
  const plan = (agent: number, bans: readonly AgentBan[], occupancy?: OccupancyIndex, ceiling?: number): SippPlan | null => {
    const a = q.agents[agent];
    if (occupancy !== undefined) {
      const focal = focalSippSearch({
        grid: q.grid, start: a.start, goal: a.goal, startHeadings: a.startHeadings, forwardMs: q.forwardMs,
        quarterTurnMs: q.quarterTurnMs, bans: compileBans(bans, cellCount), heuristic: a.heuristic, shouldStop: q.shouldStop,
        w: Math.min(w, LOW_LEVEL_FACTOR_CAP), agent, occupancy, ceiling,
      });
      lowLevelExpansions += focal.expansions;
      if (focal.isStopped) isStopped = true;
      lastLb = focal.lowerBound;
      return focal.plan;
    }
    const out = sippSearch({
      grid: q.grid,
      start: a.start,
      goal: a.goal,
      startHeadings: a.startHeadings,
      forwardMs: q.forwardMs,
      quarterTurnMs: q.quarterTurnMs,
      bans: compileBans(bans, cellCount),
      heuristic: a.heuristic,
      shouldStop: q.shouldStop,
    });
    lowLevelExpansions += out.expansions;
    if (out.isStopped) isStopped = true;
    lastLb = out.plan?.cost ?? 0;
    return out.plan;
  };

  const makeNode = (parent: CtNode | null, agent: number, bans: readonly AgentBan[], plans: readonly SippPlan[],
    visits: readonly (readonly CellVisit[])[], lbs: readonly number[] = plans.map((p) => p.cost),
    landmark: { agent: number; ban: AgentBan } | null = null): CtNode => {
    const { conflicts, conflictingPairs } = findConflicts(visits, CANDIDATE_CONFLICTS, w === 1);
    const cost = plans.reduce((s, p) => s + p.cost, 0);
    const lb = lbs.reduce((s, v) => s + v, 0);
    const id = generated++;
    const owner = parent ? parent.owner.slice() : new Int32Array(q.agents.length).fill(-1);
    if (agent >= 0) owner[agent] = id;
    if (landmark) owner[landmark.agent] = id;
    // Pathmax: the child admits a subset of the parent's plans, so the parent's f bounds it too.
    const f = Math.max(cost, parent ? parent.f : 0);
    return {
      id, parent, agent, bans, markAgent: landmark ? landmark.agent : -1, mark: landmark ? landmark.ban : null,
      plans, visits, cost, conflicts, conflictingPairs, lbs, lb, owner, f, split: null,
    };
  };

  // Sum of single-agent cost-to-go: the bound to report if the root itself is cut short.
  const soloOptima = q.agents.map((a) => Math.min(...a.startHeadings.map((h) => a.heuristic[a.start * 4 + h])));
  const trivialBound = soloOptima.reduce((s, v) => s + v, 0);
  const rootPlans: SippPlan[] = [];
  const rootLbs: number[] = [];
  // Bounded mode: each root plan avoids the plans made before it (focal order only).
  const rootOccupancy = w > 1 ? new Map<number, CellVisit[]>() : undefined;
  for (let a = 0; a < q.agents.length; a++) {
    const p = plan(a, q.initialBans?.[a] ?? [], rootOccupancy);
    if (!p) return finish(isStopped ? 'stopped' : 'infeasible', null, isStopped ? trivialBound : null);
    rootPlans.push(p);
    rootLbs.push(lastLb);
    if (rootOccupancy !== undefined) {
      for (const v of cellVisits(a, q.agents[a].start, p, q.forwardMs)) rootOccupancy.set(v.cell, [...(rootOccupancy.get(v.cell) ?? []), v]);
    }
  }
  const rootVisits = rootPlans.map((p, a) => cellVisits(a, q.agents[a].start, p, q.forwardMs));
  if (w > 1) {
    // Repair rounds: each agent still in conflict is replanned against every other agent's plan
    // and keeps the new plan when it meets fewer agents (each plan stays within w of its bound).
    for (let round = 0; round < ROOT_REPAIR_ROUNDS; round++) {
      for (let a = 0; a < q.agents.length; a++) {
        const byCell = visitsByCell(rootVisits);
        if (conflictPartners(byCell, a, rootVisits[a]).partners === 0) continue;
        const p = plan(a, q.initialBans?.[a] ?? [], occupancyIndex(rootVisits));
        if (!p) return finish(isStopped ? 'stopped' : 'infeasible', null, isStopped ? trivialBound : null);
        const list = cellVisits(a, q.agents[a].start, p, q.forwardMs);
        if (conflictPartners(byCell, a, list).partners >= conflictPartners(byCell, a, rootVisits[a]).partners) continue;
        rootPlans[a] = p;
        rootLbs[a] = Math.max(rootLbs[a], lastLb);
        rootVisits[a] = list;
      }
    }
  }
  const root = makeNode(null, -1, [], rootPlans, rootVisits, rootLbs);

  const nodes: CtNode[] = [root];
  /** Exact mode: child replans by agent, owner node and new bans (see priceSplits). */
  const replans = new Map<string, SippPlan | null>();
  /** Exact mode: pair bounds by agents and owners (see pairWeight). */
  const pairs = new Map<string, number>();
  if ((q.suboptimality ?? 1) > 1) return searchBounded(q.suboptimality as number);
  const open = new SippHeap((x, y) => {
    const a = nodes[x];
    const b = nodes[y];
    return a.f < b.f || (a.f === b.f && (a.conflictingPairs < b.conflictingPairs || (a.conflictingPairs === b.conflictingPairs && a.id < b.id)));
  });
  open.push(root.id);

  while (open.size > 0) {
    const top = nodes[open.peek() as number];
    if (top.conflicts.length === 0) return finish('solved', top, top.cost);
    if (q.shouldStop()) return finish('stopped', null, top.f);
    if (expanded >= q.nodeLimit) return finish('node-limit', null, top.f);
    open.pop();
    if (top.split === null) {
      // First pop: price the splits, choose one and raise f by the admissible heuristic; a node
      // whose f rises goes back into OPEN and is expanded only when it is the least again.
      let priced = priceSplits(top);
      if (isStopped) return finish('stopped', null, top.f);
      // Bypass (Boyarski et al., IJCAI 2015): a child plan that costs its agent no more than the
      // node's plan already satisfies the node's own bans, so adopting it leaves the node's
      // constraints, cost and admitted plans unchanged; it is taken when it meets fewer other agents.
      for (let round = 0; round < BYPASS_ROUNDS && top.conflicts.length > 0; round++) {
        if (!bypass(top, priced.options)) break;
        if (top.conflicts.length === 0) break;
        priced = priceSplits(top);
        if (isStopped) return finish('stopped', null, top.f);
      }
      if (top.conflicts.length === 0) {
        open.push(top.id);
        continue;
      }
      const h = pricedHeuristic(top, priced.options);
      if (h === Infinity) continue; // some split has no feasible child: the node admits no plan
      top.split = priced.best;
      if (top.cost + h > top.f) {
        top.f = top.cost + h;
        open.push(top.id);
        continue;
      }
    }
    expanded++;
    const split = top.split;
    top.split = null;
    const landmark = q.disjointSplitting === false ? null : landmarkFor(top, split);
    if (landmark) disjointSplits++;
    for (const [index, { child, plan: p }] of split.entries()) {
      if (!p) continue;
      open.push(addChild(top, child, p, undefined, landmark?.into === index ? landmark : null).id);
    }
  }
  return finish('infeasible', null, null);

  /** Makes and registers the child of `top` whose agent takes plan `p` under the child's bans. */
  function addChild(top: CtNode, child: BranchChild, p: SippPlan, lbs?: readonly number[],
    landmark: { agent: number; ban: AgentBan } | null = null): CtNode {
    const plans = top.plans.slice();
    plans[child.agent] = p;
    const visits = top.visits.slice();
    visits[child.agent] = cellVisits(child.agent, q.agents[child.agent].start, p, q.forwardMs);
    const node = makeNode(top, child.agent, child.bans, plans, visits, lbs, landmark);
    nodes.push(node);
    return node;
  }

  /**
   * The landmark disjoint splitting adds to one child of the split, or null: none when the split
   * offers none, when its window overlaps one the agent already has (the low level meets
   * landmarks in time order, so it needs them disjoint; the plain split stays sound), when the
   * agent has LANDMARKS_PER_AGENT already, or when the agent's current plan does not meet it
   * (never expected: progress says it does).
   */
  function landmarkFor(node: CtNode, split: readonly PricedChild[]): { agent: number; ban: LandmarkBan; into: 0 | 1 } | null {
    if (split.length !== 2) return null;
    const offer = disjointLandmark([split[0].child, split[1].child]);
    if (offer === null) return null;
    const { agent, ban } = offer;
    let held = 0;
    for (const old of [...bansOf(node, agent), ...(q.initialBans?.[agent] ?? [])]) {
      if (old.kind !== 'landmark') continue;
      if (old.from < ban.to && ban.from < old.to) return null;
      if (++held >= LANDMARKS_PER_AGENT) return null;
    }
    const keeps = node.plans[agent].steps.some((s) => s.kind === 'forward' && s.start >= ban.from && s.start < ban.to
      && ban.moves.some((m) => m.fromCell === s.from && m.toCell === s.to));
    return keeps ? offer : null;
  }

  /** The bounded loop: EECBS's choice among CLEANUP, OPEN and FOCAL (file comment); children as in the exact loop. */
  function searchBounded(w: number): CcbsOutcome {
    const entries: EesEntry[] = [];
    const estimate = new CostToGoEstimate();
    flexBound = (node) => entries[node.id]?.fLb ?? node.lb;
    const rootBound = rootPairBound();
    if (isStopped) return finish('stopped', null, trivialBound);
    if (rootBound === Infinity) return finish('infeasible', null, null);
    const lists = new EecbsLists<EesEntry>(w, (e) => nodes[e.id].conflictingPairs);
    const pushOpen = (node: CtNode): void => {
      const e = entries[node.id] ?? (entries[node.id] = { id: node.id, g: 0, fLb: 0, fHat: 0, version: 0, isClosed: false });
      e.g = node.cost;
      // Pathmax: a node admits a subset of its parent's plans, so the parent's bound holds for it too.
      e.fLb = Math.max(node.lb, e.fLb, node.parent ? entries[node.parent.id].fLb : rootBound);
      e.fHat = node.cost + estimate.estimate(Math.max(0, node.lb - node.cost), node.conflictingPairs);
      lists.push(e);
    };
    pushOpen(root);
    for (;;) {
      if (q.shouldStop()) return finish('stopped', null, lists.scanLowerBound());
      if (expanded >= q.nodeLimit) return finish('node-limit', null, lists.scanLowerBound());
      const pick = lists.select();
      if (pick === null) return finish('infeasible', null, null);
      const top = nodes[pick.node.id];
      if (boundOf(pick.lowerBound, w) - top.cost < TRIM_SLACK_SHARE * (boundOf(pick.lowerBound, w) - pick.lowerBound)) {
        trimDetours(top);
        if (isStopped) return finish('stopped', null, Math.min(entries[top.id].fLb, lists.scanLowerBound()));
      }
      if (top.conflicts.length === 0) {
        if (top.cost <= boundOf(pick.lowerBound, w)) return finish('solved', top, pick.lowerBound);
        tighten(top);
        if (isStopped) return finish('stopped', null, Math.min(entries[top.id].fLb, lists.scanLowerBound()));
        pushOpen(top);
        continue;
      }
      expanded++;
      let choice = chooseSplit(top);
      if (isStopped) return finish('stopped', null, Math.min(entries[top.id].fLb, lists.scanLowerBound()));
      for (let round = 0; round < BYPASS_ROUNDS && top.conflicts.length > 0; round++) {
        if (!bypass(top, choice.options)) break;
        if (top.conflicts.length === 0) break;
        choice = chooseSplit(top);
        if (isStopped) return finish('stopped', null, Math.min(entries[top.id].fLb, lists.scanLowerBound()));
      }
      if (top.conflicts.length === 0) {
        pushOpen(top);
        continue;
      }
      const children: CtNode[] = [];
      for (const { child, plan: p, lb } of choice.best) {
        if (!p) continue;
        const lbs = top.lbs.slice();
        lbs[child.agent] = Math.max(lbs[child.agent], lb);
        children.push(addChild(top, child, p, lbs));
      }
      if (children.length > 0) {
        const f = (n: CtNode): number => Math.max(n.cost, n.lb);
        let best = children[0];
        for (const c of children) if (c.conflictingPairs < best.conflictingPairs || (c.conflictingPairs === best.conflictingPairs && f(c) < f(best))) best = c;
        estimate.learn(f(top), top.conflictingPairs, f(best), best.conflictingPairs);
      }
      for (const c of children) pushOpen(c);
    }
  }

  /**
   * Bounded mode, a node near its bound (or above it: a CLEANUP pick, which the trim may bring
   * within it): each agent whose plan costs more than its lower bound (largest excess first) is
   * replanned optimally under the node's bans with every other agent's current visits as
   * occupancy bans, and takes that plan when it is cheaper. Such a plan meets
   * no other agent, so no conflict is added; the node's bans, lower bounds and admitted plans do
   * not change, only its cost falls (a bypass that lowers cost). Detours taken to dodge plans
   * that have since moved are so given back, and the slack they free pays for the last conflicts.
   */
  function trimDetours(node: CtNode): void {
    const plans = node.plans.slice();
    const visits = node.visits.slice();
    const excess = (a: number): number => plans[a].cost - node.lbs[a];
    const order = [...plans.keys()].filter((a) => excess(a) > 0).sort((x, y) => excess(y) - excess(x) || x - y);
    let isChanged = false;
    for (const a of order) {
      const others: AgentBan[] = [];
      for (let b = 0; b < visits.length; b++) {
        if (b === a) continue;
        for (const v of visits[b]) others.push({ kind: 'occupancy', cell: v.cell, from: v.enter, to: v.leave });
      }
      const p = plan(a, [...bansOf(node, a), ...(q.initialBans?.[a] ?? []), ...others]);
      if (isStopped) return;
      if (p === null || p.cost >= plans[a].cost) continue;
      plans[a] = p;
      visits[a] = cellVisits(a, q.agents[a].start, p, q.forwardMs);
      isChanged = true;
    }
    if (!isChanged) return;
    detourTrims++;
    const found = findConflicts(visits, CANDIDATE_CONFLICTS, false);
    node.plans = plans;
    node.visits = visits;
    node.conflicts = found.conflicts;
    node.conflictingPairs = found.conflictingPairs;
    node.cost = plans.reduce((s, p) => s + p.cost, 0);
  }

  /**
   * A conflict-free node whose cost exceeds w × LB (only CLEANUP's top is chosen so): every agent
   * above its lower bound gets an optimal plan under the node's bans, so its lower bound becomes
   * its cost; the node's cost, bound and conflicts are recomputed.
   */
  function tighten(node: CtNode): void {
    const lbs = node.lbs.slice();
    const plans = node.plans.slice();
    const visits = node.visits.slice();
    for (let a = 0; a < q.agents.length; a++) {
      if (plans[a].cost <= lbs[a]) continue;
      const p = plan(a, [...bansOf(node, a), ...(q.initialBans?.[a] ?? [])]);
      if (isStopped) return;
      if (p === null) throw new Error(`agent ${a} lost its plan at node ${node.id}`);
      lbs[a] = p.cost;
      if (p.cost !== plans[a].cost) {
        plans[a] = p;
        visits[a] = cellVisits(a, q.agents[a].start, p, q.forwardMs);
      }
    }
    const found = findConflicts(visits, CANDIDATE_CONFLICTS, false);
    node.plans = plans;
    node.visits = visits;
    node.conflicts = found.conflicts;
    node.conflictingPairs = found.conflictingPairs;
    node.lbs = lbs;
    node.lb = lbs.reduce((s, v) => s + v, 0);
    node.cost = plans.reduce((s, p) => s + p.cost, 0);
  }

  /**
   * Exact mode: prices every sound split of the node's candidate conflicts (both children
   * replanned) and picks the one to branch on (as chooseSplit). Replans are memoised across the
   * whole tree: a child's plan depends only on its agent's bans, which are those of the latest
   * node that constrained the agent (`owner`) plus the child's own, and SIPP is deterministic.
   */
  function priceSplits(node: CtNode): { best: PricedChild[]; options: PricedChild[][] } {
    const options: PricedChild[][] = [];
    const best = new BestSplit<PricedChild>();
    for (const conflict of node.conflicts) {
      for (const option of branchOptions(conflict, q.forwardMs, neighbours)) {
        const priced = option.children.map((child): PricedChild => {
          const key = `${child.agent}|${node.owner[child.agent]}|${banKey(child.bans)}`;
          let p = replans.get(key);
          if (p === undefined) {
            p = plan(child.agent, [...bansOf(node, child.agent), ...(q.initialBans?.[child.agent] ?? []), ...child.bans]);
            if (isStopped) return { child, plan: null, lb: 0 };
            if (replans.size >= REPLAN_MEMO_LIMIT) replans.clear();
            replans.set(key, p);
          }
          return { child, plan: p, lb: p?.cost ?? Infinity };
        });
        if (isStopped) return { best: [], options: [] };
        options.push(priced);
        best.offer(node, priced);
      }
    }
    return { best: best.split, options };
  }

  /** Adopts the first equally cheap child plan that meets fewer agents (then fewer visits); whether one was found. */
  function bypass(node: CtNode, options: readonly PricedChild[][]): boolean {
    const byCell = visitsByCell(node.visits);
    const current = new Map<number, { partners: number; overlaps: number }>();
    for (const priced of options) {
      for (const { child, plan: p } of priced) {
        const a = child.agent;
        if (!p || p.cost !== node.plans[a].cost) continue;
        let now = current.get(a);
        if (now === undefined) {
          now = conflictPartners(byCell, a, node.visits[a]);
          current.set(a, now);
        }
        const list = cellVisits(a, q.agents[a].start, p, q.forwardMs);
        const next = conflictPartners(byCell, a, list);
        if (next.partners > now.partners || (next.partners === now.partners && next.overlaps >= now.overlaps)) continue;
        const plans = node.plans.slice();
        plans[a] = p;
        const visits = node.visits.slice();
        visits[a] = list;
        const found = findConflicts(visits, CANDIDATE_CONFLICTS, w === 1);
        node.plans = plans;
        node.visits = visits;
        node.conflicts = found.conflicts;
        node.conflictingPairs = found.conflictingPairs;
        return true;
      }
    }
    return false;
  }

  /** The admissible heuristic of a node from its priced splits (ccbs-heuristic.ts). */
  function pricedHeuristic(node: CtNode, options: readonly PricedChild[][]): number {
    const splits: SplitDisjunction[] = options.map(([ci, cj]) => ({
      i: ci.child.agent,
      di: ci.plan ? ci.plan.cost - node.plans[ci.child.agent].cost : Infinity,
      j: cj.child.agent,
      dj: cj.plan ? cj.plan.cost - node.plans[cj.child.agent].cost : Infinity,
    }));
    const h = disjunctiveCover(q.agents.length, splits);
    if (h === Infinity || q.isPairBound === false) return h;
    // Pairwise bound, as the weighted dependency graph of Li, Felner, Boyarski, Ma, Koenig,
    // "Improved heuristics for multi-agent path finding with conflict-based search", IJCAI 2019:
    // the plans any conflict-free plan of the node gives agents i and j form a conflict-free pair
    // plan under their bans, so x_i + x_j ≥ (optimum of that two-agent problem) − c_i − c_j =: w_ij,
    // and a greedy matching of those weights bounds Σ x as in ccbs-heuristic.ts.
    const n = q.agents.length;
    const weights = new Map<number, number>();
    for (const s of splits) {
      const key = Math.min(s.i, s.j) * n + Math.max(s.i, s.j);
      if (weights.has(key)) continue;
      const wij = pairWeight(node, Math.min(s.i, s.j), Math.max(s.i, s.j));
      if (isStopped) return 0;
      if (wij === Infinity) return Infinity;
      weights.set(key, Math.max(wij, Math.min(s.di, s.dj)));
    }
    return Math.max(h, greedyMatching(n, [...weights].map(([key, wt]) => [Math.floor(key / n), key % n, wt])));
  }

  /** The pair bound w_ij of pricedHeuristic: a two-agent exact search under the node's bans, cut at PAIR_NODE_LIMIT (then its lower bound); memoised by the agents' owners. */
  function pairWeight(node: CtNode, i: number, j: number): number {
    const key = `${i}|${node.owner[i]}|${j}|${node.owner[j]}`;
    const hit = pairs.get(key);
    if (hit !== undefined) return hit;
    const out = ccbsSearch({
      grid: q.grid,
      agents: [q.agents[i], q.agents[j]],
      forwardMs: q.forwardMs,
      quarterTurnMs: q.quarterTurnMs,
      nodeLimit: PAIR_NODE_LIMIT,
      shouldStop: q.shouldStop,
      initialBans: [[...bansOf(node, i), ...(q.initialBans?.[i] ?? [])], [...bansOf(node, j), ...(q.initialBans?.[j] ?? [])]],
      isPairBound: false,
      disjointSplitting: q.disjointSplitting,
    });
    lowLevelExpansions += out.lowLevelExpansions;
    if (out.status === 'stopped') {
      isStopped = true;
      return 0;
    }
    const bound = out.status === 'infeasible' ? Infinity : (out.lowerBound as number) - node.plans[i].cost - node.plans[j].cost;
    const wij = Math.max(0, bound);
    pairs.set(key, wij);
    return wij;
  }

  /** Bounded mode: the slack w × (node's lower bound) − (node's cost), shared equally among its conflicting agent pairs. */
  function flexShare(node: CtNode): number {
    return Math.floor(Math.max(0, boundOf(flexBound(node), w) - node.cost) / Math.max(1, node.conflictingPairs));
  }

  /**
   * Bounded mode: a lower bound on the optimum from agent pairs, as the pairwise bound of exact
   * mode (pricedHeuristic; Li et al., IJCAI 2019) but over each agent's unconstrained optimum o_a
   * (its cost-to-go from the start): any conflict-free plan gives agents i and j a conflict-free
   * pair plan, so c_i + c_j ≥ P_ij (a lower bound on the two-agent optimum); with
   * x_a = c_a − o_a ≥ 0, x_i + x_j ≥ P_ij − o_i − o_j, and a fractional matching of those pair
   * bounds bounds Σ x (fractional-matching.ts), so Σ c ≥ Σ o + that bound. The pairs searched
   * are those in conflict in the root's plans or in the agents' own optimal plans (exact SIPP,
   * no other agent): the root's plans already dodge one another, so most pairs that must
   * give way to each other meet only in the latter. Any other pair may be left out (its bound
   * only adds).
   */
  function rootPairBound(): number {
    const n = q.agents.length;
    const soloVisits: CellVisit[][] = [];
    for (let a = 0; a < n; a++) {
      const p = plan(a, q.initialBans?.[a] ?? []);
      if (isStopped) return trivialBound;
      if (p === null) return Infinity;
      soloVisits.push(cellVisits(a, q.agents[a].start, p, q.forwardMs));
    }
    const candidates = new Set([...meetingPairs(root.visits), ...meetingPairs(soloVisits)]);
    const pairBounds: PairBound[] = [];
    for (const key of [...candidates].sort((x, y) => x - y)) {
      const i = Math.floor(key / n);
      const j = key % n;
      const out = ccbsSearch({
        grid: q.grid, agents: [q.agents[i], q.agents[j]], forwardMs: q.forwardMs, quarterTurnMs: q.quarterTurnMs,
        nodeLimit: PAIR_NODE_LIMIT, shouldStop: q.shouldStop, isPairBound: false,
      });
      lowLevelExpansions += out.lowLevelExpansions;
      if (out.status === 'stopped') {
        isStopped = true;
        return trivialBound;
      }
      if (out.status === 'infeasible') return Infinity;
      pairBounds.push([i, j, (out.lowerBound as number) - soloOptima[i] - soloOptima[j]]);
    }
    return trivialBound + fractionalMatchingBound(pairBounds);
  }

  /** The agent pairs in conflict (key i × n + j, i < j), from the earliest conflict of each pair. */
  function meetingPairs(visits: readonly (readonly CellVisit[])[]): number[] {
    const n = q.agents.length;
    return findConflicts(visits, 0, true).conflicts.map(({ early, late }) => Math.min(early.agent, late.agent) * n + Math.max(early.agent, late.agent));
  }

  /** Prices the sound splits of the node's first conflicts and returns the best, with its children's plans. */
  function chooseSplit(node: CtNode): { best: PricedChild[]; options: PricedChild[][] } {
    const memo = new Map<string, { plan: SippPlan | null; lb: number }>();
    const occupancy = w > 1 ? occupancyIndex(node.visits) : undefined;
    const childPlan = (child: BranchChild): { plan: SippPlan | null; lb: number } => {
      const key = `${child.agent}|${JSON.stringify(child.bans)}`;
      let hit = memo.get(key);
      if (hit === undefined) {
        const bans = [...bansOf(node, child.agent), ...(q.initialBans?.[child.agent] ?? []), ...child.bans];
        // Flex: the child may spend its share of the node's slack (see the file comment).
        const ceiling = occupancy === undefined ? undefined : node.plans[child.agent].cost + flexShare(node);
        const p = plan(child.agent, bans, occupancy, ceiling);
        hit = { plan: p, lb: lastLb };
        memo.set(key, hit);
      }
      return hit;
    };
    const best = new BestSplit<PricedChild>(true);
    const options: PricedChild[][] = [];
    // The bounded search prices only the earliest conflict's splits: it gains more from many cheap expansions.
    for (const conflict of w > 1 ? node.conflicts.slice(0, 1) : node.conflicts) {
      for (const option of branchOptions(conflict, q.forwardMs, neighbours)) {
        const priced = option.children.map((child) => ({ child, ...childPlan(child) }));
        if (isStopped) return { best: [], options: [] };
        options.push(priced);
        best.offer(node, priced);
      }
    }
    return { best: best.split, options };
  }

  function finish(status: CcbsStatus, node: CtNode | null, bound: number | null): CcbsOutcome {
    return {
      status,
      plans: node ? node.plans : null,
      soc: node ? node.cost : null,
      lowerBound: bound,
      generated,
      expanded,
      lowLevelExpansions,
      disjointSplits,
      detourTrims,
    };
  }
}

/**
 * The split to branch on among those offered: the one whose cheaper child costs most, then whose
 * dearer child costs most (a child without a plan costs Infinity), as ICBS prefers cardinal
 * conflicts; with `isCheapFirst` (bounded mode) one whose children all lack a plan (the node
 * admits no plan and is dropped), else the one whose cheaper child costs least, then whose
 * dearer child costs least. The first offered wins ties.
 *
 * Why cheap first when bounded: LB there rests on the root's pair bound and hardly moves with
 * the splits, so a cardinal split buys no bound, while a cheap one keeps the child within
 * w × LB. Measured on random-32-32-20, 100 agents, w = 1.2, 60 s CPU: 5 of 5 even scenarios
 * either way, the slowest in 10 s instead of 30 s.
 */
class BestSplit<T extends { readonly child: BranchChild; readonly plan: SippPlan | null }> {
  split: T[] = [];
  private low = -1;
  private high = -1;
  /** Children with a plan in the split held (-1: none held yet). */
  private feasible = -1;

  constructor(private readonly isCheapFirst = false) {}

  offer(node: CtNode, priced: T[]): void {
    const costs = priced.map(({ child, plan: p }) => (p ? node.cost - node.plans[child.agent].cost + p.cost : Infinity));
    const low = Math.min(...costs);
    const high = Math.max(...costs);
    const feasible = costs.filter((c) => c < Infinity).length;
    const isFirst = this.split.length === 0;
    // A split with no feasible child drops the node, so it beats every other; else the cheapest.
    const isCheaper = this.feasible !== 0 && (feasible === 0 || low < this.low || (low === this.low && high < this.high));
    const isBetter = this.isCheapFirst ? isCheaper : low > this.low || (low === this.low && high > this.high);
    if (isFirst || isBetter) {
      this.split = priced;
      this.low = low;
      this.high = high;
      this.feasible = feasible;
    }
  }
}

/**
 * The weight of a greedy matching of agent pairs (i, j, weight), heaviest first (ties: lower i, then
 * lower j), positive weights only: over agent-disjoint pairs the pairwise bounds add up.
 */
function greedyMatching(agentCount: number, pairs: readonly (readonly [number, number, number])[]): number {
  const order = [...pairs].sort((a, b) => b[2] - a[2] || a[0] - b[0] || a[1] - b[1]);
  const used = new Uint8Array(agentCount);
  let total = 0;
  for (const [i, j, weight] of order) {
    if (used[i] || used[j] || weight <= 0) continue;
    used[i] = 1;
    used[j] = 1;
    total += weight;
  }
  return total;
}

/** Every ban on `agent` along the path from `node` to the root. */
function bansOf(node: CtNode, agent: number): AgentBan[] {
  const out: AgentBan[] = [];
  for (let n: CtNode | null = node; n; n = n.parent) {
    if (n.agent === agent) out.push(...n.bans);
    if (n.markAgent === agent && n.mark) out.push(n.mark);
  }
  return out;
}

/** A text key of a list of bans (memo keys). */
function banKey(bans: readonly AgentBan[]): string {
  return bans.map((b) => {
    if (b.kind === 'occupancy') return `o${b.cell},${b.from},${b.to}`;
    if (b.kind === 'move') return `m${b.fromCell},${b.toCell},${b.from},${b.to}`;
    if (b.kind === 'landmark') return `p${b.moves.map((m) => `${m.fromCell}>${m.toCell}`).join('/')},${b.from},${b.to}`;
    return `g${b.notBefore}`;
  }).join(';');
}
