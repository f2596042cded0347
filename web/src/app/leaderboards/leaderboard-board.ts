/**
 * The leaderboard page: the board (AG Grid, infinite row model over GET /api/leaderboards/rows,
 * server-side sort, filter and paging), column choice and layout kept in the URL so a view can
 * be shared by link, export links of exactly the view on screen, the per-model summary with a
 * per-map drill-down, and the charts.
 */
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { ActivatedRoute, Router, RouterLink } from '@angular/router';
import { firstValueFrom } from 'rxjs';
import { AgGridAngular } from 'ag-grid-angular';
import {
  CellStyleModule, InfiniteRowModelModule, ModuleRegistry, NumberFilterModule, TextFilterModule, TooltipModule,
  type ColumnMovedEvent, type ColumnVisibleEvent, type DragStoppedEvent, type GridApi, type GridReadyEvent, type IDatasource, type IGetRowsParams,
} from 'ag-grid-community';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { EXPORT_FORMATS, type ExportFormat } from '@shared/exports-table';
import {
  COMPARE_METRICS, columnsOf, compareIntervalKind, compareIntervalNote, DEFAULT_ENTRY_COLUMNS, DEFAULT_VIEW, ENTRY_COLUMNS, NOMINAL_DESCRIPTION, parseView, viewToParams,
  type BestAmong, type CompareMetric, type Layout, type LeaderboardView,
} from '@shared/leaderboards';
import { hasRole } from '@shared/auth-contract';
import { Session } from '../core/session';
import { followCellLinkOnEnter, leaveGridOnTab } from '../core/grid-keyboard';
import { SkipLink } from '../core/skip-link';
import { LeaderboardApi, type BoardScope } from './leaderboard-api';
import { gridColumns, historyColumn, replayColumn, type GridRow } from './leaderboard-columns';
import { gridRows } from './grid-rows';
import { LEADERBOARD_GRID_THEME } from './leaderboard-grid-theme';
import LeaderboardCharts from './leaderboard-charts';
import ModelSummaryPanel from './model-summary';
import { filtersToGrid, withGridState, type GridFilter, type GridSort } from './grid-view';

// CellStyleModule applies the cell classes of column types (right-aligned numbers); TooltipModule shows
// the columns' headerTooltip (without it AG Grid logs error #200 and drops the tooltip).
ModuleRegistry.registerModules([InfiniteRowModelModule, TextFilterModule, NumberFilterModule, CellStyleModule, TooltipModule]);

/** The k values the comparison layout offers for its k-robust column; a view may hold any k up to 20 (parseView). */
const K_CHOICES: readonly number[] = [0, 1, 2, 3, 4, 5];

/** Rows the grid asks for at a time. */
const PAGE_ROWS = 100;

/** Column event sources (AG Grid ColumnEventType) of moves the viewer made; new column definitions from the view are not among them. */
const USER_COLUMN_MOVES: ReadonlySet<string> = new Set(['uiColumnMoved', 'uiColumnDragged', 'toolPanelUi', 'toolPanelDragAndDrop', 'contextMenu', 'columnMenu']);
/** Sources of columns hidden or shown from a menu (a header dragged out is read when the drag stops). */
const USER_COLUMN_MENUS: ReadonlySet<string> = new Set(['toolPanelUi', 'contextMenu', 'columnMenu']);

/** Button labels of the export formats. */
const FORMAT_LABELS: Readonly<Record<ExportFormat, string>> = { csv: 'CSV', latex: 'LaTeX', markdown: 'Markdown', json: 'JSON' };

@Component({
  selector: 'app-leaderboard-board',
  templateUrl: './leaderboard-board.html',
  styleUrl: './leaderboard-board.scss',
  imports: [AgGridAngular, SkipLink, RouterLink, MatButtonModule, MatFormFieldModule, MatSelectModule, MatSlideToggleModule, ModelSummaryPanel, LeaderboardCharts],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class LeaderboardBoard {
  private readonly api = inject(LeaderboardApi);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);
  protected readonly session = inject(Session);

  protected readonly theme = LEADERBOARD_GRID_THEME;
  /** Tab leaves the grid in one step; Enter on a Replay cell follows its link (core/grid-keyboard.ts). */
  protected readonly leaveOnTab = leaveGridOnTab;
  protected readonly followLink = followCellLinkOnEnter;
  protected readonly safetyNote = SAFETY_NOTE;
  protected readonly metrics = COMPARE_METRICS.map((id) => ({ id, label: ENTRY_COLUMNS.find((c) => c.id === id)?.label ?? id }));
  protected readonly formats = EXPORT_FORMATS.map((f) => ({ id: f, label: FORMAT_LABELS[f] }));
  protected readonly allEntryColumns = ENTRY_COLUMNS;
  protected readonly nominalDescription = NOMINAL_DESCRIPTION;

  /** The view on screen; the URL mirrors it. */
  protected readonly view = signal<LeaderboardView>(this.initialView());
  protected readonly viewError = signal<string | null>(null);
  protected readonly rowCount = signal<number | null>(null);
  protected readonly scope = signal<BoardScope>({ mapId: null, profile: null });
  protected readonly columnDefs = computed(() => {
    const v = this.view();
    const visible = new Set(v.columns);
    const cols = columnsOf(v).filter((c) => visible.has(c.id)).sort((a, b) => v.columns.indexOf(a.id) - v.columns.indexOf(b.id));
    const shown = gridColumns(cols, v.sort, v.layout === 'compare' ? compareIntervalKind(v.metric) : null);
    // Entry rows name one stored result; comparison rows hold several models' bests.
    // Everyone may open a visible result: visitors replay it in the browser (issue 14, item 6).
    // Each entry row also opens its history: every result and submission stored for it (issue 16, item 5).
    return v.layout === 'entries' ? [replayColumn(), historyColumn(), ...shown] : shown;
  });
  protected readonly exportLinks = computed(() => {
    const view = this.view();
    const params = viewToParams(view);
    const links: { id: string; label: string; href: string; title?: string }[] = this.formats.map((f) => ({ ...f, href: this.api.exportUrl(f.id, params) }));
    // The default columns make a 12-column paper table in LaTeX (api/src/exports/paper-columns.ts); offer the full set too.
    if (view.layout === 'entries' && sameColumns(view.columns, DEFAULT_ENTRY_COLUMNS)) {
      const latex = links.find((l) => l.id === 'latex');
      if (latex) latex.title = 'The default columns give a 12-column table that fits a paper page; choose columns to export others.';
      links.splice(links.findIndex((l) => l.id === 'latex') + 1, 0, {
        id: 'latex-shown', label: 'LaTeX, all columns', href: this.api.exportUrl('latex', { ...params, latexColumns: 'shown' }),
        title: `All ${DEFAULT_ENTRY_COLUMNS.length} columns on screen, scaled down to the text width (small type).`,
      });
    }
    return links;
  });
  /** The interval method of the comparison figure, for the legend (null: a plan figure, no interval). */
  protected readonly intervalNote = computed(() => (this.view().layout === 'compare' ? compareIntervalNote(this.view().metric) : null));
  /** Whether the viewer may submit plans (researchers and up). */
  protected readonly canSubmit = computed(() => hasRole(this.session.role(), 'researcher'));

  private grid: GridApi<GridRow> | null = null;

  private initialView(): LeaderboardView {
    const params = this.route.snapshot.queryParamMap;
    const record: Record<string, string> = {};
    for (const k of params.keys) record[k] = params.get(k) ?? '';
    try {
      return parseView(record);
    } catch (err) {
      queueMicrotask(() => this.viewError.set(`The link's view could not be read (${(err as Error).message}); showing the default view.`));
      return DEFAULT_VIEW;
    }
  }

  protected startGrid(event: GridReadyEvent<GridRow>): void {
    this.grid = event.api;
    event.api.setFilterModel(filtersToGrid(this.view().filters, columnsOf(this.view())));
    event.api.setGridOption('datasource', this.datasource());
  }

  private datasource(): IDatasource {
    return {
      getRows: (params: IGetRowsParams) => void this.loadRows(params),
    };
  }

  private async loadRows(params: IGetRowsParams): Promise<void> {
    const next = withGridState(this.view(), params.sortModel as GridSort[], params.filterModel as Record<string, GridFilter>, columnsOf(this.view()));
    this.showView(next);
    try {
      // The first block of a view counts its rows; later blocks of the same view reuse that count.
      const isCounted = params.startRow === 0 || this.rowCount() === null;
      const page = await firstValueFrom(this.api.rows(viewToParams(next), params.startRow, params.endRow, isCounted));
      if (page.rowCount >= 0) this.rowCount.set(page.rowCount);
      const rows = gridRows(page, next);
      params.successCallback(rows, this.rowCount() ?? undefined);
    } catch {
      params.failCallback();
    }
  }

  /** Puts the view in the signal and the URL (replacing the history entry, so Back leaves the board). */
  private showView(next: LeaderboardView): void {
    const same = JSON.stringify(viewToParams(next)) === JSON.stringify(viewToParams(this.view()));
    if (!same) {
      this.view.set(next);
      this.rowCount.set(null);
    }
    void this.router.navigate([], { relativeTo: this.route, queryParams: viewToParams(next), replaceUrl: true });
  }

  protected chooseLayout(layout: Layout): void {
    const base: LeaderboardView = { ...this.view(), layout, sort: [], filters: [] };
    this.resetGrid({ ...base, columns: layout === 'compare' ? columnsOf(base).map((c) => c.id) : DEFAULT_VIEW.columns });
  }

  /** Whether "best" (bold per comparison row, exports, per-model summary) considers only plans executable at nominal times. */
  protected chooseBestAmong(isExecutableOnly: boolean): void {
    const bestAmong: BestAmong = isExecutableOnly ? 'executable' : 'all';
    this.resetGrid({ ...this.view(), bestAmong });
  }

  /** The k values offered for the k-robust column (0–5, and a linked view's own k if larger). */
  protected readonly kChoices = computed(() => [...new Set([...K_CHOICES, this.view().k])].sort((a, b) => a - b));

  /** Which k-robust variant the comparison's k-robust column shows (the API joins that variant's entries). */
  protected chooseK(k: number): void {
    this.resetGrid({ ...this.view(), k });
  }

  protected chooseMetric(metric: CompareMetric): void {
    this.resetGrid({ ...this.view(), metric });
  }

  protected chooseColumns(columns: readonly string[]): void {
    const order = ENTRY_COLUMNS.map((c) => c.id);
    const kept = [...columns].sort((a, b) => order.indexOf(a) - order.indexOf(b));
    this.resetGrid({ ...this.view(), columns: kept.length > 0 ? kept : DEFAULT_VIEW.columns });
  }

  /**
   * A column dragged to another place or out of the grid: the view (URL and export links) takes the
   * grid's order and visible columns, so an export holds exactly the columns on screen (issue 14, item 8).
   * Read when a header drag ends (a column dragged out is hidden and shown again while the drag goes on),
   * and after a finished move or a visibility change made from a menu.
   */
  protected followGridColumns(event: ColumnMovedEvent<GridRow> | ColumnVisibleEvent<GridRow> | DragStoppedEvent<GridRow>): void {
    if (event.type === 'columnMoved' && !((event as ColumnMovedEvent<GridRow>).finished && USER_COLUMN_MOVES.has(event.source))) return;
    if (event.type === 'columnVisible' && !USER_COLUMN_MENUS.has((event as ColumnVisibleEvent<GridRow>).source)) return;
    const known = new Set(columnsOf(this.view()).map((c) => c.id));
    const shown = event.api.getAllDisplayedColumns().map((c) => c.getColId()).filter((id) => known.has(id));
    if (shown.length === 0 || shown.join(',') === this.view().columns.join(',')) return;
    const next: LeaderboardView = { ...this.view(), columns: shown };
    this.view.set(next);
    void this.router.navigate([], { relativeTo: this.route, queryParams: viewToParams(next), replaceUrl: true });
  }

  private resetGrid(next: LeaderboardView): void {
    this.showView(next);
    this.view.set(next);
    // New column definitions are applied by the binding; the filters and rows follow them.
    queueMicrotask(() => {
      this.grid?.setFilterModel(filtersToGrid(next.filters, columnsOf(next)));
      this.grid?.purgeInfiniteCache();
    });
  }

  protected readonly pageRows = PAGE_ROWS;
  protected readonly rowId = (p: { data: GridRow }) => p.data.__id;

  protected chooseMap(mapId: number | null): void {
    this.scope.update((s) => ({ ...s, mapId }));
  }

  protected chooseProfile(profile: string | null): void {
    this.scope.update((s) => ({ ...s, profile }));
  }
}

/** Whether two column lists hold the same ids in the same order. */
function sameColumns(a: readonly string[], b: readonly string[]): boolean {
  return a.length === b.length && a.every((id, i) => id === b[i]);
}
