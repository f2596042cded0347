/**
 * External solvers (issue 16, item 4): a program outside Quarterturn that a maintainer registers
 * under a name and version, with the plan models it solves and a command template. Sweep workers
 * that have it installed declare it (`WORKER_SOLVERS=name@version,…`); its runs go to them only.
 *
 * The command template is split into words at spaces and never given to a shell: every word
 * becomes one argument of the child process after its placeholders are replaced, so a value can
 * never start a second command or split into two arguments, whatever characters it holds. There is
 * no quoting; a path with spaces does not fit (common practice for argument templates without a
 * shell is to keep them that simple).
 *
 * Placeholders (`PLACEHOLDERS`): the worker writes the map and the scenario in the standard MAPF
 * file formats (Stern et al., SoCS 2019) into a fresh temporary folder and expects the plan at
 * `{plan}`, in Quarterturn's text format (shared/plan-format-text.ts) or its JSON plan document
 * (shared/plan-format.ts), as registered.
 */
import { z } from 'zod';
import { SINGLE_LINE_TEXT } from './control-characters';
import { PLAN_MODELS, type PlanModel } from './plan';
import { multiLineText } from './text-field';

/** What a placeholder stands for, for the form's help and the user guide. */
export const PLACEHOLDERS = {
  map: 'path of the map file (.map format)',
  scenario: 'path of the scenario file (.scen format); the first {agents} rows are the agents',
  agents: 'number of agents',
  plan: 'path where the solver writes its plan',
  timeLimitMs: "the run's time limit in ms (the process is killed at it)",
  memoryLimitMb: "the run's memory limit in MB (enforced by the operating system)",
  seed: "the run's seed",
  model: 'the plan model name, e.g. classic',
  k: 'k of k-robust (0 for other models)',
  startHeading: 'the start heading rule: N, E, S, W or free',
  scenarioId: "Quarterturn's id of the scenario (for the JSON plan document's instance)",
  node: 'the Node.js binary the worker runs on (for solvers written in TypeScript or JavaScript)',
} as const;
export type Placeholder = keyof typeof PLACEHOLDERS;

/** Placeholders every template must use: without them the solver cannot know the instance or where to write. */
export const REQUIRED_PLACEHOLDERS: readonly Placeholder[] = ['map', 'scenario', 'agents', 'plan'];

/** Plan file formats an external solver may write. */
export const EXTERNAL_PLAN_FORMATS = ['text', 'json'] as const;
export type ExternalPlanFormat = (typeof EXTERNAL_PLAN_FORMATS)[number];

/** Plan models the text format carries (weighted-split needs the JSON document's timed schedule). */
const TEXT_MODELS: readonly PlanModel[] = ['classic', 'uniform-duration', 'k-robust', 'orientation-split'];

/** Limits of a registration. */
export const EXTERNAL_SOLVER_LIMITS = {
  /** Name length: the board's variant `solver=name@version` must fit its 64 characters beside `k=20 start N`. */
  maxName: 24,
  maxVersion: 16,
  maxCommand: 1000,
  maxWords: 64,
} as const;

/** A solver name: lower-case letters, digits and hyphens, starting with a letter. */
export const SolverNameSchema = z.string().trim()
  .min(1, 'a solver name is required')
  .max(EXTERNAL_SOLVER_LIMITS.maxName, `a solver name has at most ${EXTERNAL_SOLVER_LIMITS.maxName} characters`)
  .regex(/^[a-z][a-z0-9-]*$/, 'a solver name takes lower-case letters, digits and hyphens, starting with a letter, e.g. prioritised-astar');

/** A solver version: letters, digits, dots, plus and hyphens, e.g. 1.0.0 or 2024-03. */
export const SolverVersionSchema = z.string().trim()
  .min(1, 'a solver version is required')
  .max(EXTERNAL_SOLVER_LIMITS.maxVersion, `a solver version has at most ${EXTERNAL_SOLVER_LIMITS.maxVersion} characters`)
  .regex(/^[0-9A-Za-z][0-9A-Za-z.+-]*$/, 'a solver version takes letters, digits, dots, plus signs and hyphens, e.g. 1.0.0');

/** Which registered solver: name and version. */
export const SolverRefSchema = z.object({ name: SolverNameSchema, version: SolverVersionSchema }).strict();
export type SolverRef = z.output<typeof SolverRefSchema>;

/** `name@version`: how workers declare a solver and how the board names its variant. */
export function solverKey(ref: SolverRef): string {
  return `${ref.name}@${ref.version}`;
}

/** Parses `name@version` (a WORKER_SOLVERS entry); a sentence when it is not one. */
export function parseSolverKey(text: string): { readonly ok: true; readonly ref: SolverRef } | { readonly ok: false; readonly message: string } {
  const at = text.lastIndexOf('@');
  if (at <= 0) return { ok: false, message: `"${text}" is not name@version, e.g. prioritised-astar@1.0.0` };
  const parsed = SolverRefSchema.safeParse({ name: text.slice(0, at), version: text.slice(at + 1) });
  if (!parsed.success) return { ok: false, message: `"${text}": ${parsed.error.issues[0].message}` };
  return { ok: true, ref: parsed.data };
}

/**
 * A solver a worker runs (WORKER_SOLVERS entry `name@version=sha256:<hex>`): the name and version
 * plus the SHA-256 of the command template its operator approved, whole (64 hex) or a prefix of at
 * least MIN_COMMAND_HASH_HEX. The worker reads the registration's command per run and refuses one
 * whose hash differs, so a maintainer who removes and re-registers a solver under another command
 * cannot make a worker run it. The list of registrations shows each command's hash.
 */
export interface WorkerSolver extends SolverRef {
  /** Lower-case hex, 16–64 characters: the approved command's SHA-256 or its beginning. */
  readonly commandSha256: string;
}

/** Fewest hex digits of an approved command hash (64 bits: no one finds a second command with the same prefix). */
export const MIN_COMMAND_HASH_HEX = 16;

/** Parses `name@version=sha256:<hex>` (a WORKER_SOLVERS entry); a sentence when it is not one. */
export function parseWorkerSolverEntry(text: string): { readonly ok: true; readonly solver: WorkerSolver } | { readonly ok: false; readonly message: string } {
  const eq = text.indexOf('=');
  const key = eq < 0 ? text : text.slice(0, eq);
  const parsed = parseSolverKey(key.trim());
  if (!parsed.ok) return parsed;
  const pin = eq < 0 ? '' : text.slice(eq + 1).trim();
  const hex = /^sha256:([0-9a-fA-F]+)$/.exec(pin)?.[1];
  if (hex === undefined || hex.length < MIN_COMMAND_HASH_HEX || hex.length > 64) {
    return {
      ok: false,
      message: `"${text}" must pin the approved command as ${solverKey(parsed.ref)}=sha256:<hex> (the command's SHA-256, or its first ${MIN_COMMAND_HASH_HEX} or more hex digits, as the list of external solvers shows it)`,
    };
  }
  return { ok: true, solver: { ...parsed.ref, commandSha256: hex.toLowerCase() } };
}

/** Whether a registration's command hash (64 hex) is the one a worker approved (whole or prefix). */
export function isApprovedCommand(approved: string, registeredSha256: string): boolean {
  return approved.length >= MIN_COMMAND_HASH_HEX && registeredSha256.toLowerCase().startsWith(approved.toLowerCase());
}

/** One word of a parsed template: literal pieces and placeholders in order. */
export type TemplatePiece = { readonly text: string } | { readonly placeholder: Placeholder };
export type TemplateWord = readonly TemplatePiece[];

/** A parsed template, or the problems that refuse it. */
export type ParsedTemplate =
  | { readonly ok: true; readonly words: readonly TemplateWord[] }
  | { readonly ok: false; readonly problems: readonly string[] };

const isPlaceholder = (name: string): name is Placeholder => Object.prototype.hasOwnProperty.call(PLACEHOLDERS, name);

/** Splits a command template into words and their placeholders (see the module comment). */
export function parseCommandTemplate(template: string): ParsedTemplate {
  const problems: string[] = [];
  const words: TemplateWord[] = [];
  const used = new Set<Placeholder>();
  const raw = template.trim().split(/\s+/).filter((w) => w !== '');
  if (raw.length === 0) return { ok: false, problems: ['the command is empty'] };
  if (raw.length > EXTERNAL_SOLVER_LIMITS.maxWords) problems.push(`the command has ${raw.length} words; at most ${EXTERNAL_SOLVER_LIMITS.maxWords} are allowed`);
  raw.forEach((word, index) => {
    const pieces: TemplatePiece[] = [];
    const re = /\{([^{}]*)\}/g;
    let last = 0;
    for (let m = re.exec(word); m; m = re.exec(word)) {
      if (m.index > last) pieces.push({ text: word.slice(last, m.index) });
      const name = m[1];
      if (isPlaceholder(name)) {
        pieces.push({ placeholder: name });
        used.add(name);
      } else {
        problems.push(`word ${index + 1} ("${word}"): {${name}} is not a placeholder; use ${Object.keys(PLACEHOLDERS).map((p) => `{${p}}`).join(', ')}`);
      }
      last = m.index + m[0].length;
    }
    if (last < word.length) pieces.push({ text: word.slice(last) });
    if (pieces.some((p) => 'text' in p && /[{}]/.test(p.text))) problems.push(`word ${index + 1} ("${word}") has a brace that opens or closes no placeholder`);
    words.push(pieces);
  });
  const first = words[0];
  const isNode = first.length === 1 && 'placeholder' in first[0] && first[0].placeholder === 'node';
  if (!isNode && first.some((p) => 'placeholder' in p)) problems.push('the program (first word) must be a fixed path or {node}, not another placeholder');
  for (const p of REQUIRED_PLACEHOLDERS) if (!used.has(p)) problems.push(`the command must use {${p}}`);
  return problems.length > 0 ? { ok: false, problems } : { ok: true, words };
}

/** The argument vector of one run: every word with its placeholders replaced (one word = one argument). */
export function commandArguments(words: readonly TemplateWord[], values: Readonly<Record<Placeholder, string>>): string[] {
  return words.map((pieces) => pieces.map((p) => ('text' in p ? p.text : values[p.placeholder])).join(''));
}

const commandSchema = z.string()
  .max(EXTERNAL_SOLVER_LIMITS.maxCommand, `the command has at most ${EXTERNAL_SOLVER_LIMITS.maxCommand} characters`)
  .regex(SINGLE_LINE_TEXT, 'the command must be one line without control characters or tabs')
  .superRefine((command, ctx) => {
    const parsed = parseCommandTemplate(command);
    if (!parsed.ok) for (const message of parsed.problems) ctx.addIssue({ code: 'custom', message });
  });

/** POST /api/external-solvers: a registration. */
export const ExternalSolverRequestSchema = z.object({
  name: SolverNameSchema,
  version: SolverVersionSchema,
  models: z.array(z.enum(PLAN_MODELS)).min(1, 'choose at least one plan model the solver solves')
    .refine((m) => new Set(m).size === m.length, 'each plan model at most once'),
  command: commandSchema,
  planFormat: z.enum(EXTERNAL_PLAN_FORMATS).default('text'),
  description: multiLineText().max(2000).default(''),
}).strict().superRefine((r, ctx) => {
  if (r.planFormat === 'text') {
    const wrong = r.models.filter((m) => !TEXT_MODELS.includes(m));
    if (wrong.length > 0) ctx.addIssue({ code: 'custom', path: ['models'], message: `${wrong.join(', ')} plans need the JSON plan format (the text format has no timed actions)` });
  }
});
export type ExternalSolverRequest = z.output<typeof ExternalSolverRequestSchema>;
export type ExternalSolverRequestInput = z.input<typeof ExternalSolverRequestSchema>;

/** A registered solver as the API answers it. */
export interface ExternalSolverView {
  readonly id: number;
  readonly name: string;
  readonly version: string;
  readonly models: readonly PlanModel[];
  readonly command: string;
  /** SHA-256 of `command` (hex): what a worker pins in WORKER_SOLVERS to approve this command. */
  readonly commandSha256: string;
  readonly planFormat: ExternalPlanFormat;
  readonly description: string;
  readonly registeredBy: { readonly id: number; readonly login: string } | null;
  readonly createdAt: string;
  /** Workers that declared this solver in the last WORKER_SEEN_WINDOW_MS (their names, e.g. host:pid). */
  readonly workers: readonly string[];
}

/** GET /api/external-solvers. */
export interface ExternalSolverListResponse {
  readonly items: readonly ExternalSolverView[];
}

/** A worker counts as present while it has declared its solvers this recently (it does so every 30 s). */
export const WORKER_SEEN_WINDOW_MS = 120_000;

/** How the reason of an external run that failed begins, so people and tests can tell the kinds apart. */
export const EXTERNAL_FAILURE_PREFIX = {
  crash: 'external solver crashed',
  badOutput: 'external solver wrote no readable plan',
  invalidPlan: 'invalid plan',
  unregistered: 'external solver not registered',
  spawn: 'external solver could not start',
  unapproved: 'external solver command not approved by the worker',
  local: 'external solver run could not be prepared',
} as const;

/**
 * The example external solver shipped in the repository (solvers/cli/external-example/): the demo
 * seed registers it and the embedded worker of `npm start` declares it by default, so the feature
 * works out of the box. Its command runs from the repository root, with tsx loading the TypeScript.
 */
export const EXAMPLE_SOLVER = {
  name: 'prioritised-astar',
  version: '1.0.0',
  models: ['classic'] as PlanModel[],
  command: '{node} --import tsx solvers/cli/external-example/prioritised-astar.ts --map {map} --scenario {scenario} --agents {agents} --plan {plan} --time-limit-ms {timeLimitMs}',
  planFormat: 'text' as ExternalPlanFormat,
  description: 'Prioritised planning with space-time A* (agents planned one after another in scenario order, each avoiding the earlier ones). Fast, neither optimal nor complete. Shipped with Quarterturn as the example of an external solver.',
} as const;
