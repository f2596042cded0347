import { closestApproach, overlapInterval } from './closest-approach';

// Hand-worked against the textbook closed form of the closest approach of two linearly moving
// points: τ* = −(D0·W)/(W·W), and the contact interval from the roots of
// (W·W)τ² + 2(D0·W)τ + (D0·D0 − r²) = 0 (e.g. C. Ericson, "Real-Time Collision Detection",
// Morgan Kaufmann 2005, moving spheres; from memory). Every expected number below is worked by hand.
describe('closestApproach', () => {
  it('finds the meeting point of two points driving head on', () => {
    // D0 = (10, 0), W = (−2, 0): τ* = 20 / 4 = 5, distance 0.
    const c = closestApproach([0, 0], [1, 0], [10, 0], [-1, 0], 100);
    expect(c.time).toBeCloseTo(5, 12);
    expect(c.distance).toBeCloseTo(0, 12);
  });

  it('finds a near miss and clamps to the time span', () => {
    // D0 = (10, 4), W = (−2, 0): τ* = 5, distance 4; with span 2 the closest is at τ = 2, |(6, 4)| = √52.
    expect(closestApproach([0, 0], [1, 0], [10, 4], [-1, 0], 100)).toEqual({ time: 5, distance: 4 });
    const clamped = closestApproach([0, 0], [1, 0], [10, 4], [-1, 0], 2);
    expect(clamped.time).toBe(2);
    expect(clamped.distance).toBeCloseTo(Math.sqrt(52), 12);
  });

  it('solves an oblique case', () => {
    // D0 = (3, −3), W = (−1, 2): W·W = 5, D0·W = −9, τ* = 1.8, D = (1.2, 0.6), distance √1.8.
    const c = closestApproach([1, 2], [0.5, -1], [4, -1], [-0.5, 1], 10);
    expect(c.time).toBeCloseTo(1.8, 12);
    expect(c.distance).toBeCloseTo(Math.sqrt(1.8), 12);
  });
});

describe('overlapInterval', () => {
  const out = new Float64Array(2);

  it('gives the open interval between the roots for a head-on pass', () => {
    // |10 − 2τ| < 2 ⇔ τ ∈ (4, 6).
    expect(overlapInterval(10, 0, -2, 0, 100, 2, out)).toBe(true);
    expect(out[0]).toBeCloseTo(4, 12);
    expect(out[1]).toBeCloseTo(6, 12);
  });

  it('gives the interval for a perpendicular crossing', () => {
    // A = (τ, 0), B = (5, −5 + τ): |D|² = 2(5 − τ)² < 2 ⇔ τ ∈ (4, 6).
    expect(overlapInterval(5, -5, -1, 1, 100, Math.SQRT2, out)).toBe(true);
    expect(out[0]).toBeCloseTo(4, 12);
    expect(out[1]).toBeCloseTo(6, 12);
  });

  it('solves the oblique quadratic', () => {
    // 5τ² − 18τ + 14 < 0: roots (18 ± √44) / 10.
    expect(overlapInterval(3, -3, -1, 2, 10, 2, out)).toBe(true);
    expect(out[0]).toBeCloseTo((18 - Math.sqrt(44)) / 10, 12);
    expect(out[1]).toBeCloseTo((18 + Math.sqrt(44)) / 10, 12);
  });

  it('clips to the span and reports nothing outside it', () => {
    expect(overlapInterval(10, 0, -2, 0, 5, 2, out)).toBe(true);
    expect([out[0], out[1]]).toEqual([4, 5]);
    expect(overlapInterval(10, 0, -2, 0, 3.9, 2, out)).toBe(false);
  });

  it('treats touching as no overlap and a standing overlap as the whole span', () => {
    // Parallel at distance 3: radius 3 only touches; radius 3.5 overlaps throughout, even forever.
    expect(overlapInterval(0, 3, 0, 0, 10, 3, out)).toBe(false);
    expect(overlapInterval(0, 3, 0, 0, Infinity, 3.5, out)).toBe(true);
    expect([out[0], out[1]]).toEqual([0, Infinity]);
    // Grazing: closest distance exactly the radius (D0 = (10, 2), W = (−2, 0), r = 2).
    expect(overlapInterval(10, 2, -2, 0, 100, 2, out)).toBe(false);
  });
});
