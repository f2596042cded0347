import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { CUSTOM_ELEMENTS_SCHEMA } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { AgGridAngular } from 'ag-grid-angular';
import { of, Subject } from 'rxjs';
import type { SweepDetail, SweepProgress } from '@shared/runs';
import { emptyRunCounts } from '@shared/runs';
import { SweepApi, type SweepStreamEvent } from './sweep-api';
import SweepDetailPage from './sweep-detail';

const PROGRESS: SweepProgress = {
  sweepId: 12, status: 'running', total: 8, done: 2, counts: { ...emptyRunCounts(), solved: 2, pending: 6 },
  perModel: [{ modelIndex: 0, model: 'classic', label: 'classic', counts: { ...emptyRunCounts(), solved: 2, pending: 6 } }],
  etaMs: 180_000, startedAt: '2026-06-01T10:00:00.000Z', finishedAt: null,
};

const SWEEP = {
  id: 12, name: 'quay night shift', owner: { id: 3, login: 'wren' }, status: 'running', total: 8, done: 2,
  createdAt: '2026-06-01T09:59:00.000Z', finishedAt: null, canCancel: true, progress: PROGRESS,
  definition: { timeLimitMs: 10_000, memoryLimitMb: 256, execution: { policies: [], runs: 1 } },
} as unknown as SweepDetail;

describe('SweepDetailPage', () => {
  let fixture: ComponentFixture<SweepDetailPage>;
  let events: Subject<SweepStreamEvent>;

  beforeEach(async () => {
    events = new Subject<SweepStreamEvent>();
    const api: Partial<SweepApi> = { get: () => of(SWEEP), results: () => of({ items: [] }), events: () => events };
    TestBed.configureTestingModule({
      imports: [SweepDetailPage],
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: SweepApi, useValue: api }],
    });
    // jsdom has no layout for the results grid; this spec is about the progress lines.
    TestBed.overrideComponent(SweepDetailPage, { remove: { imports: [AgGridAngular] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
    fixture = TestBed.createComponent(SweepDetailPage);
    fixture.componentRef.setInput('id', '12');
    await fixture.whenStable();
  });

  const progressText = () => (fixture.nativeElement.querySelector('[aria-label="Progress"]') as HTMLElement).textContent ?? '';

  it('shows the time left while live figures arrive', async () => {
    events.next({ type: 'progress', progress: PROGRESS });
    await fixture.whenStable();

    expect(progressText()).toContain('about 3 min 0 s left');
    expect(progressText()).not.toMatch(/lost contact/i);
  });

  it('says it lost contact instead of counting down, and resumes with the next snapshot', async () => {
    events.next({ type: 'progress', progress: PROGRESS });
    events.next({ type: 'lost' });
    await fixture.whenStable();

    expect(progressText()).toMatch(/lost contact/i);
    expect(progressText()).not.toContain('left');

    events.next({ type: 'progress', progress: { ...PROGRESS, done: 3, etaMs: 120_000 } });
    await fixture.whenStable();
    expect(progressText()).not.toMatch(/lost contact/i);
    expect(progressText()).toContain('about 2 min 0 s left');
  });
});
