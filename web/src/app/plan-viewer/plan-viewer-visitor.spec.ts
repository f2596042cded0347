/**
 * The plan viewer for a visitor (issue 14, item 6): a stored result opens without running
 * anything on the server (no POST /api/executions); its plan is read with GET
 * /api/executions/results/:id and replayed in the browser with the stored settings, so the page
 * shows the stored figures; the plan downloads as JSON and text; running on the server is offered
 * to researchers only. The "server" answers are computed with the real simulator.
 */
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatButtonHarness } from '@angular/material/button/testing';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { PLAN_MODELS, type PlanModel } from '@shared/plan';
import { TEXT_FORMAT_MODELS } from '@shared/plan-format';
import { hasTextPlan, type ResultPlanView } from '@shared/result-plan-view';
import type { StoredResultExecutionsView } from '@shared/stored-executions';
import { simulateExecution } from '@solvers/execute';
import { scheduleFromPaths } from '@solvers/models/turn-schedule';
import { Session } from '../core/session';
import { CONTEXT_2D } from './canvas-context';
import { TEST_PROFILE, testInstance } from './plan-viewer-testing';
import PlanViewer from './plan-viewer';
import { formatPercent } from './viewer-format';

// Four robots nose to tail in a 12-cell lane, each driving 7 cells east (an invented instance).
const ROW = '............';
const instance = testInstance(ROW, [[3, 10], [2, 9], [1, 8], [0, 7]]);
const paths = [[3, 4, 5, 6, 7, 8, 9, 10], [2, 3, 4, 5, 6, 7, 8, 9], [1, 2, 3, 4, 5, 6, 7, 8], [0, 1, 2, 3, 4, 5, 6, 7]];
const turned = scheduleFromPaths(instance, paths, TEST_PROFILE, { startHeading: 'free', stretch: 'none' });
const SETTINGS = { noise: { jitterCv: 0.2, stallProbability: 0.05, stallMs: 1500 }, runs: 15, seed: 9, onCollision: 'count' as const };

/** GET /api/executions/results/41 of a `model` result. */
function resultPlan(model: PlanModel = 'classic'): ResultPlanView {
  return {
    source: { instanceSetId: 1, mapId: 2, mapName: 'lane.map', scenarioId: 5, scenarioName: 'lane-queue.scen', resultId: 41, sweepId: 3 },
    instance: { width: 12, height: 1, rows: [ROW], agents: [[3, 10], [2, 9], [1, 8], [0, 7]].map(([s, g]) => ({ start: [s, 0] as const, goal: [g, 0] as const })) },
    model, modelOptions: { startHeading: 'free' }, profile: TEST_PROFILE,
    plan: { origin: 'result', timeline: 'steps', schedule: turned.schedule },
    figures: {
      soc: 28, makespan: 7, unit: 'steps', turnInclusiveSocMs: turned.turnInclusiveSocMs, turnInclusiveMakespanMs: turned.turnInclusiveMakespanMs,
      lowerBound: 28, solveTimeMs: 3, isValid: true, validation: 'stored result: passed the independent classic validator when the sweep solved it',
    },
    safetyNote: SAFETY_NOTE,
  };
}

/** GET /api/executions/stored/41: what the sweep's simulator stored for two policies (the real simulator here). */
function storedView(model: PlanModel = 'classic'): StoredResultExecutionsView {
  return {
    resultId: 41, sweepId: 3, model, profile: TEST_PROFILE,
    executions: (['open-loop', 'lockstep'] as const).map((policy) => {
      const s = simulateExecution(instance, { timeline: 'steps', schedule: turned.schedule }, TEST_PROFILE, { policy, ...SETTINGS });
      return {
        settings: { policy, ...SETTINGS },
        figures: { successRate: s.successRate, collisions: s.collisions, realisedMakespanMs: s.realisedMakespanMs, realisedSocMs: s.realisedSocMs, finishSpreadMs: s.finishSpreadMs, waitingMs: s.waitingMs },
        recorded: { seed: true, onCollision: true },
        error: null,
      };
    }),
  };
}

describe('PlanViewer for a visitor', () => {
  let fixture: ComponentFixture<PlanViewer>;
  let backend: HttpTestingController;
  let el: HTMLElement;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      imports: [PlanViewer],
      providers: [
        provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: CONTEXT_2D, useValue: () => null },
        { provide: Session, useValue: { load: async () => ({ account: null, role: 'visitor' }), hasRole: () => false } },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(PlanViewer);
    el = fixture.nativeElement as HTMLElement;
    await fixture.whenStable();
    backend.expectOne((r) => r.url === '/api/instance-sets').flush({ items: [], total: 0, page: 1, pageSize: 100 });
  });

  // Also proves no POST /api/executions was sent: an unanswered request fails verify().
  afterEach(() => {
    // A stored result's page also loads its field trials (trials/field-trials-panel.spec.ts tests that panel).
    for (const r of backend.match((q) => q.url.startsWith('/api/trials/'))) r.flush({ resultId: 0, uploads: [], canAttach: false, safetyNote: '' });
    backend.verify();
  });

  async function settle(): Promise<void> {
    for (let i = 0; i < 8; i++) {
      await new Promise((r) => setTimeout(r, 0));
      await fixture.whenStable();
      for (const r of backend.match((q) => /^\/api\/instance-sets\/\d+$/.test(q.url))) {
        r.flush({ id: 1, name: 'lanes', scenarios: [{ id: 5, name: 'lane-queue.scen', mapId: 2, rows: 4, maxAgents: 4 }] });
      }
    }
  }

  async function openResult(model: PlanModel = 'classic'): Promise<void> {
    fixture.componentRef.setInput('result', '41');
    await fixture.whenStable();
    await settle();
    backend.expectOne({ method: 'GET', url: '/api/executions/stored/41' }).flush(storedView(model));
    backend.expectOne({ method: 'GET', url: '/api/executions/results/41' }).flush(resultPlan(model));
    await settle();
  }

  const metric = (key: string) => el.querySelector(`article.pane [data-metric="${key}"] dd`)?.textContent?.trim();

  it('replays a public result in the browser with the stored settings and shows the stored figures', async () => {
    await openResult();
    expect(el.querySelector('.source')?.textContent).toContain('stored result 41 of sweep 3');
    expect(el.querySelector('[data-testid="stored-check"]')?.textContent).toContain('all 7 stored figures compared equal to the digit');
    expect(metric('success-rate')).toBe(formatPercent(storedView().executions[0].figures.successRate));
    expect(el.querySelector('app-execution-summary-card')!.textContent).toContain('computed in this browser');
    expect(el.querySelector('[data-testid="noise"]')?.textContent).toContain('open-loop · timing jitter CV 0.2');
  });

  it('offers both plan downloads and no server run, saying what needs an account', async () => {
    await openResult();
    expect(el.querySelector('[data-testid="download-json"]')?.getAttribute('href')).toBe('/api/executions/results/41/plan.json');
    expect(el.querySelector('[data-testid="download-text"]')?.getAttribute('href')).toBe('/api/executions/results/41/plan.txt');
    const loader = TestbedHarnessEnvironment.loader(fixture);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Re-run on server' }))).toHaveLength(0);
    expect(await loader.getAllHarnesses(MatButtonHarness.with({ text: 'Re-run in browser' }))).toHaveLength(1);
    expect(el.querySelector('[data-testid="browser-only"]')?.textContent).toContain('needs a researcher account');
    expect(el.querySelector('[data-testid="visitor-note"]')?.textContent).toContain('sign in');
    expect(await (await loader.getHarness(MatButtonHarness.with({ text: 'Solve and view' }))).isDisabled()).toBe(true);
  });

  it('switches to another stored policy in the browser, again with the stored figures', async () => {
    await openResult();
    const loader = TestbedHarnessEnvironment.loader(fixture);
    await (await loader.getHarness(MatButtonHarness.with({ text: 'lockstep', ancestor: '[data-testid="stored"]' }))).click();
    await settle();
    const check = el.querySelector('[data-testid="stored-check"]')?.textContent ?? '';
    expect(check).toContain('(lockstep)');
    expect(check).toContain('all 7 stored figures compared equal to the digit');
  });

  it('offers no text download for a weighted-split plan, and the text-capable models are the text format\'s', async () => {
    await openResult('weighted-split');
    expect(el.querySelector('[data-testid="download-json"]')).not.toBeNull();
    expect(el.querySelector('[data-testid="download-text"]')).toBeNull();
    expect(el.querySelector('[data-testid="plan-downloads"]')?.textContent).toContain('no text form');
    expect(PLAN_MODELS.filter(hasTextPlan)).toEqual([...TEXT_FORMAT_MODELS].sort((a, b) => PLAN_MODELS.indexOf(a) - PLAN_MODELS.indexOf(b)));
  });
});
