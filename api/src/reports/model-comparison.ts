/**
 * The figures of the model comparison report, from one outcome per instance × plan model
 * variant (pure; the SQL that reads them is in reports.service.ts). An instance is a scenario at
 * one agent count. Every rate carries a Wilson interval, every mean a Student t interval
 * (shared/confidence-interval.ts), the makespan ratio is paired per instance.
 */
import { CI95_METHOD, meanInterval, wilsonInterval } from '@shared/confidence-interval';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { RANK_CORRELATION_METHOD, spearman } from '@shared/rank-correlation';
import { variantLabel, type ReportInterval, type VariantFigures } from '@shared/reports';

/** The latest replay of a result under the report's policy. */
export interface InstanceExecution {
  readonly runs: number;
  /** Share of runs with no collision. */
  readonly successRate: number;
  readonly realisedMakespanMeanMs: number | null;
  readonly finishSpreadMeanMs: number | null;
}

/** One instance × variant: the result the report reads and its replay. */
export interface InstanceOutcome {
  readonly scenarioId: number;
  readonly agents: number;
  readonly model: PlanModel;
  readonly variant: string;
  readonly status: string;
  readonly tiMakespanMs: number | null;
  /** Open-loop at zero noise collision-free (null: not checked). */
  readonly executableAtNominal: boolean | null;
  readonly execution: InstanceExecution | null;
}

/** How the figures are computed, for the page and the exports. */
export const REPORT_METHODS: readonly string[] = [
  'An instance is one scenario at one agent count; each plan model variant contributes its newest computed result per instance (solved ones first); submitted plans are left out.',
  `Solved rate and executable-at-nominal rate: share of instances; ${CI95_METHOD.rate}`,
  `Execution success rate: share of collision-free runs, runs of all executed instances pooled (this treats runs as independent, so the interval is narrower than one over instances); ${CI95_METHOD.rate}`,
  'Realised makespan vs classic: per instance where both were executed, the variant\'s mean realised makespan over classic\'s; the geometric mean of these ratios, its 95 % interval a Student t interval on the logarithms of the ratios, mapped back.',
  'Finish spread: mean over executed instances of each instance\'s mean finish spread (ms); Student t interval of that mean over instances.',
  `Does the planned cost predict execution: ${RANK_CORRELATION_METHOD} Pairs: planned turn-inclusive makespan and mean realised makespan (ms) of each executed instance; instances of several agent counts mix, so part of the agreement comes from instance size.`,
];

/** The noise settings of a replay as words, e.g. "20 runs, timing jitter CV 0.1, no stalls". */
export function executionSettingsText(runs: number, noise: { readonly jitterCv?: number; readonly stallProbability?: number; readonly stallMs?: number }): string {
  const stalls = noise.stallProbability && noise.stallProbability > 0 ? `stall probability ${noise.stallProbability} per action, stalls of ${noise.stallMs ?? 0} ms` : 'no stalls';
  return `${runs} runs, timing jitter CV ${noise.jitterCv ?? 0}, ${stalls}`;
}

const rate = (k: number, n: number): { rate: number | null; ci: ReportInterval | null } =>
  n === 0 ? { rate: null, ci: null } : { rate: k / n, ci: wilsonInterval(k, n) };

const mean = (values: readonly number[]): number | null => (values.length === 0 ? null : values.reduce((s, v) => s + v, 0) / values.length);

const instanceKey = (o: { scenarioId: number; agents: number }): string => `${o.scenarioId}:${o.agents}`;

/** Whether the result of `o` was solved and replayed under the policy. */
const isExecuted = (o: InstanceOutcome): o is InstanceOutcome & { execution: InstanceExecution } => o.status === 'solved' && o.execution !== null;

/** The reference of the makespan ratio: classic with default parameters. */
export const isReferenceVariant = (model: string, variant: string): boolean => model === 'classic' && variant === '';

/** Figures of one variant; `classicRealised` maps instance keys to classic's mean realised makespan. */
function variantFigures(model: PlanModel, variant: string, rows: readonly InstanceOutcome[], classicRealised: ReadonlyMap<string, number>): VariantFigures {
  const solved = rows.filter((o) => o.status === 'solved');
  const checked = solved.filter((o) => o.executableAtNominal !== null);
  const executable = checked.filter((o) => o.executableAtNominal === true).length;
  const executed = rows.filter(isExecuted);
  const runs = executed.reduce((s, o) => s + o.execution.runs, 0);
  const successfulRuns = executed.reduce((s, o) => s + Math.round(o.execution.successRate * o.execution.runs), 0);
  const realised = executed.map((o) => o.execution.realisedMakespanMeanMs).filter((v): v is number => v !== null);
  const logRatios: number[] = [];
  for (const o of executed) {
    const own = o.execution.realisedMakespanMeanMs;
    const ref = classicRealised.get(instanceKey(o));
    if (own !== null && own > 0 && ref !== undefined && ref > 0) logRatios.push(Math.log(own / ref));
  }
  const logMean = mean(logRatios);
  const logCi = meanInterval(logRatios);
  const spreads = executed.map((o) => o.execution.finishSpreadMeanMs).filter((v): v is number => v !== null);
  const pairs = executed.filter((o) => o.tiMakespanMs !== null && o.execution.realisedMakespanMeanMs !== null);
  const rho = spearman(pairs.map((o) => o.tiMakespanMs as number), pairs.map((o) => o.execution.realisedMakespanMeanMs as number));
  const solvedRate = rate(solved.length, rows.length);
  const executableRate = rate(executable, checked.length);
  const successRate = rate(successfulRuns, runs);
  return {
    model,
    variant,
    label: variantLabel(model, variant),
    isReference: isReferenceVariant(model, variant),
    instances: rows.length,
    solved: solved.length,
    solvedRate: solvedRate.rate,
    solvedCi95: solvedRate.ci,
    nominalChecked: checked.length,
    nominalExecutable: executable,
    executableRate: executableRate.rate,
    executableCi95: executableRate.ci,
    executedInstances: executed.length,
    runs,
    successfulRuns,
    executionSuccessRate: successRate.rate,
    executionSuccessCi95: successRate.ci,
    instancesWithCollisions: executed.filter((o) => o.execution.successRate < 1).length,
    realisedMakespanMeanMs: mean(realised),
    makespanVsClassic: {
      pairs: logRatios.length,
      ratio: logMean === null ? null : Math.exp(logMean),
      ci95: logCi === null ? null : [Math.exp(logCi[0]), Math.exp(logCi[1])],
    },
    finishSpreadMs: { n: spreads.length, mean: mean(spreads), ci95: meanInterval(spreads) },
    plannedVsRealised: { n: rho.n, rho: rho.rho, ci95: rho.ci95 },
  };
}

/** One row of figures per variant, in plan model order, then by variant text. */
export function compareVariants(outcomes: readonly InstanceOutcome[]): VariantFigures[] {
  const groups = new Map<string, { model: PlanModel; variant: string; rows: InstanceOutcome[] }>();
  for (const o of outcomes) {
    const key = `${o.model}\u0000${o.variant}`;
    let g = groups.get(key);
    if (!g) {
      g = { model: o.model, variant: o.variant, rows: [] };
      groups.set(key, g);
    }
    g.rows.push(o);
  }
  const classicRealised = new Map<string, number>();
  for (const o of outcomes) {
    if (isReferenceVariant(o.model, o.variant) && isExecuted(o) && o.execution.realisedMakespanMeanMs !== null) {
      classicRealised.set(instanceKey(o), o.execution.realisedMakespanMeanMs);
    }
  }
  return [...groups.values()]
    .sort((a, b) => PLAN_MODELS.indexOf(a.model) - PLAN_MODELS.indexOf(b.model) || a.variant.localeCompare(b.variant))
    .map((g) => variantFigures(g.model, g.variant, g.rows, classicRealised));
}

/** Distinct instances among the outcomes. */
export function instanceCount(outcomes: readonly InstanceOutcome[]): number {
  return new Set(outcomes.map(instanceKey)).size;
}
