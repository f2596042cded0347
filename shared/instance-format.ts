/**
 * Quarterturn's own JSON instance format, for importing and exporting one MAPF instance (a map
 * and its agents' tasks) as a single document. The JSON Schema in instance-format.schema.json is
 * generated from InstanceDocumentSchema (see instance-format-json-schema.ts) and kept in step by
 * a test; checks a JSON Schema cannot state (row lengths, agents on passable distinct cells) are
 * made by the zod schema only.
 */
import { z } from 'zod';
import { HEADINGS } from './plan';

/** The `format` value every instance document carries. */
export const INSTANCE_FORMAT = 'quarterturn-instance';

/** The format version this code reads and writes. */
export const INSTANCE_FORMAT_VERSION = 1;

/** Largest map width or height a document may declare. */
export const MAX_INSTANCE_MAP_SIDE = 8192;

/** Largest number of agents a document may hold. */
export const MAX_INSTANCE_AGENTS = 10000;

/** Terrain characters of passable cells (ground `.`, `G`; swamp `S`), as in the grid map text format. */
export const INSTANCE_PASSABLE_CHARS = '.GS';

/** Terrain characters of blocked cells (`@`, `O`; trees `T` and water `W` block ground robots). */
export const INSTANCE_BLOCKED_CHARS = '@OTW';

const side = z.number().int().min(1).max(MAX_INSTANCE_MAP_SIDE);
const coordinate = z.number().int().min(0).max(MAX_INSTANCE_MAP_SIDE - 1);
const cell = z.tuple([coordinate, coordinate]).meta({ description: '[x, y]: x = column, y = row, 0-based from the top-left cell' });

/** One agent: start and goal cells, and optionally the heading it starts with. */
export const InstanceAgentSchema = z.strictObject({
  start: cell,
  goal: cell,
  startHeading: z.enum(HEADINGS).optional().meta({ description: 'N is towards row 0, E towards larger x' }),
});

/** The map: its size and its rows of terrain characters, row 0 first. */
export const InstanceMapSchema = z.strictObject({
  name: z.string().min(1).max(200).optional(),
  type: z.string().regex(/^[^\s]+$/).max(40).optional().meta({ description: "the map file's type word, usually octile" }),
  width: side,
  height: side,
  rows: z.array(z.string().regex(/^[.GS@OTW]+$/, 'a map row holds only the terrain characters . G S @ O T W'))
    .min(1).max(MAX_INSTANCE_MAP_SIDE).meta({ description: 'height strings of width terrain characters; . G S passable, @ O T W blocked' }),
});

const InstanceDocumentShape = z.strictObject({
  format: z.literal(INSTANCE_FORMAT),
  version: z.literal(INSTANCE_FORMAT_VERSION),
  name: z.string().min(1).max(200).optional(),
  map: InstanceMapSchema,
  agents: z.array(InstanceAgentSchema).min(1).max(MAX_INSTANCE_AGENTS),
});

/** An instance document as parsed. */
export type InstanceDocument = z.infer<typeof InstanceDocumentShape>;

/** One agent of an instance document. */
export type InstanceAgent = z.infer<typeof InstanceAgentSchema>;

/** A whole instance document, with the checks a JSON Schema cannot express. */
export const InstanceDocumentSchema = InstanceDocumentShape.superRefine((doc, ctx) => checkInstanceDocument(doc, ctx)).meta({
  title: 'Quarterturn MAPF instance',
  description: 'A grid map and the agents\' start and goal cells. Beyond this schema, readers also require '
    + 'map.rows to hold map.height rows of map.width characters, and every start and goal to lie on a passable cell, '
    + 'with no two agents sharing a start or a goal.',
});

function checkInstanceDocument(doc: InstanceDocument, ctx: z.RefinementCtx): void {
  const { width, height, rows } = doc.map;
  // zod runs refinements after non-fatal issues too; skip what is not even shaped right.
  if (!Array.isArray(rows) || !Array.isArray(doc.agents)) return;
  const issue = (path: (string | number)[], message: string): void => {
    ctx.addIssue({ code: 'custom', path, message });
  };
  if (rows.length !== height) issue(['map', 'rows'], `map.rows has ${rows.length} rows, expected ${height} (map.height)`);
  rows.forEach((row, y) => {
    if (row.length !== width) issue(['map', 'rows', y], `map.rows[${y}] has ${row.length} cells, expected ${width} (map.width)`);
  });
  const used = { start: new Map<string, number>(), goal: new Map<string, number>() };
  doc.agents.forEach((agent, i) => {
    for (const end of ['start', 'goal'] as const) {
      if (!Array.isArray(agent?.[end])) continue;
      const [x, y] = agent[end];
      const at = `agents[${i}].${end}`;
      if (x >= width) issue(['agents', i, end, 0], `${at} x ${x} is outside the map (width ${width})`);
      if (y >= height) issue(['agents', i, end, 1], `${at} y ${y} is outside the map (height ${height})`);
      const row = rows[y];
      const terrain = typeof row === 'string' ? row[x] : undefined;
      if (terrain !== undefined && !INSTANCE_PASSABLE_CHARS.includes(terrain)) {
        issue(['agents', i, end], `${at} [${x}, ${y}] is a blocked cell ('${terrain}')`);
      }
      const key = `${x},${y}`;
      const other = used[end].get(key);
      if (other !== undefined) issue(['agents', i, end], `${at} [${x}, ${y}] is also the ${end} of agents[${other}]`);
      else used[end].set(key, i);
    }
  });
}
