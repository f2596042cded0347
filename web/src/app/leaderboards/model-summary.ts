/** Per-model summary under the board: solved instances by agent count, turn-inclusive makespan relative to classic, execution success; drill down by map and robot profile. */
import { ChangeDetectionStrategy, Component, computed, inject, input, output } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { DecimalPipe, PercentPipe } from '@angular/common';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatTableModule } from '@angular/material/table';
import { LEADERBOARD_POLICIES, MEAN_SUCCESS_METHOD, NOMINAL_DESCRIPTION, OPTIMALITY_DESCRIPTION, type BestAmong } from '@shared/leaderboards';
import { LeaderboardApi, type BoardScope } from './leaderboard-api';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';

@Component({
  selector: 'app-model-summary',
  templateUrl: './model-summary.html',
  styleUrl: './model-summary.scss',
  imports: [MiddleEllipsisPipe, DecimalPipe, PercentPipe, MatFormFieldModule, MatSelectModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ModelSummaryPanel {
  private readonly api = inject(LeaderboardApi);
  /** Map and profile the summary is narrowed to. */
  readonly scope = input.required<BoardScope>();
  /** Whether plans that collide at nominal times are left out of the ratio and the execution success rate. */
  readonly bestAmong = input<BestAmong>('executable');
  /** The map picked for the drill-down (null = all maps). */
  readonly mapChange = output<number | null>();
  /** The robot profile picked (null = all). */
  readonly profileChange = output<string | null>();

  protected readonly summary = rxResource({
    params: () => ({ scope: this.scope(), bestAmong: this.bestAmong() }),
    stream: ({ params }) => this.api.summary(params.scope, params.bestAmong),
  });
  protected readonly policies = LEADERBOARD_POLICIES;
  protected readonly nominalDescription = NOMINAL_DESCRIPTION;
  protected readonly optimalityDescription = OPTIMALITY_DESCRIPTION;
  /** What the mean execution success rate averages and how its 95 % interval is made. */
  protected readonly meanSuccessMethod = MEAN_SUCCESS_METHOD;
  protected readonly columns = ['model', 'solved', 'optimality', 'nominal', 'byAgents', 'ratio', ...LEADERBOARD_POLICIES.map((p) => p.policy)];
  protected readonly rows = computed(() => this.summary.value()?.models ?? []);
}
