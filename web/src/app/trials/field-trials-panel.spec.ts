/**
 * The field-trials panel of a result's page: field runs beside the simulation with their flags and
 * charts, the safety note, the attach form for researchers (policy, notes, files) and a refused
 * upload's problems named by file, line and column.
 */
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { FieldTrialRun, FieldTrialsView, SimulatedRange } from '@shared/field-trials';
import { FieldTrialsPanel } from './field-trials-panel';
import { durationChart, makespanChart } from './field-trials-figures';

const range = (mean: number, low: number, high: number): SimulatedRange => ({ mean, low, high, count: 200 });

function run(id: number, makespan: number, outside: FieldTrialRun['outside']): FieldTrialRun {
  return {
    id, uploadId: 5, fileName: `bay-${id}.csv`, format: 'csv', rows: 12, isSuccess: true, isAborted: false, collisions: 0,
    realisedMakespanMs: makespan, realisedSocMs: makespan * 3, finishSpreadMs: 800, waitingMs: 400,
    perRobot: [
      { robot: 0, actionsLogged: 6, actionsPlanned: 6, plannedArrivalMs: 6000, realisedArrivalMs: makespan, arrivalDelayMs: makespan - 6000, lastEndMs: makespan, waitedMs: 200 },
      { robot: 1, actionsLogged: 6, actionsPlanned: 6, plannedArrivalMs: 5000, realisedArrivalMs: 5100, arrivalDelayMs: 100, lastEndMs: 5100, waitedMs: 200 },
    ],
    actionDurations: [{ action: 'forward', meanMs: makespan / 6, count: 10 }],
    outside,
  };
}

function view(canAttach: boolean): FieldTrialsView {
  return {
    resultId: 41, canAttach, safetyNote: SAFETY_NOTE,
    uploads: [{
      id: 5, policy: 'dependency-gated', notes: 'Invented demo data: floor C, two-wheel robots', uploadedBy: 'marguerite-oyelaran', uploadedAt: '2026-12-03T10:00:00.000Z',
      simulation: {
        policy: 'dependency-gated', runs: 200, seed: 9, noise: { jitterCv: 0.1, stallProbability: 0, stallMs: 0 }, settingsFrom: 'stored', successRate: 1,
        realisedMakespanMs: range(6200, 5800, 6900), realisedSocMs: range(17000, 16000, 18500), finishSpreadMs: range(900, 300, 1500), waitingMs: range(300, 0, 900),
        actionDurations: [{ action: 'forward', plannedMs: 1000, simulated: range(1000, 820, 1200) }],
      },
      runs: [run(1, 6300, []), run(2, 9000, ['realisedMakespanMs'])],
    }],
  };
}

describe('FieldTrialsPanel', () => {
  let fixture: ComponentFixture<FieldTrialsPanel>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;

  async function open(canAttach: boolean): Promise<void> {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } }] });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(FieldTrialsPanel);
    fixture.componentRef.setInput('resultId', 41);
    fixture.detectChanges();
    backend.expectOne({ method: 'GET', url: '/api/trials/results/41' }).flush(view(canAttach));
    await fixture.whenStable();
    fixture.detectChanges();
  }
  afterEach(() => backend.verify());

  it('shows each field run beside the simulation, flags the one outside the 95 % and keeps the safety note', async () => {
    await open(false);
    expect(el().querySelector('.safety')?.textContent).toContain(SAFETY_NOTE);
    expect(el().querySelector('[data-testid="trial-notes"]')?.textContent).toContain('Invented demo data');
    expect(el().querySelector('[data-testid="trial-invented"]')?.textContent).toContain('they are no field trial');
    const simulated = el().querySelector('tr.simulated')!.textContent!;
    expect(simulated).toContain('6.20 s (5.80 s – 6.90 s)');
    const rows = Array.from(el().querySelectorAll('[data-testid="trial-run"]'));
    expect(rows.map((r) => r.querySelector('th')!.textContent!.trim().split(/\s/)[0])).toEqual(['bay-1.csv', 'bay-2.csv']);
    expect(rows[0].querySelector('[data-testid="trial-flag"]')).toBeNull();
    expect(rows[1].querySelector('[data-testid="trial-flag"]')?.textContent).toContain("Outside the simulation's 95 %: realised makespan");
    expect(rows[1].textContent).toContain('robot 0 +3.00 s, robot 1 +0.10 s');
    // Two named charts; the flagged run's markers are the hollow ones (its makespan, and its forward mean of 1.5 s above 1.2 s).
    const captions = Array.from(el().querySelectorAll('figcaption')).map((c) => c.textContent);
    expect(captions).toEqual(['Realised makespan per field run against the simulation (dependency-gated)', 'Action durations: planned, simulated, measured (mean per run)']);
    const hollow = Array.from(el().querySelectorAll('path.point.outside')).map((p) => p.querySelector('title')!.textContent);
    expect(hollow).toEqual(['bay-2.csv: realised makespan 9.00 s (outside the simulated 95 %)', 'bay-2.csv: forward mean 1.50 s over 10 actions (outside the simulated 95 %)']);
    expect(el().querySelector('[data-testid="trial-form"]')).toBeNull();
  });

  it('draws the makespan band and points on one axis, and the planned tick of each action kind', () => {
    const v = view(false).uploads[0];
    const m = makespanChart(v, 400);
    expect(m.rows).toHaveLength(2);
    // Axis top = 1.05 × the largest value (9000 ms).
    expect(m.rows[1].points[0].x).toBeCloseTo((9000 / 9450) * 400, 6);
    expect(m.rows[0].band).toEqual({ x1: (5800 / 9450) * 400, x2: (6900 / 9450) * 400 });
    const d = durationChart(v, 400);
    expect(d.rows.map((r) => r.label)).toEqual(['forward']);
    expect(d.rows[0].tick).toBeCloseTo((1000 / 1575) * 400, 6);
    expect(d.rows[0].points.map((p) => p.isOutside)).toEqual([false, true]);
  });

  it('attaches logs with the policy and notes, and lists a refused upload’s problems by file, line and column', async () => {
    await open(true);
    const input = el().querySelector<HTMLInputElement>('[data-testid="trial-files"]')!;
    const file = new File(['robot,action,start_ms,end_ms\n0,forward,0,1000\n'], 'bay-9.csv', { type: 'text/csv' });
    Object.defineProperty(input, 'files', { value: [file] });
    input.dispatchEvent(new Event('change'));
    fixture.detectChanges();
    const textarea = el().querySelector<HTMLTextAreaElement>('textarea')!;
    textarea.value = 'Floor B, 3 Dec';
    textarea.dispatchEvent(new Event('input'));
    fixture.detectChanges();
    el().querySelector<HTMLButtonElement>('[data-testid="trial-attach"]')!.click();
    const req = backend.expectOne({ method: 'POST', url: '/api/trials/results/41' });
    const body = req.request.body as FormData;
    expect(body.get('policy')).toBe('dependency-gated');
    expect(body.get('notes')).toBe('Floor B, 3 Dec');
    expect((body.getAll('files')[0] as File).name).toBe('bay-9.csv');
    req.flush({ error: {
      code: 'TRIAL_DIVERGES', message: 'bay-9.csv:2: action: robot 0 … — the log departs from the plan; nothing was stored.',
      details: { errors: [
        { file: 'bay-9.csv', line: 2, column: 3, field: 'action', message: 'first' },
        { file: 'bay-9.csv', line: 5, column: 1, field: 'robot', message: 'second' },
      ] },
    } }, { status: 422, statusText: 'Unprocessable' });
    await fixture.whenStable();
    fixture.detectChanges();
    const problem = el().querySelector('[data-testid="trial-problem"]')!.textContent!;
    expect(problem).toContain('nothing was stored');
    expect(problem).toContain('bay-9.csv:2:3: action: first');
    expect(problem).toContain('bay-9.csv:5:1: robot: second');
  });
});
