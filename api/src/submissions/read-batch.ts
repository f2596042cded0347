/**
 * Reads a batch submission up front: the zip (its `batch.json` and the plan files it names) or the
 * JSON body, into one list of plans. Anything wrong with the batch as a whole (an unreadable zip,
 * a manifest that is not valid JSON or breaks the schema, an entry naming a file the zip lacks,
 * a plan past the size limit) is a 400 VALIDATION_FAILED naming file, line, column and field, and
 * nothing is stored; problems of one plan's content are that plan's outcome, found later.
 */
import type { ZodError } from 'zod';
import { JsonSyntaxError, lineColumnOf, locatedAt, parseLocatedJson, type LocatedJson } from '@shared/located-json';
import {
  BATCH_LIMITS, BATCH_MANIFEST_FILE, BATCH_MANIFEST_FORMAT, BatchManifestSchema, resolveBatchEntry,
  type BatchManifest, type BatchPlanRequest, type ResolvedBatchEntry,
} from '@shared/submission-batch-format';
import type { PlanFileProblem } from '@shared/submissions';
import { AppError } from '../errors/app-error';
import { ByteBudget } from '../instance-sets/byte-budget';
import { readZip } from '../instance-sets/read-zip';

/** One plan of a batch as read: where it is named, what the manifest says and its text. */
export interface BatchPlan {
  /** The plan file's path in the zip, or `plans[i]`. */
  readonly file: string;
  /** Line of the entry in batch.json; 0 for a JSON body. */
  readonly line: number;
  /** The entry with defaults applied, without its text. */
  readonly request: BatchPlanRequest;
  readonly text: string;
}

/** A batch as read. */
export interface ReadBatch {
  readonly source: 'zip' | 'json';
  readonly fileName: string | null;
  readonly plans: readonly BatchPlan[];
}

/** Problems reported in one 400 (the first ones; a broken manifest can have hundreds). */
const MAX_PROBLEMS = 20;

/** A zod path as `plans[2].instance.agents`. */
function fieldPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : `${out ? '.' : ''}${String(p)}`;
  return out || 'document';
}

function refuse(problems: readonly PlanFileProblem[]): never {
  const kept = problems.slice(0, MAX_PROBLEMS);
  const first = kept[0];
  const where = first.line > 0 ? `${first.file}, line ${first.line}, column ${first.column}` : first.file;
  const more = problems.length > 1 ? ` (and ${problems.length - 1} more problem${problems.length === 2 ? '' : 's'})` : '';
  throw new AppError('VALIDATION_FAILED', 400, `The batch was not accepted: ${where} (${first.field}): ${first.message}${more}. Nothing was stored.`, kept);
}

/** Locates problems in the manifest text (`root` null: the JSON body, which has no lines). */
function locator(file: string, text: string | null, root: LocatedJson | null): (path: readonly PropertyKey[], message: string) => PlanFileProblem {
  const position = text === null ? null : lineColumnOf(text);
  return (path, message) => {
    const at = root && position ? position(locatedAt(root, path).offset) : { line: 0, column: 0 };
    return { file, line: at.line, column: at.column, field: fieldPath(path), message };
  };
}

/** The manifest checked against the schema and the entry rules, or a 400 naming every problem. */
function checkManifest(
  value: unknown, source: 'zip' | 'json', problemAt: (path: readonly PropertyKey[], message: string) => PlanFileProblem,
): { manifest: BatchManifest; entries: ResolvedBatchEntry[] } {
  const parsed = BatchManifestSchema.safeParse(value);
  if (!parsed.success) refuse(schemaProblems(parsed.error, problemAt));
  const manifest = parsed.data;
  const entries: ResolvedBatchEntry[] = [];
  const problems: PlanFileProblem[] = [];
  manifest.plans.forEach((_, i) => {
    const resolved = resolveBatchEntry(manifest, i, source);
    if (resolved.ok) entries.push(resolved.entry);
    else problems.push(...resolved.problems.map((p) => problemAt(p.path, p.message)));
  });
  if (problems.length > 0) refuse(problems);
  return { manifest, entries };
}

function schemaProblems(err: ZodError, problemAt: (path: readonly PropertyKey[], message: string) => PlanFileProblem): PlanFileProblem[] {
  return err.issues.map((i) => problemAt(i.path, i.message));
}

/** Whether the top level is a bare array of entries (a JSON batch may be sent as just its plans). */
function asManifest(body: unknown): unknown {
  return Array.isArray(body) ? { format: BATCH_MANIFEST_FORMAT, version: 1, plans: body } : body;
}

/** Reads a JSON batch (the request body: a manifest whose entries carry `text`, or a bare array of such entries). */
export function readJsonBatch(body: unknown): ReadBatch {
  const problemAt = locator('request body', null, null);
  const { entries } = checkManifest(asManifest(body), 'json', problemAt);
  return {
    source: 'json', fileName: null,
    plans: entries.map(({ text, ...request }, i) => ({ file: `plans[${i}]`, line: 0, request, text: text ?? '' })),
  };
}

/** The folder of the manifest: `batch.json` at the root, or in the one top folder a zipped folder has. */
function findManifest(paths: readonly string[], archive: string): string {
  const found = paths.filter((p) => p === BATCH_MANIFEST_FILE || /^[^/]+\/batch\.json$/.test(p));
  const atRoot = found.filter((p) => p === BATCH_MANIFEST_FILE);
  if (atRoot.length === 1) return '';
  if (found.length === 1) return found[0].slice(0, -BATCH_MANIFEST_FILE.length);
  refuse([{
    file: archive, line: 0, column: 0, field: BATCH_MANIFEST_FILE,
    message: found.length === 0
      ? `the zip holds no ${BATCH_MANIFEST_FILE} (put the manifest at the root of the zip, beside or above the plan files)`
      : `the zip holds ${found.length} files named ${BATCH_MANIFEST_FILE} (${found.join(', ')}); keep one at the root`,
  }]);
}

/** Reads a zip batch: `batch.json` and the plan files its entries name (paths relative to the manifest's folder). */
export async function readZipBatch(archiveName: string, buffer: Buffer): Promise<ReadBatch> {
  const zip = await readZip(archiveName, buffer, new ByteBudget(BATCH_LIMITS.maxUnzippedBytes), () => true);
  if (zip.problems.length > 0) refuse(zip.problems.map((p) => ({ ...p, field: 'archive' })));
  const prefix = `${archiveName}:`;
  const files = new Map(zip.entries.map((e) => [e.label.slice(prefix.length), e.bytes] as const));
  const folder = findManifest([...files.keys()], archiveName);
  const manifestFile = `${folder}${BATCH_MANIFEST_FILE}`;
  const text = (files.get(manifestFile) ?? Buffer.alloc(0)).toString('utf8');
  let root: LocatedJson;
  try {
    root = parseLocatedJson(text);
  } catch (err) {
    const at = err instanceof JsonSyntaxError ? lineColumnOf(text)(err.offset) : { line: 0, column: 0 };
    refuse([{ file: manifestFile, ...at, field: 'document', message: `not valid JSON: ${err instanceof Error ? err.message : String(err)}` }]);
  }
  const problemAt = locator(manifestFile, text, root);
  const { entries } = checkManifest(root.value, 'zip', problemAt);
  const problems: PlanFileProblem[] = [];
  const plans: BatchPlan[] = [];
  entries.forEach(({ text: _text, ...request }, i) => {
    const path = `${folder}${request.file ?? ''}`;
    const bytes = files.get(path);
    const line = problemAt(['plans', i], '').line;
    if (!bytes) {
      problems.push(problemAt(['plans', i, 'file'], `the zip holds no file ${path}`));
      return;
    }
    if (bytes.length > BATCH_LIMITS.maxPlanChars) {
      problems.push(problemAt(['plans', i, 'file'], `${path} is ${bytes.length} bytes; a plan file may have at most ${BATCH_LIMITS.maxPlanChars}`));
      return;
    }
    plans.push({ file: path, line, request, text: bytes.toString('utf8') });
  });
  if (problems.length > 0) refuse(problems);
  return { source: 'zip', fileName: archiveName, plans };
}
