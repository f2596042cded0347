// The soundness lemma of the weighted-split splits, checked by sampling: whenever two plans
// violate BOTH children's constraints of a split, the independent schedule validator
// (solvers/validate/schedule.ts) must find an overlap between them. Also checks progress:
// the plans the split came from violate their own child's constraints. Whether a plan breaks a
// constraint is judged by code written in this spec (heldIntervals, violates), not by the
// engine's cellVisits.
import type { RobotProfile, Schedule } from '@shared/plan';
import { gridFromText, type Grid } from '../grid/grid';
import { forwardCell, headingLetter, turnedLeft, turnedRight } from '../grid/heading-graph';
import { createRng, type Rng } from '../random';
import { validateSchedule } from '../validate/schedule';
import { branchOptions } from './ccbs-branch';
import { cellVisits, findConflicts } from './ccbs-conflict';
import type { AgentBan } from './sipp-constraints';
import type { SippPlan, SippStep } from './sipp';

const grid: Grid = gridFromText('...\n...\n...');

/** A random walk of timed actions from `start`: forwards, quarter turns and waits of 1–4 ms. */
function randomPlan(rng: Rng, start: number, F: number, T: number, length: number): SippPlan {
  let cell = start;
  let heading = rng.int(4);
  let t = 0;
  const steps: SippStep[] = [];
  for (let k = 0; k < length; k++) {
    const roll = rng.next();
    const ahead = forwardCell(grid, cell, heading);
    if (roll < 0.5 && ahead >= 0) {
      steps.push({ kind: 'forward', from: cell, to: ahead, heading, start: t, end: t + F });
      cell = ahead;
      t += F;
    } else if (roll < 0.75) {
      const next = rng.next() < 0.5 ? turnedLeft(heading) : turnedRight(heading);
      steps.push({ kind: next === turnedLeft(heading) ? 'turn-left' : 'turn-right', from: cell, to: cell, heading: next, start: t, end: t + T });
      heading = next;
      t += T;
    } else {
      const d = 1 + rng.int(4);
      steps.push({ kind: 'wait', from: cell, to: cell, heading, start: t, end: t + d });
      t += d;
    }
  }
  const lastForward = [...steps].reverse().find((s) => s.kind === 'forward');
  return { steps, cost: lastForward ? lastForward.end : 0 };
}

/**
 * Another plan of the same agent with the same goal (the lemma is about one instance): either
 * the base plan with its timing stretched by extra waits, or a fresh walk that happens to end
 * at the same cell; null when neither is drawn.
 */
function samePlanGoal(rng: Rng, start: number, base: SippPlan, F: number, T: number): SippPlan | null {
  const goal = endCell(start, base);
  if (rng.next() < 0.5) {
    const steps: SippStep[] = [];
    let shift = 0;
    for (const s of base.steps) {
      if (rng.next() < 0.3) {
        const d = 1 + rng.int(4);
        steps.push({ kind: 'wait', from: s.from, to: s.from, heading: steps.length ? steps[steps.length - 1].heading : startHeadingOf(s), start: s.start + shift, end: s.start + shift + d });
        shift += d;
      }
      steps.push({ ...s, start: s.start + shift, end: s.end + shift });
    }
    const lastForward = [...steps].reverse().find((s) => s.kind === 'forward');
    return { steps, cost: lastForward ? lastForward.end : 0 };
  }
  for (let tries = 0; tries < 20; tries++) {
    const p = randomPlan(rng, start, F, T, 2 + rng.int(7));
    if (endCell(start, p) === goal) return p;
  }
  return null;
}

/** The heading an agent has before step `s` (the inverse of a turn; unchanged otherwise). */
function startHeadingOf(s: SippStep): number {
  if (s.kind === 'turn-left') return turnedRight(s.heading);
  if (s.kind === 'turn-right') return turnedLeft(s.heading);
  return s.heading;
}

function endCell(start: number, plan: SippPlan): number {
  return plan.steps.reduce((c, s) => s.to, start);
}

/**
 * The half-open intervals in which a plan holds each cell, by the occupancy rule as stated in
 * sipp.ts (written out again here, apart from the engine's cellVisits, so the judge below does
 * not check the splits against the code that made them): the start cell until the first action,
 * the current cell during every action, the target cell too during a forward move, and the
 * last cell forever after the last action.
 */
function heldIntervals(start: number, plan: SippPlan): { cell: number; from: number; to: number }[] {
  const held: { cell: number; from: number; to: number }[] = [];
  const steps = plan.steps;
  held.push({ cell: start, from: 0, to: steps.length > 0 ? steps[0].start : Infinity });
  for (const s of steps) {
    held.push({ cell: s.from, from: s.start, to: s.end });
    if (s.kind === 'forward') held.push({ cell: s.to, from: s.start, to: s.end });
  }
  if (steps.length > 0) held.push({ cell: steps[steps.length - 1].to, from: steps[steps.length - 1].end, to: Infinity });
  return held;
}

/** Whether a plan breaks a ban, by the plain reading of each ban's definition (sipp-constraints.ts). */
function violates(start: number, plan: SippPlan, ban: AgentBan): boolean {
  if (ban.kind === 'occupancy') {
    // "must not occupy `cell` at any instant of [from, to)": some held interval of the cell meets the window.
    return heldIntervals(start, plan).some((h) => h.cell === ban.cell && h.from < ban.to && ban.from < h.to);
  }
  if (ban.kind === 'move') {
    // "must not START the forward move fromCell → toCell at any time in [from, to)".
    return plan.steps.some((s) => s.kind === 'forward' && s.from === ban.fromCell && s.to === ban.toCell && ban.from <= s.start && s.start < ban.to);
  }
  if (ban.kind === 'landmark') {
    // "MUST start one of `moves` at some time in [from, to)": no forward step does.
    return !plan.steps.some((s) => s.kind === 'forward' && ban.moves.some((m) => m.fromCell === s.from && m.toCell === s.to) && ban.from <= s.start && s.start < ban.to);
  }
  // "the final visit of its goal must begin at or after notBefore": that visit begins when the
  // last forward move (into the final cell, which it then holds) starts, or at 0 if it never moves.
  const lastForward = [...plan.steps].reverse().find((s) => s.kind === 'forward');
  return (lastForward ? lastForward.start : 0) < ban.notBefore;
}

/** The 4-neighbours of a cell of the open 3 × 3 grid, by coordinates (not by the engine's tables). */
function neighboursOf(cell: number): number[] {
  const x = cell % grid.width;
  const y = Math.floor(cell / grid.width);
  return [[x, y - 1], [x + 1, y], [x, y + 1], [x - 1, y]]
    .filter(([a, b]) => a >= 0 && b >= 0 && a < grid.width && b < grid.height)
    .map(([a, b]) => b * grid.width + a);
}

function toSchedule(plans: readonly SippPlan[]): Schedule {
  const xy = (c: number): [number, number] => [c % grid.width, Math.floor(c / grid.width)];
  return plans.map((p) => p.steps.map((s, step) => ({ action: s.kind, from: xy(s.from), to: xy(s.to), heading: headingLetter(s.heading), start: s.start, end: s.end, step })));
}

describe('branchOptions', () => {
  it('every split is sound and makes progress on sampled plan pairs', () => {
    // Arrange
    const rng = createRng(31337);
    const profile: RobotProfile = { forwardMs: 3, quarterTurnMs: 2, waitMs: 1, cellPitchMm: 1, robotDiameterMm: 1, timingJitter: 0 };
    const F = profile.forwardMs;
    let bothViolated = 0;
    const kinds = new Set<string>();
    for (let trial = 0; trial < 150; trial++) {
      const starts = [rng.int(9), rng.int(9)];
      if (starts[0] === starts[1]) continue;
      const base = starts.map((s) => randomPlan(rng, s, F, profile.quarterTurnMs, 3 + rng.int(6)));
      const { conflicts } = findConflicts(base.map((p, a) => cellVisits(a, starts[a], p, F)), 3);
      for (const conflict of conflicts) {
        for (const option of [...branchOptions(conflict, F), ...branchOptions(conflict, F, neighboursOf)]) {
          kinds.add(option.kind);
          // Assert progress: each agent's current plan breaks its own child's bans.
          for (const child of option.children) {
            expect(child.bans.some((b) => violates(starts[child.agent], base[child.agent], b))).toBe(true);
          }
          // Act / Assert soundness on 60 fresh plan pairs from the same starts.
          for (let k = 0; k < 60; k++) {
            const plans = starts.map((s, a) => samePlanGoal(rng, s, base[a], F, profile.quarterTurnMs));
            if (plans.some((p) => p === null)) continue;
            const isBoth = option.children.every((child) => child.bans.some((b) => violates(starts[child.agent], plans[child.agent] as SippPlan, b)));
            if (!isBoth) continue;
            bothViolated++;
            const inst = { grid, agents: starts.map((s, a) => ({ start: s, goal: endCell(s, base[a]) })) };
            const check = validateSchedule(inst, toSchedule(plans as SippPlan[]), profile, { startHeading: 'free' });
            expect(check.violation?.kind).toBe('overlap');
          }
        }
      }
    }
    expect(bothViolated).toBeGreaterThan(1000);
    expect([...kinds].sort()).toEqual(['move-goal', 'move-move', 'move-occupancy']);
  });
});
