/**
 * Everything between receiving an upload's files and storing them, as one job for a pool thread
 * (issue 13: a maximal upload checked on the event loop froze every other request for seconds):
 * opening archives, parsing and cross-checking every map and scenario, checksums, and the stored
 * forms (cells text, scenario rows as JSON) ready to bind. Bytes travel as Uint8Arrays that own
 * their ArrayBuffer, so they can be transferred between threads instead of copied.
 *
 * Scenarios may name maps already stored in the set; the job asks for those through `loadMaps`
 * (in a thread: a MessagePort to the request's event loop, which reads them from the database).
 */
import type { UploadProblem } from '@shared/instance-sets';
import { countPassable, gridMapFromRows, type GridMap } from '@solvers/io/grid-map';
import { checkUpload, scenarioMapNames } from './check-upload';
import { collectUpload } from './collect-upload';
import type { StoredScenarioRow } from './scenario-file.model';

/** One received file: its name as the client sent it and its bytes. */
export interface UploadFileBytes {
  readonly name: string;
  readonly bytes: Uint8Array;
}

/** A stored map of the set, as much as a scenario check needs. */
export interface ExistingMapRows {
  readonly name: string;
  readonly type: string;
  /** The map rows joined by '\n' (the `maps.cells` column). */
  readonly cells: string;
}

/** What a prepare job gets: the files, and the names the set already holds. */
export interface PrepareUploadJob {
  readonly files: readonly UploadFileBytes[];
  readonly mapNames: readonly string[];
  readonly scenarioNames: readonly string[];
}

/** Reads stored maps of the set by name (only names the job was told exist). */
export type LoadMaps = (names: readonly string[]) => Promise<readonly ExistingMapRows[]>;

/** A map ready to insert. */
export interface PreparedMap {
  readonly name: string;
  readonly type: string;
  readonly width: number;
  readonly height: number;
  readonly passableCount: number;
  /** UTF-8 of the rows joined by '\n'. */
  readonly cells: Uint8Array;
  readonly checksum: string;
  readonly original: Uint8Array;
}

/** A scenario ready to insert; `mapName` names a map of this upload or of the set. */
export interface PreparedScenario {
  readonly name: string;
  readonly mapName: string;
  readonly rowCount: number;
  readonly maxAgents: number;
  /** UTF-8 JSON of the StoredScenarioRow array. */
  readonly rows: Uint8Array;
  readonly checksum: string;
  readonly original: Uint8Array;
}

/** The outcome: the problems (nothing may be stored), or every file ready to store. */
export type PreparedUpload =
  | { readonly kind: 'refused'; readonly problems: readonly UploadProblem[] }
  | { readonly kind: 'ready'; readonly maps: readonly PreparedMap[]; readonly scenarios: readonly PreparedScenario[]; readonly skipped: readonly string[] };

/** Opens, checks and prepares the files of one upload; see the module comment. */
export async function prepareUpload(job: PrepareUploadJob, loadMaps: LoadMaps): Promise<PreparedUpload> {
  const collected = await collectUpload(job.files.map((f) => ({ originalname: f.name, buffer: asBuffer(f.bytes) })));
  // Past the byte limit the upload is refused whatever its files say; parsing them would only cost time.
  if (collected.isOverBudget) return { kind: 'refused', problems: collected.problems };
  const mapNames = new Set(job.mapNames);
  const uploaded = new Set(collected.entries.map((e) => e.name));
  const wanted = scenarioMapNames(collected.entries).filter((n) => mapNames.has(n) && !uploaded.has(n));
  const stored = wanted.length === 0 ? [] : await loadMaps(wanted);
  const maps = new Map<string, GridMap>(stored.map((m) => [m.name, gridMapFromRows(m.cells.split('\n'), { name: m.name, type: m.type })]));
  const checked = checkUpload(collected.entries, { mapNames, scenarioNames: new Set(job.scenarioNames), maps });
  const problems = [...collected.problems, ...checked.problems];
  if (problems.length > 0) return { kind: 'refused', problems };
  return {
    kind: 'ready',
    skipped: collected.skipped,
    maps: checked.maps.map((m) => ({
      name: m.name, type: m.map.type, width: m.map.width, height: m.map.height, passableCount: countPassable(m.map),
      cells: ownedBytes(Buffer.from(m.map.cellsText.join('\n'), 'utf8')), checksum: m.checksum, original: ownedBytes(m.bytes),
    })),
    scenarios: checked.scenarios.map((s) => {
      const rows = s.scenario.rows.map((r): StoredScenarioRow => [r.bucket, r.start[0], r.start[1], r.goal[0], r.goal[1], r.optimalLength]);
      return {
        name: s.name, mapName: s.mapName, rowCount: rows.length, maxAgents: s.maxAgents,
        rows: ownedBytes(Buffer.from(JSON.stringify(rows), 'utf8')), checksum: s.checksum, original: ownedBytes(s.bytes),
      };
    }),
  };
}

/** A Buffer view of `bytes` without copying. */
export function asBuffer(bytes: Uint8Array): Buffer {
  return Buffer.isBuffer(bytes) ? bytes : Buffer.from(bytes.buffer, bytes.byteOffset, bytes.byteLength);
}

/**
 * `bytes` itself when it spans its whole ArrayBuffer, else a copy that does: small Buffers are
 * slices of Node's shared 8 KiB pool, and transferring a pool would detach its other slices.
 */
export function ownedBytes(bytes: Uint8Array): Uint8Array {
  if (ownsBuffer(bytes)) return bytes;
  const copy = new Uint8Array(bytes.byteLength);
  copy.set(bytes);
  return copy;
}

/** Whether `bytes` spans the whole of a plain (not shared) ArrayBuffer; tagged by name, so it holds across realms. */
function ownsBuffer(bytes: Uint8Array): boolean {
  return bytes.byteOffset === 0 && bytes.byteLength === bytes.buffer.byteLength
    && Object.prototype.toString.call(bytes.buffer) === '[object ArrayBuffer]';
}

/**
 * The ArrayBuffers to transfer with `views`, each once; a view that does not own its buffer
 * (see ownedBytes) is left out of the list, so the message copies it instead.
 */
export function transferListOf(views: Iterable<Uint8Array>): ArrayBuffer[] {
  const seen = new Set<ArrayBuffer>();
  for (const v of views) {
    if (ownsBuffer(v) && v.byteLength > 0) seen.add(v.buffer as ArrayBuffer);
  }
  return [...seen];
}

/** The files of a job with bytes that own their buffers (copies only where needed), and the list to transfer. */
export function transferableJob(job: PrepareUploadJob): { readonly job: PrepareUploadJob; readonly transferList: ArrayBuffer[] } {
  const seen = new Set<ArrayBufferLike>();
  const files = job.files.map((f) => {
    // The same buffer twice (one Buffer sent as two files) is copied once more, so every file owns its own.
    const bytes = seen.has(f.bytes.buffer) ? ownedBytes(new Uint8Array(f.bytes)) : ownedBytes(f.bytes);
    seen.add(bytes.buffer);
    return { name: f.name, bytes };
  });
  return { job: { ...job, files }, transferList: transferListOf(files.map((f) => f.bytes)) };
}

/** The byte arrays of a prepared upload (to transfer it back from the thread). */
export function preparedBytes(prepared: PreparedUpload): Uint8Array[] {
  if (prepared.kind === 'refused') return [];
  return [...prepared.maps.flatMap((m) => [m.cells, m.original]), ...prepared.scenarios.flatMap((s) => [s.rows, s.original])];
}
