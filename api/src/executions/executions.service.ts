/**
 * Rules of POST/GET /api/executions: resolve the instance from the library (respecting set
 * visibility) or the stored sweep result and its plan, refuse work too large for one request,
 * run the task on the worker pool, store request, plan and summary, and read them back for their
 * owner (and maintainers and admins).
 */
import { hasRole } from '@shared/auth';
import { EXECUTION_LIMITS, SAFETY_NOTE } from '@shared/executions-constants';
import {
  parseCreateExecution, type ExecutionInstanceView, type ExecutionSource, type ExecutionView, type InstanceExecutionRequest,
  type PlanFigures,
} from '@shared/executions';
import type { CellXY } from '@shared/plan';
import type { SolverBuild } from '@shared/runs';
import { gridMapFromRows } from '@solvers/io/grid-map';
import type { MapfInstance } from '@solvers/instance';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { isSetVisible } from '../instance-sets/instance-set-access';
import { loadInstance } from '../instance-sets/load-instance';
import type { ExecutionTask, ExecutionTaskRunner, StoredPlan } from './execution-task';
import { instanceView } from './instance-view';
import { loadResultPlan } from './result-plan';
import type { PlanExecution, PlanExecutionModel } from './plan-execution.model';
import { currentSummary } from './stored-summary';
import { requesterKey } from '../workers/interactive-pool';

/** The operations behind the executions routes. */
export interface ExecutionsService {
  /** Validates the body, runs the simulation (solving first when no plan is sent) and stores it. */
  /** `signal` cancels the computation (the client went away); nothing is stored then. */
  create(owner: Express.User, body: unknown, signal?: AbortSignal): Promise<ExecutionView>;
  /** One stored execution; 404 for an unknown id or one the viewer may not see. */
  get(viewer: Express.User, id: number): Promise<ExecutionView>;
}

/** What the service needs. */
export interface ExecutionsServiceDeps {
  readonly models: Pick<Models, 'User' | 'InstanceSet' | 'MapFile' | 'ScenarioFile' | 'Result'>;
  readonly PlanExecution: PlanExecutionModel;
  readonly runTask: ExecutionTaskRunner;
  /** The build that runs the tasks, recorded with each execution. */
  readonly build: () => SolverBuild;
}

/** A resolved instance with what the viewer needs to draw it. */
interface Resolved {
  readonly source: ExecutionSource;
  readonly instance: MapfInstance;
  readonly view: ExecutionInstanceView;
}

/** Builds the service over its models and task runner. */
export function createExecutionsService(deps: ExecutionsServiceDeps): ExecutionsService {
  const { models, PlanExecution, runTask } = deps;

  async function resolveInstance(viewer: Express.User, ref: InstanceExecutionRequest['instance']): Promise<Resolved> {
    if ('scenarioId' in ref) {
      const loaded = await loadInstance(models as Models, ref.scenarioId, ref.agents, { viewer });
      const source = {
        instanceSetId: loaded.instanceSetId, mapId: loaded.mapId, mapName: loaded.mapName,
        scenarioId: loaded.scenarioId, scenarioName: loaded.scenarioName,
      };
      return { source, instance: loaded.instance, view: instanceView(loaded.instance) };
    }
    const row = await models.MapFile.findByPk(ref.mapId, { attributes: ['id', 'instanceSetId', 'name', 'cells'] });
    const set = row && (await models.InstanceSet.findByPk(row.instanceSetId, { attributes: ['ownerId', 'visibility'] }));
    if (!row || !set || !isSetVisible(set, viewer)) throw new AppError('MAP_NOT_FOUND', 404, `No map ${ref.mapId}`);
    const grid = gridMapFromRows(row.cells.split('\n')).grid;
    const starts = new Map<number, number>();
    const goals = new Map<number, number>();
    const agents = ref.agents.map((a, i) => {
      const start = cellOf(grid, a.start, `instance.agents.${i}.start`);
      const goal = cellOf(grid, a.goal, `instance.agents.${i}.goal`);
      distinct(starts, start, i, 'start');
      distinct(goals, goal, i, 'goal');
      return a.startHeading ? { start, goal, startHeading: a.startHeading } : { start, goal };
    });
    const instance = { grid, agents };
    return { source: { instanceSetId: row.instanceSetId, mapId: row.id, mapName: row.name }, instance, view: instanceView(instance) };
  }

  function toView(row: PlanExecution, owner: { id: number; login: string }): ExecutionView {
    return {
      id: row.id,
      createdAt: new Date(row.createdAt).toISOString(),
      owner,
      ...row.plan,
      // Rows stored before issue 12 lack intervals and counts: filled from their own per-run values.
      summary: currentSummary(row.summary),
      safetyNote: SAFETY_NOTE,
    };
  }

  return {
    async create(owner, body, signal) {
      const req = parseCreateExecution(body);
      if ('resultId' in req) {
        const stored = await loadResultPlan(models as Models, owner, req.resultId);
        const { loaded, result } = stored;
        const instanceReq: InstanceExecutionRequest = {
          instance: { scenarioId: loaded.scenarioId, agents: loaded.instance.agents.length },
          model: stored.model, modelOptions: stored.modelOptions, profile: stored.profile, plan: stored.plan,
          policy: req.policy, noise: req.noise, seed: req.seed, runs: req.runs, onCollision: req.onCollision,
        };
        checkSize(instanceReq, loaded.instance);
        const outcome = await runTask({ ...buildTask(instanceReq, loaded.instance), planOrigin: 'result' }, requesterKey(owner), signal);
        if (outcome.kind === 'refused') throw new AppError(outcome.code, outcome.status, outcome.message);
        const plan: StoredPlan = {
          source: {
            instanceSetId: loaded.instanceSetId, mapId: loaded.mapId, mapName: loaded.mapName,
            scenarioId: loaded.scenarioId, scenarioName: loaded.scenarioName, resultId: result.id, ...(result.sweepId ? { sweepId: result.sweepId } : {}),
          },
          instance: instanceView(loaded.instance),
          model: stored.model,
          modelOptions: stored.modelOptions,
          profile: stored.profile,
          plan: outcome.plan,
          figures: resultFigures(outcome.figures, result),
          computedBy: deps.build(),
        };
        const row = await PlanExecution.create({ ownerId: owner.id, request: req, plan, summary: outcome.summary });
        return toView(row, { id: owner.id, login: owner.login });
      }
      const resolved = await resolveInstance(owner, req.instance);
      checkSize(req, resolved.instance);
      const task = buildTask(req, resolved.instance);
      const outcome = await runTask(task, requesterKey(owner), signal);
      if (outcome.kind === 'refused') throw new AppError(outcome.code, outcome.status, outcome.message);
      const plan: StoredPlan = {
        source: resolved.source,
        instance: resolved.view,
        model: req.model,
        modelOptions: req.modelOptions,
        profile: req.profile,
        plan: outcome.plan,
        figures: outcome.figures,
        computedBy: deps.build(),
      };
      const row = await PlanExecution.create({ ownerId: owner.id, request: req, plan, summary: outcome.summary });
      return toView(row, { id: owner.id, login: owner.login });
    },

    async get(viewer, id) {
      const row = await PlanExecution.findByPk(id);
      const isCurator = hasRole(viewer.role, 'maintainer');
      if (!row || (row.ownerId !== viewer.id && !isCurator)) throw new AppError('EXECUTION_NOT_FOUND', 404, `No execution ${id}`);
      const owner = await models.User.findByPk(row.ownerId, { attributes: ['id', 'login'] });
      return toView(row, { id: row.ownerId, login: owner?.login ?? '' });
    },
  };
}

/**
 * The figures of a stored result's plan: the re-check's sum-of-costs and makespan, with the
 * solve's lower bound and time from the result row. An orientation-split schedule has no
 * stand-alone validator here; the worker's orientation-split validator passed it before the
 * result was stored as solved (solvers/run/cbs-model-task.ts), which the text says.
 */
function resultFigures(figures: PlanFigures, result: { lowerBound: number | null; runtimeMs: number | null; model: string; soc: number | null; makespan: number | null }): PlanFigures {
  const base = { ...figures, lowerBound: result.lowerBound, solveTimeMs: result.runtimeMs };
  if (figures.isValid !== null) return base;
  return { ...base, soc: result.soc, makespan: result.makespan, isValid: true, validation: `stored sweep result: passed the independent ${result.model} validator when the sweep solved it` };
}

/** Refuses batches too large to run inside a request (checked before any work starts). */
function checkSize(req: InstanceExecutionRequest, instance: MapfInstance): void {
  const robots = instance.agents.length;
  if (robots * req.runs > EXECUTION_LIMITS.maxRobotRuns) {
    throw new AppError('VALIDATION_FAILED', 400,
      `runs: ${robots} robots × ${req.runs} runs exceeds ${EXECUTION_LIMITS.maxRobotRuns.toLocaleString('en')} robot-runs per request; ask for fewer runs.`);
  }
  if (req.plan) return;
  const cells = instance.grid.width * instance.grid.height;
  if (robots > EXECUTION_LIMITS.maxSolveAgents || cells > EXECUTION_LIMITS.maxSolveCells) {
    throw new AppError('SOLVE_TOO_LARGE', 422,
      `The server solves only instances of at most ${EXECUTION_LIMITS.maxSolveAgents} agents on maps of at most ${EXECUTION_LIMITS.maxSolveCells} cells `
      + `(this one: ${robots} agents, ${instance.grid.width}×${instance.grid.height}); send a plan in the body, or run a sweep.`);
  }
}

function buildTask(req: InstanceExecutionRequest, instance: MapfInstance): ExecutionTask {
  let cells = '';
  for (const v of instance.grid.passable) cells += v === 1 ? '1' : '0';
  return {
    instance: { width: instance.grid.width, height: instance.grid.height, cells, agents: instance.agents },
    model: req.model,
    modelOptions: req.modelOptions,
    profile: req.profile,
    plan: req.plan,
    simulation: { policy: req.policy, noise: req.noise, seed: req.seed, runs: req.runs, onCollision: req.onCollision },
    solveTimeLimitMs: EXECUTION_LIMITS.solveTimeLimitMs,
  };
}

function cellOf(grid: MapfInstance['grid'], [x, y]: CellXY, path: string): number {
  if (x >= grid.width || y >= grid.height) throw badField(path, `[${x}, ${y}] is outside the ${grid.width}×${grid.height} map`);
  const cell = y * grid.width + x;
  if (grid.passable[cell] !== 1) throw badField(path, `cell [${x}, ${y}] is blocked`);
  return cell;
}

function distinct(seen: Map<number, number>, cell: number, agent: number, field: 'start' | 'goal'): void {
  const other = seen.get(cell);
  if (other !== undefined) throw badField(`instance.agents.${agent}.${field}`, `agent ${agent} has the same ${field} as agent ${other}`);
  seen.set(cell, agent);
}

function badField(path: string, message: string): AppError {
  return new AppError('VALIDATION_FAILED', 400, `The request is not valid: ${path}: ${message}`, [{ path: path.split('.'), message }]);
}
