/**
 * The suboptimality factor w of a run (bounded-suboptimal search, solvers/search/suboptimality.ts):
 * stored in the model spec as `suboptimality` beside `following`, omitted when 1, so specs and
 * runs of exact search keep the params and hashes they always had.
 */
import type { ModelSpec } from '@shared/sweeps';
import { checkSuboptimality, isWithinBound } from '../search/suboptimality';

/** The spec's w (1 when absent); a RangeError (the run's `error`) for a value out of range. */
export function suboptimalityOf(spec: ModelSpec): number {
  return checkSuboptimality((spec as { readonly suboptimality?: number }).suboptimality);
}

/** Why a validated plan is still refused: its SOC exceeds w × the proven lower bound (null when within). */
export function boundViolation(soc: number, lowerBound: number | null, w: number): string | null {
  if (lowerBound !== null && lowerBound <= soc && isWithinBound(soc, lowerBound, w)) return null;
  return `the solver's sum-of-costs ${soc} is not within ${w} × its lower bound ${String(lowerBound)}`;
}
