/**
 * The instance library's HTTP contract: instance sets, their maps and scenarios, uploads and
 * the server-side generator. Request bodies are zod schemas (the API validates with them, the
 * web builds them); responses are plain interfaces. Cells are [x, y], x = column, y = row.
 */
import { z } from 'zod';
import type { CellXY } from './plan';
import { multiLineText, singleLineText } from './text-field';

/** Who may see a set: everyone, or only its owner plus maintainers and admins. */
export const VISIBILITIES = ['public', 'private'] as const;
export type Visibility = (typeof VISIBILITIES)[number];

/** Upload limits the server enforces (and the web shows before sending). */
export const UPLOAD_LIMITS = {
  /** Bytes per uploaded file, archive or not. */
  maxFileBytes: 8 * 1024 * 1024,
  /** Cells a map side may have. */
  maxMapSide: 1024,
  /** Entries one archive may hold (directories included). */
  maxArchiveEntries: 1000,
  /** Files one request may carry. */
  maxFilesPerUpload: 1000,
  /** Bytes of every map and scenario of one upload together, after unzipping (zip-bomb guard). */
  maxTotalBytes: 64 * 1024 * 1024,
} as const;

/** The multipart field that carries the files of POST /api/instance-sets/:id/files. */
export const UPLOAD_FIELD = 'files';

/** POST /api/instance-sets: answers the new InstanceSetDetail with 201. */
export const CreateInstanceSetRequest = z.object({
  name: singleLineText().min(1, 'a name is required').max(120),
  description: multiLineText().max(4000).default(''),
  visibility: z.enum(VISIBILITIES).default('private'),
  /** Where the files come from and under which licence they may be used. */
  source: multiLineText().max(2000).default(''),
}).strict();
export type CreateInstanceSetRequest = z.input<typeof CreateInstanceSetRequest>;

/**
 * PATCH /api/instance-sets/:id: the fields to change (at least one); answers the InstanceSetDetail.
 * A name the set's owner already uses for another set is refused with 409 CONFLICT naming `name`.
 */
export const UpdateInstanceSetRequest = z.object({
  name: singleLineText().min(1, 'a name is required').max(120).optional(),
  description: multiLineText().max(4000).optional(),
  visibility: z.enum(VISIBILITIES).optional(),
  source: multiLineText().max(2000).optional(),
}).strict().refine((r) => Object.values(r).some((v) => v !== undefined), { message: 'name a field to change: name, description, visibility or source' });
export type UpdateInstanceSetRequest = z.input<typeof UpdateInstanceSetRequest>;

/** One entry of a 409 CONFLICT answer's `details`: the field whose value is already taken (same shape as validation details). */
export interface ConflictDetail {
  readonly path: readonly string[];
  readonly code: 'taken';
  readonly message: string;
}

/** Query of GET /api/instance-sets: a search text on name and description, 1-based page. */
export const InstanceSetListQuery = z.object({
  q: singleLineText().max(120).optional(),
  page: z.coerce.number().int().min(1).max(100_000).default(1),
  pageSize: z.coerce.number().int().min(1).max(100).default(20),
});
export type InstanceSetListQuery = z.input<typeof InstanceSetListQuery>;

/** The owner of a set as shown next to it. */
export interface OwnerSummary {
  readonly id: number;
  readonly login: string;
  readonly displayName: string;
}

/** One row of the instance set table. */
export interface InstanceSetSummary {
  readonly id: number;
  readonly name: string;
  readonly description: string;
  readonly visibility: Visibility;
  readonly source: string;
  readonly owner: OwnerSummary;
  readonly mapCount: number;
  readonly scenarioCount: number;
  readonly createdAt: string;
  readonly updatedAt: string;
}

/** GET /api/instance-sets. */
export interface InstanceSetListResponse {
  readonly items: readonly InstanceSetSummary[];
  /** Sets matching the query that the viewer may see, over all pages. */
  readonly total: number;
  readonly page: number;
  readonly pageSize: number;
}

/** A stored map without its cells. */
export interface MapSummary {
  readonly id: number;
  readonly instanceSetId: number;
  /** The file name as uploaded, e.g. `empty-8-8.map`; unique within the set. */
  readonly name: string;
  readonly width: number;
  readonly height: number;
  readonly passableCount: number;
  /** sha256 of the uploaded bytes, lower-case hex. */
  readonly checksum: string;
  readonly byteSize: number;
}

/** A stored scenario without its rows. */
export interface ScenarioSummary {
  readonly id: number;
  readonly instanceSetId: number;
  readonly mapId: number;
  /** The file name as uploaded, e.g. `empty-8-8-even-1.scen`; unique within the set. */
  readonly name: string;
  readonly rowCount: number;
  /** The largest k whose first k rows have distinct starts and distinct goals. */
  readonly maxAgents: number;
  readonly checksum: string;
  readonly byteSize: number;
}

/** GET /api/instance-sets/:id. */
export interface InstanceSetDetail extends InstanceSetSummary {
  readonly maps: readonly MapSummary[];
  readonly scenarios: readonly ScenarioSummary[];
  /** Whether the viewer may upload to, generate into and delete this set. */
  readonly canManage: boolean;
}

/** GET /api/maps/:id: the map with its cells, one string of `width` terrain characters per row. */
export interface MapDetail extends MapSummary {
  /** The `type` header word, usually `octile`. */
  readonly type: string;
  readonly rows: readonly string[];
  /** Scenarios of the set that belong to this map. */
  readonly scenarios: readonly ScenarioSummary[];
}

/**
 * GET /api/instance-sets/:id/deletion-preview, /api/maps/:id/deletion-preview and
 * /api/scenarios/:id/deletion-preview: what deleting the set or file takes with it. The database
 * cascades (migrations 0100, 0200, 0400): a set takes its maps and scenarios, a map its scenarios;
 * a scenario takes the sweep runs, the results (with their execution replays and leaderboard
 * entries) and the plan submissions over it. The sweeps themselves stay, with fewer runs.
 */
export interface DeletionPreview {
  readonly kind: 'set' | 'map' | 'scenario';
  readonly id: number;
  readonly name: string;
  /** Maps that go too (a set's maps; 0 otherwise). */
  readonly maps: number;
  /** Scenarios that go too (a set's or a map's scenarios; 0 for a scenario). */
  readonly scenarios: number;
  /** Sweep runs that go. */
  readonly runs: number;
  /** Stored results that go, sweep results and submitted plans together. */
  readonly results: number;
  /** Of those results, how many came from plan submissions. */
  readonly submissions: number;
  /** Sweeps that lose runs (they stay, with fewer runs). */
  readonly sweeps: number;
}

/** One start/goal pair of a scenario as the client sees it. */
export interface ScenarioRowView {
  readonly bucket: number;
  readonly start: CellXY;
  readonly goal: CellXY;
  /** The octile distance from start to goal as given in the file. */
  readonly optimalLength: number;
}

/** GET /api/scenarios/:id. */
export interface ScenarioDetail extends ScenarioSummary {
  readonly mapName: string;
  readonly rows: readonly ScenarioRowView[];
}

/** One problem of an upload: the file, 1-based line and column (0 = the whole file) and what is wrong. */
export interface UploadProblem {
  readonly file: string;
  readonly line: number;
  readonly column: number;
  readonly message: string;
}

/** The error code of a refused upload; `details` is an UploadProblem[] covering every file. */
export const INVALID_INSTANCE_FILES = 'INVALID_INSTANCE_FILES';

/** POST /api/instance-sets/:id/files and POST /api/instance-sets/generate (201): what was stored. */
export interface UploadResponse {
  readonly maps: readonly MapSummary[];
  readonly scenarios: readonly ScenarioSummary[];
  /** Archive entries passed over because they are neither `.map` nor `.scen` (e.g. a README). */
  readonly skipped: readonly string[];
}

const whole = (min: number, max: number) => z.number().int().min(min).max(max);
const side = whole(1, UPLOAD_LIMITS.maxMapSide);
const fraction = z.number().min(0).lt(1);

/** The map generators and their parameters (see solvers/generate); every kind takes a seed. */
export const MapGeneratorSpec = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('empty'), width: side, height: side }).strict(),
  z.object({ kind: z.literal('random'), width: side, height: side, density: z.number().min(0).max(0.6) }).strict(),
  z.object({
    kind: z.literal('rooms'), roomsX: whole(1, 64), roomsY: whole(1, 64), roomWidth: whole(1, 64), roomHeight: whole(1, 64),
    doorWidth: whole(1, 64).optional(), extraDoorRate: z.number().min(0).max(1).optional(),
  }).strict(),
  z.object({
    kind: z.literal('maze'), cellsX: whole(1, 256), cellsY: whole(1, 256),
    corridorWidth: whole(1, 16).optional(), wallWidth: whole(1, 16).optional(),
  }).strict(),
  z.object({
    kind: z.literal('warehouse'), shelfColumns: whole(1, 128), shelfRows: whole(1, 128), shelfLength: whole(1, 64),
    shelfDepth: whole(1, 8).optional(), aisleWidth: whole(1, 8).optional(), crossAisleWidth: whole(1, 8).optional(),
    margin: whole(0, 32).optional(), gapRate: fraction.optional(),
  }).strict(),
]);
export type MapGeneratorSpec = z.infer<typeof MapGeneratorSpec>;

/** The map generator kinds in the order forms list them. */
export const MAP_GENERATOR_KINDS = ['empty', 'random', 'rooms', 'maze', 'warehouse'] as const;

/** POST /api/instance-sets/generate: one generated map and `scenarioCount` scenarios for it, stored in a set. */
export const GenerateInstancesRequest = z.object({
  instanceSetId: z.number().int().positive(),
  map: MapGeneratorSpec,
  /** Map file name to store (default: the generator's name plus `.map`). */
  name: z.string().trim().regex(/^[A-Za-z0-9][A-Za-z0-9._-]{0,120}$/, 'letters, digits, dot, dash and underscore only').optional(),
  scenarioCount: whole(0, 10).default(1),
  /** `even`: rows spread evenly over distance buckets; `random`: rows drawn uniformly. */
  scenarioMode: z.enum(['even', 'random']).default('even'),
  /** Rows per bucket (even) or rows in all (random). */
  rowsPerBucket: whole(1, 100).default(10),
  rowCount: whole(1, 1000).default(100),
  seed: z.number().int().min(0).max(0xffffffff),
}).strict();
export type GenerateInstancesRequest = z.input<typeof GenerateInstancesRequest>;
