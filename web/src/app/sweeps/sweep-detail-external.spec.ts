/** The sweep page under an external solver's spec (issue 16, item 4): why its runs wait, and nothing once a worker has it. */
import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { CUSTOM_ELEMENTS_SCHEMA } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { AgGridAngular } from 'ag-grid-angular';
import { of, Subject } from 'rxjs';
import type { SweepDetail, SweepProgress } from '@shared/runs';
import { emptyRunCounts } from '@shared/runs';
import { SweepApi, type SweepStreamEvent } from './sweep-api';
import SweepDetailPage from './sweep-detail';

function sweepWith(waiting: string | null, workers: number, refused: string | null = null): SweepDetail {
  const progress: SweepProgress = {
    sweepId: 12, status: 'running', total: 4, done: 2, counts: { ...emptyRunCounts(), solved: 2, pending: 2 },
    perModel: [
      { modelIndex: 0, model: 'classic', label: 'classic', counts: { ...emptyRunCounts(), solved: 2 }, switchesOff: [] },
      { modelIndex: 1, model: 'classic', label: 'classic by lacam@3', counts: { ...emptyRunCounts(), pending: 2 }, switchesOff: [],
        external: { solver: 'lacam@3', workers, waiting, refused } },
    ],
    etaMs: null, startedAt: '2026-06-01T10:00:00.000Z', finishedAt: null,
  };
  return {
    id: 12, name: 'mixed', owner: { id: 3, login: 'wren' }, status: 'running', total: 4, done: 2, createdAt: '2026-06-01T09:59:00.000Z',
    finishedAt: null, canCancel: true, progress,
    definition: { timeLimitMs: 10_000, memoryLimitMb: 256, execution: { policies: [], runs: 1 },
      models: [{ model: 'classic', startHeading: 'free', switches: {} }, { model: 'classic', startHeading: 'free', switches: {}, externalSolver: { name: 'lacam', version: '3' } }] },
  } as unknown as SweepDetail;
}

async function pageFor(sweep: SweepDetail): Promise<HTMLElement> {
  const api: Partial<SweepApi> = { get: () => of(sweep), results: () => of({ items: [] }), events: () => new Subject<SweepStreamEvent>() };
  TestBed.configureTestingModule({
    imports: [SweepDetailPage],
    providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: SweepApi, useValue: api },
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }],
  });
  TestBed.overrideComponent(SweepDetailPage, { remove: { imports: [AgGridAngular] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
  const fixture = TestBed.createComponent(SweepDetailPage);
  fixture.componentRef.setInput('id', '12');
  await fixture.whenStable();
  return fixture.nativeElement as HTMLElement;
}

describe('SweepDetailPage with an external solver', () => {
  it('says under its row that its runs wait for a worker with the solver', async () => {
    const page = await pageFor(sweepWith('waiting for a worker with solver lacam@3', 0));
    const waiting = page.querySelectorAll('[data-testid="external-waiting"]');
    expect(waiting).toHaveLength(1);
    expect(waiting[0].textContent).toContain('waiting for a worker with solver lacam@3: its runs start when a worker declaring it (WORKER_SOLVERS) is running.');
    expect(waiting[0].closest('tr')?.querySelector('th')?.textContent).toContain('classic by lacam@3');
  });

  it('says nothing of waiting once a worker has it', async () => {
    const page = await pageFor(sweepWith(null, 1));
    expect(page.querySelector('[data-testid="external-waiting"]')).toBeNull();
    expect(page.querySelector('[data-testid="external-refused"]')).toBeNull();
  });

  it('says under its row why runs were refused when the worker approved another command', async () => {
    const why = "1 run refused: the worker's approved command differs from the registration of lacam@3 (the worker's operator pins the registered command's hash in WORKER_SOLVERS)";
    const page = await pageFor(sweepWith(null, 1, why));
    const refused = page.querySelectorAll('[data-testid="external-refused"]');
    expect(refused).toHaveLength(1);
    expect(refused[0].textContent?.trim()).toBe(`${why}.`);
    expect(refused[0].closest('tr')?.querySelector('th')?.textContent).toContain('classic by lacam@3');
  });
});
