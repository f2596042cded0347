/**
 * Whether a robot profile makes "following" (a robot entering a cell its occupant is leaving at the same
 * moment, legal in the classic rule) a physical collision even when every robot keeps its planned times.
 * The planning rule that forbids it is the following conflict of Stern et al., "Multi-Agent Pathfinding:
 * Definitions, Variants, and Benchmarks", SoCS 2019.
 *
 * Geometry (same as solvers/execute): robots are disks of diameter d centred on cell centres at pitch p,
 * and two robots collide when their centres come closer than d.
 *
 * Right-angle following: the leader leaves cell v along x while the follower enters v along y, at the same
 * speed and from the same instant. With v at the origin, after both have travelled s (0 ≤ s ≤ p) the leader
 * is at (s, 0) and the follower at (0, s − p), so
 *     distance² = s² + (p − s)²,
 * whose derivative 2s − 2(p − s) vanishes at s = p/2, giving the least distance √(p²/4 + p²/4) = p/√2.
 * So d > p/√2 collides at nominal timing; no timing precision avoids it (only the follower starting late does).
 *
 * Straight following: both move along x one cell apart, so their centres stay exactly p apart; d > p
 * collides too (such robots overlap already on neighbouring cells at rest).
 *
 * Pure, zod-free: importable from web, api and solvers.
 */

export interface FollowingHazard {
  /** d > p/√2: right-angle following collides at nominal timing. */
  readonly rightAngle: boolean;
  /** d > p: straight following collides too. */
  readonly straight: boolean;
  /** p/√2 in mm: the largest diameter right-angle following tolerates. */
  readonly rightAngleLimitMm: number;
  /** p in mm: the largest diameter straight following tolerates. */
  readonly straightLimitMm: number;
  /** One sentence for a warning, or null when neither hazard applies. */
  readonly message: string | null;
  /** The derivation with this profile's numbers (mm), for the warning and its help text. */
  readonly derivation: string;
}

/** Millimetres with at most one decimal, trailing ".0" dropped (353.6, 500). */
function mm(value: number): string {
  return `${Number(value.toFixed(1))} mm`;
}

export function followingHazard(profile: { readonly cellPitchMm: number; readonly robotDiameterMm: number }): FollowingHazard {
  const p = profile.cellPitchMm;
  const d = profile.robotDiameterMm;
  const rightAngleLimitMm = p / Math.SQRT2;
  const straightLimitMm = p;
  const rightAngle = d > rightAngleLimitMm;
  const straight = d > straightLimitMm;

  const rightAngleSentence =
    `When one robot leaves a cell along one axis while the next enters it along the other, at the same speed ` +
    `from the same instant, their centres are √(s² + (p − s)²) apart after each has travelled s; the least ` +
    `distance is p/√2 = ${mm(rightAngleLimitMm)} (at s = p/2 = ${mm(p / 2)} on the ${mm(p)} pitch), ` +
    `${rightAngle ? 'less than' : 'not less than'} the ${mm(d)} robot diameter.`;
  const straightSentence =
    `When both move along the same axis one cell apart, their centres stay p = ${mm(p)} apart, ` +
    `${straight ? 'less than' : 'not less than'} the diameter.`;
  const derivation = `${rightAngleSentence} ${straightSentence}`;

  let message: string | null = null;
  if (straight) {
    message =
      `Robots of ${mm(d)} on a ${mm(p)} pitch collide in any following, straight or at a right angle, even with ` +
      `perfect timing: plans with following allowed may collide however exactly they are executed. ` +
      `Choose following forbidden, or k-robust plans with k ≥ 1.`;
  } else if (rightAngle) {
    message =
      `Robots of ${mm(d)} on a ${mm(p)} pitch collide in right-angle following (diameter above p/√2 = ` +
      `${mm(rightAngleLimitMm)}) even with perfect timing: plans with following allowed may collide however ` +
      `exactly they are executed. Choose following forbidden, or k-robust plans with k ≥ 1.`;
  }
  return { rightAngle, straight, rightAngleLimitMm, straightLimitMm, message, derivation };
}
