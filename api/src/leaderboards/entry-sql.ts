/**
 * The only SQL a board view can reach: each whitelisted column id maps to a fixed column of
 * `leaderboard_entries e` (or, in the comparison layout, of `leaderboard_compare c`). View
 * parameters never become SQL text; values travel as replacements, so no request can inject SQL.
 */
import { LEADERBOARD_POLICIES, type CompareMetric } from '@shared/leaderboards';
import type { PlanModel } from '@shared/plan';

const POLICY_SQL: Record<string, string> = Object.fromEntries(
  LEADERBOARD_POLICIES.flatMap((p) => {
    const suffix = p.policy.replace('-', '_');
    return [
      [`success${p.key}`, `e.success_${suffix}`], [`spread${p.key}`, `e.spread_${suffix}`], [`realised${p.key}`, `e.realised_${suffix}`],
      // Computed for the page from rate × runs (leaderboards.service.ts fillSuccessIntervals, which
      // reads the rate and the runs the page query adds); nothing stored holds them.
      [`success${p.key}Lo`, 'NULL'], [`success${p.key}Hi`, 'NULL'],
      [`realised${p.key}Lo`, `e.realised_lo_${suffix}`], [`realised${p.key}Hi`, `e.realised_hi_${suffix}`],
      [`spread${p.key}Lo`, `e.spread_lo_${suffix}`], [`spread${p.key}Hi`, `e.spread_hi_${suffix}`],
    ];
  }),
);

/**
 * The entries columns behind the 95 % interval of a comparison figure (issue 12, item 5; columns of
 * migration 0405): for an execution success rate its runs (the Wilson interval is computed per page
 * from rate × runs), for a mean its stored bounds; null for a figure without an interval.
 */
export type IntervalSource = { readonly kind: 'rate'; readonly runs: string } | { readonly kind: 'mean'; readonly lo: string; readonly hi: string };

const INTERVAL_SOURCES: Readonly<Record<string, IntervalSource>> = Object.fromEntries(
  LEADERBOARD_POLICIES.flatMap((p) => {
    const suffix = p.policy.replace('-', '_');
    return [
      [`success${p.key}`, { kind: 'rate', runs: `runs_${suffix}` }],
      [`realised${p.key}`, { kind: 'mean', lo: `realised_lo_${suffix}`, hi: `realised_hi_${suffix}` }],
      [`spread${p.key}`, { kind: 'mean', lo: `spread_lo_${suffix}`, hi: `spread_hi_${suffix}` }],
    ];
  }),
);

/** Where the interval of comparison figure `metric` comes from, or null (plan figures have none). */
export function intervalSource(metric: CompareMetric): IntervalSource | null {
  return INTERVAL_SOURCES[metric] ?? null;
}

/** Column id → SQL expression on `e` (entries layout). */
export const ENTRY_SQL: Readonly<Record<string, string>> = {
  map: 'e.map_name',
  scenario: 'e.scenario_name',
  agents: 'e.agents',
  model: 'e.model',
  variant: 'e.variant',
  profile: 'e.profile_label',
  status: 'e.status',
  // Migration 0405: the flag as yes / no / not checked (a generated, indexed column).
  executableAtNominal: 'e.nominal_label',
  nominalCollisions: 'e.nominal_collisions',
  // One unit per column (migration 0405 generates them from the model).
  socSteps: 'e.soc_steps',
  socMs: 'e.soc_ms',
  makespanSteps: 'e.makespan_steps',
  makespanMs: 'e.makespan_ms',
  tiSocMs: 'e.ti_soc_ms',
  tiMakespanMs: 'e.ti_makespan_ms',
  lowerBoundSteps: 'e.lower_bound_steps',
  lowerBoundMs: 'e.lower_bound_ms',
  gap: 'e.gap',
  // Migration 0407: generated from the variant and the figures, each with a sort index.
  optimality: 'e.optimality',
  suboptimality: 'e.suboptimality',
  runtimeMs: 'e.runtime_ms',
  ...POLICY_SQL,
  source: 'e.source',
  solver: 'e.solver',
};

/**
 * Cell values shown differently from what sorts and filters read: a bounded optimality names its
 * w, e.g. `bounded (w = 1.5)` (shared/leaderboards.ts optimalityLabel); filters keep the stored value.
 */
export const ENTRY_CELL_SQL: Readonly<Record<string, string>> = {
  optimality: `CASE WHEN e.optimality = 'bounded' THEN 'bounded (w = ' || e.suboptimality::text || ')' ELSE e.optimality END`,
};

/** Default order of the entries layout (matches the index leaderboard_entries_default_order). */
export const ENTRY_DEFAULT_ORDER = 'e.map_name, e.scenario_name, e.agents, e.model, e.id';

/** The entries column of a comparison figure (the `e.` dropped). */
export function figureColumn(metric: CompareMetric): string {
  return ENTRY_SQL[metric].slice(2);
}

/**
 * The `leaderboard_compare` column of one model's figure (migration 0402); its k-robust
 * columns hold k = COMPARE_TABLE_K.
 */
export function compareColumn(model: PlanModel, metric: CompareMetric): string {
  return `${model.replace('-', '_')}_${figureColumn(metric)}`;
}

/** The k whose k-robust figures `leaderboard_compare` holds; other k are looked up per row. */
export const COMPARE_TABLE_K = 1;
