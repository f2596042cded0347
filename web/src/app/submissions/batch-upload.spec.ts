/**
 * The batch section against a fake backend: a refused batch shows file, line and field; a sent
 * zip is polled while it runs, with a progress bar and caption, and its outcome table shows each
 * plan's figures and execution success rates (with the safety note and a plan viewer link) or why
 * it was refused; polling stops once the batch is done.
 */
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MATERIAL_ANIMATIONS } from '@angular/material/core';
import { MatProgressBarHarness } from '@angular/material/progress-bar/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { SAFETY_NOTE, STARTER_PROFILE } from '@shared/executions-constants';
import { profileLabel } from '@shared/leaderboards';
import type { SubmissionBatchView } from '@shared/submission-batches';
import type { SubmissionView } from '@shared/submissions';
import { errorInterceptor } from '../core/error-interceptor';
import BatchUpload, { BATCH_POLL_MS } from './batch-upload';

const ACCEPTED: SubmissionView = {
  id: 31, resultId: 77, scenarioId: 21, scenarioName: 'quay-1.scen', mapName: 'quay.map', agents: 2, model: 'classic', variant: '',
  solver: { name: 'Lantern', version: '0.9' }, soc: 4, makespan: 2, turnInclusiveSocMs: 4000, turnInclusiveMakespanMs: 2000,
  executions: [{ policy: 'open-loop', successRate: 0.85, finishSpreadMeanMs: 10 }, { policy: 'lockstep', successRate: 1, finishSpreadMeanMs: 0 }, { policy: 'dependency-gated', successRate: 1, finishSpreadMeanMs: 0 }],
  robotProfile: STARTER_PROFILE, profileLabel: profileLabel(STARTER_PROFILE), createdAt: '2026-05-01T08:00:00.000Z',
};
const base = { id: 7, source: 'zip' as const, fileName: 'week-12.zip', total: 2, createdAt: '2026-05-01T08:00:00.000Z' };
const RUNNING: SubmissionBatchView = {
  ...base, status: 'running', done: 1, accepted: 1, refused: 0, finishedAt: null,
  entries: [
    { position: 1, file: 'plans/a.txt', line: 5, instance: 'Gull Quay depot / quay.map / quay-1.scen · 2 agents', status: 'accepted', accepted: ACCEPTED, refusal: null },
    { position: 2, file: 'plans/b.txt', line: 6, instance: 'scenario 22 · 3 agents', status: 'pending', accepted: null, refusal: null },
  ],
};
const DONE: SubmissionBatchView = {
  ...RUNNING, status: 'done', done: 2, refused: 1, finishedAt: '2026-05-01T08:00:05.000Z',
  entries: [RUNNING.entries[0], {
    ...RUNNING.entries[1], status: 'refused',
    refusal: { code: 'PLAN_REJECTED', message: 'rejected', violation: { kind: 'vertex', agents: [0, 1], time: 2, cell: [2, 0], message: 'agents 0 and 1 both at (2, 0)' } },
  }],
};

describe('BatchUpload', () => {
  let fixture: ComponentFixture<BatchUpload>;
  let backend: HttpTestingController;
  const host = () => fixture.nativeElement as HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [BatchUpload],
      providers: [
        provideRouter([]), provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting(),
        { provide: MATERIAL_ANIMATIONS, useValue: { animationsDisabled: true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(BatchUpload);
    fixture.detectChanges();
    TestBed.tick();
    backend.expectOne('/api/submissions/batches').flush({ items: [] });
  });

  afterEach(() => {
    backend.verify();
    jest.useRealTimers();
  });

  async function turn(): Promise<void> {
    TestBed.tick();
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
  }

  /** Chooses `file` in the batch file input and presses the send button. */
  async function send(file: File): Promise<void> {
    const input = host().querySelector<HTMLInputElement>('input[type=file]')!;
    Object.defineProperty(input, 'files', { value: [file], configurable: true });
    input.dispatchEvent(new Event('change'));
    await turn();
    const button = [...host().querySelectorAll<HTMLButtonElement>('button')].find((b) => b.textContent?.includes('Submit the batch'))!;
    expect(button.disabled).toBe(false);
    button.click();
    await turn();
  }

  it('shows a refused batch with the file, line and field of each problem', async () => {
    await send(new File(['zip bytes'], 'broken.zip', { type: 'application/zip' }));
    const post = backend.expectOne({ method: 'POST', url: '/api/submissions/batches' });
    expect((post.request.body as FormData).get('archive')).toBeInstanceOf(File);
    post.flush(
      { error: { code: 'VALIDATION_FAILED', message: 'The batch was not accepted', details: [{ file: 'batch.json', line: 7, column: 48, field: 'plans[1].instance.agents', message: 'Invalid input: expected number, received string' }] } },
      { status: 400, statusText: 'Bad Request' },
    );
    await turn();

    const alert = host().querySelector('[role=alert]');
    expect(alert?.textContent).toContain('batch.json, line 7, column 48 (plans[1].instance.agents): Invalid input: expected number, received string');
    expect(host().querySelector('table')).toBeNull();
  });

  it('polls a running batch, shows its progress, then the outcome of every plan, and stops polling when it is done', async () => {
    jest.useFakeTimers({ doNotFake: ['nextTick', 'setImmediate', 'queueMicrotask'] });
    const sent = send(new File(['zip bytes'], 'week-12.zip', { type: 'application/zip' }));
    await jest.advanceTimersByTimeAsync(1);
    await sent;
    backend.expectOne({ method: 'POST', url: '/api/submissions/batches' }).flush({ ...RUNNING, entries: undefined }, { status: 202, statusText: 'Accepted' });
    await jest.advanceTimersByTimeAsync(1);
    backend.expectOne('/api/submissions/batches').flush({ items: [] });
    backend.expectOne('/api/submissions/batches/7').flush(RUNNING);
    await jest.advanceTimersByTimeAsync(1);
    TestBed.tick();

    const loader = TestbedHarnessEnvironment.loader(fixture);
    const bar = await loader.getHarness(MatProgressBarHarness);
    expect(await bar.getValue()).toBe(50);
    expect(host().querySelector('[data-field=progress]')?.textContent).toContain('1 of 2 plans checking… · 1 accepted · 0 refused');

    await jest.advanceTimersByTimeAsync(BATCH_POLL_MS);
    backend.expectOne('/api/submissions/batches/7').flush(DONE);
    await jest.advanceTimersByTimeAsync(1);
    backend.expectOne('/api/submissions/batches').flush({ items: [] });
    TestBed.tick();

    expect(await bar.getValue()).toBe(100);
    const table = await loader.getHarness(MatTableHarness);
    const rows = await table.getCellTextByColumnName();
    expect(rows['outcome'].text).toEqual(['Accepted', 'Refused']);
    expect(rows['details'].text[0]).toContain('SOC 4 · makespan 2 · turn-inclusive makespan 2,000 ms');
    expect(rows['details'].text[0]).toContain('open-loop: success rate 85%');
    expect(rows['details'].text[1]).toBe('vertex: agents 0, 1 at time 2, cell (2, 0): agents 0 and 1 both at (2, 0)');
    expect(rows['source'].text[0]).toBe('plans/a.txt (batch.json line 5)');
    expect(host().querySelector('a[href="/plans/view?result=77"]')).not.toBeNull();
    expect(host().textContent).toContain(SAFETY_NOTE);

    // Done: no more requests however long the page stays open.
    await jest.advanceTimersByTimeAsync(5 * BATCH_POLL_MS);
    backend.expectNone('/api/submissions/batches/7');
  });
});
