/** What the submission form needs to know about formats and models, and how it reads an error answer. Zod-free. */
import type { ErrorBody } from '@shared/errors';
import type { RobotProfile } from '@shared/plan';
import type { PlanFileProblem, SubmissionViolation } from '@shared/submissions';
import { PLAN_REJECTED } from '@shared/submissions';

/** Plan models the text format can carry (the same list as shared/plan-format.ts TEXT_FORMAT_MODELS). */
export const TEXT_MODELS = ['classic', 'uniform-duration', 'k-robust', 'orientation-split'] as const;

/** What a refused submission tells the researcher. */
export type SubmissionProblem =
  | { readonly kind: 'violation'; readonly message: string; readonly violation: SubmissionViolation }
  | { readonly kind: 'file'; readonly message: string; readonly problems: readonly PlanFileProblem[] }
  | { readonly kind: 'other'; readonly message: string };

/** Reads the error body of a refused POST /api/submissions. */
export function problemOf(body: unknown): SubmissionProblem {
  const error = (body as Partial<ErrorBody> | null)?.error;
  if (!error) return { kind: 'other', message: 'The server did not answer; try again.' };
  if (error.code === PLAN_REJECTED) {
    return { kind: 'violation', message: error.message, violation: (error.details as { violation: SubmissionViolation }).violation };
  }
  const details = error.details;
  if (Array.isArray(details) && details.length > 0 && typeof (details[0] as PlanFileProblem).line === 'number') {
    return { kind: 'file', message: error.message, problems: details as PlanFileProblem[] };
  }
  return { kind: 'other', message: error.message };
}

/** What a JSON plan document says about its instance and robot profile, read before the server checks it. */
export interface PlanDocumentPeek {
  readonly scenarioId: number;
  readonly agents: number;
  /** The document's own profile, or null when it names none (then the one chosen in the form applies). */
  readonly robotProfile: RobotProfile | null;
}

const isWhole = (v: unknown): v is number => typeof v === 'number' && Number.isInteger(v) && v > 0;

/**
 * The instance and profile a JSON plan document names, so the form can offer the instance's robot
 * profiles; null when the text is no JSON object naming a scenario and agent count (the server
 * then says what is wrong, with line and column).
 */
export function peekPlanDocument(text: string): PlanDocumentPeek | null {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch {
    return null;
  }
  const d = doc as { instance?: { scenarioId?: unknown; agents?: unknown }; robotProfile?: unknown } | null;
  if (typeof d !== 'object' || d === null || !isWhole(d.instance?.scenarioId) || !isWhole(d.instance?.agents)) return null;
  const profile = typeof d.robotProfile === 'object' && d.robotProfile !== null ? (d.robotProfile as RobotProfile) : null;
  return { scenarioId: d.instance.scenarioId, agents: d.instance.agents, robotProfile: profile };
}

/** "plan.txt, 1.2 kB" for the chosen file. */
export function fileCaption(name: string, bytes: number): string {
  const size = bytes < 1000 ? `${bytes} B` : bytes < 1_000_000 ? `${(bytes / 1000).toFixed(1)} kB` : `${(bytes / 1_000_000).toFixed(1)} MB`;
  return `${name}, ${size}`;
}
