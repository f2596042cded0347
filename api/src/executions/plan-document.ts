/**
 * A stored result's plan as a download, in the two formats a plan is submitted in: the JSON plan
 * document (shared/plan-format.ts, re-readable by PlanDocumentSchema) and the plain text format
 * (shared/plan-format-text.ts, for the models of TEXT_FORMAT_MODELS). Cells are [x, y].
 * Orientation-split results are stored as a schedule of one action per step; the document needs
 * the [x, y, heading] state per step, rebuilt here (inverse of solvers/models/heading-schedule.ts).
 */
import type { PlanDocument } from '@shared/plan-format';
import { TEXT_FORMAT_MODELS } from '@shared/plan-format';
import { HEADINGS, type CellXY, type Heading, type ScheduledAction } from '@shared/plan';
import { AppError } from '../errors/app-error';
import type { ResultPlan } from './result-plan';

/** Who computed the plan, as the document names it. */
export interface PlanAuthor {
  readonly name: string;
  readonly version: string;
}

type State = [number, number, Heading];

/** The JSON plan document of a stored result. */
export function planDocument(stored: ResultPlan, solver: PlanAuthor): PlanDocument {
  const { result, model, modelOptions } = stored;
  const common = {
    format: 'quarterturn-plan' as const, version: 1 as const,
    instance: { scenarioId: result.scenarioId, agents: result.agents },
    solver: { name: solver.name, version: solver.version },
    robotProfile: stored.profile,
    startHeading: modelOptions.startHeading,
  };
  if (model === 'weighted-split') return { ...common, model, schedule: scheduleOf(stored).map((list) => list.map((a) => ({ ...a, from: [...a.from], to: [...a.to] }))) };
  if (model === 'orientation-split') return { ...common, model, states: statesOf(stored) };
  const paths = pathsOf(stored);
  return model === 'k-robust' ? { ...common, model, k: modelOptions.k ?? 1, paths } : { ...common, model, paths };
}

/**
 * The plain text plan of a stored result: `#` comment lines saying what it is a plan for (the
 * format leaves that to the submission form), then one line per agent. 409 for weighted-split,
 * whose timed actions the text format cannot carry.
 */
export function planText(stored: ResultPlan, solver: PlanAuthor): string {
  const { result, model, modelOptions, profile: p } = stored;
  if (!(TEXT_FORMAT_MODELS as readonly string[]).includes(model)) {
    throw new AppError('PLAN_FORMAT_UNAVAILABLE', 409,
      `A ${model} plan is a schedule of timed actions, which the text format cannot carry; download it as JSON (plan.json).`);
  }
  const head = [
    `# Quarterturn result ${result.id}: plan model ${model}${model === 'k-robust' ? ` (k = ${modelOptions.k ?? 1})` : ''}, start heading ${modelOptions.startHeading}`,
    `# instance: scenario ${result.scenarioId}, first ${result.agents} agents; solver ${solver.name} ${solver.version}`,
    `# robot profile: forward ${p.forwardMs} ms, quarter turn ${p.quarterTurnMs} ms, wait ${p.waitMs} ms, cell pitch ${p.cellPitchMm} mm, diameter ${p.robotDiameterMm} mm`,
    '# one line per agent in scenario order, one cell per unit step',
  ];
  const lines = model === 'orientation-split'
    ? statesOf(stored).map((row) => row.map(([x, y, h]) => `(${x},${y},${h})`).join(' '))
    : pathsOf(stored).map((row) => row.map(([x, y]) => `(${x},${y})`).join(' '));
  return [...head, ...lines].join('\n') + '\n';
}

function pathsOf(stored: ResultPlan): [number, number][][] {
  if (stored.plan.kind !== 'paths') throw new Error(`result ${stored.result.id}: a ${stored.model} plan stored without paths`);
  return stored.plan.paths.map((p) => p.map(([x, y]): [number, number] => [x, y]));
}

function scheduleOf(stored: ResultPlan): readonly (readonly ScheduledAction[])[] {
  if (stored.plan.kind !== 'schedule') throw new Error(`result ${stored.result.id}: a ${stored.model} plan stored without a schedule`);
  return stored.plan.schedule;
}

/** Per agent its state at every step: where it stands and which way it faces. */
function statesOf(stored: ResultPlan): State[][] {
  const agents = stored.loaded.instance.agents;
  const width = stored.loaded.instance.grid.width;
  const rule = stored.modelOptions.startHeading;
  return scheduleOf(stored).map((actions, i) => {
    const first = actions[0];
    if (!first) {
      // A robot that never acts stands on its start; with a free start heading any heading is valid (N chosen).
      const start: CellXY = [agents[i].start % width, Math.floor(agents[i].start / width)];
      return [[start[0], start[1], agents[i].startHeading ?? (rule === 'free' ? 'N' : rule)]];
    }
    const states: State[] = [[first.from[0], first.from[1], headingBefore(first)]];
    for (const a of actions) states.push([a.to[0], a.to[1], a.heading]);
    return states;
  });
}

/** The heading before an action (an action records the heading after it). */
function headingBefore(a: ScheduledAction): Heading {
  const i = HEADINGS.indexOf(a.heading);
  // HEADINGS runs clockwise (N, E, S, W): a left turn came from the next one clockwise, a right turn from the previous.
  if (a.action === 'turn-left') return HEADINGS[(i + 1) % 4];
  if (a.action === 'turn-right') return HEADINGS[(i + 3) % 4];
  return a.heading;
}
