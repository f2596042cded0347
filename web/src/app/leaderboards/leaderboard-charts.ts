/**
 * The charts of the board for one robot profile and execution policy: solved rate and execution
 * success rate by agent count, the runtime cactus plot, computed against realised makespan and
 * the finish-spread distribution. Each is a figure named by its caption (title and subtitle as
 * text), shows its data as a table on request and downloads as SVG and PNG. ECharts is provided
 * here with only the pieces used.
 */
import { afterNextRender, ChangeDetectionStrategy, Component, computed, DestroyRef, ElementRef, inject, input, signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { NgxEchartsDirective, provideEchartsCore } from 'ngx-echarts';
import * as echarts from 'echarts/core';
import type { ECharts } from 'echarts/core';
import { BarChart, LineChart, ScatterChart } from 'echarts/charts';
import { GridComponent, LegendComponent, TitleComponent, TooltipComponent } from 'echarts/components';
import { CanvasRenderer, SVGRenderer } from 'echarts/renderers';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { LEADERBOARD_POLICIES } from '@shared/leaderboards';
import { chartPng, downloadSvg, saveHref, SVG_SIZE } from './chart-download';
import { CHART_IDS, chartOption, chartTitles, DEFAULT_CHART_WIDTH_PX, onScreenOption, type ChartId } from './chart-options';
import { chartTable, type ChartTable } from './chart-table';
import { chartCardWidth } from './chart-card-width';
import { LeaderboardApi, type BoardScope } from './leaderboard-api';

echarts.use([LineChart, ScatterChart, BarChart, GridComponent, LegendComponent, TitleComponent, TooltipComponent, CanvasRenderer, SVGRenderer]);

@Component({
  selector: 'app-leaderboard-charts',
  templateUrl: './leaderboard-charts.html',
  styleUrl: './leaderboard-charts.scss',
  imports: [NgxEchartsDirective, MatButtonModule, MatFormFieldModule, MatSelectModule],
  providers: [provideEchartsCore({ echarts })],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class LeaderboardCharts {
  private readonly api = inject(LeaderboardApi);
  /** Map and robot profile of the figures (profile null = the one with most rows). */
  readonly scope = input.required<BoardScope>();
  protected readonly policy = signal<string>('open-loop');
  protected readonly policies = LEADERBOARD_POLICIES;
  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly data = rxResource({
    params: () => ({ scope: this.scope(), policy: this.policy() }),
    stream: ({ params }) => this.api.charts(params.scope, params.policy),
  });
  /** Width of one chart's drawing, px: subtitles and legends wrap to it (they were cut on narrow screens). */
  private readonly chartWidth = signal(DEFAULT_CHART_WIDTH_PX);
  protected readonly charts = computed(() => {
    const d = this.data.value();
    const width = this.chartWidth();
    return d ? CHART_IDS.map((id) => {
      const option = chartOption(id, d, width);
      const names = [...new Set(((option['series'] ?? []) as { name?: string }[]).map((s) => s.name ?? ''))].filter((n) => n !== '');
      return {
        id, ...chartTitles(id, d), option: onScreenOption(option),
        // The drawing's name: what it shows and which series it draws (the table has the numbers).
        imageLabel: `${chartTitles(id, d).title}, chart of ${names.length ? names.join(', ') : 'no series'}`,
      };
    }) : [];
  });
  /** Charts whose data shows as a table. */
  protected readonly tablesShown = signal<ReadonlySet<ChartId>>(new Set());
  /** The table of each chart that shows one (built only then: a scatter may hold thousands of points). */
  protected readonly tables = computed(() => {
    const d = this.data.value();
    const out = new Map<ChartId, ChartTable>();
    if (d) for (const id of this.tablesShown()) out.set(id, chartTable(id, d));
    return out;
  });

  constructor() {
    const host = inject<ElementRef<HTMLElement>>(ElementRef);
    const destroyRef = inject(DestroyRef);
    afterNextRender(() => {
      const grid = host.nativeElement.querySelector('.grid');
      if (!grid || typeof ResizeObserver === 'undefined') return;
      // The charts have a fixed height, so a new option never changes the grid's width: no resize loop.
      const observer = new ResizeObserver(([entry]) => {
        const width = chartCardWidth(entry.contentRect.width);
        if (Math.abs(width - this.chartWidth()) >= 8) this.chartWidth.set(width);
      });
      observer.observe(grid);
      destroyRef.onDestroy(() => observer.disconnect());
    });
  }
  private readonly instances = new Map<ChartId, ECharts>();

  protected keepChart(id: ChartId, chart: ECharts): void {
    this.instances.set(id, chart);
  }

  protected toggleTable(id: ChartId): void {
    const next = new Set(this.tablesShown());
    if (!next.delete(id)) next.add(id);
    this.tablesShown.set(next);
  }

  /** The PNG at the chart's size on screen, with the title and subtitle drawn in. */
  protected downloadPng(id: ChartId): void {
    const chart = this.instances.get(id);
    const d = this.data.value();
    if (!chart || !d) return;
    const width = chart.getWidth();
    saveHref(chartPng(chartOption(id, d, width), width, chart.getHeight()), `quarterturn-${id}.png`);
  }

  protected downloadSvg(id: ChartId): void {
    const d = this.data.value();
    if (d) downloadSvg(chartOption(id, d, SVG_SIZE.width), `quarterturn-${id}.svg`);
  }
}
