/** The empty grid: every cell free. */
import { checkWhole, finishMap, type GeneratedMap } from './generated-map';

/** Options of generateEmptyMap (there is nothing random; seed is accepted so all generators look alike). */
export interface EmptyMapOptions {
  readonly width: number;
  readonly height: number;
  readonly seed?: number;
}

/** A width × height map without obstacles. */
export function generateEmptyMap(options: EmptyMapOptions): GeneratedMap {
  checkWhole('width', options.width, 1);
  checkWhole('height', options.height, 1);
  const row = '.'.repeat(options.width);
  return finishMap(`empty-w${options.width}-h${options.height}`, Array.from({ length: options.height }, () => row));
}
