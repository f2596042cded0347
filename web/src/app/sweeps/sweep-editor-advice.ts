/**
 * What the sweep form tells its user besides the definition itself, as pure functions of the form's
 * values (so they are tested without a browser): the following hazard of the chosen robot profile, and
 * how precise the execution success rate of the chosen Monte Carlo run count is.
 */
import { runsForRateHalfWidth, wilsonInterval } from '@shared/confidence-interval';
import { followingHazard } from '@shared/following-hazard';
import { FOLLOWING_MODELS, type PlanModel } from '@shared/plan';
import { SWEEP_LIMITS } from '@shared/sweeps';
import { followingRulesOf, type SweepFormValue } from './sweep-form-rules';

/** One line under the following choice. */
export const FOLLOWING_EXPLANATION =
  'Following: a robot enters a cell in the step its occupant leaves it. Forbidden adds the following conflict of ' +
  'Stern et al. (SoCS 2019) for classic, uniform-duration and orientation-split; k-robust with k ≥ 1 forbids it ' +
  'already, weighted-split lets a robot in only once the other has left the cell.';

/** Where the wait time is set: which models use it and how weighted-split waits. */
export const WAIT_RULE =
  'Used by unit-step models only (classic, uniform-duration, orientation-split, k-robust); weighted-split plans wait any whole number of ms.';

/** The warning the form shows when the profile makes following a collision, or null. */
export interface FollowingWarning {
  readonly message: string;
  readonly derivation: string;
  /** Chosen models whose plans may contain following (each with its rule, e.g. "classic (following allowed)"). */
  readonly exposedModels: readonly string[];
}

/** The part of a model spec that decides whether its plans may hold a following move. */
export interface FollowingExposure {
  readonly model: PlanModel;
  readonly k?: number;
  readonly following?: string;
}

/** How a spec whose plans may hold a following move is named in the warning, or null when they may not. */
function mayFollow(spec: FollowingExposure): string | null {
  if ((FOLLOWING_MODELS as readonly PlanModel[]).includes(spec.model)) return spec.following === 'forbidden' ? null : `${spec.model} (following allowed)`;
  if (spec.model === 'k-robust') return spec.k === 0 ? 'k-robust (k = 0 is the classic rule)' : null;
  // weighted-split: a robot enters a cell only after the other's move out of it has ended (see
  // solvers/models/weighted-split.ts), so their centres are at least one pitch apart.
  return null;
}

/**
 * The hazard warning for a profile and model specs: null when the profile is safe for following, or
 * when no spec's plans may follow (then the hazard cannot occur). Repeated names are listed once.
 */
export function followingWarningFor(
  profile: { readonly cellPitchMm: number; readonly robotDiameterMm: number },
  specs: readonly FollowingExposure[],
): FollowingWarning | null {
  if (!(profile.cellPitchMm > 0) || !(profile.robotDiameterMm > 0)) return null;
  const hazard = followingHazard(profile);
  if (hazard.message === null) return null;
  const exposedModels = [...new Set(specs.map(mayFollow).filter((m): m is string => m !== null))];
  if (exposedModels.length === 0) return null;
  return { message: hazard.message, derivation: hazard.derivation, exposedModels };
}

/** The warning for the form's profile and chosen models (one following rule and one k for all of them). */
export function followingWarning(v: SweepFormValue): FollowingWarning | null {
  return followingWarningFor(v, v.models.flatMap((model) => followingRulesOf(v).map((following) => ({ model, k: v.k, following }))));
}

/** Half-widths the form offers for "runs needed", as fractions. */
export const HALF_WIDTH_CHOICES = [0.02, 0.05, 0.1] as const;

/** "±5 %" for 0.05, "±4.2 %" for 0.0417: at most one decimal. */
export function percentText(fraction: number): string {
  return `±${Number((fraction * 100).toFixed(1))} %`;
}

/**
 * Half-width of the 95 % Wilson interval of an execution success rate measured over `runs` runs, at the
 * worst case (a rate of one half, where the interval is widest); null for fewer than one run.
 */
export function worstCaseHalfWidth(runs: number): number | null {
  if (!Number.isInteger(runs) || runs < 1) return null;
  const [lo, hi] = wilsonInterval(runs / 2, runs);
  return (hi - lo) / 2;
}

/** The sentence under the Monte Carlo runs field about the current run count. */
export function currentPrecisionText(runs: number): string | null {
  const h = worstCaseHalfWidth(runs);
  if (h === null) return null;
  return `With ${runs} Monte Carlo runs per plan and policy, an execution success rate is known to within ${percentText(h)} at worst (95 % Wilson interval, rate near 50 %).`;
}

/** The sentence for a wanted half-width: how many runs it needs, and whether a sweep allows that many. */
export function runsNeededText(halfWidth: number): { readonly runs: number; readonly text: string; readonly isAllowed: boolean } {
  const runs = runsForRateHalfWidth(halfWidth);
  const isAllowed = runs <= SWEEP_LIMITS.maxMonteCarloRuns;
  const text = `${percentText(halfWidth)} on the execution success rate needs ≥ ${runs} Monte Carlo runs` +
    (isAllowed ? '.' : ` (a sweep allows at most ${SWEEP_LIMITS.maxMonteCarloRuns}).`);
  return { runs, text, isAllowed };
}
