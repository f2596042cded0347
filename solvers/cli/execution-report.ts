/**
 * What `execute` prints from a Monte Carlo summary: the stable `--json` contract and the lines a
 * person reads. Every figure drawn from random runs carries its 95 % interval; waiting is given
 * per robot (mean and max over robots) and, labelled apart, as the total over robots.
 */
import { CI95_METHOD, type Interval95 } from '../../shared/confidence-interval';
import type { PlanModel, RobotProfile } from '../../shared/plan';
import type { ExecutionSummary, MetricStats } from '../execute';

type Interval = Interval95;

/** The keys of `execute --json`, in order; `ci95` is the one addition of issue 12 (item 5). */
export const EXECUTE_JSON_KEYS = ['runs', 'successRate', 'collisions', 'realisedMakespanMs', 'finishSpreadMs', 'waitingMs', 'firstCollision', 'ci95'] as const;

/** The 95 % intervals of `--json`: of the success rate and of the MEANS of realised makespan and finish spread; null where undefined. */
export interface JsonCi95 {
  readonly successRate: Interval | null;
  readonly realisedMakespanMs: Interval | null;
  readonly finishSpreadMs: Interval | null;
}

/** The stable JSON contract of `execute --json`. */
export function executeJson(s: ExecutionSummary): Record<(typeof EXECUTE_JSON_KEYS)[number], unknown> {
  // From the summary's intervals (solvers/execute): the rate's Wilson interval, the Student t intervals of the means.
  const ci95: JsonCi95 = { successRate: s.ci95.successRate, realisedMakespanMs: s.ci95.realisedMakespanMs, finishSpreadMs: s.ci95.finishSpreadMs };
  return {
    runs: s.runs,
    successRate: s.successRate,
    collisions: { mean: s.collisions.mean, total: s.collisions.total },
    realisedMakespanMs: { mean: s.realisedMakespanMs.mean, p95: s.realisedMakespanMs.p95 },
    finishSpreadMs: { mean: s.finishSpreadMs.mean, p95: s.finishSpreadMs.p95 },
    waitingMs: { mean: s.waitingMs.mean },
    firstCollision: s.firstCollision ? { robots: s.firstCollision.robots, timeMs: s.firstCollision.timeMs, at: s.firstCollision.at } : null,
    ci95,
  };
}

const ms = (v: number | null | undefined) => (v === null || v === undefined ? 'n/a' : `${v.toFixed(0)} ms`);
const ciMs = (i: Interval | null | undefined) => (i ? `95 % CI ${i[0].toFixed(0)}–${i[1].toFixed(0)} ms` : '95 % CI n/a');
const ciCount = (i: Interval | null) => (i ? `95 % CI ${i[0].toFixed(2)}–${i[1].toFixed(2)}` : '95 % CI n/a');
const ciPercent = (i: Interval | null | undefined) => (i ? `95 % CI ${(i[0] * 100).toFixed(1)}–${(i[1] * 100).toFixed(1)} %` : '95 % CI n/a');

/** What the human-readable report needs besides the summary. */
export interface ReportContext {
  readonly model: PlanModel;
  readonly profile: RobotProfile;
  readonly seed: number;
  readonly stallProbability: number;
  readonly stallMs: number;
  readonly following?: string;
}

/** The lines of the human-readable report (without the safety note, which the CLI adds). */
export function executeReportLines(s: ExecutionSummary, c: ReportContext): string[] {
  const perRobot = s.waitingPerRobotMs;
  const p = c.profile;
  const stats = (m: MetricStats) => `mean ${ms(m.mean)} (${ciMs(m.meanCi95)}), p95 ${ms(m.p95)} (${ciMs(m.p95Ci95)})`;
  const lines = [
    `plan model ${c.model}${c.following ? ` (following ${c.following})` : ''}, policy ${s.policy}, ${s.runs} runs (seed ${c.seed}),`
      + ` noise: jitter cv ${s.noise.jitterCv}, stalls p = ${c.stallProbability} × ${c.stallMs} ms`,
    `robot profile: forward ${p.forwardMs} ms, quarter turn ${p.quarterTurnMs} ms, wait ${p.waitMs} ms, pitch ${p.cellPitchMm} mm, diameter ${p.robotDiameterMm} mm`,
    `execution success rate        ${(s.successRate * 100).toFixed(1)} % (${ciPercent(s.ci95.successRate)})`,
    `collisions per run            mean ${s.collisions.mean.toFixed(2)} (${ciCount(s.collisions.meanCi95)}),`
      + ` total ${s.collisions.total} over all runs`,
    `realised makespan             ${stats(s.realisedMakespanMs)}`,
    `finish spread                 ${stats(s.finishSpreadMs)}`,
    `waiting per robot             mean ${ms(perRobot.mean.mean)} (${ciMs(perRobot.mean.meanCi95)}), max ${ms(perRobot.max.mean)} (${ciMs(perRobot.max.meanCi95)})`,
    '                              (per run: mean and max over robots of the time each waited; then the mean over runs)',
    `waiting, total over robots    mean ${ms(s.waitingMs.mean)} per run (${ciMs(s.waitingMs.meanCi95)})`,
  ];
  lines.push(`95 % intervals (CI): rate: ${CI95_METHOD.rate}; means: ${CI95_METHOD.mean}; p95: ${CI95_METHOD.quantile}`);
  const f = s.firstCollision;
  if (f) lines.push(`first collision               run ${f.run}: robots ${f.robots[0]} and ${f.robots[1]} at ${f.timeMs.toFixed(0)} ms near cell [${f.cell[0]}, ${f.cell[1]}]`);
  return lines;
}
