/**
 * The suboptimality factor w of bounded-suboptimal search (ECBS, Barer, Sharon, Stern, Felner,
 * "Suboptimal variants of the conflict-based search algorithm for the multi-agent pathfinding
 * problem", SoCS 2014; EECBS, Li, Ruml, Koenig, "EECBS: A bounded-suboptimal search for
 * multi-agent path finding", AAAI 2021): a plan is accepted only when its sum-of-costs is at most
 * w × a proven lower bound on the optimum. w = 1 is exact search.
 *
 * Inside the searches and checks w is a whole number of ten-thousandths, rounded down
 * (W = ⌊w × 10⁴⌋), so every bound check is exact integer arithmetic on integer costs (steps, or
 * ms for weighted-split): soc × 10⁴ ≤ W × lb, which implies soc ≤ w × lb. Rounding down only
 * tightens the bound.
 */

/** Largest accepted suboptimality factor (a sane cap: beyond it the bound says little). */
export const MAX_SUBOPTIMALITY = 10;

/** Ten-thousandths: the resolution of w in the bound checks. */
const SCALE = 10_000;

/** Returns w (default 1) after checking it: a finite number from 1 to MAX_SUBOPTIMALITY; otherwise a RangeError naming the option. */
export function checkSuboptimality(w: unknown): number {
  if (w === undefined) return 1;
  if (typeof w !== 'number' || !Number.isFinite(w) || w < 1 || w > MAX_SUBOPTIMALITY) {
    throw new RangeError(`option suboptimality must be a number from 1 to ${MAX_SUBOPTIMALITY} (1 = optimal), got ${String(w)}`);
  }
  return w;
}

/** w in ten-thousandths, rounded down (an integer; the tiny slack absorbs binary noise such as 1.1 × 10⁴ = 11000.000000000002). */
function scaled(w: number): number {
  return Math.floor(w * SCALE + 1e-6);
}

/** The largest integer cost c with c ≤ w × lb (lb a non-negative integer); exact. */
export function boundOf(lb: number, w: number): number {
  const product = lb * scaled(w);
  return (product - (product % SCALE)) / SCALE;
}

/** Whether soc ≤ w × lb, exactly (integer costs). */
export function isWithinBound(soc: number, lb: number, w: number): boolean {
  return soc * SCALE <= scaled(w) * lb;
}

/** (soc − lb) / lb: 0 when both are 0. */
export function gapOf(soc: number, lb: number): number {
  if (lb <= 0) return soc <= 0 ? 0 : Infinity;
  return (soc - lb) / lb;
}
