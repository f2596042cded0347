/**
 * Rules of the sweep form, outside the component: the defaults, and the conversion of the form's
 * values into a SweepDefinitionInput (with the same zod schema the server applies).
 */
import type { ExternalSolverView, SolverRef } from '@shared/external-solvers';
import { FOLLOWING_MODELS, FOLLOWING_RULES, PLAN_MODELS, type FollowingRule, type PlanModel } from '@shared/plan';
import { CBS_SWITCH_NAMES, SUBOPTIMALITY_HELP, SWEEP_POLICIES, SweepDefinitionSchema, type CbsSwitchName, type SweepDefinition, type SweepDefinitionInput, type SweepPolicy } from '@shared/sweeps';

type ModelSpecInput = SweepDefinitionInput['models'][number];

/** The values of the form, flat, as the controls hold them. */
export interface SweepFormValue {
  name: string;
  instanceSetId: number | null;
  scenarioIds: number[];
  countMode: 'list' | 'range';
  countList: string;
  countFrom: number;
  countTo: number;
  countStep: number;
  models: PlanModel[];
  k: number;
  startHeading: 'N' | 'E' | 'S' | 'W' | 'free';
  /**
   * Following rule of classic, uniform-duration and orientation-split (k-robust and weighted-split take
   * none); `both` asks for each of those models twice, once per rule, to compare them.
   */
  following: FollowingRule | 'both';
  /**
   * Suboptimality factors w as typed (comma list, e.g. "1, 1.5"): every chosen model is asked once
   * per factor; 1 = exact search.
   */
  suboptimality: string;
  switchesOff: CbsSwitchName[];
  /**
   * External solvers to run beside the built-in models (issue 16, item 4), each as
   * `name@version:model` (externalChoiceKey); they take the start heading and k, and no
   * following rule, w or switches.
   */
  externalSolvers: string[];
  forwardMs: number;
  quarterTurnMs: number;
  waitMs: number;
  cellPitchMm: number;
  robotDiameterMm: number;
  timingJitter: number;
  timeLimitS: number;
  memoryLimitMb: number;
  policies: SweepPolicy[];
  stallProbability: number;
  stallMs: number;
  monteCarloRuns: number;
  seeds: string;
}

/** A first sweep that finishes in seconds on a laptop. */
export const SWEEP_FORM_DEFAULTS: SweepFormValue = {
  name: '', instanceSetId: null, scenarioIds: [], countMode: 'list', countList: '2, 4, 6', countFrom: 2, countTo: 10, countStep: 2,
  models: ['classic', 'weighted-split'], k: 1, startHeading: 'free', following: 'allowed', suboptimality: '1', switchesOff: [], externalSolvers: [],
  forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 350, timingJitter: 0.1,
  timeLimitS: 30, memoryLimitMb: 512, policies: ['open-loop', 'dependency-gated'], stallProbability: 0, stallMs: 0, monteCarloRuns: 20, seeds: '1',
};

/** Model names in display order, with the ones that need `k`. */
export const FORM_MODELS = PLAN_MODELS;
/** Switch names for the ablation checkboxes. */
export const FORM_SWITCHES = CBS_SWITCH_NAMES;
/** Policies for the replay checkboxes. */
export const FORM_POLICIES = SWEEP_POLICIES;

/** One choice of the external solver picker: a registered solver for one of its plan models. */
export interface ExternalChoice {
  readonly key: string;
  readonly label: string;
}

/** The picker's key of a solver and model, e.g. `prioritised-astar@1.0.0:classic`. */
export function externalChoiceKey(ref: SolverRef, model: PlanModel): string {
  return `${ref.name}@${ref.version}:${model}`;
}

/** Every (solver, plan model) pair of the registered solvers, in their order. */
export function externalChoices(solvers: readonly Pick<ExternalSolverView, 'name' | 'version' | 'models' | 'workers'>[]): ExternalChoice[] {
  return solvers.flatMap((x) => x.models.map((model) => ({
    key: externalChoiceKey(x, model),
    label: `${x.name} ${x.version}: ${model}${x.workers.length === 0 ? ' (no worker has it now: its runs would wait)' : ''}`,
  })));
}

/** The model spec of a picker key, or null when the key is not one. */
export function externalSpecOf(key: string, v: Pick<SweepFormValue, 'k' | 'startHeading'>): ModelSpecInput | null {
  const m = /^([^@:]+)@([^:]+):(.+)$/.exec(key);
  if (!m || !(PLAN_MODELS as readonly string[]).includes(m[3])) return null;
  const model = m[3] as PlanModel;
  const externalSolver = { name: m[1], version: m[2] };
  if (model === 'weighted-split') return { model, startHeading: v.startHeading, externalSolver };
  if (model === 'k-robust') return { model, k: v.k, startHeading: v.startHeading, externalSolver };
  return { model, startHeading: v.startHeading, externalSolver };
}

/** Integers in a comma/space separated text; NaN entries make the list invalid. */
export function parseIntegers(text: string): number[] {
  return text.split(/[\s,;]+/).filter((t) => t !== '').map((t) => (/^\d+$/.test(t) ? Number(t) : NaN));
}

/** The hint under the suboptimality field. */
export const SUBOPTIMALITY_HINT = `${SUBOPTIMALITY_HELP}. A list (e.g. 1, 1.5) asks for each model once per factor.`;

/** The distinct factors of the suboptimality text in the order typed; NaN for an entry that is no number (the schema then names the field). */
export function parseFactors(text: string): number[] {
  const values = text.split(/[\s,;]+/).filter((t) => t !== '').map((t) => (/^\d+(\.\d+)?$/.test(t) ? Number(t) : NaN));
  return values.filter((w, i) => Number.isNaN(w) || values.indexOf(w) === i);
}

/** Whether a plan model takes the following rule. */
export function takesFollowingRule(model: PlanModel): boolean {
  return (FOLLOWING_MODELS as readonly PlanModel[]).includes(model);
}

/** The following rules the form asks for, in FOLLOWING_RULES order. */
export function followingRulesOf(v: Pick<SweepFormValue, 'following'>): FollowingRule[] {
  return v.following === 'both' ? [...FOLLOWING_RULES] : [v.following];
}

/** The definition the form describes, or the first problem with it as a sentence. */
export function definitionFromForm(v: SweepFormValue): { readonly definition: SweepDefinition; readonly input: SweepDefinitionInput } | { readonly problem: string } {
  if (v.instanceSetId === null) return { problem: 'Choose an instance set.' };
  const unitStep = { startHeading: v.startHeading, switches: Object.fromEntries(v.switchesOff.map((n) => [n, false])) };
  const factors = parseFactors(v.suboptimality);
  if (factors.length === 0) return { problem: 'suboptimality (w): give at least one factor; 1 = optimal.' };
  // w = 1 is left out, as stored params leave it out (shared/sweeps.ts modelParameters).
  const atEachW = (spec: ModelSpecInput): ModelSpecInput[] => factors.map((w) => (w === 1 ? spec : { ...spec, suboptimality: w }));
  const input: SweepDefinitionInput = {
    name: v.name,
    instances: { instanceSetId: v.instanceSetId, ...(v.scenarioIds.length ? { scenarioIds: v.scenarioIds } : {}) },
    agentCounts: v.countMode === 'list' ? { kind: 'list', values: parseIntegers(v.countList) } : { kind: 'range', from: v.countFrom, to: v.countTo, step: v.countStep },
    models: v.models.flatMap((model): ModelSpecInput[] => (model === 'weighted-split' ? [{ model, startHeading: v.startHeading }]
      : model === 'k-robust' ? [{ model, k: v.k, ...unitStep }]
      : followingRulesOf(v).map((following) => ({ model, ...unitStep, following }))).flatMap(atEachW))
      .concat(v.externalSolvers.map((key) => externalSpecOf(key, v)).filter((m): m is ModelSpecInput => m !== null)),
    robotProfile: { forwardMs: v.forwardMs, quarterTurnMs: v.quarterTurnMs, waitMs: v.waitMs, cellPitchMm: v.cellPitchMm, robotDiameterMm: v.robotDiameterMm, timingJitter: v.timingJitter },
    timeLimitMs: Math.round(v.timeLimitS * 1000),
    memoryLimitMb: v.memoryLimitMb,
    execution: { policies: v.policies, stallProbability: v.stallProbability, stallMs: v.stallMs, runs: v.monteCarloRuns },
    seeds: parseIntegers(v.seeds),
  };
  const parsed = SweepDefinitionSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    return { problem: `${issue.path.join('.') || 'form'}: ${issue.message}` };
  }
  return { definition: parsed.data, input };
}
