/**
 * The example external solver shipped with Quarterturn (issue 16, item 4): a stand-alone program
 * that Quarterturn runs as a child process like any solver written elsewhere. It imports nothing
 * from Quarterturn: it reads the map and scenario files in the standard MAPF formats and writes
 * the plan in Quarterturn's plain text plan format (shared/plan-format-text.ts), one line per
 * agent. So it also shows what an external solver has to do.
 *
 *   node --import tsx solvers/cli/external-example/prioritised-astar.ts \
 *     --map FILE.map --scenario FILE.scen --agents N --plan OUT.txt [--time-limit-ms MS]
 *
 * Algorithm: prioritised planning (Erdmann and Lozano-Pérez, "On multiple moving objects",
 * Algorithmica 1987), each agent planned by a space-time A* (as in the cooperative A* of
 * D. Silver, "Cooperative Pathfinding", AIIDE 2005) against a reservation table of the agents
 * planned before it, in scenario order. Both cited from memory. Moves: the four neighbours or
 * wait, one unit step each. Conflicts avoided: two agents in one cell at one step (vertex) and two
 * agents swapping cells in one step (edge), the classic model's rules; an agent that has arrived
 * stays on its goal, so a goal is reserved from the arrival on, and an agent ends its path only
 * at a step after which nobody earlier passes its goal. Neither optimal nor complete: an agent
 * whose way is blocked by earlier ones gets no path (exit status 2).
 *
 * Exit status: 0 plan written; 1 bad input; 2 no plan found; 3 time limit reached (the caller
 * kills the process at its limit anyway; stopping a little earlier says why).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { parseArgs } from 'node:util';

interface Grid {
  readonly width: number;
  readonly height: number;
  readonly free: Uint8Array;
}

interface Agent {
  readonly start: number;
  readonly goal: number;
}

class InputError extends Error {}

/** The standard .map format: `type`, `height H`, `width W`, `map`, then H rows; `.`, `G` and `S` are free cells. */
export function readMap(text: string): Grid {
  const lines = text.split(/\r?\n/);
  let width = -1;
  let height = -1;
  let row = 0;
  for (; row < lines.length; row++) {
    const line = lines[row].trim();
    const [key, value] = line.split(/\s+/);
    if (key === 'height') height = Number(value);
    else if (key === 'width') width = Number(value);
    else if (key === 'map') break;
  }
  if (!(width > 0 && height > 0)) throw new InputError('the map file lacks its width or height');
  const free = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) {
    const line = lines[row + 1 + y];
    if (line === undefined || line.length < width) throw new InputError(`map row ${y} is missing or shorter than ${width}`);
    for (let x = 0; x < width; x++) free[y * width + x] = '.GS'.includes(line[x]) ? 1 : 0;
  }
  return { width, height, free };
}

/** The standard .scen format: a `version` line, then rows `bucket map width height sx sy gx gy optimal`, tab-separated. */
export function readScenario(text: string, grid: Grid, agents: number): Agent[] {
  const rows = text.split(/\r?\n/).filter((l) => l.trim() !== '' && !/^version/i.test(l.trim()));
  if (rows.length < agents) throw new InputError(`the scenario has ${rows.length} rows, fewer than ${agents} agents`);
  return rows.slice(0, agents).map((line, i) => {
    const f = line.split('\t');
    const [sx, sy, gx, gy] = [f[4], f[5], f[6], f[7]].map(Number);
    const cell = (x: number, y: number) => {
      if (!(Number.isInteger(x) && Number.isInteger(y) && x >= 0 && y >= 0 && x < grid.width && y < grid.height) || !grid.free[y * grid.width + x]) {
        throw new InputError(`scenario row ${i + 1}: (${x},${y}) is not a free cell of the map`);
      }
      return y * grid.width + x;
    };
    return { start: cell(sx, sy), goal: cell(gx, gy) };
  });
}

function neighbours(grid: Grid, cell: number): number[] {
  const x = cell % grid.width;
  const y = (cell - x) / grid.width;
  const out = [cell];
  if (x > 0 && grid.free[cell - 1]) out.push(cell - 1);
  if (x + 1 < grid.width && grid.free[cell + 1]) out.push(cell + 1);
  if (y > 0 && grid.free[cell - grid.width]) out.push(cell - grid.width);
  if (y + 1 < grid.height && grid.free[cell + grid.width]) out.push(cell + grid.width);
  return out;
}

/** Breadth-first distances to `goal` (the A* heuristic: exact when nobody is in the way). */
function distancesTo(grid: Grid, goal: number): Int32Array {
  const d = new Int32Array(grid.width * grid.height).fill(-1);
  d[goal] = 0;
  const queue = [goal];
  for (let i = 0; i < queue.length; i++) {
    for (const n of neighbours(grid, queue[i])) {
      if (d[n] < 0) {
        d[n] = d[queue[i]] + 1;
        queue.push(n);
      }
    }
  }
  return d;
}

/** Cells and moves taken by the agents planned so far. */
class Reservations {
  private readonly vertex = new Set<string>();
  private readonly edge = new Set<string>();
  /** Per cell, the step from which an arrived agent occupies it for good. */
  private readonly parked = new Map<number, number>();
  /** Per cell, the last step at which some planned agent is in it (before parking). */
  private readonly lastUse = new Map<number, number>();

  isFree(cell: number, t: number): boolean {
    const p = this.parked.get(cell);
    return (p === undefined || t < p) && !this.vertex.has(`${cell}:${t}`);
  }

  /** Whether moving from `from` to `to` between t − 1 and t swaps with a planned agent. */
  isSwap(from: number, to: number, t: number): boolean {
    return from !== to && this.edge.has(`${to}>${from}:${t}`);
  }

  /** The last step at which a planned agent is in `cell` (−1: never). */
  lastUseOf(cell: number): number {
    return this.lastUse.get(cell) ?? -1;
  }

  add(path: readonly number[]): void {
    path.forEach((cell, t) => {
      this.vertex.add(`${cell}:${t}`);
      this.lastUse.set(cell, Math.max(this.lastUse.get(cell) ?? -1, t));
      if (t > 0) this.edge.add(`${path[t - 1]}>${cell}:${t}`);
    });
    this.parked.set(path[path.length - 1], path.length - 1);
  }
}

/** A binary min-heap of [f, h, node] (ties: smaller h first, then insertion). */
class Heap {
  private readonly items: [number, number, number][] = [];
  get size(): number {
    return this.items.length;
  }
  push(item: [number, number, number]): void {
    const a = this.items;
    a.push(item);
    for (let i = a.length - 1; i > 0;) {
      const p = (i - 1) >> 1;
      if (!less(a[i], a[p])) break;
      [a[i], a[p]] = [a[p], a[i]];
      i = p;
    }
  }
  pop(): [number, number, number] {
    const a = this.items;
    const top = a[0];
    const last = a.pop()!;
    if (a.length > 0) {
      a[0] = last;
      for (let i = 0; ;) {
        const l = 2 * i + 1;
        const r = l + 1;
        let m = i;
        if (l < a.length && less(a[l], a[m])) m = l;
        if (r < a.length && less(a[r], a[m])) m = r;
        if (m === i) break;
        [a[i], a[m]] = [a[m], a[i]];
        i = m;
      }
    }
    return top;
  }
}
const less = (a: [number, number, number], b: [number, number, number]) => a[0] < b[0] || (a[0] === b[0] && a[1] < b[1]);

/** Space-time A* for one agent against `reserved`; null when no path exists within `horizon` steps. */
function spaceTimeAStar(grid: Grid, agent: Agent, reserved: Reservations, horizon: number, deadline: number): number[] | null {
  const h = distancesTo(grid, agent.goal);
  if (h[agent.start] < 0) return null;
  if (!reserved.isFree(agent.start, 0)) return null;
  const cells = grid.width * grid.height;
  // Node id = t * cells + cell; parents kept in a map (only visited nodes cost memory).
  const parent = new Map<number, number>();
  const open = new Heap();
  const startId = agent.start;
  parent.set(startId, -1);
  open.push([h[agent.start], h[agent.start], startId]);
  const goalFrom = reserved.lastUseOf(agent.goal) + 1;
  let expanded = 0;
  while (open.size > 0) {
    const [, , id] = open.pop();
    const cell = id % cells;
    const t = (id - cell) / cells;
    if (cell === agent.goal && t >= goalFrom) {
      const path: number[] = [];
      for (let n = id; n >= 0; n = parent.get(n)!) path.push(n % cells);
      return path.reverse();
    }
    if (t >= horizon) continue;
    if (++expanded % 4096 === 0 && performance.now() > deadline) throw new TimeUp();
    for (const next of neighbours(grid, cell)) {
      const nid = (t + 1) * cells + next;
      if (parent.has(nid) || h[next] < 0) continue;
      if (!reserved.isFree(next, t + 1) || reserved.isSwap(cell, next, t + 1)) continue;
      parent.set(nid, id);
      open.push([t + 1 + h[next], h[next], nid]);
    }
  }
  return null;
}

class TimeUp extends Error {}

/** Plans every agent in order; the paths, or the index of the agent that got none. */
export function prioritisedPlanning(grid: Grid, agents: readonly Agent[], deadline: number): { readonly paths: number[][] } | { readonly failed: number } {
  const reserved = new Reservations();
  const paths: number[][] = [];
  let longest = 0;
  for (let i = 0; i < agents.length; i++) {
    // Past every earlier agent's last move the way is as free as it will ever be, so a path
    // needs at most that many steps plus the longest shortest path (at most the free cells).
    const horizon = longest + grid.free.reduce((n, f) => n + f, 0) + 1;
    const path = spaceTimeAStar(grid, agents[i], reserved, horizon, deadline);
    if (!path) return { failed: i };
    reserved.add(path);
    paths.push(path);
    longest = Math.max(longest, path.length);
  }
  return { paths };
}

const USAGE = 'usage: prioritised-astar --map FILE --scenario FILE --agents N --plan OUT [--time-limit-ms MS]\n';

function main(): number {
  let values: { map?: string; scenario?: string; agents?: string; plan?: string; 'time-limit-ms'?: string };
  try {
    ({ values } = parseArgs({
      options: {
        map: { type: 'string' }, scenario: { type: 'string' }, agents: { type: 'string' }, plan: { type: 'string' },
        'time-limit-ms': { type: 'string' },
      },
    }));
  } catch (err) {
    process.stderr.write(`${(err as Error).message}\n${USAGE}`);
    return 1;
  }
  const started = performance.now();
  const agentCount = Number(values.agents);
  if (!values.map || !values.scenario || !values.plan || !Number.isInteger(agentCount) || agentCount < 1) {
    process.stderr.write(USAGE);
    return 1;
  }
  const limit = values['time-limit-ms'] === undefined ? Infinity : Number(values['time-limit-ms']);
  // Stop a little before the caller's limit, so the reason is ours and not a kill.
  const deadline = started + Math.max(0, limit * 0.9);
  let grid: Grid;
  let agents: Agent[];
  try {
    grid = readMap(readFileSync(values.map, 'utf8'));
    agents = readScenario(readFileSync(values.scenario, 'utf8'), grid, agentCount);
  } catch (err) {
    process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
    return 1;
  }
  try {
    const out = prioritisedPlanning(grid, agents, deadline);
    if ('failed' in out) {
      process.stderr.write(`prioritised planning found no path for agent ${out.failed} (scenario row ${out.failed + 1}) around the agents planned before it\n`);
      return 2;
    }
    const xy = (c: number) => `(${c % grid.width},${Math.floor(c / grid.width)})`;
    writeFileSync(values.plan, `${out.paths.map((p) => p.map(xy).join(' ')).join('\n')}\n`);
    return 0;
  } catch (err) {
    if (err instanceof TimeUp) {
      process.stderr.write(`time limit of ${limit} ms reached\n`);
      return 3;
    }
    throw err;
  }
}

if (require.main === module) process.exitCode = main();
