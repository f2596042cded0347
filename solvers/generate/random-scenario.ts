/**
 * Seeded scenarios for a map, laid out like the standard scenario files: rows in buckets of
 * floor(octile length / 4), optimal_length the octile distance (diagonal √2, no corner cutting),
 * every start and goal in the same 4-connected component, and no start or goal used twice in the
 * file, so that every prefix of k rows is a valid k-agent instance.
 */
import { connectedComponents } from '../grid/components';
import { createOctileSearch } from '../grid/octile-search';
import type { GridMap } from '../io/grid-map';
import { bucketOf } from '../io/scenario';
import { writeScenario, type ScenarioRowData } from '../io/write-scenario';
import { createRng, type Rng } from '../random';
import { checkWhole } from './generated-map';

/** Options of generateScenario. */
export interface ScenarioOptions {
  readonly seed: number;
  /** The map_file column, e.g. `rooms-4x4.map` (default: the map's name plus `.map`). */
  readonly mapFile?: string;
  /**
   * `even` (default): the same number of rows in every bucket that could be filled, rows shuffled;
   * `random`: `count` rows with uniformly drawn pairs, in the order drawn.
   */
  readonly mode?: 'even' | 'random';
  /** Rows per bucket in `even` mode (default 10). */
  readonly perBucket?: number;
  /** Rows in `random` mode (default 100). */
  readonly count?: number;
  /** At most this many start cells are tried (one octile search each; default 2000). */
  readonly maxSearches?: number;
  /** Checked before each search; when aborted, generation stops with an AbortError (an AbortSignal fits). */
  readonly signal?: { readonly aborted: boolean };
}

/** A generated scenario: its rows and its exact file text. */
export interface GeneratedScenario {
  readonly rows: readonly ScenarioRowData[];
  readonly text: string;
}

/**
 * Generates a scenario for a map. Each tried start cell (in a seeded random order, each at most
 * once) gets one goal; in `even` mode the goal is drawn from the least filled bucket reachable
 * from that start, and buckets still short of perBucket rows when the search ends are dropped.
 * Starts equal to goals are never drawn. Fewer rows than asked come back when the map runs out
 * of distinct cells or maxSearches is reached.
 */
export function generateScenario(map: GridMap, options: ScenarioOptions): GeneratedScenario {
  const mode = options.mode ?? 'even';
  const perBucket = options.perBucket ?? 10;
  const count = options.count ?? 100;
  const maxSearches = options.maxSearches ?? 2000;
  checkWhole('perBucket', perBucket, 1, 100000);
  checkWhole('count', count, 1, 100000);
  checkWhole('maxSearches', maxSearches, 1, 10000000);
  const rng = createRng(options.seed);
  const mapFile = options.mapFile ?? `${map.name ?? 'map'}.map`;
  const { label, sizes } = connectedComponents(map.grid);
  const starts: number[] = [];
  for (let c = 0; c < label.length; c++) if (label[c] >= 0 && sizes[label[c]] >= 2) starts.push(c);
  shuffle(starts, rng);

  const search = createOctileSearch(map.grid);
  const usedGoal = new Uint8Array(label.length);
  const rowOf = (start: number, goal: number, length: number): ScenarioRowData => ({
    bucket: bucketOf(length),
    mapFile,
    mapWidth: map.width,
    mapHeight: map.height,
    start: [start % map.width, Math.floor(start / map.width)],
    goal: [goal % map.width, Math.floor(goal / map.width)],
    optimalLength: length,
  });

  const rows: ScenarioRowData[] = [];
  const byBucket = new Map<number, ScenarioRowData[]>();
  const tries = Math.min(maxSearches, starts.length);
  for (let t = 0; t < tries; t++) {
    if (options.signal?.aborted) throw Object.assign(new Error('scenario generation was aborted'), { name: 'AbortError' });
    const start = starts[t];
    const dist = search.distancesFrom(start);
    const isGoal = (c: number): boolean => c !== start && usedGoal[c] === 0 && dist[c] < Infinity;
    let goal = -1;
    if (mode === 'random') {
      goal = pickNth(dist.length, isGoal, rng);
    } else {
      // Count the free goals per bucket, then serve the least filled bucket this start can reach.
      const available = new Map<number, number>();
      for (let c = 0; c < dist.length; c++) if (isGoal(c)) {
        const b = bucketOf(dist[c]);
        available.set(b, (available.get(b) ?? 0) + 1);
      }
      let best = -1;
      let bestFill = perBucket;
      for (const b of [...available.keys()].sort((p, q) => p - q)) {
        const fill = byBucket.get(b)?.length ?? 0;
        if (!byBucket.has(b)) byBucket.set(b, []);
        if (fill < bestFill) {
          best = b;
          bestFill = fill;
        }
      }
      if (best >= 0) goal = pickNth(dist.length, (c) => isGoal(c) && bucketOf(dist[c]) === best, rng);
    }
    if (goal >= 0) {
      const row = rowOf(start, goal, dist[goal]);
      usedGoal[goal] = 1;
      if (mode === 'random') rows.push(row);
      else byBucket.get(row.bucket)?.push(row);
    }
    if (mode === 'random' && rows.length === count) break;
    if (mode === 'even' && [...byBucket.values()].every((b) => b.length === perBucket)) break;
  }
  if (mode === 'even') {
    for (const b of [...byBucket.keys()].sort((p, q) => p - q)) {
      const bucketRows = byBucket.get(b) ?? [];
      if (bucketRows.length === perBucket) rows.push(...bucketRows);
    }
    shuffle(rows, rng);
  }
  return { rows, text: writeScenario(rows) };
}

/** A uniformly drawn index i in [0, n) with accept(i), or -1 when there is none (two passes, no allocation). */
function pickNth(n: number, accept: (i: number) => boolean, rng: Rng): number {
  let total = 0;
  for (let i = 0; i < n; i++) if (accept(i)) total++;
  if (total === 0) return -1;
  let k = rng.int(total);
  for (let i = 0; i < n; i++) if (accept(i) && k-- === 0) return i;
  return -1;
}

function shuffle<T>(items: T[], rng: Rng): void {
  for (let i = items.length - 1; i > 0; i--) {
    const j = rng.int(i + 1);
    [items[i], items[j]] = [items[j], items[i]];
  }
}
