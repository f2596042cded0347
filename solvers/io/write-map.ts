/** Writer for the grid map text format; `parseMap(writeMap(m))` gives `m` back. */
import type { GridMap } from './grid-map';

/** The map file text of a map: header, `map`, then the rows as kept in `cellsText`, LF line ends. */
export function writeMap(map: GridMap): string {
  return [`type ${map.type}`, `height ${map.height}`, `width ${map.width}`, 'map', ...map.cellsText, ''].join('\n');
}
