import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, Router, withComponentInputBinding } from '@angular/router';
import { RouterTestingHarness } from '@angular/router/testing';
import { By } from '@angular/platform-browser';
import { MIXED_SETTINGS_NOTE, type ModelComparisonReport, type ReportChoices, type VariantFigures } from '@shared/reports';
import { SAFETY_NOTE } from '@shared/executions-constants';
import ModelComparisonPage from './model-comparison-page';

const CHOICES: ReportChoices = {
  sets: [
    { id: 4, name: 'Kestrel Row parcel depot', isPublic: true, profiles: [{ hash: 'aaaaaaaaaaaaaaaa', label: 'forward 1000 ms, pitch 1000 mm', entries: 40 }, { hash: 'bbbbbbbbbbbbbbbb', label: 'forward 800 ms, pitch 1200 mm', entries: 8 }] },
    { id: 9, name: 'Own yard', isPublic: false, profiles: [{ hash: 'cccccccccccccccc', label: 'forward 500 ms', entries: 3 }] },
  ],
  policies: ['open-loop', 'lockstep', 'dependency-gated'],
};

const variant = (label: string, over: Partial<VariantFigures>): VariantFigures => ({
  model: 'classic', variant: '', label, isReference: false, instances: 8, solved: 8, solvedRate: 1, solvedCi95: [0.676, 1],
  nominalChecked: 8, nominalExecutable: 8, executableRate: 1, executableCi95: [0.676, 1], executedInstances: 8, runs: 160, successfulRuns: 160,
  executionSuccessRate: 1, executionSuccessCi95: [0.977, 1], instancesWithCollisions: 0, instancesWithFailuresWithoutCollision: 0, realisedMakespanMeanMs: 12000,
  makespanVsClassic: { pairs: 8, ratio: 0.88, ci95: [0.85, 0.91] }, finishSpreadMs: { n: 8, mean: 2100, ci95: [1500, 2700] },
  plannedVsRealised: { n: 8, rho: 0.93, ci95: [0.62, 0.99] }, ...over,
});

const REPORT: ModelComparisonReport = {
  set: { id: 4, name: 'Kestrel Row parcel depot' },
  profile: { hash: 'aaaaaaaaaaaaaaaa', label: 'forward 1000 ms, pitch 1000 mm', value: { forwardMs: 1000, quarterTurnMs: 600, waitMs: 1000, cellPitchMm: 1000, robotDiameterMm: 700, timingJitter: 0.1 } },
  policy: 'dependency-gated',
  instances: 8,
  executionSettings: ['20 runs, timing jitter CV 0.1, no stalls'],
  variants: [
    variant('classic', { isReference: true, makespanVsClassic: { pairs: 8, ratio: 1, ci95: null } }),
    variant('weighted-split', { model: 'weighted-split', nominalExecutable: 7, executableRate: 7 / 8, executableCi95: [0.529, 0.978] }),
  ],
  comparison: null,
  summary: ['First sentence from the server.', 'Weighted-split: finished 12 % [9 %, 15 %] sooner than classic.'],
  methods: ['Method one.'],
  safetyNote: SAFETY_NOTE,
};

describe('ModelComparisonPage', () => {
  let backend: HttpTestingController;
  let harness: RouterTestingHarness;

  beforeEach(async () => {
    TestBed.configureTestingModule({
      providers: [
        provideHttpClient(), provideHttpClientTesting(),
        provideRouter([{ path: 'reports', component: ModelComparisonPage }], withComponentInputBinding()),
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    harness = await RouterTestingHarness.create();
  });

  afterEach(() => backend.verify());

  /**
   * Lets signals, the router and the resources run. Not whenStable: an HTTP request left open on
   * purpose (the next report) counts as pending work, so whenStable would wait for it forever.
   */
  async function settle(): Promise<void> {
    for (let i = 0; i < 3; i++) {
      harness.detectChanges();
      await new Promise((resolve) => setTimeout(resolve));
    }
    harness.detectChanges();
  }

  async function open(url: string): Promise<HTMLElement> {
    void harness.navigateByUrl(url, ModelComparisonPage);
    await settle();
    backend.expectOne('/api/reports/choices').flush(CHOICES);
    await settle();
    return harness.routeNativeElement as HTMLElement;
  }

  /** Picks `value` in the select labelled `label`, as the select reports a choice. */
  function pick(label: string, value: string | number): void {
    harness.fixture.debugElement.query(By.css(`mat-select[aria-label="${label}"]`)).triggerEventHandler('valueChange', value);
  }

  it('asks for the first set, its most used profile and dependency-gated, and shows sentences, table, methods and the safety note', async () => {
    const el = await open('/reports');
    const req = backend.expectOne((r) => r.url === '/api/reports/model-comparison');
    expect(req.request.params.get('set')).toBe('4');
    expect(req.request.params.get('profile')).toBe('aaaaaaaaaaaaaaaa');
    expect(req.request.params.get('policy')).toBe('dependency-gated');
    req.flush(REPORT);
    await settle();

    const sentences = [...el.querySelectorAll('.answer p')].map((p) => p.textContent?.trim());
    expect(sentences).toEqual(REPORT.summary);
    const headers = [...el.querySelectorAll('.figures thead th')].map((th) => th.textContent?.trim());
    expect(headers[0]).toBe('Plan model');
    expect(headers).toContain('Realised makespan / classic (ratio, 95 % CI)');
    const rows = [...el.querySelectorAll('.figures tbody tr')].map((tr) => [...tr.children].map((c) => c.textContent?.trim()));
    expect(rows).toHaveLength(2);
    expect(rows[0][0]).toBe('classic');
    expect(rows[0][4]).toBe('1 (reference)');
    expect(headers).toContain('Executable at nominal times (% of checked solved instances, 95 % CI)');
    expect(headers).toContain('Execution success rate (mean over executed instances, %, 95 % CI)');
    expect(rows[1]).toEqual(['weighted-split', '100.0 % [67.6 %, 100.0 %] (8 of 8)', '87.5 % [52.9 %, 97.8 %] (7 of 8)', '100.0 % [97.7 %, 100.0 %] (8 instances, 160 runs)',
      '0.880 [0.850, 0.910] (8 pairs)', '2100 [1500, 2700]', '0.93 [0.62, 0.99] (n = 8)']);
    expect(el.querySelector('.methods li')?.textContent).toBe('Method one.');
    expect(el.querySelector('.safety')?.textContent).toBe(SAFETY_NOTE);
    expect(el.querySelector('.settings')?.textContent).toContain('20 runs, timing jitter CV 0.1, no stalls');
    // One replay setting: nothing about mixed settings.
    expect(el.querySelector('.mixed-settings')).toBeNull();
    const links = [...el.querySelectorAll<HTMLAnchorElement>('.exports a')].map((a) => a.getAttribute('href'));
    expect(links).toEqual([
      '/api/reports/model-comparison?set=4&profile=aaaaaaaaaaaaaaaa&policy=dependency-gated&format=markdown',
      '/api/reports/model-comparison?set=4&profile=aaaaaaaaaaaaaaaa&policy=dependency-gated&format=latex',
    ]);
  });

  it('reads set, profile and policy from the link and puts a new choice into the URL', async () => {
    await open('/reports?set=4&profile=bbbbbbbbbbbbbbbb&policy=lockstep');
    const first = backend.expectOne((r) => r.url === '/api/reports/model-comparison');
    expect([first.request.params.get('profile'), first.request.params.get('policy')]).toEqual(['bbbbbbbbbbbbbbbb', 'lockstep']);
    first.flush(REPORT);
    await settle();

    pick('Execution policy', 'open-loop');
    await settle();
    expect(TestBed.inject(Router).url).toBe('/reports?set=4&profile=bbbbbbbbbbbbbbbb&policy=open-loop');
    const second = backend.expectOne((r) => r.url === '/api/reports/model-comparison');
    expect(second.request.params.get('policy')).toBe('open-loop');
    second.flush(REPORT);
    await settle();

    // Another set drops the profile, which belongs to the old set: the new set's first is asked for.
    pick('Instance set', 9);
    await settle();
    expect(TestBed.inject(Router).url).toBe('/reports?set=9&policy=open-loop');
    const third = backend.expectOne((r) => r.url === '/api/reports/model-comparison');
    expect([third.request.params.get('set'), third.request.params.get('profile')]).toEqual(['9', 'cccccccccccccccc']);
    third.flush(REPORT);
  });

  it('says the variants are not ranked when the replays were made with different settings', async () => {
    const el = await open('/reports?set=4');
    const mixed = ['20 runs, timing jitter CV 0.1, no stalls', '50 runs, timing jitter CV 0.2, no stalls'];
    backend.expectOne((r) => r.url === '/api/reports/model-comparison').flush({ ...REPORT, executionSettings: mixed });
    await settle();
    expect(el.querySelector('.settings')?.textContent).toContain(mixed.join('; '));
    expect(el.querySelector('.mixed-settings')?.textContent).toBe(MIXED_SETTINGS_NOTE);
  });

  it("shows the server's sentence when the report is refused", async () => {
    const el = await open('/reports?set=4');
    backend.expectOne((r) => r.url === '/api/reports/model-comparison').flush(
      { error: { code: 'NOT_FOUND', message: 'Instance set "Kestrel Row parcel depot" has no computed results for robot profile aaaaaaaaaaaaaaaa', details: [{ param: 'profile' }] } },
      { status: 404, statusText: 'Not Found' },
    );
    await settle();
    expect(el.querySelector('.notice')?.textContent).toContain('has no computed results for robot profile');
    expect(el.querySelector('.answer')).toBeNull();
  });

  it('shows the field runs of the report\'s results beside their simulated makespan, flagged runs marked (issue 17, item 3)', async () => {
    const el = await open('/reports');
    backend.expectOne((r) => r.url === '/api/reports/model-comparison').flush({
      ...REPORT,
      fieldTrials: [{
        resultId: 12, variant: 'classic', scenario: 'kestrel-1.scen', agents: 4, runs: 8, successfulRuns: 7, fieldMakespanMeanMs: 9410.4,
        simulatedMakespan: { mean: 8800, low: 8100, high: 9600 }, simulatedSuccessRate: 1, runsOutside: 2,
      }],
    } satisfies ModelComparisonReport);
    await settle();
    const section = el.querySelector('[data-testid="report-field-trials"]')!;
    const cells = [...section.querySelectorAll('tbody tr')[0].children].map((c) => c.textContent?.trim());
    expect(cells).toEqual(['classic', 'kestrel-1.scen, 4 agents', '8', '7 of 8', '100 %', '9410 ms', '8800 ms (8100 ms – 9600 ms)', '2']);
    expect(section.querySelector('a')?.getAttribute('href')).toBe('/plans/view?result=12');
    expect(section.querySelector('td.flagged')?.textContent?.trim()).toBe('2');
  });

  it('has no field-trials section when no result of the report has field runs', async () => {
    const el = await open('/reports');
    backend.expectOne((r) => r.url === '/api/reports/model-comparison').flush(REPORT);
    await settle();
    expect(el.querySelector('[data-testid="report-field-trials"]')).toBeNull();
  });
});
