/**
 * The CBS high level, written once against the model interface (solvers/models/model.ts):
 * Conflict-Based Search (Sharon, Stern, Felner, Sturtevant, "Conflict-based search for optimal
 * multi-agent pathfinding", AIJ 2015) with the improvements of the CBSH2-RTC line of work, each
 * behind a switch:
 * - conflict prioritisation by MDDs and bypass (Boyarski, Felner, Stern, Sharon, Tolpin,
 *   Betzalel, Shimony, "ICBS: Improved conflict-based search algorithm for multi-agent
 *   pathfinding", IJCAI 2015);
 * - the WDG heuristic (Li, Felner, Boyarski, Ma, Koenig, "Improved heuristics for multi-agent
 *   path finding with conflict-based search", IJCAI 2019), computed lazily when a node is
 *   popped, with pair weights from exact two-agent sub-searches, memoised (pair-weight-memo.ts);
 * - disjoint splitting (Li, Harabor, Stuckey, Ma, Koenig, "Disjoint splitting for multi-agent
 *   path finding with conflict-based search", ICAPS 2019);
 * - target, corridor and rectangle reasoning (Li, Harabor, Stuckey, Koenig, "Pairwise symmetry
 *   reasoning for multi-agent path finding search", AIJ 2021).
 *
 * Following conflicts (models with `following: forbidden`; following-conflicts.ts, after Stern
 * et al., SoCS 2019) are a conflict kind of their own with their own split; how each
 * improvement treats them:
 * - prioritisation: classified by the follower's MDD at t and the leader's at t − 1;
 * - bypass: unchanged (a child's paths satisfy the parent's constraints whatever the rule);
 * - disjoint splitting: not applied to them (see following-conflicts.ts); vertex and edge
 *   conflicts still split disjointly: "others not in v at t" stays a true consequence of a
 *   positive constraint under the stricter rule, and progress still comes from it;
 * - target, corridor and rectangle reasoning: they still refine only vertex and edge conflicts.
 *   Their splits are complete for every plan free of vertex and swap conflicts, and a plan free
 *   of following conflicts too is one of those, so they stay complete; following conflicts are
 *   never turned into them;
 * - WDG and the sub-search DG: the pair weights come from two-agent CBS runs on the same model
 *   (following conflicts included), so they stay exact or lower bounds; `haveConflictFreePair`
 *   applies the model's rule (following included when the model forbids it), so "no
 *   conflict-free pair of MDD paths" is a proof that the pair's joint cost exceeds its sum.
 *
 * Optimality argument: every split is complete (each solution of a node satisfies one child's
 * constraints), every agent's path is optimal under its constraints, and the node order is by
 * f = g + h with h admissible, so the first conflict-free node popped is optimal.
 *
 * Bounded-suboptimal mode (`suboptimality` w > 1; w = 1 runs exactly the search above): EECBS
 * (Li, Ruml, Koenig, "EECBS: A bounded-suboptimal search for multi-agent path finding", AAAI
 * 2021) over the ECBS low level (Barer, Sharon, Stern, Felner, SoCS 2014): each agent's path
 * comes from focal search (focal-space-time-astar.ts) and costs at most w × lb_i, where lb_i is
 * a proven lower bound on that agent's optimal cost under its constraints; a node's f_lb =
 * max(Σ lb_i, parent's f_lb) bounds the optimal SOC of the plans its constraints admit (they are
 * a subset of the parent's). The splits stay complete, so some open node always admits an
 * optimal plan and LB = min f_lb over the open nodes (eecbs-lists.ts CLEANUP) never exceeds the
 * optimum; a conflict-free node is returned only when its cost ≤ w × LB. A conflict-free node
 * whose cost exceeds it (only CLEANUP's top can be chosen so) gets optimal paths for its agents
 * (lb_i = cost_i) and goes back to the lists. The improvements in this mode: conflict
 * prioritisation (it only picks the conflict to split), bypass (only a child with the same
 * cost per agent and fewer conflicts, so the parent's lower bounds and MDDs stay its own),
 * disjoint splitting, target and corridor reasoning (complete splits whatever the path costs).
 * The WDG heuristic and rectangle reasoning, whose arguments need each agent's path to be
 * optimal (MDDs at the optimal cost), are off (the drivers switch them off).
 */
import type { SearchModel } from '../models/model';
import { Budget, LimitReached } from './budget';
import { BinaryHeap, type HeapItem } from './binary-heap';
import type { CbsSwitches } from './cbs-types';
import { ConflictAvoidanceTable } from './conflict-avoidance-table';
import {
  affectsOthers, C_EDGE, C_GT_LENGTH, C_LEQ_LENGTH, C_POS_EDGE, C_POS_VERTEX, C_RANGE, C_VERTEX, constraint, type Constraint,
} from './constraint';
import { ConstraintTable } from './constraint-table';
import {
  type Conflict, K_CORRIDOR, K_EDGE, K_RECTANGLE, K_TARGET, K_VERTEX, makeConflict, P_CARDINAL, P_NON, P_SEMI,
} from './conflict';
import { classifyByMdds } from './conflict-priority';
import { findCorridorConflict } from './corridor-reasoning';
import { classifyFollowingConflict, K_FOLLOW, splitFollowingConflict } from './following-conflicts';
import { CostToGoEstimate } from './eecbs-estimate';
import { EecbsLists, type EecbsNode } from './eecbs-lists';
import { FocalSpaceTimeAStar } from './focal-space-time-astar';
import { buildMdd, haveConflictFreePair, type Mdd } from './mdd';
import { findRectangleConflict } from './rectangle-reasoning';
import { classifyRangeConflict, K_RANGE } from './range-conflicts';
import { SpaceTimeAStar } from './space-time-astar';
import { boundOf } from './suboptimality';
import { PairWeightMemo, type PairWeightKey } from './pair-weight-memo';
import { minWeightedVertexCover, type WeightedEdge } from './weighted-vertex-cover';

/** CT expansions a WDG sub-search may use before it reports its lower bound instead. */
export const SUB_EXPAND_LIMIT = 16;

/** A WDG weight that makes the node infeasible (the pair has no joint solution). */
const INFEASIBLE = Number.POSITIVE_INFINITY;

/** WDG pair weights a run keeps before it forgets them all (a memory bound). */
const PAIR_WEIGHT_CAPACITY = 50000;

/**
 * The order in which a node's conflicts are split (lower first; ties go to the earliest time):
 * target conflicts (cardinal, then semi-cardinal), then (exact search only) vertex and edge
 * conflicts in a narrow cell, semi-cardinal before cardinal, then semi-cardinal vertex, edge and
 * rectangle conflicts, then cardinal, then non-cardinal ones (the MDD classes of Boyarski et al.,
 * IJCAI 2015; rectangles before the plain conflicts of their class). k-delay and following
 * conflicts keep the order cardinal, semi-cardinal, non-cardinal.
 *
 * Our choice, measured on room-32-32-4 and random-32-32-20; the order only picks which complete
 * split is made, never which plans some child admits, so optimality is untouched. ICBS splits
 * cardinal conflicts first to raise the bound fastest, but with the WDG heuristic the cost of a
 * cardinal conflict is mostly in h already. A conflict with one child that costs its agent
 * nothing is different: that child's constraint settles the conflict for its whole subtree (a
 * target conflict's "≤ t" child bars every other agent from the goal from t on; a semi-cardinal
 * conflict's positive constraint under disjoint splitting bars every other agent from the cell
 * or move). Left behind the cardinal ones, such a conflict is created again in each branch where
 * some agent is replanned into it, and split once per branch. Room-32-32-4 even-1 with 30 agents:
 * one semi-cardinal target conflict in a door was 11,744 of 48,465 splits (240 s, unsolved);
 * targets first: 2,470 expansions; semi-cardinal conflicts next too: 1,031.
 *
 * Narrow cells (exactly two open neighbours; for an edge conflict either end) come next: doors
 * between rooms and corridor cells, which every route between rooms passes, so a conflict there
 * left for later is made again in most branches; a cardinal one there is split before
 * semi-cardinal conflicts elsewhere, unlike in open cells. Corners have two open neighbours too,
 * but a route seldom has to pass one (another cell of the same length goes round it), so their
 * conflicts are seldom cardinal or semi-cardinal: counting only cells whose two neighbours face
 * each other gave the same expansion counts on every run below. Room-32-32-4 × 30 agents,
 * even-1 … even-5, CT nodes expanded: 1,015 / 8,152 / 779 / 57 / 1,470 against 1,031 / 62,099 /
 * 1,342 / 85 / 1,955 without this step; random-32-32-20 × 60 even-4: 8,794 against 16,188;
 * random-32-32-20 × 50 and warehouse-10-20-10-2-1 × 130 about the same (the runs:
 * benchmarks/measured/room-30-2026-12-04/narrow-cells-probe.txt). It was measured on the exact
 * search only, so the bounded search (whose frontier table was measured without it) keeps the
 * order without it: `degree` null leaves the step out.
 */
function splitRank(c: Conflict, degree: Uint8Array | null): number {
  if (c.kind === K_TARGET) return c.priority - 7;
  const isVertexOrEdge = c.kind === K_VERTEX || c.kind === K_EDGE;
  if (isVertexOrEdge && degree !== null && (degree[c.cell] === 2 || (c.kind === K_EDGE && degree[c.cell2] === 2))) {
    if (c.priority === P_SEMI) return -4;
    if (c.priority === P_CARDINAL) return -3;
  }
  if (c.priority === P_SEMI && (isVertexOrEdge || c.kind === K_RECTANGLE)) return c.kind === K_RECTANGLE ? -2 : -1;
  return c.priority * 4 + (c.kind === K_RECTANGLE ? 0 : 1);
}

/** Settings of one CBS run (the main search or a two-agent WDG sub-search). */
export interface CbsEngineConfig {
  readonly model: SearchModel;
  /** Model agent ids this run plans for. */
  readonly agents: readonly number[];
  /** Per local agent, constraints inherited from an enclosing search (already relevant to that agent). */
  readonly baseConstraints?: readonly (readonly Constraint[])[];
  /** Per local agent, a path optimal under its base constraints (else the root plans it). */
  readonly initialPaths?: readonly Int32Array[];
  /** Per local agent, the constraint table of its base constraints (saves rebuilding it). */
  readonly initialTables?: readonly ConstraintTable[];
  /** Per local agent, the MDD of its initial path's cost under its base constraints. */
  readonly initialMdds?: readonly (Mdd | null)[];
  readonly switches: CbsSwitches;
  readonly budget: Budget;
  /** Shared low-level planner (keeps buffers and counts expansions). */
  readonly planner: SpaceTimeAStar;
  readonly cat: ConflictAvoidanceTable;
  /** Cell degrees (corridor reasoning). */
  readonly degree: Uint8Array;
  /** Maximum CT nodes generated: beyond it the run stops with a lower bound. */
  readonly nodeLimit: number;
  /** Maximum CT nodes expanded (sub-searches use a small one). */
  readonly expandLimit: number;
  /** Whether reaching the node/expansion limit is a {@link LimitReached} (main run) or a normal outcome (sub-search). */
  readonly isLimitFatal: boolean;
  readonly memoryLimitBytes: number;
  /** Whether this is a two-agent sub-search (uses the DG bound instead of WDG). */
  readonly isSub: boolean;
  /** WDG pair weights kept before the memo is cleared (default {@link PAIR_WEIGHT_CAPACITY}; tests make clears frequent). */
  readonly pairWeightCapacity?: number;
  /** Suboptimality factor w (default 1 = optimal search); w > 1 needs `focalPlanner` and WDG and rectangle reasoning off. */
  readonly suboptimality?: number;
  /** The focal low level of the bounded mode (shares the budget; counts its own expansions). */
  readonly focalPlanner?: FocalSpaceTimeAStar;
  /** Sub-search: the caller has already found that the initial MDDs admit no conflict-free pair (root DG bound 1). */
  readonly isRootDependent?: boolean;
}

/** Outcome of one CBS run. */
export interface CbsOutcome {
  readonly kind: 'solved' | 'limit' | 'infeasible';
  readonly paths: Int32Array[];
  readonly soc: number;
  readonly lowerBound: number;
  readonly generated: number;
  readonly expanded: number;
  readonly reason?: string;
}

/** The owner arrays of a node expanded for good (nothing reads them after its children exist). */
const RELEASED = new Int32Array(0);

/** A constraint tree node. */
class CtNode implements HeapItem, EecbsNode {
  heapIndex = -1;
  f: number;
  isHComputed = false;
  /** Bounded mode: per local agent a proven lower bound on its optimal cost under the node's constraints. */
  lbs: Int32Array | null = null;
  /** Bounded mode: proven lower bound on the optimal SOC under the node's constraints. */
  fLb = 0;
  /** Bounded mode: g + ĥ. */
  fHat = 0;
  version = 0;
  isClosed = false;

  constructor(
    readonly id: number,
    readonly parent: CtNode | null,
    readonly added: readonly Constraint[],
    public paths: Int32Array[],
    public g: number,
    public h: number,
    public conflicts: Conflict[],
    /** Per local agent: the node whose constraints last changed that agent's constraint table. */
    public owner: Int32Array,
    /** Per local agent: the node whose constraints last changed that agent's MDD (cost-relevant set). */
    public mddOwner: Int32Array,
  ) {
    this.f = g + h;
  }
}

const lessNode = (a: CtNode, b: CtNode): boolean => {
  if (a.f !== b.f) return a.f < b.f;
  if (a.conflicts.length !== b.conflicts.length) return a.conflicts.length < b.conflicts.length;
  return a.id < b.id;
};

/** One CBS search; create, call {@link CbsEngine.run} once. */
export class CbsEngine {
  generated = 0;
  expanded = 0;
  private readonly model: SearchModel;
  private readonly sw: CbsSwitches;
  private readonly L: number;
  private readonly localOf: Int32Array;
  private readonly nodes: CtNode[] = [];
  private readonly open = new BinaryHeap<CtNode>(lessNode);
  private readonly tables = new Map<number, ConstraintTable>();
  private readonly mdds = new Map<number, Mdd | null>();
  /** Constraint sets are named by their owner node (`owner[i]`); one includes another when it is its ancestor. */
  private readonly weights: PairWeightMemo;
  private bytes = 0;
  private currentF = -1;
  private readonly refined = new WeakMap<Conflict, {
    p1: Int32Array; p2: Int32Array; m1: Mdd | null; m2: Mdd | null; out: Conflict;
  }>();
  private readonly corridors = new WeakMap<Conflict, { t1: ConstraintTable; t2: ConstraintTable; out: Conflict | null }>();
  /** Ids are never reused: caches are keyed by them, and a discarded child must not alias a later one. */
  private nextId = 1;
  /** Suboptimality factor; bounded mode when > 1. */
  private readonly w: number;
  private readonly lists: EecbsLists<CtNode> | null;
  private readonly estimate = new CostToGoEstimate();

  /** Prepares a run. */
  constructor(private readonly cfg: CbsEngineConfig) {
    this.model = cfg.model;
    this.sw = cfg.switches;
    this.L = cfg.agents.length;
    this.localOf = new Int32Array(cfg.model.agentCount).fill(-1);
    this.weights = new PairWeightMemo(cfg.pairWeightCapacity ?? PAIR_WEIGHT_CAPACITY, (a, b) => this.isAncestorOrSelf(a, b));
    cfg.agents.forEach((a, i) => { this.localOf[a] = i; });
    this.w = cfg.suboptimality ?? 1;
    if (this.w > 1 && (cfg.focalPlanner === undefined || cfg.switches.wdg || cfg.switches.rectangleReasoning || cfg.isSub)) {
      throw new Error('bounded CBS needs a focal planner and the WDG heuristic and rectangle reasoning off');
    }
    this.lists = this.w > 1 ? new EecbsLists<CtNode>(this.w, (node) => node.conflicts.length) : null;
    // Root keys are `0 * L + i`.
    cfg.initialTables?.forEach((t, i) => this.tables.set(i, t));
    cfg.initialMdds?.forEach((m, i) => this.mdds.set(i, m));
  }

  /** Runs the search to a proven optimum, a limit, or an empty open list. */
  run(): CbsOutcome {
    try {
      return this.lists !== null ? this.searchBounded(this.lists) : this.search();
    } catch (e) {
      if (e instanceof LimitReached && !this.cfg.isLimitFatal && (e.reason === 'nodes')) return this.limitOutcome('nodes');
      throw e;
    }
  }

  /** The best proven lower bound so far (min f over the open list and the node being expanded). */
  lowerBound(): number {
    if (this.lists !== null) return Math.min(this.lists.scanLowerBound(), this.currentF >= 0 ? this.currentF : Infinity);
    let lb = Infinity;
    for (const n of this.open.values()) if (n.f < lb) lb = n.f;
    if (this.currentF >= 0 && this.currentF < lb) lb = this.currentF;
    return lb;
  }

  private limitOutcome(reason: string): CbsOutcome {
    return { kind: 'limit', paths: [], soc: -1, lowerBound: this.lowerBound(), generated: this.generated, expanded: this.expanded, reason };
  }

  private search(): CbsOutcome {
    const root = this.makeRoot();
    if (root === null) {
      return { kind: 'infeasible', paths: [], soc: -1, lowerBound: Infinity, generated: this.generated, expanded: 0, reason: 'an agent has no path under its constraints' };
    }
    this.open.push(root);
    while (this.open.size > 0) {
      this.cfg.budget.check();
      const node = this.open.pop() as CtNode;
      this.currentF = node.f;
      if (node.conflicts.length === 0) {
        return { kind: 'solved', paths: node.paths, soc: node.g, lowerBound: node.g, generated: this.generated, expanded: this.expanded };
      }
      if (!node.isHComputed) {
        const h = this.computeH(node);
        node.isHComputed = true;
        if (h === INFEASIBLE) { this.currentF = -1; continue; }
        if (h > node.h) {
          node.h = h;
          node.f = node.g + h;
        }
        const top = this.open.peek();
        if (top !== undefined && lessNode(top, node)) {
          this.open.push(node);
          this.currentF = -1;
          continue;
        }
      }
      if (this.expanded >= this.cfg.expandLimit) {
        this.open.push(node);
        this.currentF = -1;
        throw new LimitReached('nodes');
      }
      this.expanded++;
      this.expand(node);
      this.currentF = -1;
      if (node.heapIndex < 0) {
        // Expanded for good: only its constraints and parent link are still needed (by descendants' tables).
        node.paths = [];
        node.conflicts = [];
        node.owner = RELEASED;
        node.mddOwner = RELEASED;
      }
    }
    return { kind: 'infeasible', paths: [], soc: -1, lowerBound: Infinity, generated: this.generated, expanded: this.expanded, reason: 'the constraint tree was exhausted' };
  }

  /** The bounded search: the EECBS high level over CLEANUP, OPEN and FOCAL (see the file comment). */
  private searchBounded(lists: EecbsLists<CtNode>): CbsOutcome {
    const root = this.makeRoot();
    if (root === null) {
      return { kind: 'infeasible', paths: [], soc: -1, lowerBound: Infinity, generated: this.generated, expanded: 0, reason: 'an agent has no path under its constraints' };
    }
    this.pushOpen(root);
    this.currentF = -1;
    for (;;) {
      this.cfg.budget.check();
      const pick = lists.select();
      if (pick === null) break;
      const node = pick.node;
      this.currentF = node.fLb;
      if (node.conflicts.length === 0) {
        if (node.g <= boundOf(pick.lowerBound, this.w)) {
          return { kind: 'solved', paths: node.paths, soc: node.g, lowerBound: pick.lowerBound, generated: this.generated, expanded: this.expanded };
        }
        this.tighten(node);
        this.pushOpen(node);
        this.currentF = -1;
        continue;
      }
      if (this.expanded >= this.cfg.expandLimit) {
        this.pushOpen(node);
        this.currentF = -1;
        throw new LimitReached('nodes');
      }
      this.expanded++;
      this.expand(node);
      this.currentF = -1;
      if (node.isClosed) {
        node.paths = [];
        node.conflicts = [];
        node.lbs = null;
        node.owner = RELEASED;
        node.mddOwner = RELEASED;
      }
    }
    return { kind: 'infeasible', paths: [], soc: -1, lowerBound: Infinity, generated: this.generated, expanded: this.expanded, reason: 'the constraint tree was exhausted' };
  }

  /**
   * A conflict-free node whose cost exceeds w × LB: every agent above its lower bound gets an
   * optimal path under the node's constraints (focal search with w = 1), so its lower bound
   * becomes its cost; the node's figures and, when a path changed, its conflicts are recomputed.
   */
  private tighten(node: CtNode): void {
    const focal = this.cfg.focalPlanner as FocalSpaceTimeAStar;
    const lbs = node.lbs as Int32Array;
    const L = this.L;
    let isChanged = false;
    for (let i = 0; i < L; i++) {
      if (node.paths[i].length - 1 <= lbs[i]) continue;
      this.cfg.cat.fill(this.model.stateCell, node.paths, i);
      const p = focal.plan(this.cfg.agents[i], this.table(node, i), this.cfg.cat, 1);
      if (p === null) throw new Error(`agent ${this.cfg.agents[i]} lost its path at node ${node.id}`);
      lbs[i] = p.length - 1;
      if (p.length !== node.paths[i].length) {
        node.paths[i] = p;
        node.mddOwner[i] = this.nextId++; // a new cost: its MDD must not be taken from the cache
        isChanged = true;
        this.bytes += p.length * 4 + 32;
      }
    }
    node.g = node.paths.reduce((sum, p) => sum + p.length - 1, 0);
    node.fLb = Math.max(node.fLb, lbs.reduce((sum, v) => sum + v, 0));
    if (isChanged) {
      const conflicts: Conflict[] = [];
      for (let i = 0; i < L; i++) for (let j = i + 1; j < L; j++) this.pairConflicts(node.paths, i, j, conflicts);
      node.conflicts = conflicts;
    }
  }

  /** Puts a node into the open list (exact mode) or the EECBS lists with its ĥ (bounded mode). */
  private pushOpen(node: CtNode): void {
    if (this.lists === null) {
      this.open.push(node);
      return;
    }
    node.fHat = node.g + this.estimate.estimate(Math.max(0, node.fLb - node.g), node.conflicts.length);
    this.lists.push(node);
  }

  /** Plans local agent i under `table`: optimal (exact mode), or within w of optimal raising `lbs[i]` to the bound proved. */
  private planAgent(i: number, table: ConstraintTable, lbs: Int32Array | null): Int32Array | null {
    if (lbs === null) return this.cfg.planner.plan(this.cfg.agents[i], table, this.cfg.cat);
    const focal = this.cfg.focalPlanner as FocalSpaceTimeAStar;
    const p = focal.plan(this.cfg.agents[i], table, this.cfg.cat, this.w);
    if (p !== null && focal.lastLowerBound > lbs[i]) lbs[i] = focal.lastLowerBound;
    return p;
  }

  // ---------------------------------------------------------------- nodes

  private register(node: CtNode): void {
    this.nodes[node.id] = node;
    this.generated++;
    this.bytes += 96 + this.L * 16 + node.conflicts.length * 8 + node.added.length * 56;
    if (this.generated > this.cfg.nodeLimit) throw new LimitReached('nodes');
    if (this.bytes > this.cfg.memoryLimitBytes) throw new LimitReached('memory');
  }

  private makeRoot(): CtNode | null {
    const L = this.L;
    const paths: (Int32Array | null)[] = new Array(L).fill(null);
    const owner = new Int32Array(L);
    const root = new CtNode(0, null, [], [], 0, 0, [], owner, new Int32Array(L));
    this.nodes[0] = root;
    const lbs = this.lists !== null ? new Int32Array(L) : null;
    for (let i = 0; i < L; i++) {
      const given = this.cfg.initialPaths?.[i];
      if (given) {
        paths[i] = given;
        continue;
      }
      this.cfg.cat.fill(this.model.stateCell, paths, i);
      const p = this.planAgent(i, this.table(root, i), lbs);
      if (p === null) return null;
      paths[i] = p;
    }
    root.paths = paths as Int32Array[];
    root.g = root.paths.reduce((s, p) => s + p.length - 1, 0);
    root.f = root.g;
    if (lbs !== null) {
      root.lbs = lbs;
      root.fLb = lbs.reduce((sum, v) => sum + v, 0);
    }
    const conflicts: Conflict[] = [];
    for (let i = 0; i < L; i++) for (let j = i + 1; j < L; j++) this.pairConflicts(root.paths, i, j, conflicts);
    root.conflicts = conflicts;
    this.currentF = root.f; // a limit hit while registering the root still reports its bound
    this.register(root);
    return root;
  }

  private pairConflicts(paths: Int32Array[], i: number, j: number, out: Conflict[]): void {
    this.model.findConflicts(this.cfg.agents[i], paths[i], this.cfg.agents[j], paths[j], out);
  }

  /** Every constraint that binds local agent i at the node with id `ownerId` (base ones first). */
  private collect(ownerId: number, i: number): Constraint[] {
    const agent = this.cfg.agents[i];
    const out: Constraint[] = [];
    for (let n: CtNode | null = this.nodes[ownerId]; n !== null; n = n.parent) {
      for (const c of n.added) if (c.agent === agent || affectsOthers(c)) out.push(c);
    }
    out.reverse();
    const base = this.cfg.baseConstraints?.[i];
    return base ? [...base, ...out] : out;
  }

  /** Whether CT node `a` is node `b` or one of its ancestors (ids grow from parent to child). */
  private isAncestorOrSelf(a: number, b: number): boolean {
    if (a === 0) return true;
    for (let n: CtNode | null = this.nodes[b]; n !== null && n.id >= a; n = n.parent) if (n.id === a) return true;
    return false;
  }

  private table(node: CtNode, i: number): ConstraintTable {
    const key = node.owner[i] * this.L + i;
    let t = this.tables.get(key);
    if (t === undefined) {
      if (this.tables.size > 20000) this.tables.clear();
      const agent = this.cfg.agents[i];
      t = new ConstraintTable(agent, this.model.goalCells[agent], this.model.cellCount, this.model.grid.width,
        this.collect(node.owner[i], i));
      this.tables.set(key, t);
      this.bytes += 64;
    }
    return t;
  }

  private mdd(node: CtNode, i: number): Mdd | null {
    const key = node.mddOwner[i] * this.L + i;
    let m = this.mdds.get(key);
    if (m === undefined) {
      if (this.mdds.size > 20000) this.mdds.clear();
      m = buildMdd(this.model, this.cfg.agents[i], this.table(node, i), node.paths[i].length - 1);
      this.mdds.set(key, m);
      this.bytes += m ? 64 + m.byteSize : 16;
    }
    return m;
  }

  private cachedMdd(node: CtNode, i: number): Mdd | null | undefined {
    return this.mdds.get(node.mddOwner[i] * this.L + i);
  }

  // ---------------------------------------------------------------- expansion

  private expand(node: CtNode): void {
    for (;;) {
      const conflict = this.selectConflict(node);
      const [left, right] = this.split(node, conflict);
      const children: CtNode[] = [];
      for (const cons of [left, right]) {
        const child = this.generateChild(node, cons);
        if (child !== null) children.push(child);
      }
      if (this.sw.bypass) {
        const better = children.find((c) => c.g === node.g && c.conflicts.length < node.conflicts.length && this.isSameCosts(c, node));
        if (better !== undefined) {
          // The child's paths satisfy the parent's constraints at the same cost: adopt them and split again.
          node.paths = better.paths;
          node.conflicts = better.conflicts;
          if (node.conflicts.length === 0) { this.pushOpen(node); return; }
          continue;
        }
      }
      if (this.lists !== null) this.learn(node, children);
      for (const c of children) this.pushOpen(c);
      return;
    }
  }

  /**
   * Bypass test beyond equal total cost: in bounded mode each agent's cost must be the same too,
   * so the parent's lower bounds and MDDs (keyed by cost-relevant owners) stay its own.
   */
  private isSameCosts(child: CtNode, node: CtNode): boolean {
    if (this.lists === null) return true;
    for (let i = 0; i < this.L; i++) if (child.paths[i].length !== node.paths[i].length) return false;
    return true;
  }

  /** EECBS online learning: the one-step errors of the expansion of `node` towards its best child. */
  private learn(node: CtNode, children: readonly CtNode[]): void {
    if (children.length === 0) return;
    let best = children[0];
    for (const c of children) {
      if (c.conflicts.length < best.conflicts.length || (c.conflicts.length === best.conflicts.length && Math.max(c.g, c.fLb) < Math.max(best.g, best.fLb))) best = c;
    }
    this.estimate.learn(Math.max(node.g, node.fLb), node.conflicts.length, Math.max(best.g, best.fLb), best.conflicts.length);
  }

  private generateChild(parent: CtNode, cons: readonly Constraint[]): CtNode | null {
    const L = this.L;
    const id = this.nextId++;
    const owner = parent.owner.slice();
    const mddOwner = parent.mddOwner.slice();
    const paths = parent.paths.slice();
    const child = new CtNode(id, parent, cons, paths, parent.g, 0, [], owner, mddOwner);
    const lbs = parent.lbs !== null ? parent.lbs.slice() : null;
    const affected = new Uint8Array(L);
    for (const c of cons) {
      const li = this.localOf[c.agent];
      if (li >= 0) affected[li] |= 1;
      if (affectsOthers(c)) for (let j = 0; j < L; j++) if (j !== li) affected[j] |= 2;
    }
    for (let j = 0; j < L; j++) if (affected[j] !== 0) owner[j] = id;
    this.nodes[id] = child;
    const replanned = new Uint8Array(L);
    const stateCell = this.model.stateCell;
    for (let j = 0; j < L; j++) {
      if (affected[j] === 0) continue;
      // Only implied prohibitions (another agent's positive or length constraint): check them
      // directly; the agent's table is built only if it must replan.
      const isImpliedOnly = affected[j] === 2;
      if (isImpliedOnly && !this.breaksImplied(paths[j], j, cons)) {
        if (this.hitsMdd(parent, j, cons)) mddOwner[j] = id;
        continue;
      }
      const table = this.table(child, j);
      if (!table.admitsPath(paths[j], stateCell)) {
        this.cfg.cat.fill(stateCell, paths, j);
        const p = this.planAgent(j, table, lbs);
        if (p === null) {
          delete this.nodes[id];
          return null;
        }
        child.g += p.length - paths[j].length;
        paths[j] = p;
        replanned[j] = 1;
        mddOwner[j] = id;
        this.bytes += p.length * 4 + 32;
      } else if (this.hitsMdd(parent, j, cons)) {
        mddOwner[j] = id;
      }
    }
    const conflicts: Conflict[] = [];
    for (const c of parent.conflicts) {
      if (replanned[this.localOf[c.a1]] === 0 && replanned[this.localOf[c.a2]] === 0) conflicts.push(c);
    }
    for (let j = 0; j < L; j++) {
      if (replanned[j] === 0) continue;
      for (let k = 0; k < L; k++) {
        if (k === j || (replanned[k] === 1 && k < j)) continue;
        this.pairConflicts(paths, j, k, conflicts);
      }
    }
    child.conflicts = conflicts;
    if (lbs !== null) {
      // The child admits a subset of the parent's plans: its optimum is at least the parent's bound.
      child.lbs = lbs;
      child.fLb = Math.max(parent.fLb, lbs.reduce((sum, v) => sum + v, 0));
    }
    child.h = Math.max(0, parent.f - child.g);
    child.f = child.g + child.h;
    this.register(child);
    return child;
  }

  /** Whether local agent j's path breaks a prohibition that another agent's constraint in `cons` implies. */
  private breaksImplied(path: Int32Array, j: number, cons: readonly Constraint[]): boolean {
    const sc = this.model.stateCell;
    const last = path.length - 1;
    const at = (t: number): number => sc[path[t < 0 ? 0 : t <= last ? t : last]];
    for (const c of cons) {
      if (this.localOf[c.agent] === j || !affectsOthers(c)) continue;
      if (c.kind === C_POS_VERTEX) {
        if (at(c.t1) === c.a) return true;
      } else if (c.kind === C_POS_EDGE) {
        if (at(c.t1) === c.b || at(c.t1 - 1) === c.a || (at(c.t1 - 1) === c.b && at(c.t1) === c.a)) return true;
      } else if (c.kind === C_LEQ_LENGTH) {
        for (let t = c.t1; t <= last; t++) if (sc[path[t]] === c.a) return true;
        if (sc[path[last]] === c.a) return true;
      }
    }
    return false;
  }

  /**
   * Whether `cons` can change local agent j's MDD (j's path still satisfies them, so its cost is
   * unchanged): true if a constraint removes an MDD node or move, or a landmark is not already
   * a single-cell level; conservative (true) when the parent's MDD is not at hand.
   */
  private hitsMdd(parent: CtNode, j: number, cons: readonly Constraint[]): boolean {
    const m = this.cachedMdd(parent, j);
    if (m === undefined || m === null) return true;
    const sc = this.model.stateCell;
    for (const c of cons) {
      const isOwn = this.localOf[c.agent] === j;
      if (!isOwn && !affectsOthers(c)) continue;
      switch (c.kind) {
        case C_VERTEX:
          if (m.hasCell(c.t1, c.a, sc)) return true;
          break;
        case C_EDGE:
          if (m.hasCell(c.t1 - 1, c.a, sc) && m.hasCell(c.t1, c.b, sc)) return true;
          break;
        case C_RANGE:
          for (let t = c.t0; t <= c.t1; t++) if (m.hasCell(t, c.a, sc)) return true;
          break;
        case C_POS_VERTEX:
          if (isOwn ? m.cellIfSingleton(c.t1) !== c.a : m.hasCell(c.t1, c.a, sc)) return true;
          break;
        case C_POS_EDGE:
          if (isOwn) {
            if (m.cellIfSingleton(c.t1 - 1) !== c.a || m.cellIfSingleton(c.t1) !== c.b) return true;
          } else if (m.hasCell(c.t1, c.b, sc) || m.hasCell(c.t1 - 1, c.a, sc)
            || (m.hasCell(c.t1 - 1, c.b, sc) && m.hasCell(c.t1, c.a, sc))) {
            return true;
          }
          break;
        case C_LEQ_LENGTH:
          if (isOwn) {
            if (m.cost > c.t1) return true;
          } else {
            for (let t = c.t1; t <= m.cost + 1; t++) if (m.hasCell(t, c.a, sc)) return true;
          }
          break;
        default:
          return true;
      }
    }
    return false;
  }

  // ---------------------------------------------------------------- conflicts

  private cost(node: CtNode, agent: number): number {
    return node.paths[this.localOf[agent]].length - 1;
  }

  /** Classifies the node's conflicts and returns the one to split on (refined by the symmetry reasonings). */
  private selectConflict(node: CtNode): Conflict {
    const sw = this.sw;
    const grid = this.model.supportsGridSymmetry;
    let best: Conflict | null = null;
    let bestRank = 0;
    const usesMdds = sw.prioritizeConflicts || (sw.rectangleReasoning && grid);
    for (const raw of node.conflicts) {
      const i1 = this.localOf[raw.a1];
      const i2 = this.localOf[raw.a2];
      const p1 = node.paths[i1];
      const p2 = node.paths[i2];
      const m1 = usesMdds ? this.mdd(node, i1) : null;
      const m2 = usesMdds ? this.mdd(node, i2) : null;
      // A raw conflict is shared by a node and its descendants; its refinement depends only on
      // the two paths and MDDs, so it is reused while those objects are the same.
      const hit = this.refined.get(raw);
      let c: Conflict;
      if (hit !== undefined && hit.p1 === p1 && hit.p2 === p2 && hit.m1 === m1 && hit.m2 === m2) {
        c = hit.out;
      } else {
        c = this.refine(raw, p1, p2, m1, m2);
        this.refined.set(raw, { p1, p2, m1, m2, out: c });
      }
      const rank = splitRank(c, this.lists === null ? this.cfg.degree : null);
      if (best === null || rank < bestRank || (rank === bestRank && c.t < best.t)) {
        best = c;
        bestRank = rank;
      }
    }
    let chosen = best as Conflict;
    if (sw.corridorReasoning && grid && (chosen.kind === K_VERTEX || chosen.kind === K_EDGE)) {
      // `chosen` is a cached refinement (fixed paths and MDDs); the corridor also depends on the tables.
      const t1 = this.table(node, this.localOf[chosen.a1]);
      const t2 = this.table(node, this.localOf[chosen.a2]);
      const hit = this.corridors.get(chosen);
      let corridor: Conflict | null;
      if (hit !== undefined && hit.t1 === t1 && hit.t2 === t2) {
        corridor = hit.out;
      } else {
        corridor = findCorridorConflict(this.cfg.planner, this.cfg.degree, chosen,
          (a) => node.paths[this.localOf[a]], (a) => (a === chosen.a1 ? t1 : t2));
        if (corridor !== null) corridor.priority = chosen.priority;
        this.corridors.set(chosen, { t1, t2, out: corridor });
      }
      if (corridor !== null) chosen = corridor;
    }
    return chosen;
  }

  /** A classified copy of a raw conflict: target relabelling, MDD priority, cardinal rectangle. */
  private refine(raw: Conflict, p1: Int32Array, p2: Int32Array, m1: Mdd | null, m2: Mdd | null): Conflict {
    const sw = this.sw;
    const cost1 = p1.length - 1;
    const cost2 = p2.length - 1;
    // k-delay conflicts carry their range-constraint split (k-robust model).
    if (raw.kind === K_RANGE) return classifyRangeConflict(raw, sw.prioritizeConflicts ? m1 : null, m2, this.model.stateCell);
    // Following conflicts (following: forbidden) carry their own split; never target, corridor or rectangle.
    if (raw.kind === K_FOLLOW) return classifyFollowingConflict(raw, sw.prioritizeConflicts ? m1 : null, m2);
    let c: Conflict;
    if (raw.kind === K_VERTEX && sw.targetReasoning && raw.t > cost1) c = makeConflict(K_TARGET, raw.a1, raw.a2, raw.cell, -1, raw.t);
    else c = makeConflict(raw.kind, raw.a1, raw.a2, raw.cell, raw.cell2, raw.t);
    if (sw.prioritizeConflicts && m1 !== null && m2 !== null) classifyByMdds(c, m1, m2);
    else c.priority = P_NON;
    if (sw.rectangleReasoning && this.model.supportsGridSymmetry && c.kind === K_VERTEX && c.priority !== P_CARDINAL
      && c.t <= cost1 && c.t <= cost2 && m1 !== null && m2 !== null) {
      // classifyByMdds may have swapped the agents: hand the rectangle finder matching paths and MDDs.
      const swapped = c.a1 !== raw.a1;
      const rect = swapped
        ? findRectangleConflict(this.model.grid.width, c.a1, c.a2, p2, p1, c.t, m2, m1)
        : findRectangleConflict(this.model.grid.width, c.a1, c.a2, p1, p2, c.t, m1, m2);
      if (rect !== null) {
        rect.isMddCardinal = c.isMddCardinal;
        c = rect;
      }
    }
    return c;
  }

  /** The two children's constraint sets of a conflict. */
  private split(node: CtNode, c: Conflict): [Constraint[], Constraint[]] {
    switch (c.kind) {
      case K_VERTEX:
        if (this.sw.disjointSplitting) {
          return [[constraint(C_POS_VERTEX, c.a1, c.cell, -1, c.t, c.t)], [constraint(C_VERTEX, c.a1, c.cell, -1, c.t, c.t)]];
        }
        return [[constraint(C_VERTEX, c.a1, c.cell, -1, c.t, c.t)], [constraint(C_VERTEX, c.a2, c.cell, -1, c.t, c.t)]];
      case K_EDGE:
        if (this.sw.disjointSplitting) {
          return [[constraint(C_POS_EDGE, c.a1, c.cell, c.cell2, c.t, c.t)], [constraint(C_EDGE, c.a1, c.cell, c.cell2, c.t, c.t)]];
        }
        return [[constraint(C_EDGE, c.a1, c.cell, c.cell2, c.t, c.t)], [constraint(C_EDGE, c.a2, c.cell2, c.cell, c.t, c.t)]];
      case K_TARGET:
        return [[constraint(C_GT_LENGTH, c.a1, c.cell, -1, c.t, c.t)], [constraint(C_LEQ_LENGTH, c.a1, c.cell, -1, c.t, c.t)]];
      case K_CORRIDOR:
      case K_RECTANGLE:
      case K_RANGE:
        return [c.constraints1 as Constraint[], c.constraints2 as Constraint[]];
      case K_FOLLOW:
        return splitFollowingConflict(c);
      default:
        throw new Error(`unknown conflict kind ${c.kind} at node ${node.id}`);
    }
  }

  // ---------------------------------------------------------------- heuristics

  private computeH(node: CtNode): number {
    if (this.cfg.isSub) {
      // Two agents: +1 when their MDDs admit no conflict-free pair of paths (the DG bound).
      if (node.conflicts.length === 0) return 0;
      // The root holds the initial paths and MDDs, which the caller has just tested.
      if (node.id === 0 && this.cfg.isRootDependent === true) return 1;
      const m0 = this.mdd(node, 0);
      const m1 = this.mdd(node, 1);
      if (m0 === null || m1 === null) return 0;
      return haveConflictFreePair(m0, m1, this.model.stateCell, this.model.forbidsFollowing === true) ? 0 : 1;
    }
    if (!this.sw.wdg) return 0;
    const L = this.L;
    const seen = new Set<number>();
    const edges: WeightedEdge[] = [];
    for (const c of node.conflicts) {
      const i = Math.min(this.localOf[c.a1], this.localOf[c.a2]);
      const j = Math.max(this.localOf[c.a1], this.localOf[c.a2]);
      const key = i * L + j;
      if (seen.has(key)) continue;
      seen.add(key);
      const w = this.pairWeight(node, i, j);
      if (w === INFEASIBLE) return INFEASIBLE;
      if (w > 0) edges.push({ u: i, v: j, w });
    }
    return minWeightedVertexCover(L, edges);
  }

  /**
   * Extra cost the pair (i, j) needs beyond their individual costs: exact, or a lower bound if the
   * sub-search is cut. It depends on the two agents' whole constraint sets as the sub-search sees
   * them (implied prohibitions included; named by `owner`) and on their costs, not on their MDDs
   * alone: nodes with the same MDD owners can differ in constraints that bind only above those
   * costs, e.g. the children of a positive constraint and of its negation, which weigh a pair
   * first when their parent never did (its weight was cleared, or the pair conflicts only in paths
   * the parent adopted by bypass). So the memo reuses a weight only where it cannot overestimate
   * (issue 11).
   */
  private pairWeight(node: CtNode, i: number, j: number): number {
    const L = this.L;
    const ci = node.paths[i].length - 1;
    const cj = node.paths[j].length - 1;
    const key: PairWeightKey = {
      mdd1: node.mddOwner[i] * L + i, mdd2: node.mddOwner[j] * L + j,
      set1: node.owner[i], set2: node.owner[j], cost1: ci, cost2: cj,
    };
    const memo = this.weights.get(key);
    if (memo !== undefined) return memo;
    const mi = this.mdd(node, i);
    const mj = this.mdd(node, j);
    let w: number;
    if (mi === null || mj === null) {
      w = 0;
    } else if (haveConflictFreePair(mi, mj, this.model.stateCell, this.model.forbidsFollowing === true)) {
      w = 0;
    } else {
      const sub = new CbsEngine({
        model: this.model,
        agents: [this.cfg.agents[i], this.cfg.agents[j]],
        baseConstraints: [this.collect(node.owner[i], i), this.collect(node.owner[j], j)],
        initialPaths: [node.paths[i], node.paths[j]],
        initialTables: [this.table(node, i), this.table(node, j)],
        initialMdds: [mi, mj],
        switches: { ...this.sw, wdg: false },
        budget: this.cfg.budget,
        planner: this.cfg.planner,
        cat: this.cfg.cat,
        degree: this.cfg.degree,
        nodeLimit: 1 << 30,
        expandLimit: SUB_EXPAND_LIMIT,
        isLimitFatal: false,
        memoryLimitBytes: Number.POSITIVE_INFINITY,
        isSub: true,
        isRootDependent: true,
      }).run();
      if (sub.kind === 'solved') w = sub.soc - ci - cj;
      else if (sub.kind === 'infeasible') w = INFEASIBLE;
      else w = Math.max(1, sub.lowerBound - ci - cj);
    }
    this.weights.set(key, w);
    this.bytes += 48;
    return w;
  }
}

