import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import type { ExecutionView, InstanceExecutionInput } from '@shared/executions';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { PlanModel } from '@shared/plan';
import { simulateExecution } from '@solvers/execute';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { CONTEXT_2D } from './canvas-context';
import { TEST_PROFILE, testInstance } from './plan-viewer-testing';
import PlanViewer from './plan-viewer';

// Four robots nose to tail in a 12-cell lane, each driving 7 cells east (an invented instance).
const ROWS = ['............'];
const instance = testInstance(ROWS[0], [[3, 10], [2, 9], [1, 8], [0, 7]]);
const paths = [[3, 4, 5, 6, 7, 8, 9, 10], [2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3, 4, 5, 6, 7, 8], [0, 1, 2, 3, 4, 5, 6, 7]];

/** What the server would answer, computed with the real simulator (open-loop, no noise). */
function serverView(id: number, model: PlanModel, body: InstanceExecutionInput): ExecutionView {
  const turned = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: model === 'uniform-duration' ? 'uniform' : 'none' });
  const plan = { timeline: 'steps' as const, schedule: turned.schedule };
  const summary = simulateExecution(instance, plan, TEST_PROFILE, {
    policy: body.policy, noise: body.noise, seed: body.seed ?? 1, runs: body.runs ?? 20,
  });
  return {
    id, createdAt: '2026-05-01T10:00:00.000Z', owner: { id: 1, login: 'someone' },
    source: { instanceSetId: 1, mapId: 2, mapName: 'lane.map', scenarioId: 5, scenarioName: 'lane-queue.scen' },
    instance: { width: 12, height: 1, rows: ROWS, agents: [[3, 10], [2, 9], [1, 8], [0, 7]].map(([s, g]) => ({ start: [s, 0] as const, goal: [g, 0] as const })) },
    model, modelOptions: { startHeading: 'free' }, profile: TEST_PROFILE, plan: { origin: 'solved', ...plan },
    figures: {
      soc: 28, makespan: 7, unit: 'steps', turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs,
      lowerBound: 28, solveTimeMs: 3, isValid: true, validation: 'optimal plan; passed the independent classic validator',
    },
    summary: summary as unknown as ExecutionView['summary'],
    safetyNote: SAFETY_NOTE,
  };
}

describe('PlanViewer', () => {
  let fixture: ComponentFixture<PlanViewer>;
  let loader: HarnessLoader;
  let backend: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [PlanViewer],
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: CONTEXT_2D, useValue: () => null }],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PlanViewer);
    loader = TestbedHarnessEnvironment.loader(fixture);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
    backend.expectOne((r) => r.url === '/api/instance-sets').flush({ items: [], total: 0, page: 1, pageSize: 100 });
  });

  afterEach(() => backend.verify());

  const metric = (pane: number, key: string) =>
    el.querySelectorAll('article.pane')[pane]?.querySelector(`[data-metric="${key}"] dd`)?.textContent?.trim();

  async function answerPost(id: number, model: PlanModel): Promise<TestRequest> {
    const req = backend.expectOne({ method: 'POST', url: '/api/executions' });
    req.flush(serverView(id, model, req.request.body as InstanceExecutionInput));
    await settle();
    return req;
  }

  async function settle(): Promise<void> {
    for (let i = 0; i < 5; i++) {
      await new Promise((r) => setTimeout(r, 0));
      await fixture.whenStable();
      // The picker reads the shown plan's instance set to offer its scenarios.
      for (const r of backend.match((q) => /^\/api\/instance-sets\/\d+$/.test(q.url))) {
        r.flush({ id: 1, name: 'lanes', scenarios: [{ id: 5, name: 'lane-queue.scen', mapId: 2, rows: 4, maxAgents: 4 }] });
      }
    }
  }

  async function open(model: PlanModel, compare?: PlanModel): Promise<void> {
    fixture.componentRef.setInput('scenario', '5');
    fixture.componentRef.setInput('agents', '4');
    fixture.componentRef.setInput('model', model);
    if (compare) fixture.componentRef.setInput('compare', compare);
    await fixture.whenStable();
  }

  it('always shows the safety note', () => {
    expect(el.querySelector('[role="note"]')?.textContent?.trim()).toBe(SAFETY_NOTE);
  });

  it('asks the server to solve and simulate the instance, and shows its figures with model and profile', async () => {
    await open('classic');
    const req = await answerPost(11, 'classic');

    expect(req.request.body).toMatchObject({ instance: { scenarioId: 5, agents: 4 }, model: 'classic', policy: 'open-loop', runs: 20, seed: 1 });
    expect(el.querySelector('.source')?.textContent).toContain('lane-queue.scen');
    expect(metric(0, 'success-rate')).toBe('100%');
    expect(metric(0, 'collisions')).toBe('0');
    expect(metric(0, 'realised-makespan')).toBe('7 s / 7 s');
    const card = el.querySelector('app-execution-summary-card')!.textContent!;
    expect(card).toContain('classic');
    expect(card).toContain('forward 1000 ms · quarter turn 500 ms');
    expect(card).toContain('computed on the server');
  });

  it('re-runs in the browser: jitter makes open-loop followers collide, dependency-gated does not', async () => {
    await open('classic');
    await answerPost(11, 'classic');

    const jitter = await loader.getHarness(MatInputHarness.with({ placeholder: undefined, selector: '[formControlName="jitterCv"]' }));
    await jitter.setValue('0.3');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run in browser' }))).click();
    await settle();
    expect(Number(metric(0, 'collisions'))).toBeGreaterThan(0);
    expect(metric(0, 'success-rate')).not.toBe('100%');
    expect(el.querySelector('app-execution-summary-card')!.textContent).toContain('computed in this browser');

    const policy = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="policy"]' }));
    await policy.clickOptions({ text: 'dependency-gated' });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run in browser' }))).click();
    await settle();
    expect(metric(0, 'collisions')).toBe('0');
    expect(metric(0, 'success-rate')).toBe('100%');
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('dependency-gated · jitter CV 0.3');
  });

  it('re-runs on the server with the same plan sent as a schedule', async () => {
    await open('classic');
    await answerPost(11, 'classic');
    const policy = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="policy"]' }));
    await policy.clickOptions({ text: 'lockstep' });

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run on server' }))).click();
    const req = await answerPost(12, 'classic');

    const body = req.request.body as InstanceExecutionInput;
    expect(body.policy).toBe('lockstep');
    expect(body.plan?.kind).toBe('schedule');
    expect(body.plan && 'schedule' in body.plan ? body.plan.schedule[0][0] : null).toMatchObject({ action: 'forward', from: [3, 0], to: [4, 0] });
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('lockstep');
  });

  it('replays a stored result by its id, names it as the source, and re-runs it on the server by the same id', async () => {
    fixture.componentRef.setInput('result', '41');
    await fixture.whenStable();
    const req = backend.expectOne({ method: 'POST', url: '/api/executions' });
    expect(req.request.body).toEqual({ resultId: 41, policy: 'open-loop', noise: { jitterCv: 0, stallProbability: 0, stallMs: 0 }, seed: 1, runs: 20, onCollision: 'count' });
    const view = serverView(11, 'classic', { ...req.request.body, instance: { scenarioId: 5, agents: 4 }, model: 'classic', profile: TEST_PROFILE } as InstanceExecutionInput);
    const computedBy = { version: '0.1.0', commit: '0123456789abcdef', node: 'v20.20.2', cpuModel: 'Test CPU', threads: 1 };
    req.flush({ ...view, source: { ...view.source, resultId: 41, sweepId: 3 }, plan: { ...view.plan, origin: 'result' }, computedBy });
    await settle();
    expect(el.querySelector('.source')?.textContent).toContain('stored result 41 of sweep 3');
    expect(el.querySelector('[data-testid="computed-by"]')?.textContent?.trim()).toBe('Quarterturn 0.1.0 (commit 0123456789), Node v20.20.2, Test CPU');
    // The picker took the shown plan's instance and profile, ready to compare it with a second model.
    const scenarioSelect = await loader.getHarness(MatSelectHarness.with({ selector: '[formControlName="scenarioId"]' }));
    expect(await scenarioSelect.getValueText()).toBe('lane-queue.scen (up to 4 agents)');
    const quarterTurn = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="quarterTurnMs"]' }));
    expect(await quarterTurn.getValue()).toBe(String(TEST_PROFILE.quarterTurnMs));
    expect(metric(0, 'success-rate')).toBe('100%');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run on server' }))).click();
    const again = backend.expectOne({ method: 'POST', url: '/api/executions' });
    expect(again.request.body).toMatchObject({ resultId: 41, policy: 'open-loop' });
    expect(again.request.body).not.toHaveProperty('plan');
    again.flush({ ...view, id: 12, source: { ...view.source, resultId: 41, sweepId: 3 } });
    await settle();
  });

  it('shows two models side by side, each with its own figures, timeline and histogram', async () => {
    await open('classic', 'uniform-duration');
    await answerPost(11, 'classic');
    await answerPost(12, 'uniform-duration');

    const panes = el.querySelectorAll('article.pane');
    expect(Array.from(panes, (p) => p.getAttribute('data-model'))).toEqual(['classic', 'uniform-duration']);
    expect(el.querySelectorAll('app-gantt-chart')).toHaveLength(2);
    expect(el.querySelectorAll('app-finish-histogram-chart')).toHaveLength(2);
    // Uniform-duration stretches every step to forward + 2 quarter turns = 2000 ms. The last robot
    // arrives 1000 ms into step 6 (6 × 2000 + 1000 = 13 s), while the model's turn-inclusive makespan
    // counts whole steps (7 × 2000 = 14 s); worked by hand.
    expect(metric(1, 'realised-makespan')).toBe('13 s / 13 s');
    const figure = (pane: number, key: string) => panes[pane].querySelector(`[data-figure="${key}"] dd`)?.textContent?.trim();
    expect(figure(1, 'turn-inclusive-makespan')).toBe('14 s');
    expect(figure(0, 'turn-inclusive-makespan')).toBe('7 s');
    expect(metric(0, 'realised-makespan')).toBe('7 s / 7 s');
  });
});
