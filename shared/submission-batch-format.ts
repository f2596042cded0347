/**
 * Quarterturn's batch manifest (`format: "quarterturn-plan-batch"`, version 1): many plans for
 * many stored instances submitted at once to POST /api/submissions/batches, either as `batch.json`
 * at the root of a zip holding the plan files (each entry names its `file`), or as the JSON body
 * itself (each entry carries its plan `text`). A plan file is the plain text format or a plan
 * document (shared/plan-format.ts), told apart by `format` or else by the file's extension.
 * - A text plan's entry names what the text cannot: the instance (instance set by name or id, map
 *   and scenario by name, or the scenario id, and the agent count), the model (and k), the start
 *   heading, the solver and optionally the robot profile. `defaults` fills what entries leave out.
 * - A plan document names its instance, model and solver itself; its entry may add only a robot
 *   profile (as the single submission form does; a document naming another profile is refused).
 * The JSON Schema twin is shared/submission-batch-format.schema.json (generated from this schema).
 */
import { z } from 'zod';
import { HEADINGS } from './plan';
import { SolverInfoSchema, TEXT_FORMAT_MODELS } from './plan-format';
import { RobotProfileSchema } from './sweeps';
import { singleLineText } from './text-field';
import { BATCH_LIMITS, BATCH_MANIFEST_FORMAT } from './submission-batches';

export { BATCH_LIMITS, BATCH_MANIFEST_FILE, BATCH_MANIFEST_FORMAT, BATCH_UPLOAD_FIELD } from './submission-batches';

/** The instance a text plan is for: the scenario by id, or by name within an instance set (and map). */
export const BatchInstanceSchema = z.strictObject({
  /** The instance set's name (among the sets the submitter may see); `setId` instead when several share it. */
  set: singleLineText().min(1).max(120).optional(),
  setId: z.number().int().positive().max(2_147_483_647).optional(),
  /** The map's file name in the set, e.g. `room.map`; checked against the scenario's map when given. */
  map: singleLineText().min(1).max(255).optional(),
  /** The scenario's file name in the set, e.g. `room-1.scen`. */
  scenario: singleLineText().min(1).max(255).optional(),
  scenarioId: z.number().int().positive().max(2_147_483_647).optional(),
  agents: z.number().int().positive().max(1000),
});
/** A batch entry's instance reference. */
export type BatchInstance = z.output<typeof BatchInstanceSchema>;

const startHeading = z.enum([...HEADINGS, 'free']);

/** What `defaults` may fill for text plans (and the robot profile for every plan). */
export const BatchDefaultsSchema = z.strictObject({
  set: singleLineText().min(1).max(120).optional(),
  setId: z.number().int().positive().max(2_147_483_647).optional(),
  model: z.enum(TEXT_FORMAT_MODELS).optional(),
  k: z.number().int().min(0).max(20).optional(),
  startHeading: startHeading.optional(),
  solver: SolverInfoSchema.optional(),
  robotProfile: RobotProfileSchema.optional(),
});

/** One plan of a batch. */
export const BatchEntrySchema = z.strictObject({
  /** Path of the plan file inside the zip (zip batches). */
  file: singleLineText().min(1).max(255).optional(),
  /** The plan file's text (JSON batches). */
  text: z.string().min(1, 'the plan text is empty').max(BATCH_LIMITS.maxPlanChars).optional(),
  /** `json` = plan document, `text` = plain text format; absent: `.json` files and inline text starting with `{` are documents, the rest text. */
  format: z.enum(['json', 'text']).optional(),
  instance: BatchInstanceSchema.optional(),
  model: z.enum(TEXT_FORMAT_MODELS).optional(),
  k: z.number().int().min(0).max(20).optional(),
  startHeading: startHeading.optional(),
  solver: SolverInfoSchema.optional(),
  robotProfile: RobotProfileSchema.optional(),
});
/** One validated batch entry as written. */
export type BatchEntry = z.output<typeof BatchEntrySchema>;

/** A batch manifest. */
export const BatchManifestSchema = z.strictObject({
  format: z.literal(BATCH_MANIFEST_FORMAT),
  version: z.literal(1),
  defaults: BatchDefaultsSchema.optional(),
  plans: z.array(BatchEntrySchema).min(1, 'the batch holds no plans').max(BATCH_LIMITS.maxEntries, `at most ${BATCH_LIMITS.maxEntries} plans per batch`),
}).meta({
  title: 'Quarterturn plan batch manifest, version 1',
  description: 'batch.json at the root of a batch zip (entries name their plan `file`), or the JSON body of POST /api/submissions/batches '
    + '(entries carry the plan `text`). A text plan\'s entry (with `defaults`) must name instance, model and solver; a plan document\'s entry names '
    + 'at most a robot profile. The scenario is named by file name with its set, or by scenarioId. Rules beyond this schema are checked by the server.',
});
/** A validated batch manifest. */
export type BatchManifest = z.output<typeof BatchManifestSchema>;

/** A manifest problem: the zod path of the field and what is wrong with it. */
export interface BatchEntryProblem {
  readonly path: readonly (string | number)[];
  readonly message: string;
}

/** A batch entry with the defaults applied and its rules checked, ready to be read as a plan. */
export type ResolvedBatchEntry =
  | {
    readonly format: 'json';
    readonly file?: string;
    readonly text?: string;
    readonly robotProfile?: z.output<typeof RobotProfileSchema>;
  }
  | {
    readonly format: 'text';
    readonly file?: string;
    readonly text?: string;
    readonly instance: BatchInstance;
    readonly model: (typeof TEXT_FORMAT_MODELS)[number];
    readonly k?: number;
    readonly startHeading: z.output<typeof startHeading>;
    readonly solver: z.output<typeof SolverInfoSchema>;
    readonly robotProfile?: z.output<typeof RobotProfileSchema>;
  };

/** A resolved entry without its text: what a batch stores beside each plan. */
export type BatchPlanRequest = ResolvedBatchEntry extends infer E ? (E extends unknown ? Omit<E, 'text'> : never) : never;

/** Fields a plan document names itself, so its entry may not. */
const DOCUMENT_OWN_FIELDS = ['instance', 'model', 'k', 'startHeading', 'solver'] as const;

/**
 * Applies `defaults` to entry `index` and checks what the schema alone cannot: where the plan
 * comes from (`file` in a zip batch, `text` in a JSON one), what a text plan must name, and that a
 * plan document's entry leaves its own fields to the document. Problems carry manifest paths.
 */
export function resolveBatchEntry(
  manifest: BatchManifest, index: number, source: 'zip' | 'json',
): { ok: true; entry: ResolvedBatchEntry } | { ok: false; problems: BatchEntryProblem[] } {
  const e = manifest.plans[index];
  const d = manifest.defaults ?? {};
  const at = (...path: (string | number)[]) => ['plans', index, ...path];
  const problems: BatchEntryProblem[] = [];
  if (source === 'zip') {
    if (e.file === undefined) problems.push({ path: at('file'), message: 'name the plan file inside the zip' });
    if (e.text !== undefined) problems.push({ path: at('text'), message: 'a zip batch names plan files; put the text in a file of the zip' });
  } else {
    if (e.text === undefined) problems.push({ path: at('text'), message: 'give the plan file\'s text (a JSON batch carries no files)' });
    if (e.file !== undefined) problems.push({ path: at('file'), message: 'a JSON batch carries no files; give the plan as text, or send a zip' });
  }
  // A text-format plan never begins with "{" (its lines hold cells or # comments), so inline text is told apart by its first character.
  const format = e.format ?? (e.file !== undefined ? (e.file.toLowerCase().endsWith('.json') ? 'json' : 'text') : e.text?.trimStart().startsWith('{') ? 'json' : 'text');
  const robotProfile = e.robotProfile ?? d.robotProfile;
  if (format === 'json') {
    for (const field of DOCUMENT_OWN_FIELDS) {
      if (e[field] !== undefined) problems.push({ path: at(field), message: 'a plan document names this itself; leave it out of the manifest' });
    }
    if (problems.length > 0) return { ok: false, problems };
    return { ok: true, entry: { format, file: e.file, text: e.text, ...(robotProfile ? { robotProfile } : {}) } };
  }
  const model = e.model ?? d.model;
  const solver = e.solver ?? d.solver;
  const k = e.k ?? d.k;
  if (!e.instance) problems.push({ path: at('instance'), message: 'a text plan needs its instance: { set, map, scenario, agents } or { scenarioId, agents }' });
  if (!model) problems.push({ path: at('model'), message: `a text plan needs its model (${TEXT_FORMAT_MODELS.join(', ')}), here or in defaults` });
  if (!solver) problems.push({ path: at('solver'), message: 'a text plan needs its solver { name, version }, here or in defaults' });
  if (model === 'k-robust' && k === undefined) problems.push({ path: at('k'), message: 'k-robust needs k, here or in defaults' });
  // The default set is for scenarios named by file name; a scenario id needs none.
  const instance = e.instance && { ...e.instance, ...(e.instance.scenario !== undefined && e.instance.set === undefined && e.instance.setId === undefined ? { set: d.set, setId: d.setId } : {}) };
  if (instance) {
    const hasName = instance.scenario !== undefined;
    if (hasName === (instance.scenarioId !== undefined)) {
      problems.push({ path: at('instance'), message: 'name the scenario either by file name (scenario, with the set) or by scenarioId' });
    } else if (hasName && instance.set === undefined && instance.setId === undefined) {
      problems.push({ path: at('instance', 'set'), message: 'a scenario named by file name needs its instance set (set or setId, here or in defaults)' });
    }
    if (instance.set !== undefined && instance.setId !== undefined) problems.push({ path: at('instance', 'setId'), message: 'give the set by name or by id, not both' });
  }
  if (problems.length > 0 || !instance || !model || !solver) return { ok: false, problems };
  const clean = Object.fromEntries(Object.entries(instance).filter(([, v]) => v !== undefined)) as BatchInstance;
  return {
    ok: true,
    entry: {
      format, file: e.file, text: e.text, instance: clean, model, ...(model === 'k-robust' ? { k } : {}),
      startHeading: e.startHeading ?? d.startHeading ?? 'free', solver, ...(robotProfile ? { robotProfile } : {}),
    },
  };
}
