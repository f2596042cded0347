import type { RunTimeline } from '@solvers/execute';
import { runAttribution } from './run-attribution';
import { testInstance } from './plan-viewer-testing';
import { realisedTimeline } from '@solvers/execute';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { TEST_PROFILE } from './plan-viewer-testing';

/** A timeline with the simulator's attribution fields (contract C3 of issue 12), worked by hand. */
function attributed(extra: object): RunTimeline {
  return { robots: [[], [], []], metrics: {} as RunTimeline['metrics'], ...extra } as unknown as RunTimeline;
}

describe('runAttribution', () => {
  it('says who waited for whom, most waiting first, robots numbered from 1', () => {
    const a = runAttribution(attributed({
      waitByRobot: [
        { robot: 0, waitedMs: 0, waitedFor: [] },
        { robot: 1, waitedMs: 400, waitedFor: [{ robot: 0, ms: 400 }] },
        { robot: 2, waitedMs: 1200, waitedFor: [{ robot: 1, ms: 800 }, { robot: 0, ms: 400 }] },
      ],
      criticalChain: [
        { robot: 0, fromMs: 0, toMs: 3000, reason: 'own', waitedFor: null },
        { robot: 2, fromMs: 3000, toMs: 3400, reason: 'dependency', waitedFor: 0 },
        { robot: 2, fromMs: 3400, toMs: 9000, reason: 'own', waitedFor: null },
      ],
    }), 'dependency-gated');
    expect(a.waits).toEqual(['robot 3 waited 1.2 s: 0.8 s for robot 2, 0.4 s for robot 1', 'robot 2 waited 0.4 s: 0.4 s for robot 1']);
    expect(a.chain).toEqual([
      'robot 1 drove its own actions, 0 s to 3 s',
      'robot 3 waited on a dependency for robot 1, 3 s to 3.4 s',
      'robot 3 drove its own actions, 3.4 s to 9 s',
    ]);
    expect(a.chainSegments).toHaveLength(3);
    expect(a.events).toEqual([]);
    expect(a.note).toBeNull();
  });

  it('explains an empty list: open-loop never waits, gating that held nobody leaves the makespan unchanged', () => {
    const none = { waitByRobot: [{ robot: 0, waitedMs: 0, waitedFor: [] }], criticalChain: [{ robot: 0, fromMs: 0, toMs: 5000, reason: 'own', waitedFor: null }] };
    expect(runAttribution(attributed(none), 'open-loop').note).toMatch(/^Open-loop: no robot waits/);
    expect(runAttribution(attributed(none), 'dependency-gated').note).toMatch(/gating never held anyone/);
  });

  it('leaves padding actions (robot already at its goal for good) out of the single waits, as the robot totals do', () => {
    const action = (start: number, waitedMs: number, isPadding: boolean) =>
      ({ start, end: start + 1000, waitedMs, waitedFor: 0, waitReason: 'barrier', isPadding });
    const a = runAttribution(attributed({
      robots: [[action(0, 0, false)], [action(1500, 500, false), action(4000, 2000, true), action(6000, 900, true)]],
      waitByRobot: [{ robot: 0, waitedMs: 0, waitedFor: [] }, { robot: 1, waitedMs: 500, waitedFor: [{ robot: 0, ms: 500 }] }],
      criticalChain: [{ robot: 1, fromMs: 0, toMs: 7000, reason: 'own', waitedFor: null }],
    }), 'lockstep');
    // Only the one non-padding wait is listed; the two longer padding waits are neither listed nor counted as left out.
    expect(a.events).toEqual(['robot 2 waited 0.5 s for robot 1 (barrier), 1 s to 1.5 s']);
    expect(a.moreEvents).toBe(0);
  });

  it('on a real run: one sentence per robot that waited, naming whom, and a chain from 0 to the realised makespan', () => {
    // Nose-to-tail lane, dependency-gated with jitter 0.3 (run 0 of seed 1): followers are held by the robot ahead.
    const instance = testInstance('........', [[2, 7], [1, 6], [0, 5]]);
    const paths = [[2, 3, 4, 5, 6, 7], [1, 2, 3, 4, 5, 6], [0, 1, 2, 3, 4, 5]];
    const { schedule } = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: 'none' });
    const timeline = realisedTimeline(instance, { timeline: 'steps', schedule }, TEST_PROFILE, { policy: 'dependency-gated', noise: { jitterCv: 0.3 }, seed: 1 }, 0);
    const waited = timeline.waitByRobot.filter((w) => w.waitedMs > 0);
    expect(waited.length).toBeGreaterThan(0);
    const a = runAttribution(timeline, 'dependency-gated');
    expect(a.waits).toHaveLength(waited.length);
    // In a lane only the robot ahead can hold a follower: robot i + 1 (screen numbering) waits for robot i.
    for (const w of a.waits) {
      const [, me, them] = /^robot (\d) waited [\d.]+ s: [\d.]+ s for robot (\d)$/.exec(w) ?? [];
      expect(Number(them)).toBe(Number(me) - 1);
    }
    // Single waits: as many as actions that waited (up to the cap), each naming the robot ahead and when.
    const waitingActions = timeline.robots.flatMap((acts, r) => acts.filter((x) => x.waitedMs > 0).map((x) => ({ r, x })));
    expect(a.events).toHaveLength(Math.min(waitingActions.length, 8));
    expect(a.moreEvents).toBe(waitingActions.length - a.events.length);
    for (const w of a.events) {
      const [, me, them] = /^robot (\d) waited [\d.]+ s for robot (\d) \(dependency\), [\d.]+ s to [\d.]+ s$/.exec(w) ?? [];
      expect(Number(them)).toBe(Number(me) - 1);
    }
    expect(a.chainSegments[0].fromMs).toBe(0);
    expect(a.chainSegments.at(-1)!.toMs).toBe(timeline.metrics.realisedMakespanMs);
    expect(a.chain).toHaveLength(a.chainSegments.length);
  });
});
