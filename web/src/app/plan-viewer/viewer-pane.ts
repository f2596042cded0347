/**
 * One model's column of the plan viewer and everything derived from its summary: the Gantt
 * segments and finish times of the drawn run, who waited for whom in it, whether the settings
 * are a sweep's stored ones or a what-if (and, if stored, whether the figures equal the stored
 * figures), and the following hazard of its robot profile.
 */
import type { ExecutionSummaryView, ExecutionView } from '@shared/executions';
import type { ResultPlanView } from '@shared/result-plan-view';
import { followingHazard, type FollowingHazard } from '@shared/following-hazard';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { realisedTimeline } from '@solvers/execute';
import type { MapfInstance } from '@solvers/instance';
import { finishTimes } from './finish-histogram';
import type { FleetTrack } from './fleet-track';
import { ganttSegments, type GanttSegments } from './gantt-layout';
import { runAttribution, type RunAttribution } from './run-attribution';
import { settingsDifferences, settingsOfSummary, storedFigureMismatches, storedOfPolicy } from './stored-settings';

/**
 * What a pane draws: an execution the server ran and stored, or (a visitor's replay, in the
 * browser) a stored result's plan read with GET /api/executions/results/:id, which has no id.
 */
export type PaneExecution = ResultPlanView & Partial<Pick<ExecutionView, 'id' | 'computedBy'>>;

/**
 * Relative difference up to which a browser replay's figure equals the stored one: the sweep ran
 * the same simulator in Node, but another engine's maths may differ in the last bits (seen in
 * Chromium on a finish-spread mean, invisible at the shown digits); 1e-9 is far below any shown digit.
 */
export const BROWSER_FIGURE_TOLERANCE = 1e-9;

/** One model's column: the execution or result plan, the summary shown and the run drawn. */
export interface ViewerPane {
  readonly execution: PaneExecution;
  readonly instance: MapfInstance;
  readonly summary: ExecutionSummaryView;
  readonly computedIn: 'server' | 'browser';
  readonly track: FleetTrack | null;
  readonly segments: GanttSegments | null;
  readonly finishes: readonly number[];
  /** Run drawn, 0-based. */
  readonly shownRun: number;
  /** The replays the sweep stored with the shown result (null: not a stored result). */
  readonly stored: StoredResultExecutionsView | null;
  /** What the summary's settings change against the stored ones; empty: the stored settings (or nothing stored). */
  readonly whatIf: readonly string[];
  /** With the stored settings: how many stored figures were compared and which differ. */
  /** `lastBits`: figures equal only to BROWSER_FIGURE_TOLERANCE (a browser replay), not bit for bit. */
  readonly storedCheck: { readonly compared: number; readonly mismatches: readonly string[]; readonly lastBits: number } | null;
  /** Who waited for whom in the drawn run, and the chain that set its realised makespan. */
  readonly attribution: RunAttribution | null;
  readonly hazard: FollowingHazard;
  /** Whether the plan's model forbids following, in words. */
  readonly followingRule: string;
  /** Whether the plan may contain following at all (so the hazard applies to it, not only to the profile). */
  readonly planMayFollow: boolean;
}

/** What a pane starts from. */
export type PaneBase = Pick<ViewerPane, 'execution' | 'instance'> & { readonly stored?: StoredResultExecutionsView | null };

/** A pane with a new summary and drawn run; everything else is derived here. */
export function paneWith(base: PaneBase, summary: ExecutionSummaryView, computedIn: 'server' | 'browser', track: FleetTrack | null, shownRun: number): ViewerPane {
  const e = base.execution;
  const stored = base.stored && base.stored.executions.length > 0 ? base.stored : null;
  const whatIf = stored ? settingsDifferences(stored, settingsOfSummary(summary)) : [];
  const storedReplay = stored && whatIf.length === 0 ? storedOfPolicy(stored, summary.policy) : null;
  return {
    execution: e, instance: base.instance, summary, computedIn, track, shownRun,
    segments: track ? ganttSegments(track) : null,
    finishes: track ? finishTimes(track) : [],
    stored: base.stored ?? null,
    whatIf,
    storedCheck: storedReplay ? storedFigureMismatches(storedReplay, summary, computedIn === 'browser' ? BROWSER_FIGURE_TOLERANCE : 0) : null,
    attribution: attributionOf(base.instance, e, summary, shownRun),
    hazard: followingHazard(e.profile),
    followingRule: followingRuleText(e),
    planMayFollow: planMayFollow(e),
  };
}

/** The drawn run's attribution, simulated again with the summary's settings (the same run as the track). */
function attributionOf(instance: MapfInstance, e: PaneExecution, s: ExecutionSummaryView, run: number): RunAttribution | null {
  if (s.runs <= 0) return null;
  const timeline = realisedTimeline(instance, e.plan, e.profile, { policy: s.policy, noise: s.noise, seed: s.seed, onCollision: s.onCollision }, run);
  return runAttribution(timeline, s.policy);
}

/** Whether the plan's rules let an agent follow another: classic rule models unless forbidden, k-robust at k = 0. */
export function planMayFollow(e: Pick<ExecutionView, 'model' | 'modelOptions'>): boolean {
  if (e.model === 'k-robust') return (e.modelOptions.k ?? 1) === 0;
  if (e.model === 'weighted-split') return false;
  return e.modelOptions.following !== 'forbidden';
}

/**
 * Whether the plan's model forbids following (an agent entering a cell another one leaves at the
 * same step; the following conflict of Stern et al., SoCS 2019).
 */
export function followingRuleText(e: Pick<ExecutionView, 'model' | 'modelOptions'>): string {
  const options = e.modelOptions;
  if (e.model === 'k-robust') {
    return (options.k ?? 1) >= 1
      ? `The k-robust plan (k = ${options.k ?? 1}) forbids following: a cell stays free for k steps after an agent leaves it.`
      : 'The k-robust plan with k = 0 allows following.';
  }
  // solvers/validate/schedule.ts: a forward occupies both its cells until it ends (half-open intervals).
  if (e.model === 'weighted-split') return 'The weighted-split plan never follows: a forward move holds both its cells until it ends, so no robot enters a cell while another is leaving it.';
  return options.following === 'forbidden'
    ? `The ${e.model} plan was solved with following forbidden.`
    : `The ${e.model} plan was solved with following allowed (the classic rule).`;
}
