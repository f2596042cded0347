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

/** A sweep of 400 mm robots on a 500 mm pitch replaying classic plans (following allowed) and weighted-split ones. */
const WIDE_ROBOT_SWEEP = {
  ...SWEEP,
  definition: {
    timeLimitMs: 10_000, memoryLimitMb: 256,
    models: [{ model: 'classic', startHeading: 'free', switches: {} }, { model: 'weighted-split', startHeading: 'free' }],
    robotProfile: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 500, robotDiameterMm: 400, timingJitter: 0.1 },
    execution: { policies: ['open-loop'], runs: 40, stallProbability: 0, stallMs: 0 },
  },
} as unknown as SweepDetail;

async function openPage(sweep: SweepDetail, events: Subject<SweepStreamEvent>): Promise<ComponentFixture<SweepDetailPage>> {
  const api: Partial<SweepApi> = { get: () => of(sweep), results: () => of({ items: [] }), events: () => events };
  TestBed.configureTestingModule({
    imports: [SweepDetailPage],
    providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: SweepApi, useValue: api }],
  });
  // jsdom has no layout for the results grid; these specs are about the lines around it.
  TestBed.overrideComponent(SweepDetailPage, { remove: { imports: [AgGridAngular] }, add: { schemas: [CUSTOM_ELEMENTS_SCHEMA] } });
  const fixture = TestBed.createComponent(SweepDetailPage);
  fixture.componentRef.setInput('id', '12');
  await fixture.whenStable();
  return fixture;
}

describe('SweepDetailPage around the results', () => {
  it('shows the robot profile, the following hazard with its derivation, and what the execution figures mean', async () => {
    const fixture = await openPage(WIDE_ROBOT_SWEEP, new Subject<SweepStreamEvent>());
    const page = fixture.nativeElement as HTMLElement;
    expect(page.querySelector('[data-testid="sweep-profile"]')?.textContent).toContain('pitch 500 mm, diameter 400 mm');
    const hazard = page.querySelector('[data-testid="following-hazard"]')?.textContent ?? '';
    expect(hazard).toContain('classic (following allowed)');
    expect(hazard).not.toContain('weighted-split');
    expect(hazard).toContain('p/√2 = 353.6 mm');
    const note = page.querySelector('[data-testid="execution-note"]')?.textContent ?? '';
    expect(note).toContain('execution success rate is the share of the');
    expect(note).toContain('40 simulated runs');
    expect(note).toContain('Wilson');
    expect(page.textContent).toContain('Simulation is no safety assessment');
  });

  it('shows no hazard when the sweep forbids following', async () => {
    const forbidden = { ...WIDE_ROBOT_SWEEP, definition: { ...WIDE_ROBOT_SWEEP.definition, models: [{ model: 'classic', startHeading: 'free', switches: {}, following: 'forbidden' }] } } as unknown as SweepDetail;
    const fixture = await openPage(forbidden, new Subject<SweepStreamEvent>());
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="following-hazard"]')).toBeNull();
  });
});

describe('SweepDetailPage', () => {
  let fixture: ComponentFixture<SweepDetailPage>;
  let events: Subject<SweepStreamEvent>;

  beforeEach(async () => {
    events = new Subject<SweepStreamEvent>();
    fixture = await openPage(SWEEP, events);
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
