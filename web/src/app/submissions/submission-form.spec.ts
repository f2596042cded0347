/** The submission form driven through Material harnesses against a fake backend. */
import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import type { SubmissionView } from '@shared/submissions';
import { errorInterceptor } from '../core/error-interceptor';
import SubmissionForm from './submission-form';

describe('SubmissionForm', () => {
  let fixture: ComponentFixture<SubmissionForm>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [SubmissionForm],
      providers: [provideRouter([]), provideHttpClient(withInterceptors([errorInterceptor])), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SubmissionForm);
    loader = TestbedHarnessEnvironment.loader(fixture);
    fixture.detectChanges();
    // The list resource asks as soon as the page renders; stability waits for its answer.
    TestBed.tick();
    backend.expectOne('/api/submissions').flush({ items: [] });
    await fixture.whenStable();
  });

  afterEach(() => backend.verify());

  async function fill(label: string, value: string): Promise<void> {
    const input = await loader.getHarness(MatInputHarness.with({ selector: `[formControlName="${label}"]` }));
    await input.setValue(value);
  }

  async function fillAndSend(): Promise<void> {
    await fill('scenarioId', '7');
    await fill('agents', '2');
    await fill('solverName', 'Hand planner');
    await fill('solverVersion', '1.0');
    await fill('text', '(0,0) (1,0)\n(2,2) (1,2)');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Check and submit' }))).click();
  }

  it('sends a text-format request and shows the first violation of a rejected plan', async () => {
    await fillAndSend();
    const req = backend.expectOne({ method: 'POST', url: '/api/submissions' });
    expect(req.request.body).toEqual({
      format: 'text', text: '(0,0) (1,0)\n(2,2) (1,2)', model: 'classic', startHeading: 'free',
      instance: { scenarioId: 7, agents: 2 }, solver: { name: 'Hand planner', version: '1.0' },
    });
    req.flush(
      { error: { code: 'PLAN_REJECTED', message: 'The classic validator rejected the plan', details: { violation: { kind: 'swap', agents: [0, 1], time: 1, cell: [1, 0], message: 'swap' } } } },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await fixture.whenStable();
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
    const alert = (fixture.nativeElement as HTMLElement).querySelector('section[role="alert"]');
    expect(alert?.querySelector('[data-field=agents]')?.textContent).toBe('0, 1');
    expect(alert?.querySelector('[data-field=time]')?.textContent).toBe('1');
    expect(alert?.querySelector('[data-field=cell]')?.textContent).toBe('(1, 0)');
  });

  it('shows the figures of an accepted plan and reloads the list', async () => {
    await fillAndSend();
    const view: SubmissionView = {
      id: 1, resultId: 9, scenarioId: 7, scenarioName: 'tiny-a.scen', mapName: 'tiny.map', agents: 2, model: 'classic', variant: '',
      solver: { name: 'Hand planner', version: '1.0' }, soc: 2, makespan: 1, turnInclusiveSocMs: 2000, turnInclusiveMakespanMs: 1000,
      executions: [{ policy: 'open-loop', successRate: 1, finishSpreadMeanMs: 0 }], createdAt: '2026-01-02T00:00:00.000Z',
    };
    backend.expectOne({ method: 'POST', url: '/api/submissions' }).flush(view);
    await new Promise((resolve) => setTimeout(resolve));
    TestBed.tick();
    backend.expectOne({ method: 'GET', url: '/api/submissions' }).flush({ items: [view] });
    await fixture.whenStable();
    const status = (fixture.nativeElement as HTMLElement).querySelector('[role="status"]');
    expect(status?.querySelector('[data-field=soc]')?.textContent).toBe('2');
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Your accepted plans');
  });
});
