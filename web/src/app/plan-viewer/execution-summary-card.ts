/**
 * The figures of one pane: the plan's own (with plan model and robot profile) and the simulated
 * fleet's, every Monte Carlo figure with its unit and 95 % interval (methods in the footnote).
 * "Solved" belongs to the plan (the solver found and validated it); "execution success" to the
 * simulated runs (a run without collision or deadlock).
 */
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import { CI95_METHOD, type Interval95 } from '@shared/confidence-interval';
import type { ExecutionSummaryView, MetricStatsView, PlanFigures } from '@shared/executions';
import type { PlanModel, RobotProfile } from '@shared/plan';
import type { SolverBuild } from '@shared/runs';
import { collisionIntervals } from './summary-intervals';
import { formatPercent, formatSeconds, profileLine } from './viewer-format';

/** Shown where a figure has no interval. */
const NO_INTERVAL = 'no interval';

/** One figure row: label with unit, value, its interval text (or why there is none). */
interface FigureRow {
  readonly key: string;
  readonly label: string;
  readonly value: string;
  readonly interval: string | null;
}

/** Summary card of one model's plan and execution. */
@Component({
  selector: 'app-execution-summary-card',
  templateUrl: './execution-summary-card.html',
  styleUrl: './execution-summary-card.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ExecutionSummaryCard {
  readonly model = input.required<PlanModel>();
  readonly startHeading = input.required<string>();
  readonly profile = input.required<RobotProfile>();
  readonly figures = input.required<PlanFigures>();
  readonly summary = input.required<ExecutionSummaryView>();
  /** Where the summary was computed. */
  readonly computedIn = input.required<'server' | 'browser'>();
  /** The server build that solved or checked the plan, when the execution recorded it. */
  readonly computedBy = input<SolverBuild | undefined>(undefined);
  protected readonly methods = CI95_METHOD;
  protected readonly buildText = computed(() => {
    const b = this.computedBy();
    return b ? `Quarterturn ${b.version} (commit ${b.commit.slice(0, 10)}), Node ${b.node}, ${b.cpuModel}` : null;
  });
  protected readonly profileText = computed(() => profileLine(this.profile()));
  protected readonly noiseText = computed(() => {
    const s = this.summary();
    const n = s.noise;
    const stall = n.stallProbability > 0 ? ` · stall probability ${formatPercent(n.stallProbability)} × ${formatSeconds(n.stallMs)}` : ' · no stalls';
    return `${s.policy} · timing jitter CV ${n.jitterCv}${stall} · ${s.runs} runs · seed ${s.seed} · on collision: ${s.onCollision === 'count' ? 'count and go on' : 'stop both robots'}`;
  });
  protected readonly rows = computed((): FigureRow[] => {
    const s = this.summary();
    const perRobot = s.waitingPerRobotMs;
    const rows: FigureRow[] = [
      { key: 'success-rate', label: 'Execution success rate (runs without collision or deadlock)', value: formatPercent(s.successRate), interval: percentRange(s.successRateCi95) },
      { key: 'collisions', label: 'Collisions, all runs (count)', value: String(s.collisions.total), interval: null },
      { key: 'collisions-mean', label: 'Collisions per run, count (mean / p95 over runs)', value: `${+s.collisions.mean.toFixed(2)} / ${s.collisions.p95}`, interval: countInterval(s) },
      ...metricRows('realised-makespan', 'Realised makespan, s', s.realisedMakespanMs),
      ...metricRows('finish-spread', 'Finish spread, s', s.finishSpreadMs),
    ];
    if (perRobot) {
      rows.push(
        { key: 'waiting-robot-mean', label: 'Waiting per robot, mean over robots, s (mean over runs)', value: formatSeconds(perRobot.mean.mean), interval: secondsRange(perRobot.mean.meanCi95) },
        { key: 'waiting-robot-max', label: 'Waiting per robot, longest robot, s (mean over runs)', value: formatSeconds(perRobot.max.mean), interval: secondsRange(perRobot.max.meanCi95) },
      );
    }
    rows.push({ key: 'waiting', label: 'Waiting, total over robots, s (mean over runs)', value: formatSeconds(s.waitingMs.mean), interval: secondsRange(s.waitingMs.meanCi95) });
    return rows;
  });
  /** Whether some interval is missing (summary stored before intervals were recorded, or too few runs). */
  protected readonly hasMissingInterval = computed(() => this.rows().some((r) => r.interval?.includes(NO_INTERVAL) ?? false));
  protected readonly planRows = computed(() => {
    const f = this.figures();
    const unit = f.unit === 'ms' ? ' ms' : ' steps';
    return [
      { key: 'soc', label: `Sum-of-costs (${f.unit})`, value: f.soc === null ? '–' : `${f.soc}${unit}` },
      { key: 'makespan', label: `Makespan (${f.unit})`, value: f.makespan === null ? '–' : `${f.makespan}${unit}` },
      { key: 'turn-inclusive-makespan', label: 'Turn-inclusive makespan, s', value: formatSeconds(f.turnInclusiveMakespanMs) },
      { key: 'lower-bound', label: `Lower bound (${f.unit})`, value: f.lowerBound === null ? '–' : `${f.lowerBound}${unit}` },
      { key: 'solve-time', label: 'Solve time, ms', value: f.solveTimeMs === null ? '–' : `${f.solveTimeMs < 10 ? f.solveTimeMs.toFixed(1) : Math.round(f.solveTimeMs)} ms` },
    ];
  });
}

/** The mean / p95 row of a metric in seconds, with the interval of each. */
function metricRows(key: string, label: string, m: MetricStatsView): FigureRow[] {
  const interval = `mean ${secondsRange(m.meanCi95)} · p95 ${secondsRange(m.p95Ci95)}`;
  return [{ key, label: label.replace(', s', ' (mean / p95 over runs), s'), value: `${formatSeconds(m.mean)} / ${formatSeconds(m.p95)}`, interval }];
}

/** The collisions-per-run intervals as text ("mean 0.1 – 0.4 · p95 no interval"). */
function countInterval(s: ExecutionSummaryView): string {
  const { mean, p95 } = collisionIntervals(s);
  const range = (i: Interval95 | null) => (i ? `${+i[0].toFixed(2)} – ${+i[1].toFixed(2)}` : NO_INTERVAL);
  return `mean ${range(mean)} · p95 ${range(p95)}`;
}

function percentRange([lo, hi]: Interval95): string {
  return `${formatPercent(lo)} – ${formatPercent(hi)}`;
}

/** "44.1 – 47.3 s", or NO_INTERVAL. */
function secondsRange(i: Interval95 | null): string {
  if (!i) return NO_INTERVAL;
  return `${formatSeconds(i[0]).replace(' s', '')} – ${formatSeconds(i[1])}`;
}
