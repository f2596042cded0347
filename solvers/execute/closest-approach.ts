/**
 * Exact contact tests for two points moving linearly: the squared distance
 * |D0 + W·τ|² is a quadratic in τ, solved in closed form rather than sampled.
 * Textbook closed form (e.g. C. Ericson, "Real-Time Collision Detection", Morgan Kaufmann 2005,
 * moving sphere against sphere; section number not checked, from memory).
 */

/** Time and distance of the closest approach of two points moving linearly. */
export interface ClosestApproach {
  /** τ in [0, span] where the distance is smallest (the earliest such τ when constant). */
  readonly time: number;
  readonly distance: number;
}

/**
 * Closest approach over τ ∈ [0, span] of points A(τ) = a + va·τ and B(τ) = b + vb·τ:
 * with D0 = b − a and W = vb − va, τ* = −(D0·W)/(W·W) clamped to [0, span].
 */
export function closestApproach(
  a: readonly [number, number], va: readonly [number, number],
  b: readonly [number, number], vb: readonly [number, number],
  span: number,
): ClosestApproach {
  const dx = b[0] - a[0];
  const dy = b[1] - a[1];
  const wx = vb[0] - va[0];
  const wy = vb[1] - va[1];
  const ww = wx * wx + wy * wy;
  let t = ww === 0 ? 0 : -(dx * wx + dy * wy) / ww;
  if (t < 0) t = 0;
  if (t > span) t = span;
  return { time: t, distance: Math.hypot(dx + wx * t, dy + wy * t) };
}

/**
 * Where on τ ∈ [0, span] two moving points are closer than `radius`, given their relative
 * position D0 = (dx, dy) at τ = 0 and relative velocity W = (wx, wy): the open interval between
 * the roots of (W·W)τ² + 2(D0·W)τ + (D0·D0 − radius²) = 0, clipped to [0, span]. Writes
 * [from, to] into `out` and returns true when there is an overlap of positive length.
 * `span` may be Infinity only when W = 0 (the points stand still relative to each other).
 */
export function overlapInterval(
  dx: number, dy: number, wx: number, wy: number, span: number, radius: number, out: Float64Array,
): boolean {
  const c = dx * dx + dy * dy - radius * radius;
  const a = wx * wx + wy * wy;
  if (a === 0) {
    if (c >= 0) return false;
    out[0] = 0;
    out[1] = span;
    return true;
  }
  const halfB = dx * wx + dy * wy;
  const disc = halfB * halfB - a * c;
  if (disc <= 0) return false;
  const sq = Math.sqrt(disc);
  // Stable root pair: q = −(halfB + sign(halfB)·√disc); roots q/a and c/q.
  const q = halfB >= 0 ? -(halfB + sq) : -(halfB - sq);
  let r0 = q / a;
  let r1 = q === 0 ? -r0 : c / q;
  if (r0 > r1) {
    const t = r0;
    r0 = r1;
    r1 = t;
  }
  if (r0 < 0) r0 = 0;
  if (r1 > span) r1 = span;
  if (!(r1 > r0)) return false;
  out[0] = r0;
  out[1] = r1;
  return true;
}
