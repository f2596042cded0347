/**
 * Each leaderboard chart is a figure named by a text caption (title and subtitle), its drawing has
 * a name, and "Show as table" lists every point of every series (issue 18, item 5).
 */
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { of } from 'rxjs';
import type { LeaderboardCharts as ChartData } from '@shared/leaderboards';
import { LeaderboardApi } from './leaderboard-api';
import LeaderboardCharts from './leaderboard-charts';
import { CHART_IDS, seriesName } from './chart-options';

// echarts ships ES modules jest does not load; the drawing itself is checked in the browser (e2e).
jest.mock('echarts/core', () => ({ use: jest.fn(), init: jest.fn() }));
jest.mock('echarts/charts', () => ({}));
jest.mock('echarts/components', () => ({}));
jest.mock('echarts/renderers', () => ({}));
jest.mock('ngx-echarts', () => {
  const ng = jest.requireActual<typeof import('@angular/core')>('@angular/core');
  class NgxEchartsDirective {
    options: unknown = null;
    readonly chartInit = new ng.EventEmitter<unknown>();
  }
  ng.Directive({ selector: '[echarts]', inputs: ['options'], outputs: ['chartInit'] })(NgxEchartsDirective);
  return { NgxEchartsDirective, provideEchartsCore: () => [] };
});

const data: ChartData = {
  profile: { hash: '0123456789abcdef', label: 'forward 1000 ms, quarter turn 600 ms', entries: 4 },
  policy: 'open-loop',
  successByAgents: [{ model: 'classic', variant: '', points: [[2, 1], [4, 0.5]] }, { model: 'k-robust', variant: 'k=1', points: [[2, 1]] }],
  executionSuccessByAgents: [{ model: 'classic', variant: '', points: [[2, 0.9], [4, 0.55]], intervals: [null, [0.2, 0.9]] }],
  cactus: [{ model: 'classic', variant: '', points: [[0, 1], [12.5, 2]] }, { model: 'weighted-split', variant: 'w=1.5', points: [[3, 1]] }],
  computedVsRealised: [{ model: 'weighted-split', variant: 'w=1.5', points: [[4000, 4300], [5000, 5100.25]] }],
  spreadHistogram: [{ model: 'classic', variant: '', points: [[0, 3], [200, 1]] }, { model: 'uniform-duration', variant: '', points: [[0, 2]] }],
  spreadBinMs: 200,
};

const SERIES: Record<(typeof CHART_IDS)[number], ChartData['cactus']> = {
  success: data.successByAgents,
  execution: data.executionSuccessByAgents,
  cactus: data.cactus,
  realised: data.computedVsRealised,
  spread: data.spreadHistogram,
};

async function render(): Promise<HTMLElement> {
  TestBed.configureTestingModule({
    imports: [LeaderboardCharts],
    providers: [
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      { provide: LeaderboardApi, useValue: { charts: () => of(data) } },
    ],
  });
  const fixture = TestBed.createComponent(LeaderboardCharts);
  fixture.componentRef.setInput('scope', { mapId: null, profile: null });
  fixture.detectChanges();
  await fixture.whenStable();
  fixture.detectChanges();
  return fixture.nativeElement as HTMLElement;
}

describe('leaderboard charts, as text', () => {
  it('names every chart figure by a visible caption with its title and its profile and policy subtitle, and names the drawing', async () => {
    const host = await render();
    const figures = [...host.querySelectorAll<HTMLElement>('figure[data-chart]')];
    expect(figures.map((f) => f.dataset['chart'])).toEqual([...CHART_IDS]);
    for (const f of figures) {
      const title = host.querySelector(`#${f.getAttribute('aria-labelledby')}`);
      expect(title?.closest('figcaption')?.parentElement).toBe(f);
      expect(title?.textContent?.trim()).not.toBe('');
      const image = f.querySelector('[role=img]');
      expect(image?.getAttribute('aria-label')).toContain(title?.textContent?.trim());
      const subtitle = host.querySelector(`#${image?.getAttribute('aria-describedby')}`);
      expect(subtitle?.textContent).toContain('Robot profile: forward 1000 ms, quarter turn 600 ms');
    }
    expect(host.querySelector('[data-chart=execution] .chart-subtitle')?.textContent).toContain('execution policy open-loop');
    expect(host.querySelector('[data-chart=success] .chart-title')?.textContent).toBe('Solved rate by agent count');
    // The drawing's name lists the series it draws.
    expect(host.querySelector('[data-chart=cactus] [role=img]')?.getAttribute('aria-label')).toBe('Instances solved within a solve time, chart of classic, weighted-split (w=1.5)');
  });

  it('shows each chart as a table with a row per point of every series, model as row header and units in the column headers', async () => {
    const host = await render();
    let compared = 0;
    for (const id of CHART_IDS) {
      const figure = host.querySelector<HTMLElement>(`figure[data-chart=${id}]`)!;
      const toggle = [...figure.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Show as table')!;
      expect(toggle.getAttribute('aria-expanded')).toBe('false');
      toggle.click();
      TestBed.tick();
      expect(toggle.getAttribute('aria-expanded')).toBe('true');
      const table = figure.querySelector('table')!;
      expect(figure.querySelector(`#${toggle.getAttribute('aria-controls')}`)?.contains(table)).toBe(true);
      expect(table.querySelector('caption')?.textContent).toContain(figure.querySelector('.chart-title')?.textContent ?? '?');
      const expected = SERIES[id].flatMap((s) => s.points.map(() => seriesName(s)));
      const rowHeads = [...table.querySelectorAll('tbody th[scope=row]')].map((th) => th.textContent?.trim());
      expect(rowHeads).toEqual(expected);
      compared += rowHeads.length;
      const heads = [...table.querySelectorAll('thead th[scope=col]')].map((th) => th.textContent?.trim() ?? '');
      expect(heads[0]).toBe('Plan model');
      // Every value column names its unit or scale.
      expect(heads.slice(1).every((h) => /\((ms|0–1|share|mean)|Agents|Instances/.test(h))).toBe(true);
      toggle.click();
      TestBed.tick();
      expect(figure.querySelector('table')).toBeNull();
    }
    expect(compared).toBe(2 + 1 + 2 + 3 + 2 + 1 + 2);
  });

  it('gives the points of the execution success chart their 95 % interval, as the band draws it', async () => {
    const host = await render();
    const figure = host.querySelector<HTMLElement>('figure[data-chart=execution]')!;
    [...figure.querySelectorAll('button')].find((b) => b.textContent?.includes('Show as table'))!.click();
    TestBed.tick();
    const rows = [...figure.querySelectorAll('tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent?.trim()));
    expect(rows).toEqual([
      ['classic', '2', '0.9', 'none (fewer than 2 instances)'],
      ['classic', '4', '0.55', '0.2 to 0.9'],
    ]);
    expect(figure.querySelector('thead')?.textContent).toContain('95 % interval');
  });
});
