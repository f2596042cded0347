import { STARTER_PROFILE } from '@shared/executions-constants';
import type { ScheduledAction } from '@shared/plan';
import { formatTrialLogCsv, parseTrialLogCsv, type TrialLog, type TrialRow } from '@shared/trial-log';
import { realisedTimeline } from '../execute';
import type { ExecutablePlan } from '../execute/execution-types';
import { randomWalks } from '../execute/testing/random-walks';
import { tinyInstance } from '../testing/tiny-instance';
import { compareTrialToPlan, type TrialComparison } from './compare-to-plan';
import { trialLogFromTimeline } from './simulated-trial';

const profile = { ...STARTER_PROFILE, timingJitter: 0 };
// Twelve robots, 40 actions each, on an open 40 × 40 grid (not conflict-free: timing figures only;
// spaced so that its dependency graph has no cycle and dependency-gated runs finish).
const walk = randomWalks(11, { robots: 12, actions: 40, side: 40, spacing: 3, profile, stopsEarly: false });
const plan: ExecutablePlan = { timeline: 'steps', schedule: walk.schedule };

function matched(c: TrialComparison) {
  if (c.kind !== 'matches') throw new Error(`expected a match, got: ${c.divergence.message}`);
  return c.figures;
}

function diverged(c: TrialComparison) {
  if (c.kind !== 'diverges') throw new Error('expected a divergence');
  return c.divergence;
}

function withRows(log: TrialLog, rows: readonly TrialRow[]): TrialLog {
  return { ...log, rows };
}

describe('compareTrialToPlan on logs written from simulated runs', () => {
  it.each(['open-loop', 'dependency-gated', 'lockstep'] as const)('gives the simulator figures of the same run under %s', (policy) => {
    const timeline = realisedTimeline(walk.instance, plan, profile, { policy, noise: { jitterCv: 0.2, stallProbability: 0.05, stallMs: 3000 }, seed: 5 }, 2);
    const log = trialLogFromTimeline('sim.csv', timeline);

    const figures = matched(compareTrialToPlan(walk.instance, plan, profile, log));

    const m = timeline.metrics;
    expect(log.rows).toHaveLength(12 * 40);
    expect(figures.realisedMakespanMs).toBe(m.realisedMakespanMs);
    expect(figures.realisedSocMs).toBe(m.realisedSocMs);
    expect(figures.waitingMs).toBe(m.waitingMs);
    expect(figures.waitingMaxPerRobotMs).toBe(m.waitingMaxPerRobotMs);
    expect(figures.finishSpreadMs).toBe(m.finishSpreadMs);
    expect(figures.perRobot.map((r) => r.waitedMs)).toEqual(timeline.waitByRobot.map((w) => w.waitedMs));
    expect(figures.collisions).toBe(log.rows.filter((r) => r.event === 'collision').length);
    expect(figures.isSuccess).toBe(figures.collisions === 0);
    if (policy !== 'open-loop') expect(figures.waitingMs).toBeGreaterThan(0);
  });

  it('gives the same figures from the CSV text of the log', () => {
    const timeline = realisedTimeline(walk.instance, plan, profile, { policy: 'dependency-gated', noise: { jitterCv: 0.1 }, seed: 9 }, 0);
    const direct = trialLogFromTimeline('sim.csv', timeline, { withPose: true, cellPitchMm: profile.cellPitchMm });
    const parsed = parseTrialLogCsv('sim.csv', formatTrialLogCsv(direct.rows));
    if (parsed.kind !== 'parsed') throw new Error(JSON.stringify(parsed.errors[0]));

    expect(parsed.log.rows).toEqual(direct.rows);
    expect(compareTrialToPlan(walk.instance, plan, profile, parsed.log)).toEqual(compareTrialToPlan(walk.instance, plan, profile, direct));
  });
});

describe('compareTrialToPlan refuses a log that departs from its plan', () => {
  const timeline = realisedTimeline(walk.instance, plan, profile, { policy: 'open-loop', seed: 1 }, 0);
  const log = trialLogFromTimeline('lab.csv', timeline);

  it('at the first row, in file order, whose action differs from the plan', () => {
    const rows = log.rows.map((row) => ({ ...row }));
    // Change robot 3's 6th and robot 1's 9th action; the one earlier in the file is reported.
    const flip = (r: number, k: number): number => {
      const i = rows.findIndex((row, j) => row.robot === r && rows.slice(0, j).filter((x) => x.robot === r).length === k);
      rows[i] = { ...rows[i], action: rows[i].action === 'wait' ? 'forward' : 'wait' };
      return i;
    };
    const first = Math.min(flip(3, 5), flip(1, 8));

    const d = diverged(compareTrialToPlan(walk.instance, plan, profile, withRows(log, rows)));

    expect(d).toEqual(expect.objectContaining({ file: 'lab.csv', line: rows[first].line, field: 'action', robot: rows[first].robot, logged: rows[first].action }));
    expect(d.planned).toBe(walk.schedule[d.robot][d.actionIndex].action);
    expect(d.planned).not.toBe(d.logged);
    expect(d.message).toContain(`robot ${d.robot}'s action ${d.actionIndex + 1} is ${d.planned} in the plan, but the log has ${d.logged}`);
  });

  it('at a row of a robot the plan does not have', () => {
    const rows = [...log.rows.slice(0, 5), { ...log.rows[5], robot: 12 }, ...log.rows.slice(6)];

    const d = diverged(compareTrialToPlan(walk.instance, plan, profile, withRows(log, rows)));

    expect(d).toEqual(expect.objectContaining({ line: log.rows[5].line, field: 'robot', robot: 12, planned: null }));
  });

  it('at a row past the end of the robot\'s plan', () => {
    const last = log.rows.filter((r) => r.robot === 4).at(-1)!;
    const rows = [...log.rows, { ...last, startMs: last.endMs, endMs: last.endMs + 500, action: 'wait' as const, line: 999 }];

    const d = diverged(compareTrialToPlan(walk.instance, plan, profile, withRows(log, rows)));

    expect(d).toEqual(expect.objectContaining({ line: 999, robot: 4, actionIndex: 40, planned: null, logged: 'wait' }));
  });

  it('when a robot stops short and no row marks an abort, at its last row', () => {
    const rows = log.rows.filter((r) => !(r.robot === 7 && r.startMs >= walk.schedule[7][30].start));

    const d = diverged(compareTrialToPlan(walk.instance, plan, profile, withRows(log, rows)));

    expect(d).toEqual(expect.objectContaining({ robot: 7, actionIndex: 30, logged: null, planned: walk.schedule[7][30].action }));
    expect(d.line).toBe(rows.filter((r) => r.robot === 7).at(-1)!.line);
    expect(d.message).toContain('stops after 30 of its 40 planned actions');
  });

  it('but takes a run stopped short with an abort row, as a failed run with no makespan', () => {
    const cut = walk.schedule[7][30].start;
    const rows = log.rows
      .filter((r) => r.startMs < cut)
      .map((r) => (r.robot === 7 && r.endMs === cut ? { ...r, event: 'abort' as const } : r));

    const figures = matched(compareTrialToPlan(walk.instance, plan, profile, withRows(log, rows)));

    expect(figures).toEqual(expect.objectContaining({ isAborted: true, isSuccess: false, realisedMakespanMs: null, finishSpreadMs: null }));
    expect(figures.perRobot[7].actionsLogged).toBe(30);
  });
});

describe('compareTrialToPlan figures of a hand-written trial', () => {
  // Two robots on a 4 × 2 map: robot 0 drives east twice, robot 1 turns, waits and drives once.
  const instance = tinyInstance('....\n....', [[[0, 0], [2, 0], 'E'], [[3, 1], [3, 0], 'E']]);
  const act = (action: ScheduledAction['action'], from: [number, number], to: [number, number], heading: ScheduledAction['heading'], start: number, end: number, step: number): ScheduledAction => ({ action, from, to, heading, start, end, step });
  const schedule: ScheduledAction[][] = [
    [act('forward', [0, 0], [1, 0], 'E', 0, 1000, 0), act('forward', [1, 0], [2, 0], 'E', 1000, 2000, 1)],
    [act('turn-left', [3, 1], [3, 1], 'N', 0, 600, 0), act('wait', [3, 1], [3, 1], 'N', 600, 1600, 1), act('forward', [3, 1], [3, 0], 'N', 1600, 2600, 2)],
  ];
  const csv = [
    'robot,action,start_ms,end_ms,event',
    '0,forward,0,1100,',
    '1,turn-left,50,700,',
    '0,forward,1300,2350,',
    '1,wait,700,1700,',
    '1,forward,1900,2800,collision',
  ].join('\n');

  it('computes makespan, waiting, spread, delays and collisions from the rows', () => {
    const parsed = parseTrialLogCsv('hand.csv', csv);
    if (parsed.kind !== 'parsed') throw new Error('the log should parse');

    const figures = matched(compareTrialToPlan(instance, { timeline: 'steps', schedule }, STARTER_PROFILE, parsed.log));

    expect(figures).toEqual(expect.objectContaining({
      isSuccess: false, isAborted: false, collisions: 1, realisedMakespanMs: 2800, realisedSocMs: 2350 + 2800,
      // Robot 0 idles 200 ms before its second move; robot 1 idles 50 ms at the start and 200 ms before its move.
      waitingMs: 200 + 250, waitingMaxPerRobotMs: 250, waitingMeanPerRobotMs: 225, finishSpreadMs: 2800 - 2350,
    }));
    expect(figures.collisionEvents).toEqual([{ robot: 1, line: 6, startMs: 1900, endMs: 2800 }]);
    expect(figures.perRobot.map((r) => [r.plannedArrivalMs, r.realisedArrivalMs, r.arrivalDelayMs, r.waitedMs])).toEqual([[2000, 2350, 350, 200], [2600, 2800, 200, 250]]);
  });
});
