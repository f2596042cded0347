/**
 * The model comparison report (GET /api/reports/model-comparison): per instance set × robot
 * profile × execution policy, one row of figures per plan model variant and sentences generated
 * from them. Types and fixed texts only; zod-free, shared by api and web.
 */
import type { Interval95 } from './confidence-interval';
import type { PlanModel, RobotProfile } from './plan';
import { SWEEP_POLICIES, type SweepPolicy } from './sweeps';

/** The execution policies a report may be asked for. */
export const REPORT_POLICIES: readonly SweepPolicy[] = SWEEP_POLICIES;

/** Export formats of the report (`format` query parameter). */
export const REPORT_FORMATS = ['json', 'markdown', 'latex'] as const;
export type ReportFormat = (typeof REPORT_FORMATS)[number];

/** One robot profile with results on a set. */
export interface ReportProfileChoice {
  readonly hash: string;
  readonly label: string;
  /** Leaderboard rows (instance × variant) with this profile on the set. */
  readonly entries: number;
}

/** An instance set the viewer may see that has results, with its robot profiles (most entries first). */
export interface ReportSetChoice {
  readonly id: number;
  readonly name: string;
  readonly isPublic: boolean;
  readonly profiles: readonly ReportProfileChoice[];
}

/** GET /api/reports/choices. */
export interface ReportChoices {
  readonly sets: readonly ReportSetChoice[];
  readonly policies: readonly SweepPolicy[];
}

/** Spearman's ρ of planned turn-inclusive makespan against realised makespan across instances. */
export interface PlannedVsRealised {
  readonly n: number;
  readonly rho: number | null;
  readonly ci95: Interval95 | null;
}

/** The figures of one plan model variant (model + parameters that change the problem). */
export interface VariantFigures {
  readonly model: PlanModel;
  /** Parameters that change the problem, e.g. "k=1", "following forbidden"; "" for the default. */
  readonly variant: string;
  /** Model and variant for people, e.g. "classic, following forbidden". */
  readonly label: string;
  /** Classic with default parameters: the reference of the makespan ratio. */
  readonly isReference: boolean;
  /** Instances (scenario × agent count) this variant was run on, and how many it solved. */
  readonly instances: number;
  readonly solved: number;
  readonly solvedRate: number | null;
  readonly solvedCi95: Interval95 | null;
  /** Solved instances whose plan was checked open-loop at zero noise, and how many ran collision-free. */
  readonly nominalChecked: number;
  readonly nominalExecutable: number;
  readonly executableRate: number | null;
  readonly executableCi95: Interval95 | null;
  /** Solved instances replayed under the policy, their runs, and runs that succeeded. */
  readonly executedInstances: number;
  readonly runs: number;
  readonly successfulRuns: number;
  /**
   * Mean over executed instances of each instance's execution success rate, with a Student t
   * interval over those instances cut to [0, 1] (MEAN_SUCCESS_METHOD; null below 2 instances).
   * Runs of one plan are strongly correlated, so no interval over pooled runs is given.
   */
  readonly executionSuccessRate: number | null;
  readonly executionSuccessCi95: Interval95 | null;
  /** Executed instances where runs collided (mean collisions per run > 0). */
  readonly instancesWithCollisions: number;
  /** Executed instances where runs failed without any collision (deadlocks). */
  readonly instancesWithFailuresWithoutCollision: number;
  /** Mean over executed instances of the mean realised makespan, ms. */
  readonly realisedMakespanMeanMs: number | null;
  /**
   * Realised makespan over classic's on the same instances: geometric mean of the per-instance
   * ratios, with its interval; `pairs` instances had both executed.
   */
  readonly makespanVsClassic: { readonly pairs: number; readonly ratio: number | null; readonly ci95: Interval95 | null };
  /** Mean over executed instances of the mean finish spread, ms, with its interval. */
  readonly finishSpreadMs: { readonly n: number; readonly mean: number | null; readonly ci95: Interval95 | null };
  readonly plannedVsRealised: PlannedVsRealised;
}

/** One variant on the instances every compared variant solved and replayed. */
export interface CommonInstanceFigures {
  readonly label: string;
  /** Mean over the common instances of the execution success rate; Student t interval over them, cut to [0, 1]. */
  readonly success: number;
  readonly successCi95: Interval95 | null;
  /** Realised makespan over classic's on the common instances (geometric mean, t interval on the logarithms); null without classic. */
  readonly makespanRatio: number | null;
  readonly makespanRatioCi95: Interval95 | null;
}

/**
 * The variants executed under the policy compared on the same instances: those every one of
 * them solved and replayed. Null when no variant was executed or the replays' settings differ.
 */
export interface CommonInstanceComparison {
  readonly instances: number;
  readonly variants: readonly CommonInstanceFigures[];
}

/** Fewest common instances for an ordering claim (below it the sentence says there are too few to tell; common practice, not a rule). */
export const MIN_RANKED_INSTANCES = 5;

/** Shown on the page and said in the summary when the replays read were made with different settings. */
export const MIXED_SETTINGS_NOTE =
  'The replays read were made with different settings (runs, timing jitter or stalls), so the variants are not ranked: '
  + 'figures from different noise are not comparable. Replay every variant with one setting to compare them.';

/** GET /api/reports/model-comparison?set=&profile=&policy=. */
export interface ModelComparisonReport {
  readonly set: { readonly id: number; readonly name: string };
  readonly profile: { readonly hash: string; readonly label: string; readonly value: RobotProfile };
  readonly policy: SweepPolicy;
  /** Distinct instances (scenario × agent count) any variant was run on. */
  readonly instances: number;
  /** Noise and runs of the executions read, e.g. "20 runs, timing jitter CV 0.1, no stalls" (several when mixed). */
  readonly executionSettings: readonly string[];
  readonly variants: readonly VariantFigures[];
  /** The executed variants on their common instances (null: nothing executed, or mixed settings). */
  readonly comparison: CommonInstanceComparison | null;
  /** Sentences generated from the figures. */
  readonly summary: readonly string[];
  /** How each figure and interval is computed, one line each. */
  readonly methods: readonly string[];
  readonly safetyNote: string;
  /**
   * Field trials of the results this report reads, run under the report's policy (issue 17, item 3):
   * one row per result with field runs; absent or empty when none has any.
   */
  readonly fieldTrials?: readonly ReportFieldTrialRow[];
}

/** A result of the report with field runs: the field figures beside the simulated ones of its newest upload. */
export interface ReportFieldTrialRow {
  readonly resultId: number;
  /** The variant label (variantLabel). */
  readonly variant: string;
  readonly scenario: string;
  readonly agents: number;
  readonly runs: number;
  readonly successfulRuns: number;
  /** Mean realised makespan of the field runs that finished, ms. */
  readonly fieldMakespanMeanMs: number | null;
  /** The simulated realised makespan the newest upload was compared with: mean and central 95 % of simulated runs, ms. */
  readonly simulatedMakespan: { readonly mean: number | null; readonly low: number | null; readonly high: number | null };
  readonly simulatedSuccessRate: number;
  /** Field runs with some figure outside the simulation's central 95 %. */
  readonly runsOutside: number;
}

/** The label of a variant: "classic", "k-robust (k=1)", "classic (following forbidden)", "classic (start N, following forbidden)". */
export function variantLabel(model: string, variant: string): string {
  if (!variant) return model;
  // Words of one parameter stay together: "k=1", "start N", "following forbidden".
  const parts = variant.split(' ').reduce<string[]>((acc, word) => {
    if (word.includes('=') || acc.length === 0 || word === 'start' || word === 'following') acc.push(word);
    else acc[acc.length - 1] += ` ${word}`;
    return acc;
  }, []);
  return `${model} (${parts.join(', ')})`;
}


/** "12.3 %" of a share, one decimal. */
const percent = (share: number): string => `${(share * 100).toFixed(1)} %`;
const ci = (iv: Interval95 | null, f: (v: number) => string): string => (iv ? ` [${f(iv[0])}, ${f(iv[1])}]` : '');

/** Column headers of the report table, each with its unit. */
export const REPORT_TABLE_HEADERS: readonly string[] = [
  'Plan model',
  'Solved rate (% of instances, 95 % CI)',
  'Executable at nominal times (% of checked solved instances, 95 % CI)',
  'Execution success rate (mean over executed instances, %, 95 % CI)',
  'Realised makespan / classic (ratio, 95 % CI)',
  'Finish spread (ms, mean, 95 % CI)',
  'Planned vs realised makespan (Spearman ρ, 95 % CI, n)',
];

/** The report's table as text cells, the same on the page and in every export. */
export function reportTableRows(report: Pick<ModelComparisonReport, 'variants'>): string[][] {
  return report.variants.map((v) => [
    v.label,
    v.solvedRate === null ? '–' : `${percent(v.solvedRate)}${ci(v.solvedCi95, percent)} (${v.solved} of ${v.instances})`,
    v.executableRate === null ? 'not checked' : `${percent(v.executableRate)}${ci(v.executableCi95, percent)} (${v.nominalExecutable} of ${v.nominalChecked})`,
    v.executionSuccessRate === null ? '–' : v.executionSuccessCi95 !== null && v.executionSuccessCi95[0] === v.executionSuccessCi95[1]
      // A constant rate over instances: a zero-width t interval says nothing, so none is shown.
      ? `${percent(v.executionSuccessRate)} on each instance (${v.executedInstances} instances, ${v.runs} runs)`
      : `${percent(v.executionSuccessRate)}${ci(v.executionSuccessCi95, percent)} (${v.executedInstances} instances, ${v.runs} runs)`,
    v.isReference ? '1 (reference)' : v.makespanVsClassic.ratio === null ? '–'
      : `${v.makespanVsClassic.ratio.toFixed(3)}${ci(v.makespanVsClassic.ci95, (x) => x.toFixed(3))} (${v.makespanVsClassic.pairs} pairs)`,
    v.finishSpreadMs.mean === null ? '–' : `${v.finishSpreadMs.mean.toFixed(0)}${ci(v.finishSpreadMs.ci95, (x) => x.toFixed(0))}`,
    v.plannedVsRealised.rho === null ? `– (n = ${v.plannedVsRealised.n})`
      : `${v.plannedVsRealised.rho.toFixed(2)}${ci(v.plannedVsRealised.ci95, (x) => x.toFixed(2))} (n = ${v.plannedVsRealised.n})`,
  ]);
}
