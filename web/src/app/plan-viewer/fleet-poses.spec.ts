import { FleetPoses, POSE_STATE } from './fleet-poses';
import { runPaths, testInstance } from './plan-viewer-testing';

describe('FleetPoses', () => {
  it('turns a robot on the spot, then drives it in a straight line (hand-worked)', () => {
    // Robot faces E at [0, 0] and goes down to [0, 1]: turn-right 0–500 ms, forward 500–1500 ms.
    const instance = testInstance('..\n..', [[0, 2, 'E']]);
    const poses = new FleetPoses(runPaths(instance, [[0, 2]]).track);

    poses.update(250);
    expect([poses.x[0], poses.y[0]]).toEqual([0, 0]);
    expect(poses.angle[0]).toBeCloseTo(Math.PI / 4, 6);
    poses.update(1000);
    expect(poses.x[0]).toBe(0);
    expect(poses.y[0]).toBeCloseTo(0.5, 6);
    expect(poses.angle[0]).toBeCloseTo(Math.PI / 2, 6);
    expect(poses.state[0]).toBe(POSE_STATE.active);
    poses.update(5000);
    expect([poses.x[0], poses.y[0], poses.state[0]]).toEqual([0, 1, POSE_STATE.done]);
  });

  it('plays backwards after a jump back (the cursor resets)', () => {
    const instance = testInstance('....', [[0, 3]]);
    const poses = new FleetPoses(runPaths(instance, [[0, 1, 2, 3]]).track);
    poses.update(2900);
    poses.update(1500);
    expect(poses.x[0]).toBeCloseTo(1.5, 6);
  });

  it('marks a follower held while it waits on its leader under dependency-gated execution', () => {
    // Leader 1 → 2, follower 0 → 1: the follower may enter cell 1 only once the leader has left it.
    const instance = testInstance('....', [[1, 2], [0, 1]]);
    const poses = new FleetPoses(runPaths(instance, [[1, 2], [0, 1]], { policy: 'dependency-gated' }).track);
    poses.update(500);
    expect(poses.state[1]).toBe(POSE_STATE.held);
    expect(poses.x[1]).toBe(0);
    expect(poses.x[0]).toBeCloseTo(1.5, 6);
    poses.update(1500);
    expect(poses.state[1]).toBe(POSE_STATE.active);
    expect(poses.x[1]).toBeCloseTo(0.5, 6);
  });

  it("agrees with the simulator's exact collision times: disks overlap just after, not just before", () => {
    // Independent check: collision-sweep.ts finds overlaps analytically; our interpolation must put
    // the two centres closer than one diameter (0.7 cells) right after each collision begins.
    const instance = testInstance('............', [[3, 10], [2, 9], [1, 8], [0, 7]]);
    const paths = [[3, 4, 5, 6, 7, 8, 9, 10], [2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3, 4, 5, 6, 7, 8], [0, 1, 2, 3, 4, 5, 6, 7]];
    let checked = 0;
    for (let run = 0; run < 10; run++) {
      const { track, runner } = runPaths(instance, paths, { noise: { jitterCv: 0.3 }, seed: 3, run });
      const collisions = runner.run(run).collisions;
      const poses = new FleetPoses(track);
      for (const c of collisions) {
        const [i, j] = c.robots;
        const gap = (t: number) => {
          poses.update(t);
          return Math.hypot(poses.x[i] - poses.x[j], poses.y[i] - poses.y[j]);
        };
        expect(gap(c.timeMs + 1e-3)).toBeLessThan(0.7);
        if (c.timeMs > 1e-3) expect(gap(c.timeMs - 1e-3)).toBeGreaterThanOrEqual(0.7 - 1e-6);
        checked++;
      }
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('freezes robots stopped by a collision and reports them stopped', () => {
    const instance = testInstance('...', [[0, 2], [2, 0]]);
    const { track, runner } = runPaths(instance, [[0, 1, 2], [2, 1, 0]], { onCollision: 'stop' });
    const hit = runner.run(0).collisions[0];
    const poses = new FleetPoses(track);
    poses.update(hit.timeMs + 2000);
    expect([poses.state[0], poses.state[1]]).toEqual([POSE_STATE.stopped, POSE_STATE.stopped]);
    // Head-on at 1 m/s each from 2 m apart, 70 cm disks: they touch after 650 ms, 0.65 cells from their starts (worked by hand).
    expect(poses.x[0]).toBeCloseTo(0.65, 5);
    expect(poses.x[1]).toBeCloseTo(1.35, 5);
  });
});
