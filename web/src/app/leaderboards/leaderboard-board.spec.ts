import { CUSTOM_ELEMENTS_SCHEMA, signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatSelectHarness } from '@angular/material/select/testing';
import { ActivatedRoute, convertToParamMap, provideRouter, Router } from '@angular/router';
import { AgGridAngular } from 'ag-grid-angular';
import { Session } from '../core/session';
import { LeaderboardApi } from './leaderboard-api';
import LeaderboardBoard from './leaderboard-board';
import LeaderboardCharts from './leaderboard-charts';
import ModelSummaryPanel from './model-summary';

// The charts pull in echarts (ES modules jest does not load); the board spec only needs a placeholder to remove.
jest.mock('./leaderboard-charts', () => ({ __esModule: true, default: class ChartsPlaceholder {} }));

describe('LeaderboardBoard, comparison layout', () => {
  async function openCompare(query: Record<string, string>) {
    const api: Partial<LeaderboardApi> = { exportUrl: (format, params) => `/api/exports/${format}?${new URLSearchParams(params).toString()}` };
    TestBed.configureTestingModule({
      imports: [LeaderboardBoard],
      providers: [
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: LeaderboardApi, useValue: api },
        { provide: Session, useValue: { role: signal('visitor') } },
        { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: convertToParamMap(query) } } },
      ],
    });
    // jsdom has no layout for the grid, and the summary and charts load their own data: this spec is about the controls.
    TestBed.overrideComponent(LeaderboardBoard, { remove: { imports: [AgGridAngular, ModelSummaryPanel, LeaderboardCharts] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const fixture = TestBed.createComponent(LeaderboardBoard);
    await fixture.whenStable();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    return { fixture, loader, navigate };
  }

  const csvHref = (el: HTMLElement) => el.querySelector('[data-export="csv"]')?.getAttribute('href') ?? '';

  it('lets the viewer choose the k of the k-robust column, and the view (URL, exports) carries it (issue 14, item 10)', async () => {
    const { fixture, loader, navigate } = await openCompare({ layout: 'compare' });
    const k = await loader.getHarness(MatSelectHarness.with({ ancestor: '[data-field="k"]' }));
    expect(await k.getValueText()).toBe('k = 1');
    expect(csvHref(fixture.nativeElement)).not.toContain('k=');

    await k.open();
    await k.clickOptions({ text: 'k = 2' });
    await fixture.whenStable();

    expect(await k.getValueText()).toBe('k = 2');
    expect(csvHref(fixture.nativeElement)).toContain('k=2');
    expect(navigate).toHaveBeenLastCalledWith([], expect.objectContaining({ queryParams: expect.objectContaining({ layout: 'compare', k: '2' }) }));
  });

  it("offers a linked view's own k even when it is not among the usual choices", async () => {
    const { loader } = await openCompare({ layout: 'compare', k: '12' });
    const k = await loader.getHarness(MatSelectHarness.with({ ancestor: '[data-field="k"]' }));

    expect(await k.getValueText()).toBe('k = 12');
    await k.open();
    expect((await k.getOptions()).length).toBe(7);
  });

  it('shows no k choice in the entries layout', async () => {
    const { fixture } = await openCompare({});
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-field="k"]')).toBeNull();
  });
});

describe('LeaderboardBoard, columns moved or hidden in the grid', () => {
  it('makes the view and the export links follow the grid\'s visible columns and their order (issue 14, item 8)', async () => {
    const api: Partial<LeaderboardApi> = { exportUrl: (format, params) => `/api/exports?${new URLSearchParams({ format, ...params }).toString()}` };
    TestBed.configureTestingModule({
      imports: [LeaderboardBoard],
      providers: [
        provideRouter([]),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
        { provide: LeaderboardApi, useValue: api },
        { provide: Session, useValue: { role: signal('visitor') } },
        { provide: ActivatedRoute, useValue: { snapshot: { queryParamMap: convertToParamMap({ cols: 'map,scenario,agents,model,socSteps' }) } } },
      ],
    });
    TestBed.overrideComponent(LeaderboardBoard, { remove: { imports: [AgGridAngular, ModelSummaryPanel, LeaderboardCharts] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    const fixture = TestBed.createComponent(LeaderboardBoard);
    await fixture.whenStable();
    const href = () => decodeURIComponent((fixture.nativeElement as HTMLElement).querySelector('[data-export="latex"]')?.getAttribute('href') ?? '');
    expect(href()).toContain('cols=map,scenario,agents,model,socSteps');

    // The grid as AG Grid reports it after a drag: the replay column, socSteps moved before model, scenario dragged out.
    const displayed = (ids: string[]) => ({ getAllDisplayedColumns: () => ids.map((id) => ({ getColId: () => id })) });
    const board = fixture.componentInstance as unknown as { followGridColumns(e: unknown): void };
    board.followGridColumns({ type: 'columnMoved', source: 'uiColumnMoved', finished: false, api: displayed(['__replay', 'map', 'socSteps', 'scenario', 'agents', 'model']) });
    // Column changes the grid makes itself (new definitions) are not the viewer's, and a column dragged
    // out is hidden while the drag goes on (it may come back): read when the drag stops.
    board.followGridColumns({ type: 'columnVisible', source: 'gridOptionsChanged', api: displayed(['__replay', 'map']) });
    board.followGridColumns({ type: 'columnVisible', source: 'uiColumnMoved', api: displayed(['__replay', 'map', 'agents', 'model', 'socSteps']) });
    fixture.detectChanges();
    expect(href()).toContain('cols=map,scenario,agents,model,socSteps');
    board.followGridColumns({ type: 'columnMoved', source: 'uiColumnMoved', finished: true, api: displayed(['__replay', 'map', 'socSteps', 'scenario', 'agents', 'model']) });
    board.followGridColumns({ type: 'dragStopped', api: displayed(['__replay', 'map', 'socSteps', 'agents', 'model']) });
    fixture.detectChanges();

    expect(href()).toContain('format=latex');
    expect(href()).toContain('cols=map,socSteps,agents,model');
    expect(navigate).toHaveBeenLastCalledWith([], expect.objectContaining({ queryParams: expect.objectContaining({ cols: 'map,socSteps,agents,model' }) }));
  });
});
