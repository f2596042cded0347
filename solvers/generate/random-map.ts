/** Uniformly scattered single-cell obstacles at a given density. */
import { createRng } from '../random';
import { checkFraction, checkWhole, finishMap, rowsOf, type GeneratedMap } from './generated-map';

/** Options of generateRandomMap. */
export interface RandomMapOptions {
  readonly width: number;
  readonly height: number;
  /** Fraction of blocked cells in [0, 1); exactly round(density · width · height) cells are blocked. */
  readonly density: number;
  readonly seed: number;
}

/**
 * A map with round(density · cells) blocked cells chosen uniformly without replacement (a partial
 * Fisher–Yates shuffle). The free space need not be connected; the scenario generator keeps
 * each start and goal in one component.
 */
export function generateRandomMap(options: RandomMapOptions): GeneratedMap {
  const { width, height, density, seed } = options;
  checkWhole('width', width, 1);
  checkWhole('height', height, 1);
  checkFraction('density', density);
  const n = width * height;
  const blocked = Math.round(density * n);
  const order = new Int32Array(n);
  for (let i = 0; i < n; i++) order[i] = i;
  const rng = createRng(seed);
  const free = new Uint8Array(n).fill(1);
  for (let i = 0; i < blocked; i++) {
    const j = i + rng.int(n - i);
    const cell = order[j];
    order[j] = order[i];
    order[i] = cell;
    free[cell] = 0;
  }
  const percent = Math.round(density * 100);
  return finishMap(`random-w${width}-h${height}-d${percent}-seed${seed >>> 0}`, rowsOf(width, height, free));
}
