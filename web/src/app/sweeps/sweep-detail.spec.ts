import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { CUSTOM_ELEMENTS_SCHEMA } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { provideRouter } from '@angular/router';
import { AgGridAngular } from 'ag-grid-angular';
import { of, Subject } from 'rxjs';
import type { SweepDetail, SweepProgress } from '@shared/runs';
import { emptyRunCounts } from '@shared/runs';
import { SweepApi, type SweepStreamEvent } from './sweep-api';
import SweepDetailPage from './sweep-detail';

const PROGRESS: SweepProgress = {
  sweepId: 12, status: 'running', total: 8, done: 2, counts: { ...emptyRunCounts(), solved: 2, pending: 6 },
  perModel: [{ modelIndex: 0, model: 'classic', label: 'classic', counts: { ...emptyRunCounts(), solved: 2, pending: 6 }, switchesOff: [] }],
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

async function openPage(sweep: SweepDetail, events: Subject<SweepStreamEvent>, more: Partial<SweepApi> = {}): Promise<ComponentFixture<SweepDetailPage>> {
  const api: Partial<SweepApi> = { get: () => of(sweep), results: () => of({ items: [] }), events: () => events, ...more };
  TestBed.configureTestingModule({
    imports: [SweepDetailPage],
    providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: SweepApi, useValue: api },
      // Without animations a dialog closes at once, so afterClosed() fires within the test.
      { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }],
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

describe('SweepDetailPage ablation and cancel', () => {
  it('names the CBS improvements the sweep turns off by label, with what each removes, and never by field name', async () => {
    const ablation = { ...WIDE_ROBOT_SWEEP, definition: { ...WIDE_ROBOT_SWEEP.definition, models: [
      { model: 'classic', startHeading: 'free', switches: { wdg: false } },
      { model: 'k-robust', k: 1, startHeading: 'free', switches: { wdg: false, disjointSplitting: false, bypass: true } },
    ] } } as unknown as SweepDetail;
    const fixture = await openPage(ablation, new Subject<SweepStreamEvent>());
    const items = [...(fixture.nativeElement as HTMLElement).querySelectorAll('[data-testid="sweep-switches-off"] li')].map((li) => li.textContent?.trim() ?? '');
    expect(items).toHaveLength(2);
    expect(items[0]).toMatch(/^WDG heuristic: \S/);
    expect(items[1]).toMatch(/^Disjoint splitting: \S/);
    expect(items.join(' ')).not.toMatch(/\bwdg\b|disjointSplitting|[Bb]ypass/);
  });

  it('shows no ablation line when every improvement is on', async () => {
    const fixture = await openPage(WIDE_ROBOT_SWEEP, new Subject<SweepStreamEvent>());
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="sweep-switches-off"]')).toBeNull();
  });

  it('asks before cancelling, saying what stops and what stays; keeping it sends nothing, confirming sends the cancel once', async () => {
    const cancel = jest.fn(() => of({ ...SWEEP, progress: { ...PROGRESS, status: 'cancelled' as const } }));
    const fixture = await openPage(SWEEP, new Subject<SweepStreamEvent>(), { cancel } as Partial<SweepApi>);
    const page = fixture.nativeElement as HTMLElement;
    const cancelButton = () => [...page.querySelectorAll('button')].find((b) => b.textContent?.trim() === 'Cancel sweep') as HTMLButtonElement;
    const settle = async () => {
      await fixture.whenStable();
      await new Promise((r) => setTimeout(r, 0));
      fixture.detectChanges();
    };

    cancelButton().click();
    await settle();
    const dialog = document.querySelector('mat-dialog-container') as HTMLElement;
    expect(dialog.querySelector('h2')?.textContent?.trim()).toBe('Cancel sweep “quay night shift”?');
    expect(dialog.textContent).toContain('6 of its 8 runs are not over yet: they stop and will not be solved.');
    expect(dialog.textContent).toContain('What the 2 runs already over found stays stored.');
    (dialog.querySelector('[data-testid="confirm-keep"]') as HTMLButtonElement).click();
    await settle();
    expect(document.querySelector('mat-dialog-container')).toBeNull();
    expect(cancel).not.toHaveBeenCalled();

    cancelButton().click();
    await settle();
    (document.querySelector('mat-dialog-container [data-testid="confirm-act"]') as HTMLButtonElement).click();
    await settle();
    expect(cancel).toHaveBeenCalledTimes(1);
    expect(cancel).toHaveBeenCalledWith(12);
    expect(page.querySelector('[data-testid="sweep-status"]')?.textContent).toBe('Cancelled');
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
