/**
 * GET /api/executions/results/:resultId: a stored result's plan as the plan viewer draws it, for
 * anyone who may see the result (visitors too, for public instance sets). Nothing runs on the
 * server: the viewer replays it in the browser with the settings of GET /api/executions/stored/:id.
 * The plan downloads at GET /api/executions/results/:resultId/plan.json (shared/plan-format.ts)
 * and /plan.txt (shared/plan-format-text.ts, models of TEXT_FORMAT_MODELS only).
 * Zod-free, types only: the web imports it.
 */
import type { ExecutionView } from './executions';
import type { PlanModel } from './plan';

/** The plan-side fields of an execution view: source, instance, model, profile, plan and its figures. */
export type ResultPlanView = Pick<ExecutionView, 'source' | 'instance' | 'model' | 'modelOptions' | 'profile' | 'plan' | 'figures' | 'safetyNote'>;

/** The download formats of a result's plan. */
export const PLAN_DOWNLOAD_FORMATS = ['json', 'txt'] as const;
/** One of PLAN_DOWNLOAD_FORMATS. */
export type PlanDownloadFormat = (typeof PLAN_DOWNLOAD_FORMATS)[number];

/**
 * Whether a model's plans download in the text format: every model but weighted-split, whose timed
 * actions it cannot carry (shared/plan-format.ts TEXT_FORMAT_MODELS, which pulls zod into a bundle;
 * kept equal by web/src/app/plan-viewer/plan-viewer-visitor.spec.ts).
 */
export function hasTextPlan(model: PlanModel): boolean {
  return model !== 'weighted-split';
}
