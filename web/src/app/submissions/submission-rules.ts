/** What the submission form needs to know about formats and models, and how it reads an error answer. Zod-free. */
import type { ErrorBody } from '@shared/errors';
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
