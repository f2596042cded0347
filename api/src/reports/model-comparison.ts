/**
 * The figures of the model comparison report, from one outcome per instance × plan model
 * variant (pure; the SQL that reads them is in reports.service.ts). An instance is a scenario at
 * one agent count. Rates over instances carry a Wilson interval (plans of different instances are
 * independent); the execution success rate is a mean over instances with a Student t interval,
 * because runs of one plan are strongly correlated (a plan that collides at nominal times fails
 * nearly every run), so pooling runs would give a far too narrow interval. Variants are ranked
 * only on the instances all of them solved and replayed (compareOnCommonInstances).
 */
import { CI95_METHOD, meanInterval, wilsonInterval, type Interval95 } from '@shared/confidence-interval';
import { MEAN_SUCCESS_METHOD } from '@shared/leaderboards';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { RANK_CORRELATION_METHOD, spearman } from '@shared/rank-correlation';
import { MIN_RANKED_INSTANCES, variantLabel, type CommonInstanceComparison, type VariantFigures } from '@shared/reports';

/** The latest replay of a result under the report's policy. */
export interface InstanceExecution {
  readonly runs: number;
  /** Share of runs that succeeded (no collision, every robot arrived). */
  readonly successRate: number;
  /** Mean collisions per run: > 0 means some run collided; failures with 0 are deadlocks. */
  readonly collisionsMean: number;
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
  `Solved rate: share of instances; executable-at-nominal rate: share of checked solved instances whose plan, replayed open-loop at zero noise, did not collide; both ${CI95_METHOD.rate}, over instances (plans of different instances are independent).`,
  `Execution success rate: ${MEAN_SUCCESS_METHOD}; the instances are the solved ones replayed under this policy. Runs are not pooled: runs of one plan are strongly correlated, so an interval over pooled runs would be far too narrow.`,
  `Which plan model: the variants executed under this policy are compared only on the instances every one of them solved and replayed (n in the sentence), by their mean execution success rate and realised makespan over classic's on those instances, with the intervals above. One is put ahead of another only when their intervals do not overlap, at least ${MIN_RANKED_INSTANCES} such instances exist, and not both intervals have zero width (constant values give no interval to trust); otherwise the sentence says no order can be told. Replays with different runs, timing jitter or stalls are not ranked.`,
  'Realised makespan vs classic: per instance where both were executed, the variant\'s mean realised makespan over classic\'s; the geometric mean of these ratios, its 95 % interval a Student t interval on the logarithms of the ratios, mapped back.',
  'Finish spread: mean over executed instances of each instance\'s mean finish spread (ms); Student t interval of that mean over instances.',
  `Does the planned cost predict execution: ${RANK_CORRELATION_METHOD} Pairs: planned turn-inclusive makespan and mean realised makespan (ms) of each executed instance; instances of several agent counts mix, so part of the agreement comes from instance size.`,
];

/** The noise settings of a replay as words, e.g. "20 runs, timing jitter CV 0.1, no stalls". */
export function executionSettingsText(runs: number, noise: { readonly jitterCv?: number; readonly stallProbability?: number; readonly stallMs?: number }): string {
  const stalls = noise.stallProbability && noise.stallProbability > 0 ? `stall probability ${noise.stallProbability} per action, stalls of ${noise.stallMs ?? 0} ms` : 'no stalls';
  return `${runs} runs, timing jitter CV ${noise.jitterCv ?? 0}, ${stalls}`;
}

const rate = (k: number, n: number): { rate: number | null; ci: Interval95 | null } =>
  n === 0 ? { rate: null, ci: null } : { rate: k / n, ci: wilsonInterval(k, n) };

const mean = (values: readonly number[]): number | null => (values.length === 0 ? null : values.reduce((s, v) => s + v, 0) / values.length);

/** Mean of per-instance success rates with its Student t interval cut to [0, 1] (MEAN_SUCCESS_METHOD). */
function meanSuccess(rates: readonly number[]): { mean: number | null; ci: Interval95 | null } {
  const ci = meanInterval(rates);
  return { mean: mean(rates), ci: ci === null ? null : [Math.max(0, ci[0]), Math.min(1, ci[1])] };
}

/** Geometric mean of per-instance ratios (given as logarithms), with the t interval on the logarithms mapped back. */
function geometricMean(logRatios: readonly number[]): { ratio: number | null; ci: Interval95 | null } {
  const logMean = mean(logRatios);
  const logCi = meanInterval(logRatios);
  return { ratio: logMean === null ? null : Math.exp(logMean), ci: logCi === null ? null : [Math.exp(logCi[0]), Math.exp(logCi[1])] };
}

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
  const success = meanSuccess(executed.map((o) => o.execution.successRate));
  const realised = executed.map((o) => o.execution.realisedMakespanMeanMs).filter((v): v is number => v !== null);
  const logRatios: number[] = [];
  for (const o of executed) {
    const own = o.execution.realisedMakespanMeanMs;
    const ref = classicRealised.get(instanceKey(o));
    if (own !== null && own > 0 && ref !== undefined && ref > 0) logRatios.push(Math.log(own / ref));
  }
  const vsClassic = geometricMean(logRatios);
  const spreads = executed.map((o) => o.execution.finishSpreadMeanMs).filter((v): v is number => v !== null);
  const pairs = executed.filter((o) => o.tiMakespanMs !== null && o.execution.realisedMakespanMeanMs !== null);
  const rho = spearman(pairs.map((o) => o.tiMakespanMs as number), pairs.map((o) => o.execution.realisedMakespanMeanMs as number));
  const solvedRate = rate(solved.length, rows.length);
  const executableRate = rate(executable, checked.length);
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
    executionSuccessRate: success.mean,
    executionSuccessCi95: success.ci,
    instancesWithCollisions: executed.filter((o) => o.execution.collisionsMean > 0).length,
    instancesWithFailuresWithoutCollision: executed.filter((o) => o.execution.collisionsMean === 0 && o.execution.successRate < 1).length,
    realisedMakespanMeanMs: mean(realised),
    makespanVsClassic: {
      pairs: logRatios.length,
      ratio: vsClassic.ratio,
      ci95: vsClassic.ci,
    },
    finishSpreadMs: { n: spreads.length, mean: mean(spreads), ci95: meanInterval(spreads) },
    plannedVsRealised: { n: rho.n, rho: rho.rho, ci95: rho.ci95 },
  };
}

interface VariantGroup {
  readonly model: PlanModel;
  readonly variant: string;
  readonly rows: InstanceOutcome[];
}

/** The outcomes per variant, in plan model order, then by variant text. */
function groupByVariant(outcomes: readonly InstanceOutcome[]): VariantGroup[] {
  const groups = new Map<string, VariantGroup>();
  for (const o of outcomes) {
    const key = `${o.model}\u0000${o.variant}`;
    let g = groups.get(key);
    if (!g) {
      g = { model: o.model, variant: o.variant, rows: [] };
      groups.set(key, g);
    }
    g.rows.push(o);
  }
  return [...groups.values()].sort((a, b) => PLAN_MODELS.indexOf(a.model) - PLAN_MODELS.indexOf(b.model) || a.variant.localeCompare(b.variant));
}

/** Classic's mean realised makespan per instance key (the reference of the makespan ratio). */
function classicRealisedByInstance(outcomes: readonly InstanceOutcome[]): Map<string, number> {
  const classicRealised = new Map<string, number>();
  for (const o of outcomes) {
    if (isReferenceVariant(o.model, o.variant) && isExecuted(o) && o.execution.realisedMakespanMeanMs !== null) {
      classicRealised.set(instanceKey(o), o.execution.realisedMakespanMeanMs);
    }
  }
  return classicRealised;
}

/** One row of figures per variant, in plan model order, then by variant text. */
export function compareVariants(outcomes: readonly InstanceOutcome[]): VariantFigures[] {
  const classicRealised = classicRealisedByInstance(outcomes);
  return groupByVariant(outcomes).map((g) => variantFigures(g.model, g.variant, g.rows, classicRealised));
}

/**
 * The variants executed under the policy on the instances every one of them solved and replayed,
 * so that a variant run on a few easy instances cannot lead: per variant the mean execution
 * success rate over those instances (t interval cut to [0, 1]) and the realised makespan over
 * classic's on them. Null when no variant was executed.
 */
export function compareOnCommonInstances(outcomes: readonly InstanceOutcome[]): CommonInstanceComparison | null {
  const executedGroups = groupByVariant(outcomes)
    .map((g) => ({ ...g, executed: new Map(g.rows.filter(isExecuted).map((o) => [instanceKey(o), o] as const)) }))
    .filter((g) => g.executed.size > 0);
  if (executedGroups.length === 0) return null;
  const common = [...executedGroups[0].executed.keys()].filter((key) => executedGroups.every((g) => g.executed.has(key)));
  const classicRealised = classicRealisedByInstance(outcomes);
  // The makespan ratio needs classic on every common instance; it is, when classic is among the executed variants.
  const withClassic = common.every((key) => classicRealised.has(key));
  return {
    instances: common.length,
    variants: executedGroups.map((g) => {
      const rows = common.map((key) => g.executed.get(key)!);
      const success = meanSuccess(rows.map((o) => o.execution.successRate));
      const logRatios = rows.flatMap((o) => {
        const own = o.execution.realisedMakespanMeanMs;
        const ref = classicRealised.get(instanceKey(o));
        return own !== null && own > 0 && ref !== undefined && ref > 0 ? [Math.log(own / ref)] : [];
      });
      // A ratio only when it covers every common instance (otherwise it is again a different subset).
      const ratio = withClassic && common.length > 0 && logRatios.length === common.length ? geometricMean(logRatios) : { ratio: null, ci: null };
      return {
        label: variantLabel(g.model, g.variant),
        success: success.mean ?? 0,
        successCi95: success.ci,
        makespanRatio: ratio.ratio,
        makespanRatioCi95: ratio.ci,
      };
    }),
  };
}

/** Distinct instances among the outcomes. */
export function instanceCount(outcomes: readonly InstanceOutcome[]): number {
  return new Set(outcomes.map(instanceKey)).size;
}
