/**
 * The high level of the weighted-split solver: Conflict-Based Search (Sharon, Stern, Felner,
 * Sturtevant, "Conflict-based search for optimal multi-agent pathfinding", Artificial
 * Intelligence 2015) over time-interval constraints, as in continuous-time CBS (Andreychuk
 * et al., Artificial Intelligence 2022), with the sound splits of ccbs-branch.ts and the SIPP
 * low level of sipp.ts. Best-first on sum of arrival times; ties prefer fewer conflicting
 * agent pairs, then the older node, so runs are deterministic.
 *
 * Split choice: for the first few conflicts of a node, every sound split is priced by
 * replanning both children, and the node branches on the split whose cheaper child costs most
 * (then whose dearer child costs most), as ICBS prefers cardinal conflicts (Boyarski et al.,
 * IJCAI 2015). Any sound split keeps optimality, so this choice only affects speed; the
 * children's plans are kept, so no low-level search is repeated.
 *
 * Bounded-suboptimal mode (`suboptimality` w > 1): the ECBS high level (Barer, Sharon, Stern,
 * Felner, SoCS 2014; focal-lists.ts) over a focal SIPP low level (focal-sipp.ts): each agent's
 * plan costs at most w × lb_i, lb_i a proven lower bound on its optimal arrival under its
 * constraints (kept at least its parent's, as constraints only grow), and the node's lower
 * bound is Σ lb_i. The node expanded is the one with the fewest conflicting agent pairs among the
 * open nodes whose cost is at most w × LB, LB = the least open lower bound. Soundness: the splits
 * are sound, so some open node admits an optimal plan, whose cost is at least that node's Σ lb_i,
 * so LB never exceeds the optimum; a conflict-free node is returned only when its cost ≤ w × LB.
 */
import type { Grid } from '../grid/grid';
import { branchOptions, type BranchChild } from './ccbs-branch';
import { cellVisits, findConflicts, type CellVisit, type OccupancyConflict } from './ccbs-conflict';
import { compileBans, type AgentBan } from './sipp-constraints';
import { sippSearch, type SippPlan } from './sipp';
import { SippHeap } from './sipp-heap';
import { FocalLists } from './focal-lists';
import { focalSippSearch, occupancyIndex, type OccupancyIndex } from './focal-sipp';

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
  /** Least node cost still open (a lower bound on the optimum); equals soc when solved optimally, soc ≤ w × it when bounded. */
  readonly lowerBound: number | null;
  readonly generated: number;
  readonly expanded: number;
  readonly lowLevelExpansions: number;
}

interface CtNode {
  readonly id: number;
  readonly parent: CtNode | null;
  /** The agent this node's new bans apply to (-1 at the root). */
  readonly agent: number;
  readonly bans: readonly AgentBan[];
  readonly plans: readonly SippPlan[];
  readonly visits: readonly (readonly CellVisit[])[];
  readonly cost: number;
  readonly conflicts: readonly OccupancyConflict[];
  readonly conflictingPairs: number;
  /** Per agent a proven lower bound on its optimal arrival under the node's constraints (= its plan's cost when exact). */
  readonly lbs: readonly number[];
  /** Σ lbs: a lower bound on the optimum of the plans the node admits. */
  readonly lb: number;
}

/** How many of a node's earliest conflicts are priced when choosing the split. */
const CANDIDATE_CONFLICTS = 4;

/** Runs CBS with interval constraints; optimal in sum of arrival times when it returns `solved`. */
export function ccbsSearch(q: CcbsQuery): CcbsOutcome {
  const cellCount = q.grid.width * q.grid.height;
  let generated = 0;
  let expanded = 0;
  let lowLevelExpansions = 0;
  let isStopped = false;

  const w = q.suboptimality ?? 1;
  /** The lower bound the last `plan` call proved (its plan's cost when exact). */
  let lastLb = 0;
  const plan = (agent: number, bans: readonly AgentBan[], occupancy?: OccupancyIndex): SippPlan | null => {
    const a = q.agents[agent];
    if (occupancy !== undefined) {
      const focal = focalSippSearch({
        grid: q.grid, start: a.start, goal: a.goal, startHeadings: a.startHeadings, forwardMs: q.forwardMs,
        quarterTurnMs: q.quarterTurnMs, bans: compileBans(bans, cellCount), heuristic: a.heuristic, shouldStop: q.shouldStop,
        w, agent, occupancy,
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
    visits: readonly (readonly CellVisit[])[], lbs: readonly number[] = plans.map((p) => p.cost)): CtNode => {
    const { conflicts, conflictingPairs } = findConflicts(visits, CANDIDATE_CONFLICTS);
    const cost = plans.reduce((s, p) => s + p.cost, 0);
    const lb = lbs.reduce((s, v) => s + v, 0);
    return { id: generated++, parent, agent, bans, plans, visits, cost, conflicts, conflictingPairs, lbs, lb };
  };

  // Sum of single-agent cost-to-go: the bound to report if the root itself is cut short.
  const trivialBound = q.agents.reduce((s, a) => s + Math.min(...a.startHeadings.map((h) => a.heuristic[a.start * 4 + h])), 0);
  const rootPlans: SippPlan[] = [];
  const rootLbs: number[] = [];
  // Bounded mode: each root plan avoids the plans made before it (focal order only).
  const rootOccupancy = w > 1 ? new Map<number, CellVisit[]>() : undefined;
  for (let a = 0; a < q.agents.length; a++) {
    const p = plan(a, [], rootOccupancy);
    if (!p) return finish(isStopped ? 'stopped' : 'infeasible', null, isStopped ? trivialBound : null);
    rootPlans.push(p);
    rootLbs.push(lastLb);
    if (rootOccupancy !== undefined) {
      for (const v of cellVisits(a, q.agents[a].start, p, q.forwardMs)) rootOccupancy.set(v.cell, [...(rootOccupancy.get(v.cell) ?? []), v]);
    }
  }
  const root = makeNode(null, -1, [], rootPlans, rootPlans.map((p, a) => cellVisits(a, q.agents[a].start, p, q.forwardMs)), rootLbs);

  const nodes: CtNode[] = [root];
  if ((q.suboptimality ?? 1) > 1) return searchBounded(q.suboptimality as number);
  const open = new SippHeap((x, y) => {
    const a = nodes[x];
    const b = nodes[y];
    return a.cost < b.cost || (a.cost === b.cost && (a.conflictingPairs < b.conflictingPairs || (a.conflictingPairs === b.conflictingPairs && a.id < b.id)));
  });
  open.push(root.id);

  while (open.size > 0) {
    const top = nodes[open.peek() as number];
    if (top.conflicts.length === 0) return finish('solved', top, top.cost);
    if (q.shouldStop()) return finish('stopped', null, top.cost);
    if (expanded >= q.nodeLimit) return finish('node-limit', null, top.cost);
    open.pop();
    expanded++;
    const split = chooseSplit(top);
    if (isStopped) return finish('stopped', null, top.cost);
    for (const { child, plan: p } of split) {
      if (!p) continue;
      const plans = top.plans.slice();
      plans[child.agent] = p;
      const visits = top.visits.slice();
      visits[child.agent] = cellVisits(child.agent, q.agents[child.agent].start, p, q.forwardMs);
      const node = makeNode(top, child.agent, child.bans, plans, visits);
      nodes.push(node);
      open.push(node.id);
    }
  }
  return finish('infeasible', null, null);

  /** The bounded loop: FOCAL's best node, children as in the exact loop. */
  function searchBounded(w: number): CcbsOutcome {
    const lists = new FocalLists(w, (id) => nodes[id].lb, (id) => nodes[id].cost, (id) => nodes[id].conflictingPairs);
    lists.push(root.id);
    for (;;) {
      if (q.shouldStop()) return finish('stopped', null, lists.lowerBound());
      if (expanded >= q.nodeLimit) return finish('node-limit', null, lists.lowerBound());
      const pick = lists.select();
      if (pick === null) return finish('infeasible', null, null);
      const top = nodes[pick.id];
      if (top.conflicts.length === 0) return finish('solved', top, pick.lowerBound);
      expanded++;
      const split = chooseSplit(top);
      if (isStopped) return finish('stopped', null, Math.min(top.lb, lists.lowerBound()));
      for (const { child, plan: p, lb } of split) {
        if (!p) continue;
        const plans = top.plans.slice();
        plans[child.agent] = p;
        const visits = top.visits.slice();
        visits[child.agent] = cellVisits(child.agent, q.agents[child.agent].start, p, q.forwardMs);
        const lbs = top.lbs.slice();
        lbs[child.agent] = Math.max(lbs[child.agent], lb);
        const node = makeNode(top, child.agent, child.bans, plans, visits, lbs);
        nodes.push(node);
        lists.push(node.id);
      }
    }
  }

  /** Prices the sound splits of the node's first conflicts and returns the best, with its children's plans. */
  function chooseSplit(node: CtNode): { child: BranchChild; plan: SippPlan | null; lb: number }[] {
    const memo = new Map<string, { plan: SippPlan | null; lb: number }>();
    const occupancy = w > 1 ? occupancyIndex(node.visits) : undefined;
    const childPlan = (child: BranchChild): { plan: SippPlan | null; lb: number } => {
      const key = `${child.agent}|${JSON.stringify(child.bans)}`;
      let hit = memo.get(key);
      if (hit === undefined) {
        const p = plan(child.agent, [...bansOf(node, child.agent), ...child.bans], occupancy);
        hit = { plan: p, lb: lastLb };
        memo.set(key, hit);
      }
      return hit;
    };
    let best: { child: BranchChild; plan: SippPlan | null; lb: number }[] = [];
    let bestLow = -1;
    let bestHigh = -1;
    // The bounded search prices only the earliest conflict's splits: it gains more from many cheap expansions.
    for (const conflict of w > 1 ? node.conflicts.slice(0, 1) : node.conflicts) {
      for (const option of branchOptions(conflict, q.forwardMs)) {
        const priced = option.children.map((child) => ({ child, ...childPlan(child) }));
        if (isStopped) return [];
        const costs = priced.map(({ child, plan: p }) => (p ? node.cost - node.plans[child.agent].cost + p.cost : Infinity));
        const low = Math.min(...costs);
        const high = Math.max(...costs);
        if (low > bestLow || (low === bestLow && high > bestHigh)) {
          best = priced;
          bestLow = low;
          bestHigh = high;
        }
      }
    }
    return best;
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
    };
  }
}

/** Every ban on `agent` along the path from `node` to the root. */
function bansOf(node: CtNode, agent: number): AgentBan[] {
  const out: AgentBan[] = [];
  for (let n: CtNode | null = node; n; n = n.parent) if (n.agent === agent) out.push(...n.bans);
  return out;
}
