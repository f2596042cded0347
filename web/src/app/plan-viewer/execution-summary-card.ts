/** The figures of one pane: the plan's own (with model and profile) and the simulated fleet's. */
import { ChangeDetectionStrategy, Component, computed, input } from '@angular/core';
import type { ExecutionSummaryView, PlanFigures } from '@shared/executions';
import type { PlanModel, RobotProfile } from '@shared/plan';
import type { SolverBuild } from '@shared/runs';
import { formatPercent, formatSeconds, profileLine } from './viewer-format';

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
  protected readonly buildText = computed(() => {
    const b = this.computedBy();
    return b ? `Quarterturn ${b.version} (commit ${b.commit.slice(0, 10)}), Node ${b.node}, ${b.cpuModel}` : null;
  });
  protected readonly profileText = computed(() => profileLine(this.profile()));
  protected readonly noiseText = computed(() => {
    const n = this.summary().noise;
    const stall = n.stallProbability > 0 ? ` · stall ${formatPercent(n.stallProbability)} × ${formatSeconds(n.stallMs)}` : '';
    return `${this.summary().policy} · jitter CV ${n.jitterCv}${stall} · ${this.summary().runs} runs · seed ${this.summary().seed}`;
  });
  protected readonly rows = computed(() => {
    const s = this.summary();
    return [
      { key: 'success-rate', label: 'Success rate', value: formatPercent(s.successRate) },
      { key: 'collisions', label: 'Collisions (all runs)', value: String(s.collisions.total) },
      { key: 'collisions-mean', label: 'Collisions per run (mean / p95)', value: `${+s.collisions.mean.toFixed(2)} / ${s.collisions.p95}` },
      { key: 'realised-makespan', label: 'Realised makespan (mean / p95)', value: `${formatSeconds(s.realisedMakespanMs.mean)} / ${formatSeconds(s.realisedMakespanMs.p95)}` },
      { key: 'finish-spread', label: 'Finish spread (mean / p95)', value: `${formatSeconds(s.finishSpreadMs.mean)} / ${formatSeconds(s.finishSpreadMs.p95)}` },
      { key: 'waiting', label: 'Waiting time (mean)', value: formatSeconds(s.waitingMs.mean) },
    ];
  });
  protected readonly planRows = computed(() => {
    const f = this.figures();
    const unit = f.unit === 'ms' ? ' ms' : ' steps';
    return [
      { key: 'soc', label: 'Sum-of-costs', value: f.soc === null ? '–' : `${f.soc}${unit}` },
      { key: 'makespan', label: 'Makespan', value: f.makespan === null ? '–' : `${f.makespan}${unit}` },
      { key: 'turn-inclusive-makespan', label: 'Turn-inclusive makespan', value: formatSeconds(f.turnInclusiveMakespanMs) },
      { key: 'lower-bound', label: 'Lower bound', value: f.lowerBound === null ? '–' : `${f.lowerBound}${unit}` },
      { key: 'solve-time', label: 'Solve time', value: f.solveTimeMs === null ? '–' : `${f.solveTimeMs < 10 ? f.solveTimeMs.toFixed(1) : Math.round(f.solveTimeMs)} ms` },
    ];
  });
}
