/**
 * The caption of an export: which figure, plan models and robot profiles the numbers come from.
 * The safety note of execution figures is the table's caution (exportCaution), never caption text.
 */
import { SAFETY_NOTE } from '@shared/executions-constants';
import { CI95_METHOD } from '@shared/confidence-interval';
import { COLLISION_MARK, INTERVAL_NOT_STORED } from '@shared/exports-table';
import { columnsOf, compareIntervalNote, INTERVAL_NOT_STORED_REASON, NOMINAL_DESCRIPTION, type LeaderboardView } from '@shared/leaderboards';

/** Column ids whose figures come from the execution simulator. */
const isExecutionColumn = (id: string): boolean => /^(success|spread|realised)/.test(id);

/** A one-paragraph caption for `view` over rows with the given robot profile labels. */
export function exportCaption(view: LeaderboardView, profileLabels: readonly string[], hasCollidingMarks = false): string {
  const parts: string[] = [];
  if (view.layout === 'compare') {
    const metric = columnsOf({ layout: 'entries', metric: view.metric }).find((c) => c.id === view.metric);
    parts.push(`${metric?.label ?? view.metric}${metric?.unit ? ` (${metric.unit})` : ''} of the best result per plan model (k-robust at k = ${view.k}); one row per instance and robot profile; the best value per row in bold${view.bestAmong === 'executable' ? ', among plans that are executable at nominal times (a plan that collides when replayed open-loop with zero noise under its robot profile is never bold)' : ', among all plans, including ones that collide at nominal times'}.`);
  } else {
    parts.push('Best result per instance and plan model (a plan executable at nominal times before one that collides at nominal times); sum-of-costs, makespan and lower bound in steps (classic, uniform-duration, orientation-split, k-robust) or ms (weighted-split), each unit in its own column.');
  }
  const profiles = [...new Set(profileLabels)];
  if (profiles.length === 1) parts.push(`Robot profile: ${profiles[0]}.`);
  // Several: each row names its own in the Robot profile column (added when the view has none).
  else if (profiles.length > 1) parts.push('Rows differ in robot profile; each row names its own in the Robot profile column.');
  if (view.filters.length > 0) parts.push(`Filters: ${view.filters.map((f) => `${f.column} ${f.op} ${f.value}`.trim()).join(', ')}.`);
  const shown = view.layout === 'compare' ? [view.metric] : view.columns;
  if (hasCollidingMarks) parts.push(`${COLLISION_MARK} after a value: that plan collides at nominal times (Markdown and LaTeX only; JSON and CSV leave values plain).`);
  if (shown.includes('executableAtNominal')) parts.push(`Executable at nominal times: ${NOMINAL_DESCRIPTION}`);
  const compareNote = view.layout === 'compare' ? compareIntervalNote(view.metric) : null;
  // Markdown and LaTeX write "x [lo, hi]"; CSV and JSON put the bounds in <model column>_lo / _hi columns.
  if (compareNote) parts.push(`${compareNote} (Markdown and LaTeX: value [low, high]; CSV and JSON: separate low and high columns.)`);
  if (shown.some((id) => /^(success|realised|spread).*(Lo|Hi)$/.test(id))) {
    parts.push(`95 % intervals: execution success rate by the ${CI95_METHOD.rate}, recomputed from rate × runs; means of realised makespan and finish spread by the ${CI95_METHOD.mean}, as stored with the execution (empty bounds: ${INTERVAL_NOT_STORED}, ${INTERVAL_NOT_STORED_REASON}).`);
  }
  return parts.join(' ');
}

/** The caution that goes with `view`'s figures: the safety note when execution figures are shown, else none. */
export function exportCaution(view: LeaderboardView): string | undefined {
  const shown = view.layout === 'compare' ? [view.metric] : view.columns;
  return shown.some(isExecutionColumn) ? SAFETY_NOTE : undefined;
}
