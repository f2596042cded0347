/**
 * The terrain characters of the grid map text format (N. Sturtevant, "Benchmarks for
 * Grid-Based Pathfinding", IEEE TCIAIG 4(2), 2012) and how a ground robot treats them.
 * The format itself also knows swamp (S, passable), water (W) and trees (T); MAPF work on
 * ground robots treats only `.`, `G` and `S` as passable (common practice): a wheeled robot can
 * neither drive through water nor through trees, so both block.
 */

/** Characters of passable cells: ground (`.`, `G`) and swamp (`S`). */
export const PASSABLE_CHARS = ['.', 'G', 'S'] as const;

/** Characters of blocked cells: out of bounds (`@`, `O`), trees (`T`) and water (`W`). */
export const BLOCKED_CHARS = ['@', 'O', 'T', 'W'] as const;

/** Every character a map row may contain, in the order error messages list them. */
export const TERRAIN_CHARS: readonly string[] = [...PASSABLE_CHARS, ...BLOCKED_CHARS];

/** Passability by character code: 1 passable, 0 blocked, -1 not a terrain character. */
const TERRAIN_BY_CODE: Int8Array = (() => {
  const table = new Int8Array(128).fill(-1);
  for (const ch of PASSABLE_CHARS) table[ch.charCodeAt(0)] = 1;
  for (const ch of BLOCKED_CHARS) table[ch.charCodeAt(0)] = 0;
  return table;
})();

/** 1 when the character is a passable terrain, 0 when blocked, -1 when it is no terrain at all. */
export function terrainOf(ch: string): -1 | 0 | 1 {
  const code = ch.charCodeAt(0);
  if (ch.length !== 1 || code >= 128) return -1;
  return TERRAIN_BY_CODE[code] as -1 | 0 | 1;
}
