/**
 * The Action Dependency Graph (ADG) of W. Hönig, S. Kiesel, A. Tinka, J. W. Durham,
 * N. Ayanian, "Persistent and robust execution of MAPF schedules in warehouses", IEEE Robotics
 * and Automation Letters 4(2), 2019. Besides each robot's own order, an action that enters a
 * cell depends on the latest earlier-planned action of every other robot on that cell (one that
 * starts, ends or stays there); waiting for the latest implies the earlier ones.
 *
 * "Earlier-planned" on the `ms` timeline: a smaller nominal start. On the `steps` timeline: a
 * smaller step, or the same step when that action leaves the cell — classic plans allow
 * following, where one robot enters a cell in the step the other leaves it, and the follower
 * must wait until the leader has left.
 *
 * Guarantee (stated condition): if the plan is valid under the occupancy rule in its planned
 * order (no vertex or swap conflict; on `steps` following is fine) and cellPitch ≥ robot
 * diameter, dependency-gated execution never lets two disks overlap, whatever the timing: at
 * any moment the robots' occupied cells are disjoint, each robot lies on the segment between
 * the centres of its (at most two, adjacent) occupied cells, and two such segments with no
 * common cell are at least one pitch apart. Rotations (a cycle of robots each following the
 * next within one step, allowed by classic conflicts) make the graph cyclic: those actions, and
 * everything after them, never start — reported as a deadlock.
 */
import type { PreparedPlan } from './prepared-plan';

/** The ADG in compressed form plus a release order. */
export interface ActionDependencies {
  /** Cross-robot predecessors of action b are deps[depStart[b]] … deps[depStart[b + 1] − 1]. */
  readonly depStart: Int32Array;
  readonly deps: Int32Array;
  /** Actions that can ever start, in an order where every predecessor comes first. */
  readonly order: Int32Array;
  /** 1 for actions on or behind a dependency cycle (they never start). */
  readonly isBlocked: Uint8Array;
  readonly hasDeadlock: boolean;
}

/** Builds the Action Dependency Graph of a prepared plan and a topological release order (Kahn's algorithm). */
export function buildActionDependencies(p: PreparedPlan): ActionDependencies {
  const n = p.actionCount;
  const cells = p.instance.grid.passable.length;
  // Actions touching each cell, in index order (so per robot in plan order).
  const cellCount = new Int32Array(cells + 1);
  for (let a = 0; a < n; a++) {
    cellCount[p.fromCell[a] + 1]++;
    if (p.toCell[a] !== p.fromCell[a]) cellCount[p.toCell[a] + 1]++;
  }
  for (let c = 0; c < cells; c++) cellCount[c + 1] += cellCount[c];
  const cellActions = new Int32Array(cellCount[cells]);
  const fill = cellCount.slice(0, cells);
  for (let a = 0; a < n; a++) {
    cellActions[fill[p.fromCell[a]]++] = a;
    if (p.toCell[a] !== p.fromCell[a]) cellActions[fill[p.toCell[a]]++] = a;
  }

  const isSteps = p.timeline === 'steps';
  const latest = new Int32Array(p.robotCount).fill(-1);
  const touched: number[] = [];
  const depStart = new Int32Array(n + 1);
  const depList: number[] = [];
  for (let b = 0; b < n; b++) {
    depStart[b] = depList.length;
    if (p.kind[b] !== 0) continue;
    const c = p.toCell[b];
    const rb = p.robotOf[b];
    for (let k = cellCount[c]; k < cellCount[c + 1]; k++) {
      const a = cellActions[k];
      const ra = p.robotOf[a];
      if (ra === rb) continue;
      const isEarlier = isSteps
        ? p.step[a] < p.step[b] || (p.step[a] === p.step[b] && p.fromCell[a] === c && p.toCell[a] !== c)
        : p.plannedStart[a] < p.plannedStart[b];
      if (!isEarlier) continue;
      if (latest[ra] === -1) touched.push(ra);
      if (a > latest[ra]) latest[ra] = a;
    }
    touched.sort((x, y) => x - y);
    for (const r of touched) {
      depList.push(latest[r]);
      latest[r] = -1;
    }
    touched.length = 0;
  }
  depStart[n] = depList.length;
  const deps = Int32Array.from(depList);
  return { depStart, deps, ...releaseOrder(p, depStart, deps) };
}

function releaseOrder(p: PreparedPlan, depStart: Int32Array, deps: Int32Array): Pick<ActionDependencies, 'order' | 'isBlocked' | 'hasDeadlock'> {
  const n = p.actionCount;
  const indegree = new Int32Array(n);
  const succCount = new Int32Array(n + 1);
  for (let b = 0; b < n; b++) {
    indegree[b] = depStart[b + 1] - depStart[b] + (b > p.first[p.robotOf[b]] ? 1 : 0);
    for (let k = depStart[b]; k < depStart[b + 1]; k++) succCount[deps[k] + 1]++;
  }
  for (let a = 0; a < n; a++) succCount[a + 1] += succCount[a];
  const succ = new Int32Array(succCount[n]);
  const fill = succCount.slice(0, n);
  for (let b = 0; b < n; b++) for (let k = depStart[b]; k < depStart[b + 1]; k++) succ[fill[deps[k]]++] = b;

  const order = new Int32Array(n);
  let head = 0;
  let tail = 0;
  for (let a = 0; a < n; a++) if (indegree[a] === 0) order[tail++] = a;
  while (head < tail) {
    const a = order[head++];
    const release = (b: number): void => {
      if (--indegree[b] === 0) order[tail++] = b;
    };
    if (a + 1 < p.first[p.robotOf[a] + 1]) release(a + 1);
    for (let k = succCount[a]; k < succCount[a + 1]; k++) release(succ[k]);
  }
  const isBlocked = new Uint8Array(n).fill(1);
  for (let k = 0; k < tail; k++) isBlocked[order[k]] = 0;
  return { order: order.slice(0, tail), isBlocked, hasDeadlock: tail < n };
}
