/**
 * Read-only access to stored results' plans for anyone who may see the result (visitors too, for
 * public sets): the viewer's form and the two download formats. Nothing is simulated or stored.
 */
import { QueryTypes } from 'sequelize';
import type { PlanDownloadFormat, ResultPlanView } from '@shared/result-plan-view';
import type { Models } from '../db/models';
import type { Viewer } from '../instance-sets/instance-set-access';
import { planDocument, planText, type PlanAuthor } from './plan-document';
import { loadResultPlan, type ResultPlan } from './result-plan';
import { resultPlanView } from './result-plan-view';

/** A plan file: its name, media type and text. */
export interface PlanFile {
  readonly fileName: string;
  readonly contentType: string;
  readonly body: string;
}

/** The operations behind GET /api/executions/results/:resultId[/plan.json|/plan.txt]. */
export interface ResultPlans {
  view(viewer: Viewer, resultId: number): Promise<ResultPlanView>;
  download(viewer: Viewer, resultId: number, format: PlanDownloadFormat): Promise<PlanFile>;
}

/** Builds the reader over the models (404 RESULT_NOT_FOUND for results of sets the viewer may not see). */
export function createResultPlans(models: Models): ResultPlans {
  /** Sweep results were solved by Quarterturn's CBS of that build; submitted ones name their own solver. */
  async function authorOf(stored: ResultPlan): Promise<PlanAuthor> {
    const r = stored.result;
    if (r.submissionId === null) return { name: 'Quarterturn CBS', version: r.solverVersion };
    const sequelize = models.Result.sequelize!;
    const [row] = await sequelize.query<{ solver_name: string; solver_version: string }>(
      'SELECT solver_name, solver_version FROM submissions WHERE id = :id', { type: QueryTypes.SELECT, replacements: { id: r.submissionId } },
    );
    return row ? { name: row.solver_name, version: row.solver_version } : { name: 'submitted', version: r.solverVersion };
  }

  return {
    async view(viewer, resultId) {
      return resultPlanView(await loadResultPlan(models, viewer, resultId));
    },
    async download(viewer, resultId, format) {
      const stored = await loadResultPlan(models, viewer, resultId);
      const author = await authorOf(stored);
      const base = `quarterturn-result-${resultId}-${stored.model}`;
      return format === 'json'
        ? { fileName: `${base}.json`, contentType: 'application/json; charset=utf-8', body: JSON.stringify(planDocument(stored, author), null, 1) + '\n' }
        : { fileName: `${base}.txt`, contentType: 'text/plain; charset=utf-8', body: planText(stored, author) };
    },
  };
}
