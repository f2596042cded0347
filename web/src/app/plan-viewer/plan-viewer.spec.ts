import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting, type TestRequest } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { CI95_METHOD, wilsonInterval } from '@shared/confidence-interval';
import type { ExecutionView, InstanceExecutionInput } from '@shared/executions';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { SAFETY_NOTE } from '@shared/executions-constants';
import type { PlanModel } from '@shared/plan';
import { realisedTimeline, simulateExecution } from '@solvers/execute';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { Session } from '../core/session';
import { CONTEXT_2D } from './canvas-context';
import { TEST_PROFILE, testInstance } from './plan-viewer-testing';
import PlanViewer from './plan-viewer';
import { formatPercent, formatSeconds } from './viewer-format';

// Four robots nose to tail in a 12-cell lane, each driving 7 cells east (an invented instance).
const ROWS = ['............'];
const instance = testInstance(ROWS[0], [[3, 10], [2, 9], [1, 8], [0, 7]]);
const paths = [[3, 4, 5, 6, 7, 8, 9, 10], [2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3, 4, 5, 6, 7, 8], [0, 1, 2, 3, 4, 5, 6, 7]];

/** What the server would answer, computed with the real simulator (open-loop, no noise). */
function serverView(id: number, model: PlanModel, body: InstanceExecutionInput): ExecutionView {
  const turned = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: model === 'uniform-duration' ? 'uniform' : 'none' });
  const plan = { timeline: 'steps' as const, schedule: turned.schedule };
  const summary = simulateExecution(instance, plan, TEST_PROFILE, {
    policy: body.policy, noise: body.noise, seed: body.seed ?? 1, runs: body.runs ?? 20, onCollision: body.onCollision,
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
      providers: [
        provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: CONTEXT_2D, useValue: () => null },
        // A researcher: stored results run on the server (visitors: plan-viewer-visitor.spec.ts).
        { provide: Session, useValue: { load: async () => ({ account: null, role: 'researcher' }), hasRole: () => true } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PlanViewer);
    loader = TestbedHarnessEnvironment.loader(fixture);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
    backend.expectOne((r) => r.url === '/api/instance-sets').flush({ items: [], total: 0, page: 1, pageSize: 100 });
  });

  afterEach(() => {
    // A stored result's page also loads its field trials (trials/field-trials-panel.spec.ts tests that panel).
    for (const r of backend.match((q) => q.url.startsWith('/api/trials/'))) r.flush({ resultId: 0, uploads: [], canAttach: false, safetyNote: '' });
    backend.verify();
  });

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

  it('lists every robot state in the map legend, blocked included, each with its own shape (issue 18, item 6)', async () => {
    await open('classic');
    await answerPost(11, 'classic');
    const items = [...el.querySelectorAll('.robot-legend li')];
    expect(items.map((li) => [li.getAttribute('data-shape'), li.textContent?.trim()])).toEqual([
      ['disk', 'Moving as planned (driving, turning or waiting)'],
      ['square', 'Waiting on dependency'],
      ['ring', 'At goal'],
      ['octagon', 'Stopped by collision'],
      ['cross', 'Blocked (dependency cycle)'],
      ['collision', 'Collision (wide ring round the contact point)'],
    ]);
    // Each glyph is drawn as SVG (the namespace matters: an HTML <circle> draws nothing).
    expect(items.map((li) => li.querySelector('svg')?.firstElementChild?.namespaceURI)).toEqual(items.map(() => 'http://www.w3.org/2000/svg'));
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
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('dependency-gated · timing jitter CV 0.3');
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

  /** What the sweep stored for result 41: its three policies, replayed with jitter 0.15, 5 % stalls of 1.5 s, 25 runs, seed 7. */
  const STORED_SETTINGS = { noise: { jitterCv: 0.15, stallProbability: 0.05, stallMs: 1500 }, runs: 25, seed: 7, onCollision: 'count' as const };
  function storedView(profile = TEST_PROFILE): StoredResultExecutionsView {
    return {
      resultId: 41, sweepId: 3, model: 'classic', profile,
      executions: (['open-loop', 'lockstep', 'dependency-gated'] as const).map((policy) => {
        // The stored figures are what the sweep's simulator computed with these settings (the real simulator here too).
        const s = serverView(0, 'classic', { policy, ...STORED_SETTINGS } as InstanceExecutionInput).summary;
        return {
          settings: { policy, ...STORED_SETTINGS },
          figures: { successRate: s.successRate, collisions: s.collisions, realisedMakespanMs: s.realisedMakespanMs, realisedSocMs: s.realisedSocMs, finishSpreadMs: s.finishSpreadMs, waitingMs: s.waitingMs },
          recorded: { seed: true, onCollision: true },
          error: null,
        };
      }),
    };
  }

  /** Opens result 41: answers the stored replays, then the POST the page sends, with the real simulator. */
  async function openStored(policy?: string): Promise<TestRequest> {
    fixture.componentRef.setInput('result', '41');
    if (policy) fixture.componentRef.setInput('policy', policy);
    await fixture.whenStable();
    backend.expectOne({ method: 'GET', url: '/api/executions/stored/41' }).flush(storedView());
    await settle();
    return answerStoredPost(11);
  }

  async function answerStoredPost(id: number): Promise<TestRequest> {
    const req = backend.expectOne({ method: 'POST', url: '/api/executions' });
    const view = serverView(id, 'classic', { ...req.request.body, instance: { scenarioId: 5, agents: 4 }, model: 'classic', profile: TEST_PROFILE } as InstanceExecutionInput);
    req.flush({ ...view, source: { ...view.source, resultId: 41, sweepId: 3 }, plan: { ...view.plan, origin: 'result' } });
    await settle();
    return req;
  }

  it('opens a stored result with exactly the settings its sweep stored, and says its figures are the stored ones', async () => {
    const req = await openStored();
    expect(req.request.body).toEqual({ resultId: 41, policy: 'open-loop', ...STORED_SETTINGS });
    expect(el.querySelector('.source')?.textContent).toContain('stored result 41 of sweep 3');
    expect(el.querySelector('[data-testid="stored-check"]')?.textContent).toContain('all 7 stored figures compared equal to the digit');
    expect(el.querySelector('[data-testid="what-if"]')).toBeNull();
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('open-loop · timing jitter CV 0.15 · stall probability 5.0% × 1.5 s · 25 runs · seed 7');
    const stored = storedView().executions[0].figures;
    expect(metric(0, 'success-rate')).toBe(formatPercent(stored.successRate));
    // The form shows the stored settings, so a re-run without changes is the stored replay again.
    const jitter = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="jitterCv"]' }));
    expect(await jitter.getValue()).toBe('0.15');
    expect(await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="seed"]' }))).getValue()).toBe('7');
    // Stored policy buttons: the shown one is pressed.
    const pressed = Array.from(el.querySelectorAll('[data-testid="stored"] button'), (b) => [b.textContent?.trim(), b.getAttribute('aria-pressed')]);
    expect(pressed).toEqual([['open-loop', 'true'], ['lockstep', 'false'], ['dependency-gated', 'false']]);
  });

  it('opens the stored policy named in the query, and switches to another stored policy with its stored settings', async () => {
    const req = await openStored('dependency-gated');
    expect(req.request.body).toMatchObject({ policy: 'dependency-gated', seed: 7, runs: 25 });
    await (await loader.getHarness(MatButtonHarness.with({ text: 'lockstep', ancestor: '[data-testid="stored"]' }))).click();
    const again = await answerStoredPost(12);
    expect(again.request.body).toEqual({ resultId: 41, policy: 'lockstep', ...STORED_SETTINGS });
    expect(el.querySelector('[data-testid="stored-check"]')?.textContent).toContain('(lockstep)');
  });

  it('a changed setting is a labelled what-if naming what differs, with the stored figures beside it and a way back', async () => {
    await openStored();
    const jitter = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="jitterCv"]' }));
    await jitter.setValue('0.3');
    await settle();
    expect(el.querySelector('[data-testid="pending-what-if"]')?.textContent).toContain('what-if: jitter CV 0.3 instead of 0.15');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run in browser' }))).click();
    await settle();

    const banner = el.querySelector('[data-testid="what-if"]')?.textContent ?? '';
    expect(banner).toContain('What-if: these are not the stored figures.');
    expect(banner).toContain('jitter CV 0.3 instead of 0.15');
    expect(banner).toContain(`Stored figures: open-loop: execution success rate ${formatPercent(storedView().executions[0].figures.successRate)}`);
    expect(el.querySelector('[data-testid="stored-check"]')).toBeNull();
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('jitter CV 0.3');

    await (await loader.getHarness(MatButtonHarness.with({ text: 'Back to the stored figures' }))).click();
    const back = await answerStoredPost(12);
    expect(back.request.body).toEqual({ resultId: 41, policy: 'open-loop', ...STORED_SETTINGS });
    expect(el.querySelector('[data-testid="what-if"]')).toBeNull();
    expect(await jitter.getValue()).toBe('0.15');
    expect(el.querySelector('[data-testid="stored-check"]')?.textContent).toContain('compared equal');
  });

  it('a re-run in the browser with the stored settings is no what-if and reproduces the stored figures', async () => {
    await openStored();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run in browser' }))).click();
    await settle();
    expect(el.querySelector('app-execution-summary-card')!.textContent).toContain('computed in this browser');
    expect(el.querySelector('[data-testid="what-if"]')).toBeNull();
    expect(el.querySelector('[data-testid="stored-check"]')?.textContent).toContain('all 7 stored figures compared equal to the digit');
  });

  it('a stored result without stored replays (a submitted plan) says so and uses the form settings', async () => {
    fixture.componentRef.setInput('result', '41');
    await fixture.whenStable();
    backend.expectOne({ method: 'GET', url: '/api/executions/stored/41' }).flush({ ...storedView(), sweepId: null, executions: [] });
    await settle();
    const req = await answerStoredPost(11);
    expect(req.request.body).toEqual({ resultId: 41, policy: 'open-loop', noise: { jitterCv: 0, stallProbability: 0, stallMs: 0 }, seed: 1, runs: 20, onCollision: 'count' });
    expect(el.querySelector('[data-testid="stored"]')?.textContent).toContain('has no stored replays');
    expect(el.querySelector('[data-testid="what-if"]')).toBeNull();
  });

  it('a kept execution of a stored result (execution=ID) is labelled against the stored settings', async () => {
    fixture.componentRef.setInput('execution', '12');
    await fixture.whenStable();
    const view = serverView(12, 'classic', { policy: 'open-loop', ...STORED_SETTINGS, seed: 9 } as InstanceExecutionInput);
    backend.expectOne({ method: 'GET', url: '/api/executions/12' }).flush({ ...view, source: { ...view.source, resultId: 41, sweepId: 3 } });
    await settle();
    backend.expectOne({ method: 'GET', url: '/api/executions/stored/41' }).flush(storedView());
    await settle();
    expect(el.querySelector('[data-testid="what-if"]')?.textContent).toContain('seed 9 instead of 7');
  });

  it('every Monte Carlo figure carries its unit and 95 % interval, the methods are named, waiting is per robot and the total is labelled', async () => {
    await openStored();
    const card = el.querySelector('app-execution-summary-card')!;
    const s = storedView().executions[0].figures;
    // Wilson interval recomputed from rate × runs when the summary has none (shared/confidence-interval.ts).
    const [lo, hi] = wilsonInterval(Math.round(s.successRate * 25), 25);
    expect(card.querySelector('[data-interval="success-rate"]')?.textContent).toContain(`${formatPercent(lo)} – ${formatPercent(hi)}`);
    expect(card.querySelector('[data-metric="realised-makespan"] dt')?.textContent).toContain('Realised makespan (mean / p95 over runs), s');
    // 25 runs: a Student t interval of the mean; the p95's order-statistic interval needs at least 72 runs (CI95_METHOD.quantile).
    expect(card.querySelector('[data-interval="realised-makespan"]')?.textContent).toMatch(/mean [\d.]+ – [\d.]+ s · p95 no interval/);
    expect(card.querySelector('[data-metric="waiting-robot-mean"] dt')?.textContent).toContain('Waiting per robot, mean over robots');
    expect(card.querySelector('[data-metric="waiting-robot-max"] dt')?.textContent).toContain('Waiting per robot, longest robot');
    expect(card.querySelector('[data-testid="ci-methods"]')?.textContent).toContain('"No interval": too few runs');
    expect(card.querySelector('[data-metric="waiting"] dt')?.textContent).toContain('total over robots');
    expect(card.querySelector('[data-testid="ci-methods"]')?.textContent).toContain(CI95_METHOD.rate);
    expect(card.querySelector('[data-testid="ci-methods"]')?.textContent).toContain(CI95_METHOD.mean);
    expect(card.querySelector('[data-testid="profile"]')?.textContent).toContain('Robot profile: forward 1000 ms');
    expect(card.textContent).toContain('Plan model classic');
    expect(card.textContent).toContain('Execution success rate');
    expect(el.querySelector('[role="note"]')?.textContent?.trim()).toBe(SAFETY_NOTE);
  });

  it('names who waited in the drawn run under dependency-gated execution, robot by robot as the simulator attributed it', async () => {
    await openStored('dependency-gated');
    const section = el.querySelector('[data-testid="attribution"]');
    expect(section?.querySelector('h3')?.textContent).toContain('Who waited for whom, run 1');
    const waits = Array.from(section?.querySelectorAll('.waits li') ?? [], (li) => li.textContent?.trim() ?? '');
    // The same run, simulated here: the robots that waited, most waiting first.
    const turned = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: 'none' });
    const timeline = realisedTimeline(instance, { timeline: 'steps', schedule: turned.schedule }, TEST_PROFILE, { policy: 'dependency-gated', ...STORED_SETTINGS }, 0);
    const waited = timeline.robots.map((a, r) => ({ r, ms: a.reduce((sum, x) => sum + x.waitedMs, 0) })).filter((w) => w.ms > 0).sort((a, b) => b.ms - a.ms || a.r - b.r);
    // Jitter 0.15 and stalls on nose-to-tail followers: run 1 holds some follower (checked, so the list is not empty by luck).
    expect(waited.length).toBeGreaterThan(0);
    expect(waits).toHaveLength(waited.length);
    waits.forEach((w, i) => expect(w.startsWith(`robot ${waited[i].r + 1} waited ${formatSeconds(waited[i].ms)}`)).toBe(true));
  });

  it('warns with the derivation when the robot diameter exceeds pitch/√2, and says the plan allows following', async () => {
    await open('classic');
    const req = backend.expectOne({ method: 'POST', url: '/api/executions' });
    // 750 mm robots on a 1000 mm pitch: 750 > 1000/√2 ≈ 707.1 mm but not > 1000 mm (worked by hand).
    req.flush({ ...serverView(11, 'classic', req.request.body as InstanceExecutionInput), profile: { ...TEST_PROFILE, robotDiameterMm: 750 } });
    await settle();
    const hazard = el.querySelector('[data-testid="following-hazard"]')?.textContent ?? '';
    expect(hazard).toContain('collide in right-angle following (diameter above p/√2 = 707.1 mm)');
    expect(hazard).toContain('The classic plan was solved with following allowed (the classic rule).');
    expect(hazard).toContain('least distance is p/√2 = 707.1 mm');
  });

  it('shows no following warning for 700 mm robots on a 1000 mm pitch (700 < 707.1 mm)', async () => {
    await open('classic');
    await answerPost(11, 'classic');
    expect(el.querySelector('[data-testid="following-hazard"]')).toBeNull();
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
