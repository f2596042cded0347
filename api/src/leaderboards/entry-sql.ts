/**
 * The only SQL a board view can reach: each whitelisted column id maps to a fixed expression
 * over `leaderboard_entries e`. View parameters never become SQL text; values travel as
 * replacements, so no request can inject SQL.
 */
import { LEADERBOARD_POLICIES } from '@shared/leaderboards';

/** The SQL label of a robot profile, equal to shared/leaderboards.ts profileLabel() for stored profiles. */
export const PROFILE_LABEL_SQL = `format('forward %s ms, quarter turn %s ms, wait %s ms, pitch %s mm, diameter %s mm, jitter %s',
  e.robot_profile->>'forwardMs', e.robot_profile->>'quarterTurnMs', e.robot_profile->>'waitMs',
  e.robot_profile->>'cellPitchMm', e.robot_profile->>'robotDiameterMm', e.robot_profile->>'timingJitter')`;

const POLICY_SQL: Record<string, string> = Object.fromEntries(
  LEADERBOARD_POLICIES.flatMap((p) => {
    const suffix = p.policy.replace('-', '_');
    return [[`success${p.key}`, `e.success_${suffix}`], [`spread${p.key}`, `e.spread_${suffix}`], [`realised${p.key}`, `e.realised_${suffix}`]];
  }),
);

/** Column id → SQL expression on `e` (entries layout). */
export const ENTRY_SQL: Readonly<Record<string, string>> = {
  map: 'e.map_name',
  scenario: 'e.scenario_name',
  agents: 'e.agents',
  model: 'e.model',
  variant: 'e.variant',
  profile: PROFILE_LABEL_SQL,
  status: 'e.status',
  soc: 'e.soc',
  makespan: 'e.makespan',
  tiSocMs: 'e.ti_soc_ms',
  tiMakespanMs: 'e.ti_makespan_ms',
  lowerBound: 'e.lower_bound',
  gap: 'e.gap',
  runtimeMs: 'e.runtime_ms',
  ...POLICY_SQL,
  source: 'e.source',
  solver: "(e.solver_name || ' ' || e.solver_version)",
};

/** Default order of the entries layout (matches the index leaderboard_entries_default_order). */
export const ENTRY_DEFAULT_ORDER = 'e.map_name, e.scenario_name, e.agents, e.model, e.id';
