/**
 * A stored result's plan as the plan viewer draws it (GET /api/executions/results/:resultId),
 * without simulating anything: the schedule the fleet would run (the same one an execution of
 * the result runs, result-schedule.ts) and the plan's figures as stored with the result. Visitors
 * read it for results of public sets and replay it in the browser.
 */
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { ExecutionPlanView, PlanFigures } from '@shared/executions';
import type { ResultPlanView } from '@shared/result-plan-view';
import { instanceView } from './instance-view';
import type { ResultPlan } from './result-plan';
import { arrivalFigures, pathsSchedule } from './result-schedule';

/** The viewer's form of a loaded result plan. */
export function resultPlanView(stored: ResultPlan): ResultPlanView {
  const { result, loaded, model, modelOptions, profile } = stored;
  const width = loaded.instance.grid.width;
  let plan: ExecutionPlanView;
  let turnFigures: Pick<PlanFigures, 'turnInclusiveSocMs' | 'turnInclusiveMakespanMs'>;
  if (stored.plan.kind === 'paths') {
    const paths = stored.plan.paths.map((p) => p.map(([x, y]) => y * width + x));
    const turned = pathsSchedule(model, modelOptions.startHeading, loaded.instance, paths, profile);
    plan = { origin: 'result', timeline: 'steps', schedule: turned.schedule };
    turnFigures = { turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs };
  } else {
    plan = { origin: 'result', timeline: model === 'weighted-split' ? 'ms' : 'steps', schedule: stored.plan.schedule };
    turnFigures = arrivalFigures(stored.plan.schedule);
  }
  const how = result.submissionId !== null ? 'when it was submitted' : 'when the sweep solved it';
  return {
    source: {
      instanceSetId: loaded.instanceSetId, mapId: loaded.mapId, mapName: loaded.mapName,
      scenarioId: loaded.scenarioId, scenarioName: loaded.scenarioName, resultId: result.id, ...(result.sweepId ? { sweepId: result.sweepId } : {}),
    },
    instance: instanceView(loaded.instance),
    model, modelOptions, profile, plan,
    figures: {
      soc: result.soc, makespan: result.makespan, unit: model === 'weighted-split' ? 'ms' : 'steps',
      ...turnFigures,
      lowerBound: result.lowerBound, solveTimeMs: result.runtimeMs,
      // Only plans that passed their model's validator are stored as solved (sweep worker, submissions check).
      isValid: true, validation: `stored result: passed the independent ${model} validator ${how}`,
    },
    safetyNote: SAFETY_NOTE,
  };
}
