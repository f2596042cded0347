/**
 * Reads a submitted plan file (our JSON plan document or the plain text format) into one
 * normalised shape. Every problem names the file, line, column and field; JSON syntax errors
 * are located from the parser's offset, schema problems by their field path.
 */
import type { ZodError } from 'zod';
import { STARTER_PROFILE } from '@shared/executions-constants';
import { PlanDocumentSchema, type SubmissionRequest } from '@shared/plan-format';
import { parsePlanText } from '@shared/plan-format-text';
import type { CellXY, Heading, PlanModel, RobotProfile, Schedule, StartHeading } from '@shared/plan';
import type { PlanFileProblem } from '@shared/submissions';
import { AppError } from '../errors/app-error';

/** The plan itself, cells still [x, y]. */
export type SubmittedPlan =
  | { readonly kind: 'paths'; readonly paths: readonly (readonly CellXY[])[] }
  | { readonly kind: 'states'; readonly states: readonly (readonly (readonly [number, number, Heading])[])[] }
  | { readonly kind: 'schedule'; readonly schedule: Schedule };

/** A submission after reading: what it is for and the plan. */
export interface ReadSubmission {
  readonly format: 'json' | 'text';
  readonly model: PlanModel;
  readonly k?: number;
  readonly startHeading: StartHeading;
  readonly scenarioId: number;
  readonly agents: number;
  readonly solver: { readonly name: string; readonly version: string };
  readonly robotProfile: RobotProfile;
  readonly plan: SubmittedPlan;
}

/** Whether two robot profiles have the same figures. */
function sameProfile(a: RobotProfile, b: RobotProfile): boolean {
  return a.forwardMs === b.forwardMs && a.quarterTurnMs === b.quarterTurnMs && a.waitMs === b.waitMs
    && a.cellPitchMm === b.cellPitchMm && a.robotDiameterMm === b.robotDiameterMm && a.timingJitter === b.timingJitter;
}

/** 1-based line and column of offset `at` in `text`. */
export function lineColumn(text: string, at: number): { line: number; column: number } {
  const before = text.slice(0, Math.max(0, Math.min(at, text.length)));
  const lines = before.split('\n');
  return { line: lines.length, column: lines[lines.length - 1].length + 1 };
}

function rejectFile(problems: readonly PlanFileProblem[]): never {
  const first = problems[0];
  const where = first.line > 0 ? `${first.file}, line ${first.line}, column ${first.column}` : first.file;
  throw new AppError('VALIDATION_FAILED', 400, `${where} (${first.field}): ${first.message}`, problems);
}

/** A zod path as `paths[2][5]` / `solver.name`. */
function fieldPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) out += typeof p === 'number' ? `[${p}]` : `${out ? '.' : ''}${String(p)}`;
  return out || 'document';
}

function parseJson(text: string, file: string): unknown {
  try {
    return JSON.parse(text);
  } catch (err) {
    const message = err instanceof Error ? err.message : String(err);
    // V8 reports "... at position N" for most syntax errors; an early end has none and sits at the end.
    const at = /position (\d+)/.exec(message);
    const { line, column } = lineColumn(text, at ? Number(at[1]) : text.length);
    rejectFile([{ file, line, column, field: 'document', message: `not valid JSON: ${message.replace(/ in JSON at position \d+.*$/, '')}` }]);
  }
}

function schemaProblems(err: ZodError, file: string): PlanFileProblem[] {
  return err.issues.slice(0, 20).map((i) => ({ file, line: 0, column: 0, field: fieldPath(i.path), message: i.message }));
}

/** Reads a validated request body into a ReadSubmission, or throws 400 naming the problems. */
export function readPlanFile(req: SubmissionRequest): ReadSubmission {
  const file = req.fileName ?? (req.format === 'json' ? 'plan.json' : 'plan.txt');
  if (req.format === 'json') {
    const parsed = PlanDocumentSchema.safeParse(parseJson(req.text, file));
    if (!parsed.success) rejectFile(schemaProblems(parsed.error, file));
    const doc = parsed.data;
    // The form sends the profile the researcher chose; a document that names a different one is not scored silently under either.
    if (doc.robotProfile && req.robotProfile && !sameProfile(doc.robotProfile, req.robotProfile)) {
      rejectFile([{ file, line: 0, column: 0, field: 'robotProfile', message: 'the document names a different robot profile than the one chosen for the submission; remove one of them or make them equal' }]);
    }
    const base = {
      format: 'json' as const, model: doc.model, startHeading: doc.startHeading, scenarioId: doc.instance.scenarioId,
      agents: doc.instance.agents, solver: doc.solver, robotProfile: doc.robotProfile ?? req.robotProfile ?? STARTER_PROFILE,
    };
    if (doc.model === 'weighted-split') return { ...base, plan: { kind: 'schedule', schedule: doc.schedule } };
    if (doc.model === 'orientation-split') return { ...base, plan: { kind: 'states', states: doc.states } };
    return { ...base, ...(doc.model === 'k-robust' ? { k: doc.k } : {}), plan: { kind: 'paths', paths: doc.paths } };
  }
  const withHeadings = req.model === 'orientation-split';
  const text = parsePlanText(req.text, { file, withHeadings });
  if (!text.ok) rejectFile(text.problems);
  const plan: SubmittedPlan = withHeadings
    ? { kind: 'states', states: text.cells.map((row, i) => row.map(([x, y], t): [number, number, Heading] => [x, y, text.headings[i][t]])) }
    : { kind: 'paths', paths: text.cells };
  return {
    format: 'text', model: req.model, ...(req.model === 'k-robust' ? { k: req.k } : {}), startHeading: req.startHeading,
    scenarioId: req.instance.scenarioId, agents: req.instance.agents, solver: req.solver,
    robotProfile: req.robotProfile ?? STARTER_PROFILE, plan,
  };
}
