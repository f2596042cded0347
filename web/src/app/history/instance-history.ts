/**
 * The page at /leaderboards/history?scenarioId&agents&model&variant&profile (issue 16, item 5):
 * every result and submission stored for one board row (instance × plan model variant × robot
 * profile), newest first, superseded and failed ones included, with where each came from, its
 * solver, seed, parameters and figures. Reached from the History cell of each board row.
 */
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { DatePipe, DecimalPipe, PercentPipe } from '@angular/common';
import { RouterLink } from '@angular/router';
import { MatButtonModule } from '@angular/material/button';
import { MatTableModule } from '@angular/material/table';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { HistoryApi } from './history-api';
import { executionFigure, executionRuns, nominalText, parametersText, policiesOf, sourceText } from './history-cells';

/** Items per page (the API allows up to 200). */
export const HISTORY_PAGE = 50;

/** Columns before the execution figures and after them. */
const LEADING = ['stored', 'source', 'solver', 'status', 'seed', 'w', 'parameters', 'soc', 'makespan', 'lowerBound', 'tiSoc', 'tiMakespan', 'runtime', 'nominal'];
const TRAILING = ['plan'];

@Component({
  selector: 'app-instance-history',
  templateUrl: './instance-history.html',
  styleUrl: './instance-history.scss',
  imports: [DatePipe, DecimalPipe, PercentPipe, RouterLink, MatButtonModule, MatTableModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class InstanceHistoryPage {
  private readonly api = inject(HistoryApi);
  /** Query parameters: the row's key. */
  readonly scenarioId = input('');
  readonly agents = input('');
  readonly model = input('');
  readonly variant = input('');
  readonly profile = input('');

  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly parametersText = parametersText;
  protected readonly sourceText = sourceText;
  protected readonly nominalText = nominalText;
  protected readonly executionFigure = executionFigure;
  protected readonly executionRuns = executionRuns;
  /** First item shown (newest = 0). */
  protected readonly start = signal(0);

  protected readonly history = rxResource({
    params: () => ({
      scenarioId: this.scenarioId(), agents: this.agents(), model: this.model(), variant: this.variant() ?? '', profile: this.profile(),
      start: this.start(), limit: HISTORY_PAGE,
    }),
    stream: ({ params }) => this.api.history(params),
  });
  /** The page's history, or undefined while loading and after an error (value() throws then). */
  protected readonly shown = computed(() => (this.history.hasValue() ? this.history.value() : undefined));
  protected readonly items = computed(() => this.shown()?.items ?? []);
  /** Policies the shown results were replayed under; each gets its three figure columns. */
  protected readonly policies = computed(() => policiesOf(this.items()));
  protected readonly columns = computed(() => [
    ...LEADING, ...this.policies().flatMap((p) => [`success-${p}`, `realised-${p}`, `spread-${p}`]), ...TRAILING,
  ]);
  /** Whether execution figures show (then the safety note goes with them). */
  protected readonly hasExecutions = computed(() => this.policies().length > 0);
  /** "1–50 of 120". */
  protected readonly range = computed(() => {
    const h = this.shown();
    if (!h || h.total === 0) return '';
    return `${h.start + 1}–${h.start + h.items.length} of ${h.total}`;
  });
  protected readonly hasNewer = computed(() => this.start() > 0);
  protected readonly hasOlder = computed(() => {
    const h = this.shown();
    return h !== undefined && h.start + h.items.length < h.total;
  });

  protected showNewer(): void {
    this.start.update((s) => Math.max(0, s - HISTORY_PAGE));
  }

  protected showOlder(): void {
    this.start.update((s) => s + HISTORY_PAGE);
  }
}
