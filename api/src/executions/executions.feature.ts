/** Wires the executions feature into an app: its model, the task runner and the router. */
import type { Router } from 'express';
import type { AppContext } from '../app-context';
import { executionsRouter } from './executions.router';
import { createExecutionsService } from './executions.service';
import type { ExecutionTaskRunner } from './execution-task';
import { definePlanExecution } from './plan-execution.model';
import { createResultPlans } from './result-plans';
import { loadStoredExecutions } from './stored-executions';

/**
 * The /api/executions router for `ctx`. The model is bound here rather than in db/models.ts so
 * this feature stays inside its folder; `runTask` defaults to the app's interactive worker pool,
 * so no request computes on the event loop.
 */
export function executionsFeature(ctx: AppContext, runTask: ExecutionTaskRunner = (task, requester, signal) => ctx.interactive.execute(task, requester, signal)): Router {
  const PlanExecution = definePlanExecution(ctx.sequelize);
  const svc = createExecutionsService({ models: ctx.models, PlanExecution, runTask, build: () => ctx.interactive.build });
  return executionsRouter(svc, (viewer, resultId) => loadStoredExecutions(ctx.models, viewer, resultId), createResultPlans(ctx.models));
}
