import { followingHazard } from './following-hazard';

/**
 * Least centre distance of two robots moving at the same speed from the same instant, found by sampling their
 * positions (no use of the closed form in following-hazard.ts). The leader starts on cell v = (0, 0) and leaves
 * along +x; the follower starts one cell before v, at `followerStart`, and drives towards v.
 */
function sampledLeastDistance(pitchMm: number, followerStart: readonly [number, number], samples: number): number {
  let least = Infinity;
  for (let i = 0; i <= samples; i++) {
    const travelled = (pitchMm * i) / samples;
    const leader = [travelled, 0];
    const along = [-followerStart[0] / pitchMm, -followerStart[1] / pitchMm];
    const follower = [followerStart[0] + along[0] * travelled, followerStart[1] + along[1] * travelled];
    least = Math.min(least, Math.hypot(leader[0] - follower[0], leader[1] - follower[1]));
  }
  return least;
}

describe('followingHazard', () => {
  it('matches sampled centre paths of right-angle and straight following for many profiles', () => {
    let compared = 0;
    for (const pitch of [300, 500, 1000, 1250]) {
      // 7001 samples (odd count of steps, so the midpoint s = p/2 is NOT a sample point: the check does not lean on it).
      const rightAngleLeast = sampledLeastDistance(pitch, [0, -pitch], 7001);
      const straightLeast = sampledLeastDistance(pitch, [-pitch, 0], 7001);
      for (let diameter = 50; diameter <= 1.5 * pitch; diameter += 7) {
        // Skip diameters within sampling error of the sampled least distance.
        if (Math.abs(diameter - rightAngleLeast) < 0.05 || Math.abs(diameter - straightLeast) < 0.05) continue;
        const h = followingHazard({ cellPitchMm: pitch, robotDiameterMm: diameter });
        expect(h.rightAngle).toBe(rightAngleLeast < diameter);
        expect(h.straight).toBe(straightLeast < diameter);
        expect(h.message === null).toBe(!(rightAngleLeast < diameter));
        compared++;
      }
      expect(h0(pitch).rightAngleLimitMm).toBeCloseTo(rightAngleLeast, 1);
      expect(h0(pitch).straightLimitMm).toBeCloseTo(straightLeast, 6);
    }
    expect(compared).toBeGreaterThan(500);
  });

  it('flags 400 mm robots on a 500 mm pitch for right-angle following only, least distance 353.6 mm', () => {
    // Example of issue 12: agents (1,1)→(1,2) and (0,1)→(1,1) on an empty 3×3 map collide at perfect timing.
    const h = followingHazard({ cellPitchMm: 500, robotDiameterMm: 400 });
    expect(h.rightAngle).toBe(true);
    expect(h.straight).toBe(false);
    expect(h.rightAngleLimitMm).toBeCloseTo(353.553, 3);
    expect(h.straightLimitMm).toBe(500);
    expect(h.derivation).toContain('p/√2 = 353.6 mm');
    expect(h.derivation).toContain('s = p/2 = 250 mm');
    expect(h.derivation).toContain('less than the 400 mm robot diameter');
    expect(h.message).toContain('right-angle following');
    expect(h.message).toContain('following forbidden');
    expect(h.message).toContain('k-robust');
  });

  it('says nothing for robots no wider than pitch/√2 (the boundary itself only touches)', () => {
    expect(followingHazard({ cellPitchMm: 1000, robotDiameterMm: 700 }).message).toBeNull();
    const boundary = followingHazard({ cellPitchMm: 1000, robotDiameterMm: 1000 / Math.SQRT2 });
    expect(boundary.rightAngle).toBe(false);
    expect(boundary.message).toBeNull();
    expect(boundary.derivation).toContain('not less than');
  });

  it('names straight following too when the diameter exceeds the pitch', () => {
    const h = followingHazard({ cellPitchMm: 500, robotDiameterMm: 520 });
    expect(h.rightAngle).toBe(true);
    expect(h.straight).toBe(true);
    expect(h.message).toContain('straight or at a right angle');
  });
});

function h0(pitch: number) {
  return followingHazard({ cellPitchMm: pitch, robotDiameterMm: 1 });
}
